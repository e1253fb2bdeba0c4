// Helpers shared by the SVG charts (the cohort trend chart, the report's funnel plots):
// how a coordinate is printed and where a value axis ends. The charts draw their own
// frames; these helpers decide nothing about layout or colour.
#pragma once

#include <array>
#include <span>
#include <string>

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

}  // namespace medload
