#include "medload/format/svg_chart.h"

#include <cmath>
#include <locale>
#include <sstream>

#include "medload/format/output.h"

namespace medload {

double NiceAxisTop(double value, std::span<const double> steps) {
  if (value <= 0) return 1;
  const double power = std::pow(10.0, std::floor(std::log10(value)));
  for (const double step : steps) {
    if (step * power >= value) return step * power;
  }
  return 10 * power;
}

std::string SvgNumber(double value) {
  std::ostringstream text;
  text.imbue(std::locale::classic());
  text.setf(std::ios::fixed);
  text.precision(1);
  text << value;
  return text.str();
}

void WriteSvgText(std::ostream& svg, double x, double y, double size, std::string_view anchor, std::string_view text,
                  std::string_view extra) {
  svg << "<text x=\"" << SvgNumber(x) << "\" y=\"" << SvgNumber(y) << "\" font-size=\"" << size << "\"";
  if (anchor != "start") svg << " text-anchor=\"" << anchor << "\"";
  svg << extra << ">" << EscapeHtml(text) << "</text>\n";
}

void WriteSvgLine(std::ostream& svg, double x1, double y1, double x2, double y2, std::string_view attributes) {
  svg << "<line x1=\"" << SvgNumber(x1) << "\" y1=\"" << SvgNumber(y1) << "\" x2=\"" << SvgNumber(x2) << "\" y2=\""
      << SvgNumber(y2) << "\" " << attributes << "/>\n";
}

}  // namespace medload
