// The import's check for control characters in a record: a NUL, an escape sequence or
// another C0 control (other than tab, CR and LF) or DEL has no place in a patient id,
// product or dosage, and would reach terminals, CSV and HTML outputs. It does not check
// UTF-8 (the readers do) or any field's meaning. Private to src/store.
#pragma once

#include <cstddef>
#include <optional>
#include <string_view>

#include "medload/input/csv_records.h"

namespace medload {

// The first control character in `text`, written as a byte or, when `json` is true, also
// as a JSON \u escape (\u0000 to \u001f other than \u0009, \u000a and \u000d, and \u007f),
// as a "control_character" fault
// "FILE:LINE: row: holds the control character 0x1B (at byte 14); remove it from the file",
// or nullopt when there is none. Bytes are counted from 1.
std::optional<RowFault> ControlCharacterFault(std::string_view file, size_t line,
                                              std::string_view text, bool json);

}  // namespace medload
