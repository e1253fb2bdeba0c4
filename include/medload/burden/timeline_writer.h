// `medload timeline`: a patient's medication episodes as an SVG chart (one row per
// medicine, supplied days as solid bars and tail days as pale ones, dispensings as ticks,
// the census date, the concurrent count over time), an HTML page around it, or a text
// table. Writers run no queries.
#pragma once

#include <iosfwd>
#include <optional>
#include <span>
#include <string>
#include <utility>
#include <vector>

#include <nlohmann/json.hpp>

#include "medload/burden/timeline.h"

namespace medload {

struct TimelineModel {
  std::string patient;
  Date from;                  // first day shown
  Date to;                    // last day shown; REQUIRES: from <= to
  std::optional<Date> census; // drawn as a vertical line when inside the range
  const Timeline* timeline = nullptr;  // REQUIRES: non-null
  std::span<const DispensingRecord> records;  // the records the timeline was built from
  long dropped = 0;           // older dispensings the store left out (PatientHistory::dropped)
};

// The days an episode's supplies cover (merged where they meet), by start; the episode's
// other days are tail days (a supply ran out and the next had not begun).
std::vector<std::pair<Date, Date>> SuppliedSpans(const Episode& episode);

// Number of medicines with an episode containing each day from `from` to `to`.
std::vector<int> ConcurrentCounts(const Timeline& timeline, Date from, Date to);

// What the chart leaves out, one sentence each, in every format: the dispensings of each
// product nothing in the formulary recognises (by name, at most 20, then how many more),
// of non-medicines, those left out by --exclude-prn or --exclude-route, and those whose
// status does not count, and the `dropped` older dispensings left out by the store's bound
// on one patient's history (the latest `kept` were read). Empty when nothing is left out.
std::vector<std::string> NotDrawnNotes(const Timeline& timeline, long dropped = 0, size_t kept = 0);

void WriteTimelineSvg(std::ostream& out, const TimelineModel& model);
void WriteTimelineHtml(std::ostream& out, const TimelineModel& model);
void WriteTimelineText(std::ostream& out, const TimelineModel& model);
void WriteTimelineCsv(std::ostream& out, const TimelineModel& model);
// {"patient", "from", "to", "census", "episodes": [{"medicine", "ingredients", "start",
// "end", "days", "supplied_days", "tail_days", "supplied": [{"from", "to"}],
// "dispensings"}], "caution"}: the episodes shown, as in the CSV, with their supplied spans.
nlohmann::json TimelineJson(const TimelineModel& model);

}  // namespace medload
