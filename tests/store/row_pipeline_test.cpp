// The import's read-ahead: rows parsed on a second thread reach the calling thread in
// input order, whatever the batch shape, and a failure on either side stops both.
#include "store/row_pipeline.h"

#include <doctest/doctest.h>

#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

namespace medload {
namespace {

// "N,ok" rows are records; "N,bad" rows are faults.
std::string Rows(int count) {
  std::string text;
  for (int i = 1; i <= count; ++i) text += std::to_string(i) + (i % 7 == 0 ? ",bad\n" : ",ok\n");
  return text;
}

std::optional<RowFault> CheckRow(const CsvRow& row, std::string& record) {
  if (row.fields.size() != 2) return RowFault{"shape", "line " + std::to_string(row.line)};
  if (row.fields[1] == "bad") return RowFault{"bad", "line " + std::to_string(row.line)};
  record.assign(row.fields[0]);
  return std::nullopt;
}

struct Seen {
  std::vector<size_t> lines;
  std::vector<std::string> records;
  std::vector<size_t> faults;
};

Status Collect(Seen& seen, const CheckedRow<std::string>& row) {
  seen.lines.push_back(row.line);
  if (row.fault) seen.faults.push_back(row.line);
  else seen.records.push_back(row.record);
  return Status::Ok();
}

}  // namespace

TEST_SUITE("store/row_pipeline") {

TEST_CASE("Rows and faults reach the calling thread in input order whatever the batch shape") {
  const std::vector<ReadAheadShape> shapes = {{1, 1}, {1, 4}, {3, 2}, {7, 1}, {1024, 4}, {100, 3}};
  for (const int count : {0, 1, 6, 7, 21, 300}) {
    for (const ReadAheadShape& shape : shapes) {
      CAPTURE(count);
      CAPTURE(shape.rows_per_batch);
      CAPTURE(shape.batches);
      std::istringstream in(Rows(count));
      CsvReader reader(in);
      Seen seen;
      const Status status = ReadAheadRows<std::string>(
          reader, CheckRow, [&](const CheckedRow<std::string>& row) { return Collect(seen, row); }, shape);
      REQUIRE(status.ok());
      REQUIRE(seen.lines.size() == static_cast<size_t>(count));
      std::vector<std::string> records;
      std::vector<size_t> faults;
      for (int i = 1; i <= count; ++i) {
        CHECK(seen.lines[static_cast<size_t>(i - 1)] == static_cast<size_t>(i));
        if (i % 7 == 0) faults.push_back(static_cast<size_t>(i));
        else records.push_back(std::to_string(i));
      }
      CHECK(seen.records == records);
      CHECK(seen.faults == faults);
    }
  }
}

TEST_CASE("A row's text and line count are handed over with it") {
  std::istringstream in("1,\"two\nlines\"\n2,ok\n");
  CsvReader reader(in);
  std::vector<std::string> texts;
  std::vector<size_t> counts;
  const Status status = ReadAheadRows<std::string>(reader, CheckRow, [&](const CheckedRow<std::string>& row) {
    texts.push_back(row.text);
    counts.push_back(row.line_count);
    return Status::Ok();
  });
  REQUIRE(status.ok());
  CHECK(texts == std::vector<std::string>{"1,\"two\nlines\"", "2,ok"});
  CHECK(counts == std::vector<size_t>{2, 1});
}

TEST_CASE("The first failing take stops the import there and its status is returned") {
  for (const size_t per_batch : {size_t{1}, size_t{5}, size_t{1024}}) {
    CAPTURE(per_batch);
    std::istringstream in(Rows(5000));
    CsvReader reader(in);
    std::vector<size_t> lines;
    const Status status = ReadAheadRows<std::string>(
        reader, CheckRow,
        [&](const CheckedRow<std::string>& row) {
          lines.push_back(row.line);
          return row.line == 12 ? Status::Input("store: full at line 12") : Status::Ok();
        },
        {per_batch, 2});
    CHECK(status.message() == "store: full at line 12");
    REQUIRE(lines.size() == 12);
    CHECK(lines.back() == 12);
  }
}

TEST_CASE("An exception thrown while checking a row is thrown again on the calling thread") {
  std::istringstream in(Rows(3000));
  CsvReader reader(in);
  long taken = 0;
  auto check = [](const CsvRow& row, std::string& record) -> std::optional<RowFault> {
    if (row.line == 2500) throw std::runtime_error("out of memory at 2500");
    return CheckRow(row, record);
  };
  CHECK_THROWS_WITH(ReadAheadRows<std::string>(
                        reader, check,
                        [&](const CheckedRow<std::string>&) {
                          ++taken;
                          return Status::Ok();
                        },
                        {100, 2}),
                    "out of memory at 2500");
  CHECK(taken == 2400);  // the batches handed over before the one that failed
}

}  // TEST_SUITE

}  // namespace medload
