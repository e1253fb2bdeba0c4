// Invariant checks for the libFuzzer targets in this folder: a failed check prints what
// broke and traps, so that libFuzzer records the input as a crash. It is not a test
// framework; the unit tests use doctest.
#pragma once

#include <cstdio>
#include <string_view>

namespace medload {

// Prints `what` and traps unless `holds`.
inline void FuzzCheck(bool holds, const char* what) {
  if (holds) return;
  std::fprintf(stderr, "medload fuzz invariant broken: %s\n", what);
  __builtin_trap();
}

// True if `text` starts with `prefix`.
inline bool StartsWith(std::string_view text, std::string_view prefix) {
  return text.substr(0, prefix.size()) == prefix;
}

}  // namespace medload
