// Checks on the SVG charts medload writes: the box each <text> element takes (from its x, y,
// font size, anchor and the TextWidth estimate), whether any two boxes overlap, and
// whether any leaves the drawing. Rotated texts (with a transform) are left out. The
// browser test (tests/browser/check_report.sh) repeats the check with real glyph boxes.
// Test code only.
#pragma once

#include <regex>
#include <string>
#include <vector>

#include "medload/format/chart_layout.h"

namespace medload::testing {

struct TextBox {
  std::string text;
  double left = 0;
  double right = 0;
  double top = 0;
  double bottom = 0;
};

inline std::string Attribute(const std::string& attributes, const std::string& name) {
  const std::regex pattern("(?:^|\\s)" + name + "=\"([^\"]*)\"");
  std::smatch match;
  return std::regex_search(attributes, match, pattern) ? match[1].str() : std::string();
}

inline std::string Unescape(std::string text) {
  const std::pair<const char*, const char*> entities[] = {
      {"&lt;", "<"}, {"&gt;", ">"}, {"&quot;", "\""}, {"&#39;", "'"}, {"&amp;", "&"}};
  for (const auto& [entity, plain] : entities) {
    for (size_t at = text.find(entity); at != std::string::npos; at = text.find(entity, at + 1)) {
      text.replace(at, std::string(entity).size(), plain);
    }
  }
  return text;
}

// Every unrotated <text> of `svg` as a box as tall as a browser draws a text line: ascent
// 0.93 and descent 0.24 of the font size (the line metrics of DejaVu Sans, the tallest of
// the usual sans-serif faces).
inline std::vector<TextBox> TextBoxes(const std::string& svg) {
  static const std::regex kText("<text([^>]*)>([^<]*)</text>");
  std::vector<TextBox> boxes;
  for (auto it = std::sregex_iterator(svg.begin(), svg.end(), kText); it != std::sregex_iterator(); ++it) {
    const std::string attributes = (*it)[1].str();
    if (!Attribute(attributes, "transform").empty()) continue;
    TextBox box;
    box.text = Unescape((*it)[2].str());
    const double size = std::stod(Attribute(attributes, "font-size"));
    const double bold = Attribute(attributes, "font-weight") == "bold" ? kBoldWidth : 1.0;
    const double width = TextWidth(box.text, size) * bold;
    const double x = std::stod(Attribute(attributes, "x"));
    const double y = std::stod(Attribute(attributes, "y"));
    const std::string anchor = Attribute(attributes, "text-anchor");
    box.left = anchor == "middle" ? x - width / 2 : anchor == "end" ? x - width : x;
    box.right = box.left + width;
    box.top = y - 0.93 * size;
    box.bottom = y + 0.24 * size;
    boxes.push_back(box);
  }
  return boxes;
}

// "A / B" for each pair of boxes that overlap (touching edges do not count).
inline std::vector<std::string> Overlaps(const std::vector<TextBox>& boxes) {
  std::vector<std::string> found;
  for (size_t i = 0; i < boxes.size(); ++i) {
    for (size_t j = i + 1; j < boxes.size(); ++j) {
      const TextBox& a = boxes[i];
      const TextBox& b = boxes[j];
      if (a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom) {
        found.push_back(a.text + " / " + b.text);
      }
    }
  }
  return found;
}

// The texts of `svg` that reach outside its width and height attributes.
inline std::vector<std::string> OutsideDrawing(const std::string& svg) {
  static const std::regex kSize(R"re(<svg[^>]*\swidth="([0-9.]+)"[^>]*\sheight="([0-9.]+)")re");
  std::smatch match;
  if (!std::regex_search(svg, match, kSize)) return {"(no width and height)"};
  const double width = std::stod(match[1].str());
  const double height = std::stod(match[2].str());
  std::vector<std::string> found;
  for (const TextBox& box : TextBoxes(svg)) {
    if (box.left < 0 || box.right > width || box.top < 0 || box.bottom > height) found.push_back(box.text);
  }
  return found;
}

// The found items on one line ("" when none), for CHECK messages.
inline std::string Listed(const std::vector<std::string>& found) {
  std::string line;
  for (const std::string& item : found) line += (line.empty() ? "" : " | ") + item;
  return line;
}

}  // namespace medload::testing
