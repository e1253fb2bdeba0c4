#include "medload/format/chart_layout.h"

#include <doctest/doctest.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <map>
#include <random>
#include <set>

#include "format/svg_checks.h"

namespace medload {
namespace {

// WCAG 2.1, "relative luminance" and "contrast ratio" (W3C Recommendation, 2018,
// section 7 definitions): sRGB channels linearised, weighted 0.2126 / 0.7152 / 0.0722.
double Channel(int value) {
  const double c = value / 255.0;
  return c <= 0.04045 ? c / 12.92 : std::pow((c + 0.055) / 1.055, 2.4);
}

std::array<double, 3> Linear(std::string_view hex) {
  auto at = [&](size_t i) { return Channel(std::stoi(std::string(hex.substr(i, 2)), nullptr, 16)); };
  return {at(1), at(3), at(5)};
}

double ContrastOnWhite(std::string_view hex) {
  const auto [r, g, b] = Linear(hex);
  const double luminance = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  return 1.05 / (luminance + 0.05);
}

// CIE 1976 L*a*b* under D65 from sRGB (CIE 15:2004; the sRGB to XYZ matrix of IEC
// 61966-2-1), and the distance between two colours (Delta E 1976).
std::array<double, 3> Lab(std::string_view hex) {
  const auto [r, g, b] = Linear(hex);
  const double x = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
  const double y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const double z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
  auto f = [](double t) { return t > 216.0 / 24389 ? std::cbrt(t) : (24389.0 / 27 * t + 16) / 116; };
  return {116 * f(y) - 16, 500 * (f(x) - f(y)), 200 * (f(y) - f(z))};
}

double DeltaE(std::string_view a, std::string_view b) {
  const auto la = Lab(a);
  const auto lb = Lab(b);
  return std::hypot(la[0] - lb[0], la[1] - lb[1], la[2] - lb[2]);
}

}  // namespace

TEST_SUITE("format/chart_layout") {

TEST_CASE("text widths grow with the text and count wide letters and non-ASCII as a whole em") {
  const struct {
    const char* text;
    double em;
  } cases[] = {
      {"", 0},        {"a", 0.64},      {"A", 0.8},          {"M", 1.0}, {"i", 0.4},
      {"1.5", 1.68},  {"NW01", 3.08},   {"items>=10", 6.36}, {"é", 1.0}, {"Ünal", 2.68},
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    CHECK(TextWidth(c.text, 10) == doctest::Approx(10 * c.em));
  }
  CHECK(TextWidth("network total", 11) > TextWidth("network", 11));
}

TEST_CASE("a label too wide for its room is cut at a whole character and ends in an ellipsis") {
  const struct {
    const char* text;
    double room;
    const char* fitted;
  } cases[] = {
      {"NW01", 100, "NW01"},
      {"network total", 40, "netw..."},
      {"Gorse Square Health Centre", 90, "Gorse Square..."},
      {"Ünal Ünal", 40, "Ünal..."},  // the space before the cut is dropped
      {"ÜÜÜÜ", 35, "ÜÜ..."},         // never half a UTF-8 character
      {"abc", 5, ""},                // not even the ellipsis fits
  };
  for (const auto& c : cases) {
    CAPTURE(c.text);
    CAPTURE(c.room);
    const std::string fitted = FitText(c.text, 10, c.room);
    CHECK(fitted == c.fitted);
    CHECK(TextWidth(fitted, 10) <= c.room);
  }
}

TEST_CASE("long text is wrapped at spaces into lines that fit, and an overlong word is cut") {
  const std::vector<std::string> lines = WrapText("Solid bars: days supplied. Pale bars: tail days.", 10, 100);
  CHECK(lines == std::vector<std::string>{"Solid bars: days", "supplied. Pale", "bars: tail days."});
  for (const std::string& line : lines) CHECK(TextWidth(line, 10) <= 100);
  CHECK(WrapText("a  Wwwwwwwwwwwwwwwwwwww b", 10, 60) == std::vector<std::string>{"a", "Wwww...", "b"});
  CHECK(WrapText("", 10, 60).empty());
}

TEST_CASE("labels that already stand apart stay where they want to be") {
  const std::vector<double> wanted = {100, 40, 70};
  const auto placed = PlaceLabels(wanted, 13, 0, 200);
  REQUIRE(placed.has_value());
  CHECK(*placed == wanted);
}

TEST_CASE("labels wanted at one height are spread apart, inside the bounds, in their order") {
  const std::vector<double> wanted = {195, 195, 195, 10};
  const auto placed = PlaceLabels(wanted, 13, 0, 200);
  REQUIRE(placed.has_value());
  CHECK((*placed)[3] == 10);
  CHECK((*placed)[2] == 200);  // pushed down past the bottom, then back up
  CHECK((*placed)[1] == 187);
  CHECK((*placed)[0] == 174);
}

TEST_CASE("labels that cannot fit between the bounds are refused") {
  const std::vector<double> wanted(17, 50.0);
  CHECK(PlaceLabels(wanted, 13, 0, 13 * 16).has_value());  // 17 labels, 16 gaps: just fits
  CHECK_FALSE(PlaceLabels(wanted, 13, 0, 13 * 16 - 1).has_value());
  CHECK(PlaceLabels(std::vector<double>{}, 13, 0, 0)->empty());
}

TEST_CASE("placed labels never overlap, never leave the bounds and keep their order, whatever they want") {
  std::mt19937 random(20261031);  // fixed seed: the same cases on every run
  for (int round = 0; round < 500; ++round) {
    std::uniform_int_distribution<int> count(1, 35);  // 34 gaps of 11 fit in 380
    std::uniform_real_distribution<double> where(-50, 450);
    std::vector<double> wanted(static_cast<size_t>(count(random)));
    for (double& y : wanted) y = where(random);
    const double top = 20;
    const double bottom = 400;
    const auto placed = PlaceLabels(wanted, 11, top, bottom);
    CAPTURE(round);
    REQUIRE(placed.has_value());
    REQUIRE(placed->size() == wanted.size());
    std::vector<size_t> order(wanted.size());
    for (size_t i = 0; i < order.size(); ++i) order[i] = i;
    std::stable_sort(order.begin(), order.end(), [&](size_t a, size_t b) { return wanted[a] < wanted[b]; });
    for (size_t k = 0; k < order.size(); ++k) {
      const double y = (*placed)[order[k]];
      CHECK(y >= top);
      CHECK(y <= bottom);
      if (k > 0) CHECK(y - (*placed)[order[k - 1]] >= 11 - 1e-9);
    }
  }
}

TEST_CASE("the panel grid widens with the number of panels up to five columns") {
  const struct {
    size_t panels, columns, rows;
  } cases[] = {{1, 2, 1}, {2, 2, 1}, {4, 2, 2}, {5, 3, 2}, {9, 3, 3}, {13, 4, 4}, {16, 4, 4}, {17, 5, 4}, {50, 5, 10}};
  for (const auto& c : cases) {
    CAPTURE(c.panels);
    const PanelGrid grid = GridFor(c.panels);
    CHECK(grid.columns == c.columns);
    CHECK(grid.rows == c.rows);
  }
}

TEST_CASE("every palette colour is readable as text on white and far from every other") {
  const auto palette = Palette();
  REQUIRE(palette.size() == kPaletteSize);
  for (size_t i = 0; i < palette.size(); ++i) {
    CAPTURE(palette[i]);
    CHECK(ContrastOnWhite(palette[i]) >= 4.5);  // WCAG 2.1, success criterion 1.4.3 (text)
    CHECK(DeltaE(palette[i], kReferenceColour) >= 20);
    for (size_t j = 0; j < i; ++j) {
      CAPTURE(palette[j]);
      CHECK(DeltaE(palette[i], palette[j]) >= 20);
    }
  }
  // The first three, which a small network uses, are far apart.
  CHECK(DeltaE(palette[0], palette[1]) >= 60);
  CHECK(DeltaE(palette[0], palette[2]) >= 60);
  CHECK(DeltaE(palette[1], palette[2]) >= 60);
}

TEST_CASE("a practice's colour depends on the set of practices, not on the order they come in") {
  const SeriesColours one({"WV003", "WV001", "WV002"});
  const SeriesColours two({"WV001", "WV002", "WV003", "WV002"});
  for (const char* code : {"WV001", "WV002", "WV003"}) {
    CAPTURE(code);
    CHECK(one.Of(code) == two.Of(code));
  }
  CHECK(one.Of("WV001") == Palette()[0]);  // sorted order takes the palette in turn
  CHECK(one.Of("WV003") == Palette()[2]);
  CHECK(one.Of("network total") == kReferenceColour);
}

TEST_CASE("up to ten practices get ten different colours; fifty share each colour five times") {
  std::vector<std::string> codes;
  for (int i = 1; i <= 50; ++i) codes.push_back("NW" + std::string(i < 10 ? "0" : "") + std::to_string(i));
  const SeriesColours ten(std::vector<std::string>(codes.begin(), codes.begin() + 10));
  std::set<std::string_view> distinct;
  for (size_t i = 0; i < 10; ++i) distinct.insert(ten.Of(codes[i]));
  CHECK(distinct.size() == 10);
  const SeriesColours fifty(codes);
  std::map<std::string_view, int> uses;
  for (const std::string& code : codes) ++uses[fifty.Of(code)];
  CHECK(uses.size() == kPaletteSize);
  for (const auto& [colour, n] : uses) CHECK(n == 5);
  CHECK(uses.count(kReferenceColour) == 0);
}

TEST_CASE("the text-box check of the chart tests finds overlapping labels and labels outside the drawing") {
  const std::string svg =
      "<svg width=\"100\" height=\"50\"><text x=\"10\" y=\"20\" font-size=\"10\">NW01</text>"
      "<text x=\"30\" y=\"25\" font-size=\"10\">NW02</text>"
      "<text x=\"95\" y=\"45\" font-size=\"10\" text-anchor=\"middle\">far &amp; out</text>"
      "<text x=\"10\" y=\"20\" font-size=\"10\" transform=\"rotate(-90)\">rotated</text></svg>";
  const std::vector<testing::TextBox> boxes = testing::TextBoxes(svg);
  REQUIRE(boxes.size() == 3);
  CHECK(boxes[2].text == "far & out");
  CHECK(testing::Overlaps(boxes) == std::vector<std::string>{"NW01 / NW02"});
  CHECK(testing::OutsideDrawing(svg) == std::vector<std::string>{"far & out"});
}

}  // TEST_SUITE

}  // namespace medload
