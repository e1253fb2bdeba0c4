#include "medload/store/practice_codes.h"

#include <algorithm>

#include "medload/core/text.h"

namespace medload {
namespace {

std::string AsciiLower(std::string text) {
  for (char& c : text) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  }
  return text;
}

bool AllKnown(const std::vector<std::string>& codes, const std::vector<std::string>& known) {
  return std::all_of(codes.begin(), codes.end(),
                     [&](const std::string& code) { return std::binary_search(known.begin(), known.end(), code); });
}

}  // namespace

std::string UnknownPracticeMessage(const std::string& code, const std::vector<std::string>& known) {
  std::string message = "practice \"" + code + "\" is not in the store";
  for (const std::string& candidate : known) {
    if (candidate != code && AsciiLower(candidate) == AsciiLower(code)) {
      message += "; codes are case-sensitive: did you mean \"" + candidate + "\"?";
      break;
    }
  }
  if (known.empty()) return message + " (it knows no practice: import practices or patients first)";
  std::vector<std::string> shown(known.begin(), known.begin() + static_cast<long>(std::min(known.size(), kShownPracticeCodes)));
  std::string list = Join(shown, ", ");
  if (known.size() > shown.size()) list += " and " + std::to_string(known.size() - shown.size()) + " more";
  return message + " (known: " + list + ")";
}

Status CheckPracticeCodes(const Store& store, const std::vector<std::string>& codes) {
  if (codes.empty()) return Status::Ok();
  auto known = store.PracticeCodes(false);
  if (!known.ok()) return known.status();
  if (AllKnown(codes, *known)) return Status::Ok();
  known = store.PracticeCodes(true);
  if (!known.ok()) return known.status();
  for (const std::string& code : codes) {
    if (!std::binary_search(known->begin(), known->end(), code)) return Status::Input(UnknownPracticeMessage(code, *known));
  }
  return Status::Ok();
}

}  // namespace medload
