// The report's funnel plots, and the cohort table behind its trend charts.
#include <algorithm>
#include <cmath>
#include <set>
#include <sstream>

#include "medload/format/chart_layout.h"
#include "medload/format/output.h"
#include "medload/format/suppression.h"
#include "medload/format/svg_chart.h"
#include "medload/report/funnel.h"
#include "medload/report/report_pages.h"

namespace medload {
namespace {

constexpr double kWidth = 760;
constexpr double kHeight = 440;
constexpr double kLeft = 70;
constexpr double kRight = 150;  // the column of practice labels
constexpr double kTop = 40;
constexpr double kBottom = 100; // tick values, axis title, key, note
constexpr double kFont = 11;
constexpr double kLabelGap = 13;
constexpr int kCurveSteps = 80;
constexpr int kTicks = 5;       // with kFineAxisSteps every tick is a round number

struct Frame {
  double x_top = 1;  // registered patients at the right edge
  double y_top = 1;  // rate per 1000 at the top edge
  static double Right() { return kWidth - kRight; }
  static double Bottom() { return kHeight - kBottom; }
  double X(double n) const { return kLeft + (Right() - kLeft) * n / x_top; }
  double Y(double rate) const { return kTop + (Bottom() - kTop) * (1 - std::clamp(rate, 0.0, y_top) / y_top); }
};

// A text element at the charts' usual size unless told.
void Text(std::ostringstream& svg, double x, double y, std::string_view anchor, std::string_view text,
          std::string_view extra = "", double size = kFont) {
  WriteSvgText(svg, x, y, size, anchor, text, extra);
}

void WriteFrame(std::ostringstream& svg, const Frame& f, const std::string& title) {
  Text(svg, 8, 22, "start", FitText(title, 15 * kBoldWidth, kWidth - 16), " font-weight=\"bold\"", 15);
  for (int tick = 0; tick <= kTicks; ++tick) {
    const double rate = f.y_top * tick / kTicks;
    const double n = f.x_top * tick / kTicks;
    WriteSvgLine(svg, kLeft, f.Y(rate), Frame::Right(), f.Y(rate), "stroke=\"#ddd\"");
    Text(svg, kLeft - 6, f.Y(rate) + 4, "end", FormatNumber(rate, 1));
    Text(svg, f.X(n), Frame::Bottom() + 16, "middle", FormatNumber(n, 0));
  }
  WriteSvgLine(svg, kLeft, Frame::Bottom(), Frame::Right(), Frame::Bottom(), "stroke=\"#333\"");
  WriteSvgLine(svg, kLeft, kTop, kLeft, Frame::Bottom(), "stroke=\"#333\"");
  Text(svg, f.X(f.x_top / 2), Frame::Bottom() + 36, "middle", "Registered patients on the census date", "", 12);
  const double middle = kTop + (Frame::Bottom() - kTop) / 2;
  svg << "<text x=\"16\" y=\"" << SvgNumber(middle) << "\" font-size=\"12\" text-anchor=\"middle\" transform=\"rotate(-90 16 "
      << SvgNumber(middle) << ")\">Patients per 1000</text>\n";
}

// One control-limit curve (upper or lower) as a polyline over the list sizes.
void WriteLimit(std::ostringstream& svg, const Frame& f, double p0, double coverage, bool upper,
                const char* dash) {
  svg << "<polyline fill=\"none\" stroke=\"#555\" stroke-width=\"1.3\" stroke-dasharray=\"" << dash
      << "\" points=\"";
  const double n_min = std::max(10.0, f.x_top / kCurveSteps);
  for (int step = 0; step <= kCurveSteps; ++step) {
    const double n = n_min + (f.x_top - n_min) * step / kCurveSteps;
    const ControlLimits limits = FunnelLimits(p0, std::lround(n), coverage);
    svg << (step == 0 ? "" : " ") << SvgNumber(f.X(n)) << "," << SvgNumber(f.Y(1000 * (upper ? limits.upper : limits.lower)));
  }
  svg << "\"/>\n";
}

// The key, in one row under the axis title: line styles, then the practice marker.
void WriteKey(std::ostringstream& svg, double network_rate) {
  const double y = Frame::Bottom() + 60;
  const struct {
    const char* dash;
    std::string text;
  } items[] = {{"", "network rate " + FormatNumber(network_rate, 1)},
               {"6 4", "95% control limits"},
               {"2 3", "99.8% control limits"}};
  double x = kLeft;
  for (const auto& item : items) {
    WriteSvgLine(svg, x, y - 4, x + 26, y - 4,
             std::string("stroke=\"#222\" stroke-width=\"1.5\"") +
             (item.dash[0] != 0 ? std::string(" stroke-dasharray=\"") + item.dash + "\"" : ""));
    Text(svg, x + 32, y, "start", item.text);
    x += 32 + TextWidth(item.text, kFont) + 18;
  }
  svg << "<circle cx=\"" << SvgNumber(x + 5) << "\" cy=\"" << SvgNumber(y - 4) << "\" r=\"4\" fill=\"#888\" stroke=\"#000\"/>\n";
  Text(svg, x + 14, y, "start", "a practice");
}

// A practice's point on the plot.
struct FunnelPoint {
  const ReportSeries* series = nullptr;
  double x = 0;
  double y = 0;
  double rate = 0;
  double z = 0;       // (p - p0) / sqrt(p0 (1 - p0) / n): how far from the network rate
  bool outside = false;  // outside the 95% limits
};

std::vector<FunnelPoint> PointsOf(const ReportModel& model, size_t key, const Frame& f, double p0) {
  const size_t last = model.dates.size() - 1;
  std::vector<FunnelPoint> points;
  for (const ReportSeries& s : model.practices) {
    const long n = s.registered[last];
    const long count = s.counts[key][last];
    if (n < 1 || !HasFigures(s.data[last]) || IsSuppressed(count, model.config.suppress_below)) continue;
    const double p = static_cast<double>(count) / static_cast<double>(n);
    const double sd = std::sqrt(std::max(p0 * (1 - p0), 1e-12) / static_cast<double>(n));
    const bool outside = p0 > 0 && p0 < 1 && PositionOf(count, n, p0, 0.95) != FunnelPosition::kWithin;
    points.push_back({&s, f.X(static_cast<double>(n)), f.Y(1000 * p), 1000 * p, (p - p0) / sd, outside});
  }
  return points;
}

// The points that get a label in the right-hand column: all when they fit, else those
// outside the 95% limits, farthest from the network rate first, as many as fit.
std::vector<const FunnelPoint*> Labelled(const std::vector<FunnelPoint>& points, size_t room) {
  std::vector<const FunnelPoint*> chosen;
  for (const FunnelPoint& p : points) {
    if (points.size() <= room || p.outside) chosen.push_back(&p);
  }
  std::stable_sort(chosen.begin(), chosen.end(),
                   [](const FunnelPoint* a, const FunnelPoint* b) { return std::abs(a->z) > std::abs(b->z); });
  if (chosen.size() > room) chosen.resize(room);
  return chosen;
}

// Labels in a column right of the plot, in the points' vertical order, none overlapping,
// each joined to its point by a thin leader line; then a note saying which are labelled.
void WriteLabels(std::ostringstream& svg, const std::vector<FunnelPoint>& points, const SeriesColours& colours) {
  const double top = kTop + 4;
  const double bottom = Frame::Bottom() + 4;
  const auto room = static_cast<size_t>(std::floor((bottom - top) / kLabelGap)) + 1;
  const std::vector<const FunnelPoint*> chosen = Labelled(points, room);
  std::vector<double> wanted;
  for (const FunnelPoint* p : chosen) wanted.push_back(p->y + 4);
  const std::vector<double> placed = PlaceLabels(wanted, kLabelGap, top, bottom).value_or(std::vector<double>{});
  const double x = Frame::Right() + 22;
  for (size_t i = 0; i < placed.size(); ++i) {
    const FunnelPoint& p = *chosen[i];
    WriteSvgLine(svg, p.x + 4, p.y, x - 3, placed[i] - 4, "stroke=\"#9a9a9a\" stroke-width=\"0.8\"");
    Text(svg, x, placed[i], "start", FitText(p.series->code, kFont, kRight - 28),
         " fill=\"" + std::string(colours.Of(p.series->code)) + "\"");
  }
  std::string note;
  if (chosen.size() == points.size()) note = "Every practice shown is labelled.";
  else if (chosen.empty()) note = "No practice is outside the 95% limits, so none is labelled; the table above gives each position.";
  else {
    note = "Labelled: " + std::to_string(chosen.size()) + " of " + std::to_string(points.size()) +
           " practices, those outside the 95% limits" + (chosen.size() == room ? " farthest from the network rate" : "") +
           "; the table above gives each position.";
  }
  Text(svg, kLeft, Frame::Bottom() + 82, "start", FitText(note, kFont, kWidth - kLeft - 8), " fill=\"#444\"");
}

Frame FrameOf(const ReportModel& model, size_t key, double p0) {
  const size_t last = model.dates.size() - 1;
  double top_rate = 2000 * p0;
  long top_n = 0;
  for (const ReportSeries& s : model.practices) {
    top_n = std::max(top_n, s.registered[last]);
    if (s.registered[last] > 0) {
      top_rate = std::max(top_rate, 1000.0 * static_cast<double>(s.counts[key][last]) / static_cast<double>(s.registered[last]));
    }
  }
  Frame f;
  f.x_top = NiceAxisTop(1.05 * static_cast<double>(std::max(top_n, 10L)), kFineAxisSteps);
  f.y_top = NiceAxisTop(1.05 * std::max(top_rate, 1.0), kFineAxisSteps);
  return f;
}

}  // namespace

std::string FunnelSvg(const ReportModel& model, size_t key, const SeriesColours& colours) {
  const size_t last = model.dates.size() - 1;
  const long network_n = model.network.registered[last];
  const double p0 = network_n > 0 ? static_cast<double>(model.network.counts[key][last]) / static_cast<double>(network_n) : 0;
  const Frame f = FrameOf(model, key, p0);
  const std::string title = model.keys[key] + ": rate per 1000 against list size, " + model.on.ToIso();
  std::ostringstream svg;
  svg << "<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"funnel\" viewBox=\"0 0 " << kWidth << " " << kHeight
      << "\" width=\"" << kWidth << "\" height=\"" << kHeight << "\" font-family=\"sans-serif\" role=\"img\" aria-label=\""
      << EscapeHtml(title) << "\">\n<title>" << EscapeHtml(title) << "</title>\n";
  WriteFrame(svg, f, title);
  WriteSvgLine(svg, f.X(0), f.Y(1000 * p0), f.X(f.x_top), f.Y(1000 * p0), "stroke=\"#222\" stroke-width=\"1.5\"");
  if (p0 > 0 && p0 < 1) {
    for (const bool upper : {true, false}) {
      WriteLimit(svg, f, p0, 0.95, upper, "6 4");
      WriteLimit(svg, f, p0, 0.998, upper, "2 3");
    }
  }
  const std::vector<FunnelPoint> points = PointsOf(model, key, f, p0);
  for (const FunnelPoint& p : points) {
    svg << "<circle cx=\"" << SvgNumber(p.x) << "\" cy=\"" << SvgNumber(p.y) << "\" r=\"4\" fill=\""
        << colours.Of(p.series->code) << "\" stroke=\"#000\"><title>"
        << EscapeHtml(p.series->code + ": " + FormatNumber(p.rate, 1) + " per 1000, " +
                      std::to_string(p.series->registered[last]) + " registered")
        << "</title></circle>\n";
  }
  WriteLabels(svg, points, colours);
  WriteKey(svg, 1000 * p0);
  svg << "</svg>\n";
  return svg.str();
}

CohortTable ReportCohortTable(const ReportModel& model, const std::string* only) {
  CohortTally tally = model.tally;
  tally.groups.clear();
  tally.unseen.clear();
  std::set<std::string>& network_practices = tally.practices[std::string(kNetworkGroup)];
  std::vector<CohortCell> total;
  for (const ReportSeries& series : model.practices) {
    const auto it = model.tally.groups.find(series.code);
    if (it == model.tally.groups.end()) continue;
    if (only == nullptr || *only == series.code) tally.groups[series.code] = it->second;
    network_practices.insert(series.code);
    if (total.empty()) {
      CohortCell empty;
      empty.counts.assign(model.keys.size(), 0);
      empty.counts_by_band.assign(model.keys.size(), std::array<long, kEspBands>{});
      total.assign(it->second.size(), empty);
    }
    for (size_t d = 0; d < total.size() && d < it->second.size(); ++d) {
      if (!HasFigures(series.data[d])) continue;  // a practice without data adds nothing that day
      AddCell(total[d], it->second[d]);
    }
  }
  if (!total.empty()) tally.groups[std::string(kNetworkGroup)] = std::move(total);
  return BuildCohortTable(tally, model.config.suppress_below, model.history_days);
}

}  // namespace medload
