#include "medload/store/practice_codes.h"

#include <algorithm>
#include <set>

#include "medload/core/text.h"
#include "store/sqlite.h"

namespace medload {
namespace {

std::string AsciiLower(std::string text) {
  for (char& c : text) {
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  }
  return text;
}

// Adds the first column of every row of `sql` to `codes`.
Status CollectCodes(sqlite3* db, const char* sql, std::set<std::string>& codes) {
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  for (;;) {
    Result<bool> row = stmt->Step();
    if (!row.ok()) return row.status();
    if (!*row) return Status::Ok();
    codes.emplace(stmt->ColumnText(0));
  }
}

bool AllKnown(const std::vector<std::string>& codes, const std::vector<std::string>& known) {
  return std::all_of(codes.begin(), codes.end(),
                     [&](const std::string& code) { return std::binary_search(known.begin(), known.end(), code); });
}

}  // namespace

// A Store member: it lives here beside the check that is its only user.
Result<std::vector<std::string>> Store::PracticeCodes(bool with_dispensings) const {
  std::set<std::string> codes;
  // A shard's store also knows the practices named by the dispensings it left to others.
  for (const char* sql : {"SELECT practice FROM practices WHERE practice <> ''",
                          "SELECT DISTINCT practice FROM patients WHERE practice <> ''",
                          "SELECT practice FROM other_shard_coverage WHERE practice <> ''"}) {
    if (Status status = CollectCodes(db_, sql, codes); !status.ok()) return status;
  }
  if (with_dispensings) {
    Status status = CollectCodes(db_, "SELECT DISTINCT practice FROM dispensings WHERE practice <> ''", codes);
    if (!status.ok()) return status;
  }
  return std::vector<std::string>(codes.begin(), codes.end());
}

std::string UnknownPracticeMessage(const std::string& code, const std::vector<std::string>& known) {
  std::string message = "practice \"" + code + "\" is not in the store";
  for (const std::string& candidate : known) {
    if (candidate != code && AsciiLower(candidate) == AsciiLower(code)) {
      message += "; codes are case-sensitive: did you mean \"" + candidate + "\"?";
      break;
    }
  }
  if (known.empty()) return message + " (it knows no practice: import practices or patients first)";
  std::vector<std::string> shown(known.begin(), known.begin() + static_cast<long>(std::min(known.size(), kShownPracticeCodes)));
  std::string list = Join(shown, ", ");
  if (known.size() > shown.size()) list += " and " + std::to_string(known.size() - shown.size()) + " more";
  return message + " (known: " + list + ")";
}

Status CheckPracticeCodes(const Store& store, const std::vector<std::string>& codes) {
  if (codes.empty()) return Status::Ok();
  auto known = store.PracticeCodes(false);
  if (!known.ok()) return known.status();
  if (AllKnown(codes, *known)) return Status::Ok();
  known = store.PracticeCodes(true);
  if (!known.ok()) return known.status();
  for (const std::string& code : codes) {
    if (!std::binary_search(known->begin(), known->end(), code)) return Status::Input(UnknownPracticeMessage(code, *known));
  }
  return Status::Ok();
}

}  // namespace medload
