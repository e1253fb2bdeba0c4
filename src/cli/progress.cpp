#include "cli/progress.h"

#include <cmath>
#include <ostream>

#include "medload/format/output.h"

namespace medload::cli {

std::string GroupDigits(uint64_t value) {
  std::string digits = std::to_string(value);
  for (size_t at = digits.size(); at > 3; at -= 3) digits.insert(at - 3, ",");
  return digits;
}

namespace {

uint64_t PerSecond(double count, double seconds) {
  return seconds > 0 ? static_cast<uint64_t>(std::llround(count / seconds)) : 0;
}

}  // namespace

std::string PassProgressText(const PassProgress& progress, double seconds) {
  if (progress.packing) return "packing patient histories after the import (once)";
  const long percent =
      progress.ranges == 0 ? 100 : std::lround(100.0 * static_cast<double>(progress.ranges_done) /
                                                static_cast<double>(progress.ranges));
  const auto patients = static_cast<uint64_t>(std::max(progress.patients, 0L));
  std::string text = std::to_string(percent) + "% of patients (" + GroupDigits(patients) + " read";
  if (seconds >= 1) text += ", " + GroupDigits(PerSecond(static_cast<double>(patients), seconds)) + " a second";
  return text + ")";
}

std::string ImportProgressText(long rows, uint64_t bytes_read, uint64_t bytes_total, double seconds) {
  const auto count = static_cast<uint64_t>(std::max(rows, 0L));
  std::string text = GroupDigits(count) + " rows";
  if (bytes_total > 0) {
    const double share = std::min(1.0, static_cast<double>(bytes_read) / static_cast<double>(bytes_total));
    text += ", " + std::to_string(std::lround(100 * share)) + "% of " +
            FormatNumber(static_cast<double>(bytes_total) / 1e6, bytes_total < 10000000 ? 1 : 0) + " MB";
  }
  if (seconds >= 1) text += " (" + GroupDigits(PerSecond(static_cast<double>(count), seconds)) + " rows a second)";
  return text;
}

ProgressLine::ProgressLine(std::ostream& err, std::string label, std::chrono::milliseconds interval, Clock clock)
    : err_(err), label_(std::move(label)), interval_(interval), clock_(std::move(clock)), start_(clock_()),
      last_(start_) {}

double ProgressLine::Elapsed() const {
  return std::chrono::duration<double>(clock_() - start_).count();
}

void ProgressLine::Restart() {
  start_ = clock_();
  last_ = start_;
}

void ProgressLine::Update(const std::string& text, bool force) {
  const auto now = clock_();
  if (!force && now - last_ < interval_) return;
  last_ = now;
  printed_ = true;
  err_ << "medload: " << label_ << ": " << text << "\n";
}

bool ShowsProgress(const Context& context) { return !context.quiet && context.err_is_terminal; }

PassProgressFn PassProgressPrinter(const Context& context, const std::string& label) {
  if (!ShowsProgress(context)) return {};
  auto line = std::make_shared<ProgressLine>(*context.err, label);
  auto packing = std::make_shared<bool>(false);
  return [line, packing](const PassProgress& progress) {
    // The packing notice always shows (it can take a while and nothing moves meanwhile);
    // reading is timed from its end. The last line shows only after earlier ones, to
    // close them.
    if (*packing && !progress.packing) line->Restart();
    *packing = progress.packing;
    const bool last = !progress.packing && progress.ranges_done == progress.ranges;
    if (last && !line->printed()) return;
    line->Update(PassProgressText(progress, line->Elapsed()), progress.packing || last);
  };
}

}  // namespace medload::cli
