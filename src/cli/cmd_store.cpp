// `medload store pack`: brings the store's packed copy of the histories up to date now,
// so that later readers that may not write the store (a batch array on shared storage,
// a read-only copy) read the copy instead of the dispensings table.
#include <ostream>

#include "cli/options.h"
#include "medload/format/output.h"
#include "medload/store/store.h"

namespace medload::cli {
namespace {

// As long as an import: packing waits for the imports before it.
constexpr int kPackWaitMs = 3600 * 1000;

}  // namespace

int RunStorePack(Context& context, const std::vector<std::string>& args) {
  po::options_description options("store pack options");
  int exit_code = 0;
  const auto vm = ParseOptions(context, "medload store pack", options, {}, args, exit_code);
  if (!vm) return exit_code;
  const auto fail = [&](const Status& status) { return Fail(context, status); };
  StoreOptions store_options;
  store_options.must_exist = true;
  store_options.busy_timeout_ms = kPackWaitMs;
  Result<Store> store = Store::Open(context.db_path, store_options);
  if (!store.ok()) return fail(store.status());
  Result<PackOutcome> packed = store->PackHistoriesNow();
  if (!packed.ok()) return fail(packed.status());
  if (packed->was_current) {
    *context.out << context.db_path << ": the packed histories are already current\n";
  } else if (packed->whole) {
    *context.out << context.db_path << ": packed the histories of " << packed->patients << " patients\n";
  } else {
    *context.out << context.db_path << ": packed again the histories of " << packed->patients
                 << " patients with dispensings imported since the last packing\n";
  }
  WriteTextCaution(*context.out);
  return 0;
}

}  // namespace medload::cli
