// Small-number suppression shared by every output that shows counts of patients (cohort
// tables, the report's pages, charts and digests, the worklist summary): which counts are
// withheld and the note that says so. It does not decide the threshold (the caller's).
#pragma once

#include <string>

namespace medload {

// A count c with 0 < c < suppress_below is withheld (null), and so are its crude and
// standardised rates. Zero is shown. Registered counts (list sizes) are shown.
// suppress_below <= 1 suppresses nothing.
bool IsSuppressed(long count, long suppress_below);

// The suppression rule and the note on secondary disclosure, in words (for every format).
std::string SuppressionNote(long suppress_below);

}  // namespace medload
