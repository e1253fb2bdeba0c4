// Layout arithmetic shared by the SVG charts: how wide a label will be, how to shorten it
// to fit, where to put a column of labels so that none overlaps another, how to lay out a
// grid of small panels, and which colour each named series gets. It draws nothing; the
// charts (cohort/cohort_chart.cpp, report/report_charts.cpp, burden/timeline_writer.cpp)
// do, and docs/report.md ("Charts") describes the resulting design.
#pragma once

#include <map>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace medload {

// An upper estimate of the width in pixels of `text` set in a regular sans-serif face at
// `font_size` px: per code point, space and narrow letters or punctuation 0.4 em, digits
// and most lower case 0.64 em, upper case 0.8 em, and 1 em for 'm', 'w', 'M', 'W', '%',
// '@', '+', '<', '=', '>' and anything outside ASCII. From the advance widths of DejaVu
// Sans, the widest of the usual faces (Liberation Sans and Arial are narrower), so that a
// box from it contains the drawn text. Bold text: multiply by kBoldWidth.
double TextWidth(std::string_view text, double font_size);
inline constexpr double kBoldWidth = 1.12;

// `text` itself when TextWidth(text) <= max_width; else its longest prefix (whole UTF-8
// code points) that fits with an ellipsis ("...") appended; "" when not even "..." fits.
std::string FitText(std::string_view text, double font_size, double max_width);

// `text` broken at spaces into lines no wider than `max_width` (by TextWidth); a word wider
// than that is cut with FitText. Empty for empty text.
std::vector<std::string> WrapText(std::string_view text, double font_size, double max_width);

// Vertical positions for labels that want to sit at `wanted` (any order), each at least
// `gap` from every other and inside [top, bottom], moved as little as a top-down then
// bottom-up pass allows. The result is in the order of `wanted`, and labels keep their
// vertical order (a label wanted higher is never placed lower). nullopt when they cannot
// fit: (size - 1) * gap > bottom - top. REQUIRES: gap > 0, top <= bottom.
std::optional<std::vector<double>> PlaceLabels(std::span<const double> wanted, double gap, double top,
                                               double bottom);

// A grid of `panels` equal panels, filled row by row: 2 columns up to 4 panels, 3 up to
// 9, 4 up to 16, then 5.
struct PanelGrid {
  size_t columns = 1;
  size_t rows = 1;
};
PanelGrid GridFor(size_t panels);

// The colours of the series of a chart, one per name, from a fixed palette of distinct
// hues dark enough for text on white (contrast at least 4.5:1, WCAG 2.1 success criterion
// 1.4.3), ordered so that its first colours differ most. The names in sorted order take
// the palette in turn, so a name's colour depends only on the set of names: the same
// practices get the same colours on every page and in every run, and up to kPaletteSize
// names never share one. Beyond that colours repeat, and charts never rely on colour
// alone (every series is named in text).
inline constexpr size_t kPaletteSize = 10;
std::span<const std::string_view> Palette();
// The colour of reference series (the network total): near-black, not in the palette.
inline constexpr std::string_view kReferenceColour = "#333333";

class SeriesColours {
 public:
  SeriesColours() = default;
  explicit SeriesColours(std::vector<std::string> names);
  // The colour of `name` ("#rrggbb"); kReferenceColour for a name not given.
  std::string_view Of(std::string_view name) const;

 private:
  std::map<std::string, std::string_view, std::less<>> colours_;
};

}  // namespace medload
