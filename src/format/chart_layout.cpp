#include "medload/format/chart_layout.h"

#include <algorithm>
#include <array>
#include <numeric>

namespace medload {
namespace {

constexpr std::string_view kEllipsis = "...";

// Width in em of one ASCII character (see TextWidth).
double AsciiWidth(char c) {
  static constexpr std::string_view kNarrow = " .,:;'`|!()[]{}/\\-ijlft\"";
  static constexpr std::string_view kWide = "mwMW%@+<=>";
  if (kWide.find(c) != std::string_view::npos) return 1.0;
  if (kNarrow.find(c) != std::string_view::npos) return 0.4;
  if (c >= 'A' && c <= 'Z') return 0.8;
  return 0.64;
}

bool IsLeadByte(char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }

// The palette: ten hues, each with a contrast of at least 4.5:1 against white (WCAG 2.1,
// relative luminance) and at least 20 apart in CIELAB from every other; each next colour
// is the one farthest from all before it, so that two or three practices get very
// different colours (checked by tests/format/chart_layout_test.cpp).
constexpr std::array<std::string_view, kPaletteSize> kPalette = {
    "#1f5fa8", "#a35a00", "#2a7d46", "#a8326e", "#0f7480",
    "#7b3fa0", "#5b6b00", "#7a4a2a", "#b8402b", "#3d4fc4"};

}  // namespace

double TextWidth(std::string_view text, double font_size) {
  double em = 0;
  for (size_t i = 0; i < text.size(); ++i) {
    const char c = text[i];
    if (static_cast<unsigned char>(c) < 0x80) em += AsciiWidth(c);
    else if (IsLeadByte(c)) em += 1.0;
  }
  return em * font_size;
}

std::string FitText(std::string_view text, double font_size, double max_width) {
  if (TextWidth(text, font_size) <= max_width) return std::string(text);
  const double room = max_width - TextWidth(kEllipsis, font_size);
  if (room < 0) return "";
  size_t end = 0;
  for (size_t i = 1; i <= text.size(); ++i) {
    if (i < text.size() && !IsLeadByte(text[i])) continue;  // inside a code point
    if (TextWidth(text.substr(0, i), font_size) > room) break;
    end = i;
  }
  std::string fitted(text.substr(0, end));
  while (!fitted.empty() && fitted.back() == ' ') fitted.pop_back();
  return fitted + std::string(kEllipsis);
}

std::vector<std::string> WrapText(std::string_view text, double font_size, double max_width) {
  std::vector<std::string> lines;
  std::string line;
  size_t at = 0;
  while (at < text.size()) {
    const size_t space = text.find(' ', at);
    const std::string_view word = text.substr(at, space == std::string_view::npos ? std::string_view::npos : space - at);
    at = space == std::string_view::npos ? text.size() : space + 1;
    if (word.empty()) continue;
    const std::string joined = line.empty() ? std::string(word) : line + " " + std::string(word);
    if (TextWidth(joined, font_size) <= max_width) {
      line = joined;
      continue;
    }
    if (!line.empty()) lines.push_back(line);
    line = FitText(word, font_size, max_width);
  }
  if (!line.empty()) lines.push_back(line);
  return lines;
}

std::optional<std::vector<double>> PlaceLabels(std::span<const double> wanted, double gap, double top,
                                               double bottom) {
  if (wanted.empty()) return std::vector<double>{};
  if (static_cast<double>(wanted.size() - 1) * gap > bottom - top) return std::nullopt;
  std::vector<size_t> order(wanted.size());
  std::iota(order.begin(), order.end(), size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](size_t a, size_t b) { return wanted[a] < wanted[b]; });
  std::vector<double> y(wanted.size());
  // Down from the top: each label at least `gap` below the one above it...
  for (size_t k = 0; k < order.size(); ++k) {
    const double floor = k == 0 ? top : y[order[k - 1]] + gap;
    y[order[k]] = std::max(std::clamp(wanted[order[k]], top, bottom), floor);
  }
  // ...then up from the bottom, so that none is pushed past it. Since (n - 1) * gap fits,
  // the k-th label stays at or below top + k * gap after both passes.
  for (size_t k = order.size(); k-- > 0;) {
    const double ceiling = k + 1 == order.size() ? bottom : y[order[k + 1]] - gap;
    y[order[k]] = std::min(y[order[k]], ceiling);
  }
  return y;
}

PanelGrid GridFor(size_t panels) {
  PanelGrid grid;
  grid.columns = panels <= 4 ? 2 : panels <= 9 ? 3 : panels <= 16 ? 4 : 5;
  grid.rows = std::max<size_t>(1, (panels + grid.columns - 1) / grid.columns);
  return grid;
}

std::span<const std::string_view> Palette() { return kPalette; }

SeriesColours::SeriesColours(std::vector<std::string> names) {
  std::sort(names.begin(), names.end());
  names.erase(std::unique(names.begin(), names.end()), names.end());
  for (size_t i = 0; i < names.size(); ++i) colours_[names[i]] = kPalette[i % kPaletteSize];
}

std::string_view SeriesColours::Of(std::string_view name) const {
  const auto it = colours_.find(name);
  return it == colours_.end() ? kReferenceColour : it->second;
}

}  // namespace medload
