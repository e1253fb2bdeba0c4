// The parts every dictionary reader shares, the simple CSV list, and dictionary.csv
// itself (written whole, then renamed, so that a failed load never leaves half a table).
#include "medload/formulary/dictionary.h"

#include <charconv>
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>

#include "formulary/description_words.h"
#include "formulary/dictionary_release.h"
#include "formulary/name_index.h"
#include "formulary/table_reader.h"

namespace medload {
namespace formulary_internal {

std::string IngredientOfSubstance(const Formulary& formulary, std::string_view substance,
                                  std::set<std::string>& unknown) {
  if (const Ingredient* ingredient = formulary.FindIngredient(substance)) return ingredient->name;
  const ResolvedProduct product = Resolve(formulary, substance);
  if (product.match == MatchKind::kIngredient && product.ingredients.size() == 1) {
    return product.ingredients.front().ingredient;
  }
  // Named without its salt ("Frobazine hydrochloride" -> frobazine), as a dispensing
  // description would be read.
  const std::string key = NameKey(substance);
  std::string name;
  for (const Word& word : SplitWords(key)) {
    if (!IsDescriptiveWord(word.text)) name += (name.empty() ? "" : " ") + std::string(word.text);
  }
  if (name.empty()) name = key;
  unknown.insert(name);
  return "?" + name;
}

namespace {

std::string Number(double value) {
  char buffer[32];
  const auto [end, error] = std::to_chars(buffer, buffer + sizeof buffer, value);
  return error == std::errc() ? std::string(buffer, end) : std::string("0");
}

}  // namespace

std::string StrengthText(const Strength& strength) {
  std::string text = Number(strength.amount);
  switch (strength.unit) {
    case StrengthUnit::kMg: text += "mg"; break;
    case StrengthUnit::kUnits: text += "units"; break;
    case StrengthUnit::kPercent: text += "%"; break;
  }
  if (strength.per.empty()) return text;
  return text + "/" + Number(strength.per_amount) + (strength.per == "hour" ? "hours" : strength.per);
}

std::string FileName(std::string_view path) {
  return std::filesystem::path(std::string(path)).filename().string();
}

}  // namespace formulary_internal

namespace {

using formulary_internal::ReleaseFile;

constexpr std::string_view kColumns[] = {"code_system", "code", "name", "brand", "ingredients", "source"};

Result<DictionaryLoad> ReadCsvRelease(const Formulary& formulary, const std::vector<ReleaseFile>& files) {
  DictionaryLoad load;
  load.code_system = "csv";
  std::set<std::string> unknown;
  for (const ReleaseFile& file : files) {
    std::vector<std::string> faults;
    const auto table = formulary_internal::ParseTable(formulary_internal::FileName(file.path), file.content,
                                                      {"code_system", "code", "name", "brand", "ingredients"}, faults);
    if (!faults.empty()) return Status::Input(file.path + ": " + faults.front());
    for (const auto& row : table->rows) {
      DictionaryEntry entry{row.fields[0], row.fields[1], row.fields[2], row.fields[3], {},
                            formulary_internal::FileName(file.path) + " (loaded with medload formulary load-dictionary)",
                            row.line};
      if (entry.code_system.empty() || (entry.code.empty() && entry.name.empty() && entry.brand.empty())) {
        return Status::Input(file.path + ":" + std::to_string(row.line) +
                             ": needs a code_system and a code, name or brand");
      }
      for (const std::string& element : formulary_internal::SplitList(row.fields[4])) {
        const size_t equals = element.find('=');
        const std::string name = formulary_internal::IngredientOfSubstance(formulary, element.substr(0, equals), unknown);
        entry.ingredients.push_back(equals == std::string::npos ? name : name + element.substr(equals));
      }
      if (entry.ingredients.empty()) return Status::Input(file.path + ":" + std::to_string(row.line) + ": ingredients: empty");
      if (entry.name.empty() && entry.code.empty()) entry.name = entry.brand;
      load.entries.push_back(std::move(entry));
    }
  }
  load.unknown_substances.assign(unknown.begin(), unknown.end());
  return load;
}

std::string CsvField(const std::string& field) {
  if (field.find_first_of(",\"\n\r") == std::string::npos && (field.empty() || field.front() != '#')) return field;
  std::string quoted = "\"";
  for (const char c : field) quoted += c == '"' ? std::string("\"\"") : std::string(1, c);
  return quoted + "\"";
}

std::string Join(const std::vector<std::string>& parts) {
  std::string out;
  for (const std::string& part : parts) out += (out.empty() ? "" : "|") + part;
  return out;
}

// The rows of an existing dictionary.csv in `dir` (none if there is no such file).
Result<std::vector<DictionaryEntry>> ExistingRows(const std::filesystem::path& path) {
  std::error_code error;
  if (!std::filesystem::exists(path, error)) return std::vector<DictionaryEntry>{};
  std::ifstream in(path, std::ios::binary);
  std::ostringstream content;
  content << in.rdbuf();
  if (!in) return Status::Input(path.string() + ": cannot be read");
  std::vector<std::string> faults;
  const auto table = formulary_internal::ParseTable("dictionary.csv", content.str(),
                                                    std::vector<std::string_view>(std::begin(kColumns), std::end(kColumns)), faults);
  if (!faults.empty()) return Status::Input(path.string() + ": " + faults.front() + " (fix it or remove the file)");
  std::vector<DictionaryEntry> rows;
  for (const auto& row : table->rows) {
    rows.push_back(DictionaryEntry{row.fields[0], row.fields[1], row.fields[2], row.fields[3],
                                   formulary_internal::SplitList(row.fields[4]), row.fields[5], row.line});
  }
  return rows;
}

}  // namespace

std::optional<DictionarySystem> DictionarySystemFromName(std::string_view name) {
  if (name == "dmd") return DictionarySystem::kDmd;
  if (name == "rxnorm") return DictionarySystem::kRxnorm;
  if (name == "csv") return DictionarySystem::kCsv;
  return std::nullopt;
}

Result<DictionaryLoad> ReadDictionaryRelease(const Formulary& formulary, DictionarySystem system,
                                             const std::vector<std::string>& paths) {
  std::vector<ReleaseFile> files;
  for (const std::string& path : paths) {
    std::ifstream in(path, std::ios::binary);
    if (!in) return Status::Input(path + ": cannot be opened");
    std::ostringstream content;
    content << in.rdbuf();
    if (in.bad()) return Status::Input(path + ": cannot be read");
    files.push_back(ReleaseFile{path, content.str()});
  }
  switch (system) {
    case DictionarySystem::kDmd: return formulary_internal::ReadDmdRelease(formulary, files);
    case DictionarySystem::kRxnorm: return formulary_internal::ReadRxnormRelease(formulary, files);
    case DictionarySystem::kCsv: break;
  }
  return ReadCsvRelease(formulary, files);
}

std::string DictionaryCsv(const std::vector<DictionaryEntry>& entries) {
  std::string text = "code_system,code,name,brand,ingredients,source\n";
  for (const DictionaryEntry& entry : entries) {
    text += CsvField(entry.code_system) + "," + CsvField(entry.code) + "," + CsvField(entry.name) + "," +
            CsvField(entry.brand) + "," + CsvField(Join(entry.ingredients)) + "," + CsvField(entry.source) + "\n";
  }
  return text;
}

Status WriteDictionary(const std::string& dir, const DictionaryLoad& load) {
  const std::filesystem::path path = std::filesystem::path(dir) / "dictionary.csv";
  auto existing = ExistingRows(path);
  if (!existing.ok()) return existing.status();
  std::set<std::string> loaded_systems;
  for (const DictionaryEntry& entry : load.entries) loaded_systems.insert(CodeSystemKey(entry.code_system));
  std::vector<DictionaryEntry> rows;
  for (DictionaryEntry& entry : *existing) {
    if (loaded_systems.count(CodeSystemKey(entry.code_system)) == 0) rows.push_back(std::move(entry));
  }
  rows.insert(rows.end(), load.entries.begin(), load.entries.end());
  const std::filesystem::path temporary = path.string() + ".writing";
  {
    std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
    out << DictionaryCsv(rows);
    if (!out.flush()) return Status::Input(temporary.string() + ": cannot be written");
  }
  std::error_code error;
  std::filesystem::rename(temporary, path, error);
  if (error) return Status::Input(path.string() + ": cannot be replaced (" + error.message() + ")");
  return Status::Ok();
}

}  // namespace medload
