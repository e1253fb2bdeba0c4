// The SVG trend chart of a cohort table: one labelled plot for a few groups, small panels
// on a shared scale for many (docs/report.md, "Charts").
#include "medload/cohort/cohort_chart.h"

#include <algorithm>
#include <cmath>
#include <sstream>

#include "medload/format/output.h"
#include "medload/format/svg_chart.h"

namespace medload {
namespace {

constexpr double kWidth = 760;
constexpr double kFont = 11;          // labels and tick values
constexpr double kSmallFont = 9;      // inside panels
constexpr double kLabelGap = 13;      // baseline to baseline of two end labels
constexpr double kMaxLabelWidth = 170;
constexpr const char* kPanelReference = "#9a9a9a";

struct Point {
  double x = 0;
  double y = 0;
};

// One group's rates, by date index (absent = no data, suppressed or none registered),
// and the data coverage of each date.
struct Series {
  std::vector<std::optional<double>> rates;
  std::vector<DataState> data;
};

Series SeriesOf(const CohortTable& table, const std::string& group, size_t key) {
  Series series{std::vector<std::optional<double>>(table.dates.size()),
                std::vector<DataState>(table.dates.size(), DataState::kNoData)};
  for (const CohortRow& row : table.rows) {
    if (row.group != group) continue;
    const auto at = static_cast<size_t>(std::find(table.dates.begin(), table.dates.end(), row.date) -
                                        table.dates.begin());
    if (at >= table.dates.size()) continue;
    series.rates[at] = row.values[key].rate;
    series.data[at] = row.data;
  }
  return series;
}

// Where rates and date indexes go.
struct Plot {
  double left = 0;
  double top = 0;
  double width = 0;
  double height = 0;
  double y_top = 1;
  size_t dates = 1;
  double Bottom() const { return top + height; }
  double Right() const { return left + width; }
  double X(size_t d) const {
    if (dates <= 1) return left + width / 2;
    return left + width * static_cast<double>(d) / static_cast<double>(dates - 1);
  }
  double Y(double rate) const { return Bottom() - height * std::clamp(rate / y_top, 0.0, 1.0); }
};

// A point's marker: filled circle (full), hollow circle (short history), hollow square
// (beyond the data), so that the states read without colour.
void WriteMarker(std::ostringstream& svg, const Point& p, DataState data, std::string_view colour) {
  if (data == DataState::kBeyondData) {
    svg << "<rect x=\"" << SvgNumber(p.x - 3) << "\" y=\"" << SvgNumber(p.y - 3) << "\" width=\"6\" height=\"6\" "
        << "fill=\"#fff\" stroke=\"" << colour << "\" stroke-width=\"1.5\"><title>beyond the data</title></rect>\n";
    return;
  }
  const bool full = data == DataState::kFull;
  svg << "<circle cx=\"" << SvgNumber(p.x) << "\" cy=\"" << SvgNumber(p.y) << "\" r=\"" << (full ? "2.5" : "3")
      << "\" fill=\"" << (full ? colour : "#fff") << "\"";
  if (!full) svg << " stroke=\"" << colour << "\" stroke-width=\"1.5\"";
  svg << (data == DataState::kShortHistory ? "><title>short history</title></circle>\n" : "/>\n");
}

// Which points of a series get a marker.
enum class Markers {
  kAll,
  kNotFullAndLast,  // points that are not full, and the last one
  kNone,
};

// Draws one series: solid between two full points, dashed where either end is
// short-history or beyond the data, a gap where a date has no value. Returns the last
// point drawn.
std::optional<Point> WriteSeries(std::ostringstream& svg, const Plot& plot, const Series& series,
                                 std::string_view colour, double width, Markers markers) {
  std::string solid, dashed;
  std::optional<Point> last;
  DataState last_data = DataState::kFull;
  std::optional<bool> previous_full;  // the style of the segment ending at d - 1, if any
  std::vector<std::pair<Point, DataState>> marks;
  for (size_t d = 0; d < series.rates.size(); ++d) {
    if (!series.rates[d]) {
      previous_full.reset();
      continue;
    }
    const Point p{plot.X(d), plot.Y(*series.rates[d])};
    if (d > 0 && series.rates[d - 1]) {
      const bool full = series.data[d] == DataState::kFull && series.data[d - 1] == DataState::kFull;
      std::string& path = full ? solid : dashed;
      if (previous_full != full) path += " M" + SvgNumber(last->x) + " " + SvgNumber(last->y);
      path += " L" + SvgNumber(p.x) + " " + SvgNumber(p.y);
      previous_full = full;
    }
    last = p;
    last_data = series.data[d];
    if (markers == Markers::kAll || (markers == Markers::kNotFullAndLast && last_data != DataState::kFull)) {
      marks.emplace_back(p, last_data);
    }
  }
  const std::string stroke = "\" fill=\"none\" stroke=\"" + std::string(colour) + "\" stroke-width=\"" + SvgNumber(width);
  if (!solid.empty()) svg << "<path d=\"" << solid.substr(1) << stroke << "\"/>\n";
  if (!dashed.empty()) svg << "<path d=\"" << dashed.substr(1) << stroke << "\" stroke-dasharray=\"5 4\"/>\n";
  if (markers == Markers::kNotFullAndLast && last && last_data == DataState::kFull) marks.emplace_back(*last, last_data);
  for (const auto& [p, data] : marks) WriteMarker(svg, p, data, colour);
  return last;
}

// The date labels under a plot: every n-th date, n chosen so that neighbours keep a gap.
void WriteDateLabels(std::ostringstream& svg, const Plot& plot, const std::vector<Date>& dates) {
  const double label = TextWidth("0000-00-00", kFont) + 10;
  const double spacing = dates.size() > 1 ? plot.width / static_cast<double>(dates.size() - 1) : plot.width;
  const auto every = static_cast<size_t>(std::max(1.0, std::ceil(label / spacing)));
  for (size_t d = 0; d < dates.size(); d += every) {
    WriteSvgText(svg, plot.X(d), plot.Bottom() + 19, kFont, "middle", dates[d].ToIso());
  }
}

void WriteLineAxes(std::ostringstream& svg, const Plot& plot, const std::vector<Date>& dates) {
  for (int tick = 0; tick <= 5; ++tick) {  // fifths of a kFineAxisSteps top are round
    const double rate = plot.y_top * tick / 5.0;
    WriteSvgLine(svg, plot.left, plot.Y(rate), plot.Right(), plot.Y(rate), "stroke=\"#ddd\"");
    WriteSvgText(svg, plot.left - 6, plot.Y(rate) + 4, kFont, "end", FormatNumber(rate, 1));
  }
  WriteDateLabels(svg, plot, dates);
  WriteSvgLine(svg, plot.left, plot.Bottom(), plot.Right(), plot.Bottom(), "stroke=\"#333\"");
  WriteSvgLine(svg, plot.left, plot.top, plot.left, plot.Bottom(), "stroke=\"#333\"");
  WriteSvgText(svg, plot.left + plot.width / 2, plot.Bottom() + 42, 12, "middle", "census date");
  svg << "<text transform=\"translate(16 " << SvgNumber(plot.top + plot.height / 2)
      << ") rotate(-90)\" font-size=\"12\" text-anchor=\"middle\">rate per 1000 registered</text>\n";
}

struct Drawn {
  std::string group;
  std::string_view colour;
  Series series;
};

void OpenSvg(std::ostringstream& svg, double height, const std::string& title) {
  svg << "<svg xmlns=\"http://www.w3.org/2000/svg\" role=\"img\" class=\"trend\" width=\"" << kWidth
      << "\" height=\"" << SvgNumber(height) << "\" viewBox=\"0 0 " << kWidth << " " << SvgNumber(height)
      << "\" font-family=\"sans-serif\"><title>" << EscapeHtml(title) << "</title>\n";
  WriteSvgText(svg, 8, 20, 15, "start", FitText(title, 15 * kBoldWidth, kWidth - 16), " font-weight=\"bold\"");
}

// One plot, one line per series (the reference first, under the others), each labelled
// at its end. nullopt when the end labels cannot all fit beside the plot.
std::optional<std::string> LineChart(const std::vector<Drawn>& drawn, const std::vector<Date>& dates,
                                     double y_top, const std::string& title) {
  double label_width = 0;
  for (const Drawn& d : drawn) label_width = std::max(label_width, TextWidth(FitText(d.group, kFont, kMaxLabelWidth), kFont));
  const Plot plot{64, 36, kWidth - 64 - (label_width + 20), 248, y_top, dates.size()};
  std::ostringstream svg;
  OpenSvg(svg, 340, title);
  WriteLineAxes(svg, plot, dates);
  std::vector<double> wanted;
  std::vector<const Drawn*> labelled;
  for (const Drawn& d : drawn) {
    if (const auto last = WriteSeries(svg, plot, d.series, d.colour, 2, Markers::kAll)) {
      wanted.push_back(last->y + 4);
      labelled.push_back(&d);
    }
  }
  // Baselines from just under the top of the plot down to the x axis (the date labels,
  // centred under the last date, reach out beside the plot just below it).
  const auto placed = PlaceLabels(wanted, kLabelGap, plot.top + 4, plot.Bottom());
  if (!placed) return std::nullopt;
  for (size_t i = 0; i < labelled.size(); ++i) {
    WriteSvgText(svg, plot.Right() + 8, (*placed)[i], kFont, "start", FitText(labelled[i]->group, kFont, kMaxLabelWidth),
              " fill=\"" + std::string(labelled[i]->colour) + "\"");
  }
  svg << "</svg>";
  return svg.str();
}

// The geometry of the panel grid (docs/report.md, "Charts").
struct Panels {
  static constexpr double kLeft = 40;     // room for the shared scale's values
  static constexpr double kGapX = 14;
  static constexpr double kHeader = 80;   // title, three lines of key
  static constexpr double kTitle = 18;    // a panel's title line
  static constexpr double kBelow = 26;    // date labels and the gap to the next row
  PanelGrid grid;
  double width = 0;        // of one panel
  double plot_height = 0;  // of one panel's plot
  explicit Panels(size_t count) : grid(GridFor(count)) {
    const auto columns = static_cast<double>(grid.columns);
    width = (kWidth - kLeft - 8 - (columns - 1) * kGapX) / columns;
    plot_height = std::min(110.0, std::round(width * 0.5));
  }
  double Height() const { return kTitle + plot_height + kBelow; }
  double Total() const { return kHeader + static_cast<double>(grid.rows) * Height(); }
  Plot PlotOf(size_t index, double y_top, size_t dates) const {
    const auto column = static_cast<double>(index % grid.columns);
    const auto row = static_cast<double>(index / grid.columns);
    return Plot{kLeft + column * (width + kGapX), kHeader + row * Height() + kTitle, width, plot_height, y_top, dates};
  }
};

std::string MonthText(Date date) { return date.ToIso().substr(0, 7); }

// The frame of one panel: light lines at 0, half and the top; the scale's values on the
// first column; the first and last month under the plot.
void WritePanelFrame(std::ostringstream& svg, const Plot& plot, bool first_column, const std::vector<Date>& dates) {
  for (const double share : {0.0, 0.5, 1.0}) {
    WriteSvgLine(svg, plot.left, plot.Y(plot.y_top * share), plot.Right(), plot.Y(plot.y_top * share),
                 share == 0 ? "stroke=\"#888\"" : "stroke=\"#e2e2e2\"");
    if (first_column && share != 0.5) {
      WriteSvgText(svg, plot.left - 4, plot.Y(plot.y_top * share) + 3, kSmallFont, "end", FormatNumber(plot.y_top * share, 1));
    }
  }
  const double below = plot.Bottom() + 12;
  if (dates.size() == 1 || TextWidth("0000-00", kSmallFont) * 2 + 8 > plot.width) {
    WriteSvgText(svg, plot.Right(), below, kSmallFont, "end", MonthText(dates.back()));
    return;
  }
  WriteSvgText(svg, plot.left, below, kSmallFont, "start", MonthText(dates.front()));
  WriteSvgText(svg, plot.Right(), below, kSmallFont, "end", MonthText(dates.back()));
}

// The panel's title: the group in its colour, and its value on the last date at the right.
void WritePanelTitle(std::ostringstream& svg, const Plot& plot, const Drawn& d) {
  const std::optional<double> last = d.series.rates.empty() ? std::nullopt : d.series.rates.back();
  const std::string value = last ? FormatNumber(*last, 1) : "-";
  const double value_width = TextWidth(value, kFont);
  const double baseline = plot.top - 6;
  WriteSvgText(svg, plot.left, baseline, kFont, "start",
            FitText(d.group, kFont * kBoldWidth, plot.width - value_width - 8),
            " font-weight=\"bold\" fill=\"" + std::string(d.colour) + "\"");
  WriteSvgText(svg, plot.Right(), baseline, kFont, "end", value, " fill=\"" + std::string(d.colour) + "\"");
}

// Three lines under the title saying how to read the panels.
void WritePanelKey(std::ostringstream& svg, double y_top, const std::string& reference, GroupBy group_by) {
  std::string first = "One panel per " + std::string(GroupByName(group_by)) + ", all on one scale: 0 to " +
                      FormatNumber(y_top, 1) + " per 1000.";
  if (!reference.empty()) first += " Grey line: " + reference + ".";
  const std::string lines[] = {first, "Top right of each panel: the rate on the last census date.",
                               "Hollow circle: short history; hollow square: beyond the data; dashed: not full."};
  double y = 38;
  for (const std::string& line : lines) {
    WriteSvgText(svg, 8, y, kFont, "start", FitText(line, kFont, kWidth - 16), " fill=\"#444\"");
    y += 15;
  }
}

std::string PanelChart(const std::vector<Drawn>& drawn, const Drawn* reference, const CohortTable& table,
                       double y_top, const std::string& title) {
  const Panels panels(drawn.size());
  std::ostringstream svg;
  OpenSvg(svg, panels.Total(), title);
  WritePanelKey(svg, y_top, reference != nullptr ? reference->group : "", table.group_by);
  for (size_t i = 0; i < drawn.size(); ++i) {
    const Plot plot = panels.PlotOf(i, y_top, table.dates.size());
    svg << "<g class=\"panel\">\n";
    WritePanelFrame(svg, plot, i % panels.grid.columns == 0, table.dates);
    if (reference != nullptr) WriteSeries(svg, plot, reference->series, kPanelReference, 2.5, Markers::kNone);
    WriteSeries(svg, plot, drawn[i].series, drawn[i].colour, 1.8, Markers::kNotFullAndLast);
    WritePanelTitle(svg, plot, drawn[i]);
    svg << "</g>\n";
  }
  svg << "</svg>";
  return svg.str();
}

}  // namespace

std::string CohortTrendSvg(const CohortTable& table, size_t key, const TrendStyle& style) {
  std::vector<std::string> names;
  for (const std::string& group : table.groups) {
    if (group != style.reference) names.push_back(group);
  }
  const SeriesColours colours = style.colours ? *style.colours : SeriesColours(names);
  std::vector<Drawn> drawn;
  std::optional<Drawn> reference;
  double highest = 0;
  for (const std::string& group : table.groups) {
    Drawn d{group, group == style.reference ? kReferenceColour : colours.Of(group), SeriesOf(table, group, key)};
    for (const auto& rate : d.series.rates) highest = std::max(highest, rate.value_or(0));
    if (group == style.reference) reference = std::move(d);
    else drawn.push_back(std::move(d));
  }
  const double y_top = NiceAxisTop(highest, kFineAxisSteps);
  const std::string title = table.keys[key] + ": rate per 1000 registered, by " + std::string(GroupByName(table.group_by));
  if (drawn.size() <= kMaxTrendLines) {
    std::vector<Drawn> lines;
    if (reference) lines.push_back(*reference);  // first: drawn under the others
    lines.insert(lines.end(), drawn.begin(), drawn.end());
    if (auto chart = LineChart(lines, table.dates, y_top, title)) return *chart;
  }
  return PanelChart(drawn, reference ? &*reference : nullptr, table, y_top, title);
}

}  // namespace medload
