// Reading dispensing rows of the store into records: the columns and the filter every
// reader of the dispensings table shares, and the bound on one history. Private to the
// store; it neither opens the store nor decides when the packed copy is used.
#pragma once

#include <cstddef>
#include <optional>
#include <string_view>
#include <vector>

#include "medload/core/date.h"
#include "medload/core/records.h"
#include "medload/core/status.h"
#include "store/sqlite.h"

namespace medload {

// The columns ReadDispensing reads, in its order.
inline constexpr const char* kDispensingColumns =
    "record_id, patient_id, practice, dispensed_on, product, code, code_system, quantity,"
    " unit, days_supply, dosage, structured_units_per_day, structured_as_needed, status,"
    " structured_unit";

// The statuses that count in measures (docs/input-formats.md: only "completed" or none).
inline constexpr const char* kCounting = "status IN ('', 'completed')";

// The date in column `index`, or none when it is NULL or malformed.
std::optional<Date> ColumnDate(const Statement& stmt, int index);

// Fills `record` from a row selected with kDispensingColumns. Fails with Input, naming
// the patient, on a malformed date.
Status ReadDispensing(const Statement& stmt, DispensingRecord& record);

// Reading a patient's records in order while holding only the latest `cap` of them: once
// the buffer holds twice that many, its older half is dropped (at most 2 x cap records
// are ever held). `used` records of `records` are live; `dropped` counts the ones let go.
void SlideIfFull(std::vector<DispensingRecord>& records, size_t& used, size_t cap, long& dropped);

// After the last record: only the latest `cap` stay live (moved to the front).
void KeepLatest(std::vector<DispensingRecord>& records, size_t& used, size_t cap, long& dropped);

// One patient's dispensings (only those that count when `counting_only`) in date order,
// then import order, the latest `cap` of them; `dropped_out` (when given) receives how
// many older ones were left out. Fails with Input on a storage error.
Result<std::vector<DispensingRecord>> SelectDispensings(sqlite3* db, std::string_view patient_id,
                                                        bool counting_only, size_t cap, long* dropped_out);

// Runs a query of one integer (a count); 0 when it returns no row.
Result<long> QueryCount(sqlite3* db, const char* sql);

}  // namespace medload
