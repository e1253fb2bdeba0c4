// The SVG trend chart of a cohort table: crude rate per 1000 per group over the census
// dates, one labelled line per group.
#include <algorithm>
#include <cmath>
#include <sstream>

#include "medload/cohort/cohort_writer.h"
#include "medload/format/output.h"
#include "medload/format/svg_chart.h"

namespace medload {
namespace {

constexpr double kWidth = 760;
constexpr double kHeight = 340;
constexpr double kLeft = 64;
constexpr double kRight = 150;  // room for the group labels at the line ends
constexpr double kTop = 36;
constexpr double kBottom = 56;
constexpr double kLabelGap = 12;  // the least vertical distance between two end labels
constexpr const char* kColours[] = {"#1b6ca8", "#c0392b", "#2e8b57", "#8e44ad", "#d35400",
                                    "#2c3e50", "#7f8c8d", "#b7950b"};

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
    series.rates[at] = row.values[key].rate;
    series.data[at] = row.data;
  }
  return series;
}

// A point's marker: filled circle (full), hollow circle (short history), hollow square
// (beyond the data), so that the states read without colour.
void WriteMarker(std::ostringstream& svg, const Point& p, DataState data, const char* colour) {
  if (data == DataState::kBeyondData) {
    svg << "<rect x=\"" << SvgNumber(p.x - 3) << "\" y=\"" << SvgNumber(p.y - 3) << "\" width=\"6\" height=\"6\" "
        << "fill=\"#fff\" stroke=\"" << colour << "\" stroke-width=\"1.5\"><title>beyond the data</title></rect>\n";
    return;
  }
  svg << "<circle cx=\"" << SvgNumber(p.x) << "\" cy=\"" << SvgNumber(p.y) << "\" r=\"" << (data == DataState::kFull ? "2.5" : "3")
      << "\" fill=\"" << (data == DataState::kFull ? colour : "#fff") << "\""
      << (data == DataState::kFull ? "" : std::string(" stroke=\"") + colour + "\" stroke-width=\"1.5\"")
      << (data == DataState::kShortHistory ? "><title>short history</title></circle>\n" : "/>\n");
}

// The x of date index `d` of `n`: spread across the plot, or its middle for one date.
double XOf(size_t d, size_t n) {
  const double plot_w = kWidth - kLeft - kRight;
  if (n <= 1) return kLeft + plot_w / 2;
  return kLeft + plot_w * static_cast<double>(d) / static_cast<double>(n - 1);
}

void WriteAxes(std::ostringstream& svg, const CohortTable& table, double top_rate,
               const std::string& title) {
  const double plot_w = kWidth - kLeft - kRight;
  const double plot_h = kHeight - kTop - kBottom;
  svg << "<text x=\"" << kLeft << "\" y=\"20\" font-size=\"15\" font-weight=\"bold\">"
      << EscapeHtml(title) << "</text>\n";
  for (int tick = 0; tick <= 4; ++tick) {
    const double y = kTop + plot_h - plot_h * tick / 4.0;
    svg << "<line x1=\"" << kLeft << "\" y1=\"" << SvgNumber(y) << "\" x2=\"" << kLeft + plot_w
        << "\" y2=\"" << SvgNumber(y) << "\" stroke=\"#ddd\"/>\n"
        << "<text x=\"" << kLeft - 6 << "\" y=\"" << SvgNumber(y + 4)
        << "\" font-size=\"11\" text-anchor=\"end\">" << FormatNumber(top_rate * tick / 4.0, 1)
        << "</text>\n";
  }
  const size_t n = table.dates.size();
  const size_t every = std::max<size_t>(1, (n + 7) / 8);  // at most about 8 date labels
  for (size_t d = 0; d < n; d += every) {
    const double x = XOf(d, n);
    svg << "<text x=\"" << SvgNumber(x) << "\" y=\"" << SvgNumber(kTop + plot_h + 16)
        << "\" font-size=\"11\" text-anchor=\"middle\">" << table.dates[d].ToIso() << "</text>\n";
  }
  svg << "<line x1=\"" << kLeft << "\" y1=\"" << kTop + plot_h << "\" x2=\"" << kLeft + plot_w
      << "\" y2=\"" << kTop + plot_h << "\" stroke=\"#333\"/>\n"
      << "<line x1=\"" << kLeft << "\" y1=\"" << kTop << "\" x2=\"" << kLeft << "\" y2=\""
      << kTop + plot_h << "\" stroke=\"#333\"/>\n"
      << "<text x=\"" << SvgNumber(kLeft + plot_w / 2) << "\" y=\"" << kHeight - 14
      << "\" font-size=\"12\" text-anchor=\"middle\">census date</text>\n"
      << "<text transform=\"translate(16 " << SvgNumber(kTop + plot_h / 2)
      << ") rotate(-90)\" font-size=\"12\" text-anchor=\"middle\">rate per 1000 registered</text>\n";
}

struct Label {
  double y = 0;
  std::string group;
  const char* colour = "";
};

// Moves labels apart so that none is closer than kLabelGap to the one above it, and none
// falls below the x axis.
void SpreadLabels(std::vector<Label>& labels) {
  std::sort(labels.begin(), labels.end(),
            [](const Label& a, const Label& b) { return a.y != b.y ? a.y < b.y : a.group < b.group; });
  for (size_t i = 1; i < labels.size(); ++i) {
    labels[i].y = std::max(labels[i].y, labels[i - 1].y + kLabelGap);
  }
  // Then back up from the x axis, so that no label drops onto the date labels below it.
  const double lowest = kHeight - kBottom + 4;
  for (size_t i = labels.size(); i-- > 0;) {
    const double limit = i + 1 < labels.size() ? labels[i + 1].y - kLabelGap : lowest;
    labels[i].y = std::min(labels[i].y, limit);
  }
}

std::vector<std::optional<Point>> PointsOf(const std::vector<std::optional<double>>& values,
                                           double top_rate) {
  const double plot_h = kHeight - kTop - kBottom;
  std::vector<std::optional<Point>> points;
  for (size_t d = 0; d < values.size(); ++d) {
    if (!values[d]) {
      points.emplace_back();
      continue;
    }
    points.push_back(Point{XOf(d, values.size()), kTop + plot_h - plot_h * *values[d] / top_rate});
  }
  return points;
}

}  // namespace

std::string CohortTrendSvg(const CohortTable& table, size_t key) {
  double highest = 0;
  for (const CohortRow& row : table.rows) highest = std::max(highest, row.values[key].rate.value_or(0));
  const double top_rate = NiceAxisTop(highest);
  const std::string title = table.keys[key] + ": rate per 1000 registered, by " +
                            std::string(GroupByName(table.group_by));
  std::ostringstream svg;
  svg << "<svg xmlns=\"http://www.w3.org/2000/svg\" role=\"img\" width=\"" << kWidth
      << "\" height=\"" << kHeight << "\" viewBox=\"0 0 " << kWidth << " " << kHeight
      << "\" font-family=\"sans-serif\"><title>" << EscapeHtml(title) << "</title>\n";
  WriteAxes(svg, table, top_rate, title);
  std::vector<Label> labels;
  for (size_t g = 0; g < table.groups.size(); ++g) {
    const char* colour = kColours[g % (sizeof(kColours) / sizeof(kColours[0]))];
    const Series series = SeriesOf(table, table.groups[g], key);
    const std::vector<std::optional<Point>> points = PointsOf(series.rates, top_rate);
    // Solid between two full points, dashed where either end is short-history or beyond
    // the data; a date without a value is a gap.
    std::string solid, dashed;
    std::optional<Point> last;
    std::optional<bool> previous_full;  // the style of the segment ending at d - 1, if any
    for (size_t d = 0; d < points.size(); ++d) {
      if (!points[d]) {
        previous_full.reset();
        continue;
      }
      const Point& p = *points[d];
      if (d > 0 && points[d - 1]) {
        const bool full = series.data[d] == DataState::kFull && series.data[d - 1] == DataState::kFull;
        std::string& path = full ? solid : dashed;
        if (previous_full != full) path += " M" + SvgNumber(points[d - 1]->x) + " " + SvgNumber(points[d - 1]->y);
        path += " L" + SvgNumber(p.x) + " " + SvgNumber(p.y);
        previous_full = full;
      }
      last = p;
      WriteMarker(svg, p, series.data[d], colour);
    }
    if (!solid.empty()) {
      svg << "<path d=\"" << solid.substr(1) << "\" fill=\"none\" stroke=\"" << colour
          << "\" stroke-width=\"2\"/>\n";
    }
    if (!dashed.empty()) {
      svg << "<path d=\"" << dashed.substr(1) << "\" fill=\"none\" stroke=\"" << colour
          << "\" stroke-width=\"2\" stroke-dasharray=\"5 4\"/>\n";
    }
    if (last) labels.push_back(Label{last->y + 4, table.groups[g], colour});
  }
  SpreadLabels(labels);
  for (const Label& label : labels) {
    svg << "<text x=\"" << kWidth - kRight + 8 << "\" y=\"" << SvgNumber(label.y)
        << "\" font-size=\"11\" fill=\"" << label.colour << "\">" << EscapeHtml(label.group)
        << "</text>\n";
  }
  svg << "</svg>";
  return svg.str();
}

}  // namespace medload
