// The SVG trend chart of a cohort table: crude rate per 1000 per group over the census
// dates. Up to kMaxTrendLines groups share one plot, each line labelled at its end; more
// groups get one small panel each on a shared scale, every panel with the reference series
// (the report's network total) behind the group's own line. It formats nothing else.
#pragma once

#include <optional>
#include <string>

#include "medload/cohort/cohort_table.h"
#include "medload/format/chart_layout.h"

namespace medload {

// Groups (besides the reference) that share one plot; beyond this, small panels.
inline constexpr size_t kMaxTrendLines = 5;

struct TrendStyle {
  // A group drawn for comparison: a labelled near-black line in the single plot, a grey
  // line behind the group's own in each panel. "" (default): none.
  std::string reference;
  // The colour of each group; default SeriesColours(table.groups). The report passes the
  // colours of all its practices so that a practice has one colour on every page.
  std::optional<SeriesColours> colours;
};

// The chart of `table.keys[key]`: a title, the axis (or shared scale) labels, every date or
// every n-th so that date labels do not touch, and every series named in text (end labels
// or panel titles) so that it reads without colour. Suppressed values and dates without
// figures leave gaps; short-history points are hollow circles and beyond-data points
// hollow squares, joined by dashed lines. Labels never overlap one another.
// REQUIRES: key < table.keys.size().
std::string CohortTrendSvg(const CohortTable& table, size_t key, const TrendStyle& style = {});

}  // namespace medload
