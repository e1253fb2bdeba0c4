// Kernels of the dispensing import before the store: the streaming CSV reader over an
// in-memory file of generated dispensing rows, and the same with every row checked and
// parsed into a DispensingRecord. No file system or store work is timed.
#include <benchmark/benchmark.h>

#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <streambuf>
#include <string>
#include <system_error>

#include "medload/core/records.h"
#include "medload/input/csv_reader.h"
#include "medload/input/csv_records.h"
#include "medload/synth/synth.h"

namespace medload {
namespace {

// A stream over a buffer the caller owns, without copying it (std::istringstream copies).
class MemoryBuffer : public std::streambuf {
 public:
  MemoryBuffer(char* begin, size_t size) { setg(begin, begin, begin + size); }
};

// dispensing.csv of a generated care network (2,000 patients, 12 months: about 38,000
// rows, 4 MB, with quoted dosage texts holding commas), read once into memory.
std::string& DispensingCsv() {
  static std::string text = [] {
    namespace fs = std::filesystem;
    std::error_code ignored;
    const fs::path folder = fs::temp_directory_path() / "medload_csv_bench";
    SynthOptions options;
    options.patients = 2000;
    options.seed = 7;
    std::string contents;
    if (WriteSynthData(options, folder.string()).ok()) {
      std::ifstream in(folder / "dispensing.csv", std::ios::binary);
      std::ostringstream out;
      out << in.rdbuf();
      contents = out.str();
    }
    fs::remove_all(folder, ignored);
    return contents;
  }();
  return text;
}

void BM_CsvReaderDispensing(benchmark::State& state) {
  std::string& text = DispensingCsv();
  if (text.empty()) return state.SkipWithError("could not generate the dispensing file");
  size_t rows = 0;
  for (auto _ : state) {
    MemoryBuffer buffer(text.data(), text.size());
    std::istream in(&buffer);
    CsvReader reader(in);
    CsvRow row;
    rows = 0;
    while (reader.Next(row)) ++rows;
    benchmark::DoNotOptimize(rows);
  }
  state.SetBytesProcessed(state.iterations() * static_cast<int64_t>(text.size()));
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(rows));
  state.counters["rows"] = static_cast<double>(rows);
}
BENCHMARK(BM_CsvReaderDispensing)->Unit(benchmark::kMillisecond);

// Reads the header, then checks and parses every row into one reused DispensingRecord,
// as the import does before it writes to the store.
void BM_ParseDispensingRows(benchmark::State& state) {
  std::string& text = DispensingCsv();
  if (text.empty()) return state.SkipWithError("could not generate the dispensing file");
  const RowContext context{"dispensing.csv", DateOrder::kIso};
  size_t rows = 0;
  size_t rejected = 0;
  for (auto _ : state) {
    MemoryBuffer buffer(text.data(), text.size());
    std::istream in(&buffer);
    CsvReader reader(in);
    CsvRow row;
    if (!reader.Next(row)) return state.SkipWithError("empty file");
    auto layout = HeaderLayout::Find(InputKind::kDispensing, row, ColumnMap{}, context.file);
    if (!layout.ok()) return state.SkipWithError("header not recognised");
    DispensingRecord record;
    rows = 0;
    rejected = 0;
    while (reader.Next(row)) {
      ++rows;
      if (ParseDispensingRow(row, layout.value(), context, record)) ++rejected;
      benchmark::DoNotOptimize(record);
    }
  }
  if (rejected != 0) return state.SkipWithError("generated rows were rejected");
  state.SetBytesProcessed(state.iterations() * static_cast<int64_t>(text.size()));
  state.SetItemsProcessed(state.iterations() * static_cast<int64_t>(rows));
  state.counters["rows"] = static_cast<double>(rows);
}
BENCHMARK(BM_ParseDispensingRows)->Unit(benchmark::kMillisecond);

}  // namespace
}  // namespace medload
