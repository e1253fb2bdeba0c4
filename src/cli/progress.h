// Progress lines on standard error for commands that can run longer than a couple of
// seconds (import, review, cohort, report): what is done, of what total where known, and
// the rate. Quiet with --quiet or when standard error is not a terminal (a scheduler's log
// then holds only results, warnings and faults). Private to cli/.
#pragma once

#include <chrono>
#include <cstdint>
#include <functional>
#include <memory>
#include <optional>
#include <string>

#include "cli/context.h"
#include "medload/burden/run_context.h"

namespace medload::cli {

// "1,234,567": thousands separated by commas (locale-independent).
std::string GroupDigits(uint64_t value);

// The text of a pass's progress after `seconds`: "packing patient histories after the
// import (once)" or "41% of patients (12,288 read, 2,450 a second)".
std::string PassProgressText(const PassProgress& progress, double seconds);

// The text of an import's progress: "1,000,000 rows, 45% of 212 MB (530,000 rows a
// second)"; without the percentage when the size is unknown (standard input).
std::string ImportProgressText(long rows, uint64_t bytes_read, uint64_t bytes_total, double seconds);

// Prints "medload: LABEL: TEXT" at most once every `interval`, the first time not before
// `interval` has passed (a quick command prints nothing); the clock is injectable for tests.
class ProgressLine {
 public:
  using Clock = std::function<std::chrono::steady_clock::time_point()>;
  ProgressLine(std::ostream& err, std::string label, std::chrono::milliseconds interval = std::chrono::seconds(2),
               Clock clock = std::chrono::steady_clock::now);
  // Seconds since the line was made.
  double Elapsed() const;
  // Prints when the interval has passed since the last line (or `force`).
  void Update(const std::string& text, bool force = false);
  // Counts time (for Elapsed and the first interval) from now: a new phase begins.
  void Restart();
  // Whether any line was printed.
  bool printed() const { return printed_; }

 private:
  std::ostream& err_;
  std::string label_;
  std::chrono::milliseconds interval_;
  Clock clock_;
  std::chrono::steady_clock::time_point start_;
  std::chrono::steady_clock::time_point last_;
  bool printed_ = false;
};

// Whether a command prints progress: not --quiet and standard error a terminal.
bool ShowsProgress(const Context& context);

// A pass progress callback printing through a ProgressLine labelled `label`, or an empty
// function when ShowsProgress is false.
PassProgressFn PassProgressPrinter(const Context& context, const std::string& label);

}  // namespace medload::cli
