// Writing the store's packed copy of each history (packed_histories): every patient's
// again, or only those of the patients with dispensings imported since the copy was last
// packed. Private to the store; whether and when to pack is the Store's (store_pack.cpp),
// and what a packed history holds is store/packed_history.h's.
#pragma once

#include <cstddef>
#include <string>
#include <vector>

#include "medload/core/status.h"
#include "store/sqlite.h"

namespace medload {

// Packs every patient's counting dispensings (the latest `cap` of each, with how many
// older ones were left out) into packed_histories, replacing what it held. Inside the
// caller's write transaction. Returns the number of histories written. Fails with Input
// on a storage error or a malformed stored date.
Result<long> PackEveryHistory(sqlite3* db, size_t cap);

// Packs again only the histories of the patients with a counting dispensing whose id is
// above `packed_up_to`, which must be the copy's state: every dispensing up to that id
// packed, none updated or deleted since (the state row's promise). Each such history is
// its packed copy with the newer dispensings merged in, in date order and then import
// order (a newer id sorts after every packed dispensing of its date); a history with no
// packed row (a new patient), one that left older dispensings out, or one whose copy
// cannot be read, is read from the table. The
// rows written are byte for byte what PackEveryHistory would write. Inside the caller's
// write transaction. Appends the repacked patients' ids to `touched` when given, in id
// order; returns how many. Fails with Input on a storage error or a malformed date.
Result<long> PackTouchedHistories(sqlite3* db, long packed_up_to, size_t cap,
                                  std::vector<std::string>* touched = nullptr);

}  // namespace medload
