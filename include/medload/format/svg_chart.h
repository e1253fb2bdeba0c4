// Helpers shared by the SVG charts (the cohort trend chart, the report's funnel plots):
// how a coordinate is printed, where a value axis ends, and how a text or line element is
// written. The charts draw their own frames; these helpers decide nothing about layout or
// colour.
#pragma once

#include <array>
#include <ostream>
#include <span>
#include <string>
#include <string_view>

namespace medload {

// Axis ends at 1, 2 or 5 times a power of ten.
inline constexpr std::array<double, 4> kAxisSteps = {1.0, 2.0, 5.0, 10.0};
// Finer axis ends: 1, 1.5, 2, 2.5 or 5 times a power of ten.
inline constexpr std::array<double, 6> kFineAxisSteps = {1.0, 1.5, 2.0, 2.5, 5.0, 10.0};

// The least "round" number at or above `value`: a step of `steps` (ascending, the last 10)
// times a power of ten. 1 for a value of 0 or less.
double NiceAxisTop(double value, std::span<const double> steps = kAxisSteps);

// An SVG coordinate: fixed-point with one decimal ("12.0", "-3.5"), locale-independent.
std::string SvgNumber(double value);

// A <text> element at (x, y) of font size `size`, its text escaped; `anchor` "start" (not
// written), "middle" or "end"; `extra` attributes written as given, after a space of
// their own (" fill=\"#444\"").
void WriteSvgText(std::ostream& svg, double x, double y, double size, std::string_view anchor, std::string_view text,
                  std::string_view extra = "");

// A <line> element from (x1, y1) to (x2, y2) with `attributes` written as given
// ("stroke=\"#333\"").
void WriteSvgLine(std::ostream& svg, double x1, double y1, double x2, double y2, std::string_view attributes);

}  // namespace medload
