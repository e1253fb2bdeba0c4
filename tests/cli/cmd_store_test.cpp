// `medload store pack` after a monthly import: packing only the patients the month touched
// gives the same packed copy, and so the same cohort and review, as packing a store that
// imported every month before its first packing.
#include <doctest/doctest.h>
#include <sqlite3.h>

#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "cli/medload_process.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

// The dispensed_on field (the fourth) of a synthetic dispensing row, whose first three
// fields are plain identifiers.
std::string DateOf(const std::string& line) {
  size_t at = 0;
  for (int field = 0; field < 3; ++field) at = line.find(',', at) + 1;
  return line.substr(at, 10);
}

// Splits the synthetic dispensing.csv into the rows before its latest month and the rows
// of that month (two files with its header); returns the latest date.
std::string SplitLatestMonth(const std::string& path, const std::string& before, const std::string& latest) {
  std::ifstream in(path);
  std::string header;
  std::getline(in, header);
  std::vector<std::string> lines;
  std::string newest;
  for (std::string line; std::getline(in, line);) {
    newest = std::max(newest, DateOf(line));
    lines.push_back(line);
  }
  std::ofstream early(before), late(latest);
  early << header << "\n";
  late << header << "\n";
  for (const std::string& line : lines) (DateOf(line).compare(0, 7, newest, 0, 7) == 0 ? late : early) << line << "\n";
  return newest;
}

// Every packed row of the store at `path`: patient, packed bytes in hex, how many left out.
std::string PackedRows(const std::string& path) {
  sqlite3* db = nullptr;
  REQUIRE(sqlite3_open_v2(path.c_str(), &db, SQLITE_OPEN_READONLY, nullptr) == SQLITE_OK);
  sqlite3_stmt* stmt = nullptr;
  REQUIRE(sqlite3_prepare_v2(db, "SELECT patient_id, hex(packed), dropped FROM packed_histories ORDER BY patient_id",
                             -1, &stmt, nullptr) == SQLITE_OK);
  std::string rows;
  while (sqlite3_step(stmt) == SQLITE_ROW) {
    for (int column = 0; column < 3; ++column) {
      rows += reinterpret_cast<const char*>(sqlite3_column_text(stmt, column));
      rows += column < 2 ? "|" : "\n";
    }
  }
  sqlite3_finalize(stmt);
  sqlite3_close(db);
  return rows;
}

std::string Run(const std::vector<std::string>& args, const ProcessOptions& run) {
  const ProcessResult result = RunMedload(args, run);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  return result.out;
}

}  // namespace

TEST_SUITE("cli/cmd_store") {

TEST_CASE("a month packed onto the copy gives the cohort and review of a store packed whole") {
  TempFolder folder;
  const ProcessOptions run = InFolder(folder.File(""));
  Run({"synth", "--patients", "150", "--months", "12", "--seed", "5", "--out", "data"}, run);
  const std::string newest = SplitLatestMonth(folder.File("data/dispensing.csv"), folder.File("early.csv"),
                                              folder.File("late.csv"));
  std::vector<std::string> outputs;
  for (const std::string db : {"monthly.db", "whole.db"}) {
    for (const char* kind : {"practices", "patients", "reviews"}) {
      Run({"--db", db, "--quiet", "import", kind, "data/" + std::string(kind) + ".csv"}, run);
    }
    Run({"--db", db, "--quiet", "import", "dispensing", "early.csv"}, run);
    if (db == "monthly.db") {
      CHECK(Run({"--db", db, "store", "pack"}, run).rfind("monthly.db: packed the histories of ", 0) == 0);
    }
    Run({"--db", db, "--quiet", "import", "dispensing", "late.csv"}, run);
    const std::string packed = Run({"--db", db, "store", "pack"}, run);
    CAPTURE(packed);
    CHECK(packed.find(db == "monthly.db" ? " with dispensings imported since the last packing\n"
                                         : "whole.db: packed the histories of ") != std::string::npos);
    outputs.push_back(Run({"--db", db, "cohort", "--on", newest, "--at-least", "items=5"}, run) +
                      Run({"--db", db, "review", "--on", newest, "--at-least", "items=5"}, run));
  }
  const std::string monthly = PackedRows(folder.File("monthly.db"));
  CHECK(monthly.size() > 10000);
  CHECK(monthly == PackedRows(folder.File("whole.db")));
  CHECK(outputs[0].find("rank  patient") != std::string::npos);  // the worklist has patients
  CHECK(outputs[0] == outputs[1]);
}

}  // TEST_SUITE

}  // namespace medload
