// The report's funnel plots, and the cohort table behind its trend charts.
#include <algorithm>
#include <cmath>
#include <set>
#include <sstream>

#include "medload/format/output.h"
#include "medload/format/suppression.h"
#include "medload/format/svg_chart.h"
#include "medload/report/funnel.h"
#include "medload/report/report_pages.h"

namespace medload {
namespace {

constexpr double kWidth = 760;
constexpr double kHeight = 400;
constexpr double kLeft = 70;
constexpr double kRight = 190;  // room for the legend
constexpr double kTop = 40;
constexpr double kBottom = 60;
constexpr int kCurveSteps = 80;

struct Frame {
  double x_top = 1;  // registered patients at the right edge
  double y_top = 1;  // rate per 1000 at the top edge
  double X(double n) const { return kLeft + (kWidth - kLeft - kRight) * n / x_top; }
  double Y(double rate) const {
    const double clipped = std::clamp(rate, 0.0, y_top);
    return kTop + (kHeight - kTop - kBottom) * (1 - clipped / y_top);
  }
};

void WriteFrame(std::ostringstream& svg, const Frame& f, const std::string& title) {
  const double bottom = kHeight - kBottom;
  svg << "<text x=\"" << kLeft << "\" y=\"22\" font-size=\"15\" font-weight=\"bold\">" << EscapeHtml(title)
      << "</text>\n";
  for (int tick = 0; tick <= 4; ++tick) {
    const double rate = f.y_top * tick / 4.0;
    const double n = f.x_top * tick / 4.0;
    svg << "<line x1=\"" << kLeft << "\" y1=\"" << SvgNumber(f.Y(rate)) << "\" x2=\"" << SvgNumber(f.X(f.x_top)) << "\" y2=\""
        << SvgNumber(f.Y(rate)) << "\" stroke=\"#ddd\"/>\n<text x=\"" << kLeft - 6 << "\" y=\"" << SvgNumber(f.Y(rate) + 4)
        << "\" font-size=\"11\" text-anchor=\"end\">" << FormatNumber(rate, 1) << "</text>\n"
        << "<text x=\"" << SvgNumber(f.X(n)) << "\" y=\"" << SvgNumber(bottom + 16)
        << "\" font-size=\"11\" text-anchor=\"middle\">" << FormatNumber(n, 0) << "</text>\n";
  }
  svg << "<line x1=\"" << kLeft << "\" y1=\"" << bottom << "\" x2=\"" << SvgNumber(f.X(f.x_top)) << "\" y2=\"" << bottom
      << "\" stroke=\"#333\"/>\n<line x1=\"" << kLeft << "\" y1=\"" << kTop << "\" x2=\"" << kLeft << "\" y2=\""
      << bottom << "\" stroke=\"#333\"/>\n"
      << "<text x=\"" << SvgNumber(f.X(f.x_top / 2)) << "\" y=\"" << SvgNumber(bottom + 38)
      << "\" font-size=\"12\" text-anchor=\"middle\">Registered patients on the census date</text>\n"
      << "<text x=\"16\" y=\"" << SvgNumber(kTop + (bottom - kTop) / 2) << "\" font-size=\"12\" text-anchor=\"middle\" "
      << "transform=\"rotate(-90 16 " << SvgNumber(kTop + (bottom - kTop) / 2) << ")\">Patients per 1000</text>\n";
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

void WriteLegend(std::ostringstream& svg, double network_rate) {
  const double x = kWidth - kRight + 16;
  const struct {
    const char* dash;
    std::string text;
  } items[] = {{"", "network rate " + FormatNumber(network_rate, 1)},
               {"6 4", "95% control limits"},
               {"2 3", "99.8% control limits"}};
  double y = kTop + 8;
  for (const auto& item : items) {
    svg << "<line x1=\"" << x << "\" y1=\"" << y << "\" x2=\"" << x + 26 << "\" y2=\"" << y
        << "\" stroke=\"#222\" stroke-width=\"1.5\"" << (item.dash[0] != 0 ? std::string(" stroke-dasharray=\"") + item.dash + "\"" : "")
        << "/>\n<text x=\"" << x + 32 << "\" y=\"" << y + 4 << "\" font-size=\"11\">" << EscapeHtml(item.text)
        << "</text>\n";
    y += 18;
  }
  svg << "<circle cx=\"" << x + 13 << "\" cy=\"" << y << "\" r=\"4\" fill=\"#1b6ca8\" stroke=\"#000\"/>\n<text x=\""
      << x + 32 << "\" y=\"" << y + 4 << "\" font-size=\"11\">a practice (code)</text>\n";
}

}  // namespace

std::string FunnelSvg(const ReportModel& model, size_t key) {
  const size_t last = model.dates.size() - 1;
  const long network_n = model.network.registered[last];
  const double p0 = network_n > 0 ? static_cast<double>(model.network.counts[key][last]) / static_cast<double>(network_n) : 0;
  Frame f;
  double top_rate = 2000 * p0;
  long top_n = 0;
  for (const ReportSeries& s : model.practices) {
    top_n = std::max(top_n, s.registered[last]);
    if (s.registered[last] > 0) {
      top_rate = std::max(top_rate, 1000.0 * static_cast<double>(s.counts[key][last]) / static_cast<double>(s.registered[last]));
    }
  }
  f.x_top = NiceAxisTop(1.1 * static_cast<double>(std::max(top_n, 10L)), kFineAxisSteps);
  f.y_top = NiceAxisTop(1.1 * std::max(top_rate, 1.0), kFineAxisSteps);
  const std::string title = model.keys[key] + ": rate per 1000 against list size, " + model.on.ToIso();
  std::ostringstream svg;
  svg << "<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"funnel\" viewBox=\"0 0 " << kWidth << " " << kHeight
      << "\" width=\"" << kWidth << "\" height=\"" << kHeight << "\" role=\"img\" aria-label=\"" << EscapeHtml(title)
      << "\">\n<title>" << EscapeHtml(title) << "</title>\n";
  WriteFrame(svg, f, title);
  svg << "<line x1=\"" << SvgNumber(f.X(0)) << "\" y1=\"" << SvgNumber(f.Y(1000 * p0)) << "\" x2=\"" << SvgNumber(f.X(f.x_top))
      << "\" y2=\"" << SvgNumber(f.Y(1000 * p0)) << "\" stroke=\"#222\" stroke-width=\"1.5\"/>\n";
  if (p0 > 0 && p0 < 1) {
    for (const bool upper : {true, false}) {
      WriteLimit(svg, f, p0, 0.95, upper, "6 4");
      WriteLimit(svg, f, p0, 0.998, upper, "2 3");
    }
  }
  for (const ReportSeries& s : model.practices) {
    const long n = s.registered[last];
    const long count = s.counts[key][last];
    if (n < 1 || IsSuppressed(count, model.config.suppress_below)) continue;
    const double rate = 1000.0 * static_cast<double>(count) / static_cast<double>(n);
    const double x = f.X(static_cast<double>(n));
    const double y = f.Y(rate);
    svg << "<circle cx=\"" << SvgNumber(x) << "\" cy=\"" << SvgNumber(y) << "\" r=\"4\" fill=\"#1b6ca8\" stroke=\"#000\"><title>"
        << EscapeHtml(s.code + ": " + FormatNumber(rate, 1) + " per 1000, " + std::to_string(n) + " registered")
        << "</title></circle>\n<text x=\"" << SvgNumber(x + 6) << "\" y=\"" << SvgNumber(y - 6) << "\" font-size=\"11\">"
        << EscapeHtml(s.code) << "</text>\n";
  }
  WriteLegend(svg, 1000 * p0);
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
