// Checks practice codes that a user typed (review and cohort --practice, a report
// config's "practices") against the codes the store knows, so that a typing slip is an
// error naming the known codes instead of an empty list. It filters nothing itself.
#pragma once

#include <string>
#include <vector>

#include "medload/core/status.h"
#include "medload/store/store.h"

namespace medload {

// Ok when every code in `codes` is known to the store (Store::PracticeCodes: the
// practices table and registry first; the dispensings are walked only when a code is not
// found there). Otherwise Input naming the first unknown code and the known ones:
//   practice "WV999" is not in the store (known: WV001, WV002, WV003)
//   practice "wv001" is not in the store; codes are case-sensitive: did you mean "WV001"? (known: ...)
// At most kShownPracticeCodes known codes are listed, then "and N more". Storage errors
// are returned as they are.
Status CheckPracticeCodes(const Store& store, const std::vector<std::string>& codes);

inline constexpr size_t kShownPracticeCodes = 20;

// The message for one unknown code given the known ones (sorted), as above.
std::string UnknownPracticeMessage(const std::string& code, const std::vector<std::string>& known);

}  // namespace medload
