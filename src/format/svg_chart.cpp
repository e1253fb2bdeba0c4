#include "medload/format/svg_chart.h"

#include <cmath>
#include <locale>
#include <sstream>

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

}  // namespace medload
