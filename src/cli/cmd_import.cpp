// `medload import dispensing|patients|practices|reviews FILE...`: loads files into the
// store, one transaction per file, and prints how many rows were read, imported,
// duplicates and rejected (docs/input-formats.md), and how many stored dispensings have
// a product the formulary does not fully recognise.
#include <charconv>
#include <cmath>
#include <iostream>
#include <map>
#include <memory>
#include <optional>
#include <ostream>
#include <set>
#include <sys/stat.h>
#include <unordered_map>

#include "cli/options.h"
#include "cli/progress.h"
#include "medload/format/output_file.h"
#include "medload/formulary/formulary.h"
#include "medload/formulary/resolver.h"
#include "medload/input/fhir_reader.h"
#include "medload/store/import_summary.h"
#include "medload/store/importer.h"
#include "medload/store/store.h"

namespace medload::cli {
namespace {

// Rows between progress calls (cli/progress.h prints at most one line every 2 seconds).
constexpr long kProgressEvery = 20000;
// How long an import waits for the store's write lock (another import, a migration): an
// hour, so that imports started together by a scheduler run one after the other.
constexpr int kImportWaitMs = 3600 * 1000;

po::options_description ImportOptionsDescription(InputKind kind) {
  po::options_description options(std::string("import ") + std::string(InputKindName(kind)) +
                                  " options");
  options.add_options()
      ("columns", po::value<std::string>(),
       "MAP.json: header names in your file for medload's column names (see docs/input-formats.md)")
      ("date-format", po::value<std::string>()->default_value("iso"),
       "order of CSV dates: iso (YYYY-MM-DD), dmy (DD/MM/YYYY) or mdy (MM/DD/YYYY)")
      ("rejects", po::value<std::string>(),
       "FILE: write every rejected row (file, line, reason, message, original row) as CSV; - for standard "
       "output (with --output FILE for the summary)")
      ("max-reject-rate", po::value<std::string>()->default_value("0.05"),
       "R: roll a file back (exit 3) when rejected/read is above R, 0 to 1")
      ("shard", po::value<std::string>(),
       "K/N: store only the rows of the patients in shard K of N, into a store of shard K's own; rows of "
       "other shards are counted apart (practices: every row; CSV only; docs/cohort.md)");
  return options;
}

Result<ImportOptions> ReadImportOptions(const po::variables_map& vm, InputKind kind) {
  ImportOptions options;
  const std::string order = vm["date-format"].as<std::string>();
  if (order == "dmy") options.date_order = DateOrder::kDmy;
  else if (order == "mdy") options.date_order = DateOrder::kMdy;
  else if (order != "iso") return Status::Usage("--date-format \"" + order + "\" is not one of iso, dmy, mdy");
  const std::string rate = vm["max-reject-rate"].as<std::string>();
  const auto [end, error] = std::from_chars(rate.data(), rate.data() + rate.size(), options.max_reject_rate);
  if (error != std::errc() || end != rate.data() + rate.size() || !std::isfinite(options.max_reject_rate) ||
      options.max_reject_rate < 0 || options.max_reject_rate > 1) {
    return Status::Usage("--max-reject-rate \"" + rate + "\" is not a number from 0 to 1");
  }
  if (vm.count("columns") != 0U) {
    Result<ColumnMap> map = LoadColumnMap(vm["columns"].as<std::string>(), kind);
    if (!map.ok()) return map.status();
    options.columns = std::move(map.value());
  }
  if (vm.count("shard") != 0U) {
    Result<ShardSpec> shard = ParseShard(vm["shard"].as<std::string>());
    if (!shard.ok()) return AsFlagFault(shard.status());
    options.shard = *shard;
  }
  return options;
}

// Every named file must exist before anything is imported ("-" is standard input, once).
Status CheckFiles(const std::vector<std::string>& files) {
  if (files.empty()) return Status::Usage("name at least one FILE (or - for standard input)");
  int stdin_count = 0;
  for (const std::string& file : files) {
    if (file == "-") {
      if (++stdin_count > 1) return Status::Usage("standard input (-) can be named only once");
      continue;
    }
    struct stat info {};
    if (::stat(file.c_str(), &info) != 0) return Status::Input(file + ": no such file");
    if (S_ISDIR(info.st_mode)) return Status::Input(file + ": is a folder, not a file");
  }
  return Status::Ok();
}

void WriteSummary(Format format, const std::vector<ImportSummary>& summaries, std::ostream& out) {
  switch (format) {
    case Format::kCsv: WriteImportCsv(summaries, out); break;
    case Format::kJson: WriteImportJson(summaries, out); break;
    case Format::kHtml: WriteImportHtml(summaries, out); break;
    default: WriteImportText(summaries, out); break;
  }
}

// Tallies, by match kind, the counting dispensings whose product the formulary does not
// recognise, recognises only in part or reads from a close spelling; each distinct
// product is resolved once.
class ProductCheck {
 public:
  explicit ProductCheck(Formulary formulary) : formulary_(std::move(formulary)) {}

  void Note(const DispensingRecord& record, std::map<std::string, long>& flags) {
    if (!StatusCounts(record.status)) return;
    key_.assign(record.product).append(1, '\x1f').append(record.code).append(1, '\x1f').append(record.code_system);
    auto it = seen_.find(key_);
    if (it == seen_.end()) {
      const ResolvedProduct product = Resolve(formulary_, record.product, record.code, record.code_system);
      it = seen_.emplace(key_, product.match).first;
    }
    const MatchKind match = it->second;
    if (match == MatchKind::kUnmatched || match == MatchKind::kPartial || match == MatchKind::kApproximate) {
      ++flags[std::string(MatchKindName(match))];
    }
  }

 private:
  Formulary formulary_;
  std::unordered_map<std::string, MatchKind> seen_;
  std::string key_;
};

// The product check of a dispensing import, or none (with a note) when the formulary
// does not load: the import itself does not need it.
std::unique_ptr<ProductCheck> OpenProductCheck(Context& context, InputKind kind) {
  if (kind != InputKind::kDispensing) return nullptr;
  auto formulary = LoadFormulary(context.formulary_dir);
  if (!formulary.ok()) {
    *context.err << "medload: products not checked: formulary " << context.formulary_dir
                 << " does not load (medload formulary check lists its faults)\n";
    return nullptr;
  }
  return std::make_unique<ProductCheck>(std::move(formulary).value());
}

// Imports the files one by one; a file that fails does not stop the others.
int ImportAll(Context& context, Store& store, InputKind kind, const std::vector<std::string>& files,
              ImportOptions& options) {
  std::vector<ImportSummary> summaries;
  int exit_code = 0;
  const std::unique_ptr<ProductCheck> check = OpenProductCheck(context, kind);
  std::map<std::string, long> flags;  // the current file's
  if (check) options.stored_dispensing = [&](const DispensingRecord& record) { check->Note(record, flags); };
  for (const std::string& file : files) {
    std::optional<ProgressLine> line;
    if (ShowsProgress(context)) {
      line.emplace(*context.err, "import " + file);
      options.progress_every = kProgressEvery;
      options.progress = [&line](long rows, uint64_t bytes_read, uint64_t bytes_total) {
        line->Update(ImportProgressText(rows, bytes_read, bytes_total, line->Elapsed()));
      };
    }
    flags.clear();
    Result<ImportSummary> summary = ImportFile(store, kind, file, options);
    if (!summary.ok()) {
      Fail(context, summary.status());
      exit_code = kExitInput;
      continue;
    }
    if (!summary->rolled_back) summary->product_flags = flags;  // a rolled-back file stored nothing
    if (summary->rolled_back) {
      *context.err << "medload: " << RollbackMessage(*summary) << "\n";
      if (exit_code == 0) exit_code = kExitRejected;
    }
    summaries.push_back(std::move(summary.value()));
  }
  if (!summaries.empty()) WriteSummary(context.format, summaries, *context.out);
  return exit_code;
}

int RunImport(Context& context, const std::vector<std::string>& args, InputKind kind) {
  const std::string usage = "medload import " + std::string(InputKindName(kind)) +
                            " FILE... [--columns MAP.json] [--date-format iso|dmy|mdy]"
                            " [--rejects FILE] [--max-reject-rate R] [--shard K/N]";
  const po::options_description description = ImportOptionsDescription(kind);
  int exit_code = 0;
  const auto vm = ParseOptions(context, usage.c_str(), description, {{"file", -1}}, args, exit_code);
  if (!vm) return exit_code;
  if (context.format == Format::kSvg) return Fail(context, Status::Usage("import writes text, csv, json or html"));
  const std::vector<std::string> files =
      vm->count("file") != 0U ? (*vm)["file"].as<std::vector<std::string>>() : std::vector<std::string>();
  Result<ImportOptions> options = ReadImportOptions(*vm, kind);
  if (!options.ok()) return Fail(context, options.status());
  if (Status status = CheckFiles(files); !status.ok()) return Fail(context, status);
  // An import waits for another one's transaction to end, however long its file.
  StoreOptions store_options;
  store_options.busy_timeout_ms = kImportWaitMs;
  Result<Store> store = Store::Open(context.db_path, store_options);
  if (!store.ok()) return Fail(context, store.status());
  // Rejected rows are the original rows, patient identifiers and all: owner-only. The file
  // appears (or replaces the previous one) only once every file has been imported, so
  // that a killed import leaves no rejects file that looks complete.
  std::optional<OutputFile> rejects;
  if (vm->count("rejects") != 0U && (*vm)["rejects"].as<std::string>() == "-") {
    // "-" is standard output, as for input files; the summary must then go elsewhere.
    if (context.output_path.empty() || context.output_path == "-") {
      return Fail(context, Status::Usage("--rejects - would mix the rejected rows with the import summary on standard "
                                         "output: give --rejects FILE, or --output FILE for the summary"));
    }
    WriteRejectsHeader(std::cout);
    options->rejects = &std::cout;
  } else if (vm->count("rejects") != 0U) {
    Result<OutputFile> opened = OutputFile::Open((*vm)["rejects"].as<std::string>(), FileAccess::kOwnerOnly);
    if (!opened.ok()) return Fail(context, opened.status());
    rejects.emplace(std::move(opened.value()));
    WriteRejectsHeader(rejects->stream());
    options->rejects = &rejects->stream();
  }
  exit_code = ImportAll(context, *store, kind, files, *options);
  if (rejects) {
    if (Status status = rejects->Commit(); !status.ok()) return Fail(context, status);
  }
  return exit_code;
}

}  // namespace

int RunImportDispensing(Context& context, const std::vector<std::string>& args) {
  return RunImport(context, args, InputKind::kDispensing);
}

int RunImportPatients(Context& context, const std::vector<std::string>& args) {
  return RunImport(context, args, InputKind::kPatients);
}

int RunImportPractices(Context& context, const std::vector<std::string>& args) {
  return RunImport(context, args, InputKind::kPractices);
}

int RunImportReviews(Context& context, const std::vector<std::string>& args) {
  return RunImport(context, args, InputKind::kReviews);
}

}  // namespace medload::cli
