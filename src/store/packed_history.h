// One patient's counting dispensings packed into one byte string, for the store's copy of
// each history (table packed_histories) that the ordered pass reads in place of one table
// row per dispensing. Private to the store.
#pragma once

#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "medload/core/records.h"
#include "medload/core/status.h"

namespace medload {

// Packs `records` (one patient's, in the pass's order). The strings a history repeats
// (practice, product, code, system, unit, dosage, status) are written once each; dates
// as day numbers; the patient id is not written (it is the row's key).
std::string PackHistory(std::span<const DispensingRecord> records);

// Unpacks what PackHistory wrote into `into`, one record per packed dispensing, each with
// `patient_id`. Records already in `into` are overwritten in place (their strings keep
// their buffers); extra ones move to `spare`, and new ones come from `spare` first.
// Fails with Input, naming the patient, when `packed` is not a whole packed history.
Status UnpackHistory(std::string_view packed, std::string_view patient_id,
                     std::vector<DispensingRecord>& into, std::vector<DispensingRecord>& spare);

}  // namespace medload
