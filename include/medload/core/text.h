// Small text helpers that every stage shares: joining parts, trimming and testing for
// blank text over a chosen set of blank bytes. Byte-wise and locale-independent; they do
// no Unicode work (ICU does that where it matters, in the formulary's normaliser).
#pragma once

#include <optional>
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

// The number that the whole of `text` spells (std::from_chars: no leading '+' or blanks;
// "inf" and "nan" read as such, so callers bound what they accept). nullopt when `text`
// is empty, is not a number, or has bytes left over.
std::optional<double> ParseDecimal(std::string_view text);

// True for a name of lower-case letters, digits and '-', not empty and neither starting
// nor ending with '-' ("statin", "ras-blocker"): the form of class and category names.
bool IsLowerHyphenated(std::string_view name);

}  // namespace medload
