#include "medload/format/suppression.h"

namespace medload {

bool IsSuppressed(long count, long suppress_below) {
  return count > 0 && count < suppress_below;
}

std::string SuppressionNote(long suppress_below) {
  if (suppress_below <= 1) {
    return "No small-number suppression (--suppress-below 0): do not publish counts below "
           "your local threshold.";
  }
  const std::string n = std::to_string(suppress_below);
  return "Counts from 1 to " + std::to_string(suppress_below - 1) + " (below " + n +
         ") are withheld with their rates; zero is shown. Secondary disclosure: a withheld "
         "cell can still be worked out from a visible total, from the other criteria or "
         "groups, or from an earlier or later date; medload suppresses each cell on its own "
         "and does not suppress complementary cells, so check tables before publishing.";
}

}  // namespace medload
