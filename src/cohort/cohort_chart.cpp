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

// One group's rates, by date index (absent = suppressed or none registered).
std::vector<std::optional<double>> SeriesOf(const CohortTable& table, const std::string& group,
                                            size_t key) {
  std::vector<std::optional<double>> values(table.dates.size());
  for (const CohortRow& row : table.rows) {
    if (row.group != group) continue;
    const auto at = std::find(table.dates.begin(), table.dates.end(), row.date);
    values[static_cast<size_t>(at - table.dates.begin())] = row.values[key].rate;
  }
  return values;
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
    const std::vector<std::optional<Point>> points =
        PointsOf(SeriesOf(table, table.groups[g], key), top_rate);
    std::string path;
    bool drawing = false;
    std::optional<Point> last;
    for (const std::optional<Point>& p : points) {
      if (!p) {
        drawing = false;  // a gap: the next point starts a new segment
        continue;
      }
      path += (drawing ? " L" : " M") + SvgNumber(p->x) + " " + SvgNumber(p->y);
      drawing = true;
      last = p;
      svg << "<circle cx=\"" << SvgNumber(p->x) << "\" cy=\"" << SvgNumber(p->y)
          << "\" r=\"2.5\" fill=\"" << colour << "\"/>\n";
    }
    if (!path.empty()) {
      svg << "<path d=\"" << path.substr(1) << "\" fill=\"none\" stroke=\"" << colour
          << "\" stroke-width=\"2\"/>\n";
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
