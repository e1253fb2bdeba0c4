// `medload synth --patients N --months M --seed S --out DIR`: writes a synthetic,
// deterministic data set for an invented care network and prints what it wrote.
#include <charconv>
#include <chrono>
#include <nlohmann/json.hpp>
#include <ostream>

#include "cli/options.h"
#include "medload/core/caution.h"
#include "medload/format/json_text.h"
#include "medload/format/output.h"
#include "medload/synth/synth.h"

namespace medload::cli {
namespace {

Result<uint64_t> ReadWholeNumber(const po::variables_map& vm, const char* name) {
  const std::string text = vm[name].as<std::string>();
  uint64_t value = 0;
  const auto [end, error] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (text.empty() || error != std::errc() || end != text.data() + text.size()) {
    return Status::Usage(std::string("--") + name + " \"" + text + "\" is not a whole number");
  }
  return value;
}

Result<SynthOptions> ReadSynthOptions(const po::variables_map& vm) {
  SynthOptions options;
  Result<uint64_t> patients = ReadWholeNumber(vm, "patients");
  if (!patients.ok()) return patients.status();
  options.patients = *patients;
  Result<uint64_t> months = ReadWholeNumber(vm, "months");
  if (!months.ok()) return months.status();
  options.months = static_cast<int>(std::min<uint64_t>(*months, 100000));
  Result<uint64_t> seed = ReadWholeNumber(vm, "seed");
  if (!seed.ok()) return seed.status();
  options.seed = *seed;
  if (vm.count("end") != 0U) {
    const std::string text = vm["end"].as<std::string>();
    const std::optional<Date> end = ParseDate(text);
    if (!end) return Status::Usage("--end \"" + text + "\" is not a date (YYYY-MM-DD)");
    options.end = *end;
  }
  const std::string format = vm["data-format"].as<std::string>();
  if (format == "fhir") {
    options.format = SynthFormat::kFhir;
  } else if (format != "csv") {
    return Status::Usage("--data-format \"" + format + "\" is not one of csv, fhir");
  }
  if (Status status = CheckSynthOptions(options); !status.ok()) return AsFlagFault(status);
  return options;
}

std::vector<std::vector<std::string>> FileRows(const SynthSummary& summary) {
  std::vector<std::vector<std::string>> rows;
  for (const SynthFileSummary& file : summary.files) {
    rows.push_back({file.name, std::to_string(file.rows)});
  }
  return rows;
}

nlohmann::json SummaryJson(const SynthSummary& summary) {
  nlohmann::json files = nlohmann::json::array();
  for (const SynthFileSummary& file : summary.files) {
    files.push_back({{"name", file.name}, {"rows", file.rows}});
  }
  return {{"out", summary.folder},
          {"seed", summary.seed},
          {"data_format", SynthFormatName(summary.format)},
          {"from", summary.from.ToIso()},
          {"to", summary.to.ToIso()},
          {"network", summary.network},
          {"practices", summary.practices},
          {"patients", summary.patients},
          {"registered_patients", summary.registered_patients},
          {"dispensing_rows", summary.dispensing_rows},
          {"reviews", summary.reviews},
          {"files", files},
          {"caution", std::string(kCaution)}};
}

// The summary is deterministic (no timings) so that runs can be compared byte for byte.
void WriteSummary(Context& context, const SynthSummary& summary) {
  std::ostream& out = *context.out;
  const std::vector<std::string> header = {"file", "rows"};
  switch (context.format) {
    case Format::kJson:
      out << JsonText(SummaryJson(summary)) << "\n";
      return;
    case Format::kCsv:
      WriteCsvCaution(out);
      out << CsvRow(header);
      for (const auto& row : FileRows(summary)) out << CsvRow(row);
      return;
    case Format::kHtml:
      WriteHtmlStart(out, "Synthetic data set");
      out << "<p>" << EscapeHtml(summary.network) << ": " << summary.patients
          << " invented patients, " << summary.from.ToIso() << " to " << summary.to.ToIso()
          << ", seed " << summary.seed << ", written to " << EscapeHtml(summary.folder)
          << "</p>\n";
      WriteHtmlTable(out, header, FileRows(summary));
      WriteHtmlEnd(out);
      return;
    case Format::kText:
    case Format::kSvg:  // refused before anything is written (RunSynth)
      break;
  }
  out << "synthetic data set written to " << summary.folder << "\n"
      << "  " << summary.network << " (invented): " << summary.practices << " practices, "
      << summary.patients << " patients (" << summary.registered_patients
      << " on the registered lists)\n"
      << "  " << summary.from.ToIso() << " to " << summary.to.ToIso() << ", seed "
      << summary.seed << ", " << SynthFormatName(summary.format) << "\n\n";
  WriteTextTable(out, header, FileRows(summary));
  WriteTextCautionLine(out);
}

}  // namespace

int RunSynth(Context& context, const std::vector<std::string>& args) {
  po::options_description options("synth options");
  options.add_options()
      ("patients", po::value<std::string>()->default_value("1000"), "patients to invent")
      ("months", po::value<std::string>()->default_value("12"), "whole months of dispensing")
      ("seed", po::value<std::string>()->default_value("1"),
       "the seed: the same options and seed give the same bytes")
      ("out", po::value<std::string>(), "the folder to write (created if missing)")
      ("end", po::value<std::string>(),
       "the data end on the last day of this date's month (default 2026-10-31)")
      ("data-format", po::value<std::string>()->default_value("csv"),
       "csv (dispensing.csv, patients.csv) or fhir (FHIR R4 NDJSON)");
  int exit_code = 0;
  const char* usage = "medload synth --patients N --months M --seed S --out DIR "
                      "[--end DATE] [--data-format csv|fhir]";
  auto vm = ParseOptions(context, usage, options, {}, args, exit_code);
  if (!vm) return exit_code;
  auto fail = [&](const Status& status) { return Fail(context, status); };
  if (vm->count("out") == 0U) return fail(Status::Usage("synth needs --out DIR"));
  if (context.format == Format::kSvg) return fail(Status::Usage("synth writes its summary as text, csv, json or html"));
  Result<SynthOptions> synth_options = ReadSynthOptions(*vm);
  if (!synth_options.ok()) return fail(synth_options.status());
  const auto started = std::chrono::steady_clock::now();
  Result<SynthSummary> summary = WriteSynthData(*synth_options, (*vm)["out"].as<std::string>());
  if (!summary.ok()) return fail(summary.status());
  const std::chrono::duration<double> elapsed = std::chrono::steady_clock::now() - started;
  if (!context.quiet) {
    const double seconds = elapsed.count();
    const double rate = seconds > 0 ? static_cast<double>(summary->dispensing_rows) / seconds : 0;
    *context.err << "medload: " << summary->dispensing_rows << " dispensing rows in "
                 << FormatNumber(seconds, 2) << " s (" << FormatNumber(rate, 0) << " rows/s)\n";
  }
  WriteSummary(context, *summary);
  return 0;
}

}  // namespace medload::cli
