// Small text helpers that every stage shares: joining parts, trimming and testing for
// blank text over a chosen set of blank bytes. Byte-wise and locale-independent; they do
// no Unicode work (ICU does that where it matters, in the formulary's normaliser).
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace medload {

// The blank bytes most readers skip around a field: space and tab.
inline constexpr std::string_view kSpaceTab = " \t";

// `parts` with `separator` before each part once the text so far is not empty: so empty
// leading parts add nothing ({"", "a", "b"} -> "a,b"), while a later empty part still
// adds its separator ({"a", "", "b"} -> "a,,b").
std::string Join(const std::vector<std::string>& parts, std::string_view separator);

// `text` without leading bytes from `blanks`.
std::string_view TrimStart(std::string_view text, std::string_view blanks = kSpaceTab);
// `text` without trailing bytes from `blanks`.
std::string_view TrimEnd(std::string_view text, std::string_view blanks = kSpaceTab);
// `text` without leading and trailing bytes from `blanks`; a view into `text`.
std::string_view Trim(std::string_view text, std::string_view blanks = kSpaceTab);

// True when every byte of `text` is in `blanks` (so also when `text` is empty).
bool IsBlank(std::string_view text, std::string_view blanks = kSpaceTab);

}  // namespace medload
