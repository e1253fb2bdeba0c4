// The clinical-review caution that every output of the tool carries (docs/clinical-safety.md),
// in one place so that every writer prints the same words.
#pragma once

#include <string_view>

namespace medload {

// One paragraph, plain text, no line breaks.
inline constexpr std::string_view kCaution =
    "CAUTION: this output supports clinical judgement and does not replace it. Counts and "
    "scores come from the editable formulary tables and from the dispensing records loaded, "
    "which may be incomplete (other prescribers, hospital or private supplies, products the "
    "tables did not recognise). Confirm every medicine with the patient and the clinical "
    "record before acting; local guidance, coding rules and licensed practice take "
    "precedence.";

// The same four points in one line, for outputs that carry no clinical figures (an import
// summary, `synth`, `--help`), where the paragraph would only be skipped. Clinical outputs
// always carry kCaution in full.
inline constexpr std::string_view kCautionLine =
    "CAUTION: this output supports clinical judgement and does not replace it; figures depend on the "
    "editable tables and on complete records; confirm each medicine with the patient and the clinical "
    "record; local guidance prevails.";

}  // namespace medload
