// Subjects given by identifier are never taken as patient ids: an identifier value or a
// urn becomes a patient_id only when a Patient resource declares it, or when it is itself
// the id of a registry row (HL7 FHIR R4 references.html: Reference.identifier is a
// logical reference, which the reader must resolve; it is not a literal id).
#include "store/fhir_import.h"

#include <optional>
#include <string>
#include <vector>

#include "store/control_characters.h"

namespace medload {
namespace {

// Dispenses held back for the end of the file at most; beyond, a dispense is settled
// against what is loaded when it is read.
constexpr size_t kMaxPending = 100000;

// The system under which an entry's fullUrl, or any URI, is an identifier (FHIR R4
// Identifier.system for a URI: urn:ietf:rfc:3986).
constexpr std::string_view kUriSystem = "urn:ietf:rfc:3986";

enum class Lookup { kFound, kNotYet, kAmbiguous, kUnknown };

// The store's tables of Patient identifiers and Medication resources, read and written.
class FhirLinks {
 public:
  Status Prepare(sqlite3* db, long run_id);
  // Stores the identifiers of a Patient; true when any was new.
  Result<bool> WriteIdentifiers(const std::string& patient_id, const std::vector<FhirIdentifier>& identifiers);
  Result<WriteOutcome> WriteMedication(const FhirMedicationRecord& medication);
  // Sets item.dispense.patient_id when found. `final`: the file has ended (or too many
  // wait), so that the registry's ids are consulted and "not yet" becomes "unknown".
  Result<Lookup> FindSubject(FhirItem& item, bool final, std::string& others);
  // Replaces the product and code by the Medication's when found.
  Result<Lookup> FindMedication(FhirItem& item, bool final);

 private:
  Result<Lookup> ByIdentifier(std::string_view system, std::string_view value, std::string& patient_id,
                              std::string& others);
  Result<bool> InRegistry(std::string_view patient_id);

  sqlite3* db_ = nullptr;
  long run_id_ = 0;
  Statement insert_identifier_;
  Statement find_identifier_;
  Statement in_registry_;
  Statement select_medication_;
  Statement upsert_medication_;
};

Status FhirLinks::Prepare(sqlite3* db, long run_id) {
  db_ = db;
  run_id_ = run_id;
  const std::pair<Statement*, const char*> statements[] = {
      {&insert_identifier_,
       "INSERT INTO patient_identifiers (system, value, patient_id, run_id) VALUES (?1, ?2, ?3, ?4)"
       " ON CONFLICT DO NOTHING"},
      {&find_identifier_,
       "SELECT DISTINCT patient_id FROM patient_identifiers WHERE value = ?1 AND (?2 = '' OR system = ?2)"
       " ORDER BY patient_id LIMIT 2"},
      {&in_registry_, "SELECT 1 FROM patients WHERE patient_id = ?1"},
      {&select_medication_, "SELECT product, code, code_system FROM fhir_medications WHERE medication_id = ?1"},
      {&upsert_medication_,
       "INSERT INTO fhir_medications (medication_id, product, code, code_system, run_id)"
       " VALUES (?1, ?2, ?3, ?4, ?5) ON CONFLICT (medication_id) DO UPDATE SET product = excluded.product,"
       " code = excluded.code, code_system = excluded.code_system, run_id = excluded.run_id"},
  };
  for (const auto& [statement, sql] : statements) {
    Result<Statement> prepared = Statement::Prepare(db, sql);
    if (!prepared.ok()) return prepared.status();
    *statement = std::move(prepared.value());
  }
  return Status::Ok();
}

Result<bool> FhirLinks::WriteIdentifiers(const std::string& patient_id,
                                         const std::vector<FhirIdentifier>& identifiers) {
  bool any = false;
  for (const FhirIdentifier& identifier : identifiers) {
    insert_identifier_.BindText(1, identifier.system);
    insert_identifier_.BindText(2, identifier.value);
    insert_identifier_.BindText(3, patient_id);
    insert_identifier_.BindInt(4, run_id_);
    if (Status status = insert_identifier_.Run(); !status.ok()) return status;
    any = any || ChangedRows(db_) == 1;
  }
  return any;
}

Result<WriteOutcome> FhirLinks::WriteMedication(const FhirMedicationRecord& medication) {
  select_medication_.BindText(1, medication.id);
  Result<bool> found = select_medication_.Step();
  if (!found.ok()) return found.status();
  const bool same = *found && select_medication_.ColumnText(0) == medication.product &&
                    select_medication_.ColumnText(1) == medication.code &&
                    select_medication_.ColumnText(2) == medication.code_system;
  const bool existed = *found;
  select_medication_.Reset();
  if (same) return WriteOutcome::kDuplicate;
  upsert_medication_.BindText(1, medication.id);
  upsert_medication_.BindText(2, medication.product);
  upsert_medication_.BindText(3, medication.code);
  upsert_medication_.BindText(4, medication.code_system);
  upsert_medication_.BindInt(5, run_id_);
  if (Status status = upsert_medication_.Run(); !status.ok()) return status;
  return existed ? WriteOutcome::kUpdated : WriteOutcome::kImported;
}

Result<bool> FhirLinks::InRegistry(std::string_view patient_id) {
  in_registry_.BindText(1, patient_id);
  Result<bool> found = in_registry_.Step();
  in_registry_.Reset();
  return found;
}

// The Patient declaring (system, value); an empty system matches any. `others` names a
// second patient when two declare it.
Result<Lookup> FhirLinks::ByIdentifier(std::string_view system, std::string_view value,
                                       std::string& patient_id, std::string& others) {
  find_identifier_.BindText(1, value);
  find_identifier_.BindText(2, system);
  std::vector<std::string> found;
  for (;;) {
    Result<bool> row = find_identifier_.Step();
    if (!row.ok()) {
      find_identifier_.Reset();
      return row.status();
    }
    if (!*row) break;
    found.emplace_back(find_identifier_.ColumnText(0));
  }
  find_identifier_.Reset();
  if (found.empty()) return Lookup::kNotYet;
  if (found.size() > 1) {
    others = QuoteForMessage(found[0]) + " and " + QuoteForMessage(found[1]);
    return Lookup::kAmbiguous;
  }
  patient_id = found[0];
  return Lookup::kFound;
}

Result<Lookup> FhirLinks::FindSubject(FhirItem& item, bool final, std::string& others) {
  if (item.subject.form == SubjectForm::kLiteral) return Lookup::kFound;
  const bool urn = item.subject.form == SubjectForm::kUrn;
  std::string& patient_id = item.dispense.patient_id;
  Result<Lookup> declared =
      ByIdentifier(urn ? kUriSystem : std::string_view(item.subject.system), item.subject.value, patient_id, others);
  if (!declared.ok() || *declared != Lookup::kNotYet || !final) return declared;
  // The registry's own ids: the identifier value (or the urn's UUID) as a patient_id.
  const std::string candidate = urn ? item.subject.value.substr(9) : item.subject.value;
  Result<bool> registered = InRegistry(candidate);
  if (!registered.ok()) return registered.status();
  if (!*registered) return Lookup::kUnknown;
  patient_id = candidate;
  return Lookup::kFound;
}

Result<Lookup> FhirLinks::FindMedication(FhirItem& item, bool final) {
  if (item.medication_reference.empty()) return Lookup::kFound;
  select_medication_.BindText(1, item.medication_reference);
  Result<bool> found = select_medication_.Step();
  if (!found.ok() || !*found) {
    select_medication_.Reset();
    if (!found.ok()) return found.status();
    if (!final) return Lookup::kNotYet;
    return item.dispense.product.empty() ? Lookup::kUnknown : Lookup::kFound;  // the display
  }
  item.dispense.product.assign(select_medication_.ColumnText(0));
  item.dispense.code.assign(select_medication_.ColumnText(1));
  item.dispense.code_system.assign(select_medication_.ColumnText(2));
  select_medication_.Reset();
  return Lookup::kFound;
}

// A dispense waiting for the end of the file, with its own copy of the line.
struct Pending {
  FhirItem item;
  std::string text;
};

std::string SubjectNamed(const FhirSubject& subject) {
  if (subject.form == SubjectForm::kUrn) return QuoteForMessage(subject.value);
  return "system " + QuoteForMessage(subject.system) + " value " + QuoteForMessage(subject.value);
}

std::string_view SubjectPointer(const FhirSubject& subject) {
  return subject.form == SubjectForm::kUrn ? "/subject/reference" : "/subject/identifier";
}

class FhirImport {
 public:
  FhirImport(InputKind kind, sqlite3* db, WriteSource source, RowSink& sink, ImportSummary& summary)
      : kind_(kind), db_(db), source_(source), sink_(sink), summary_(summary) {}

  Status Prepare() {
    if (Status status = dispensings_.Prepare(db_, source_); !status.ok()) return status;
    if (Status status = patients_.Prepare(db_, source_); !status.ok()) return status;
    return links_.Prepare(db_, source_.run_id);
  }

  Status Add(FhirItem& item);
  // Settles every dispense still waiting.
  Status Finish();

 private:
  Status Reject(const FhirItem& item, std::string_view text, std::string reason, std::string_view pointer,
                std::string_view fault) {
    return sink_.Reject(item.line, RowFault{std::move(reason), FaultMessage(summary_.file, item.line, pointer, fault)},
                        text);
  }
  Status AddPatient(const FhirItem& item);
  Status AddMedication(const FhirItem& item);
  Status Settle(FhirItem& item, std::string_view text, bool final);

  InputKind kind_;
  sqlite3* db_;
  WriteSource source_;
  RowSink& sink_;
  ImportSummary& summary_;
  DispensingWriter dispensings_;
  PatientWriter patients_;
  FhirLinks links_;
  std::vector<Pending> pending_;
};

Status FhirImport::AddPatient(const FhirItem& item) {
  if (kind_ == InputKind::kDispensing) ++summary_.patients;
  Result<WriteOutcome> outcome = patients_.Write(item.patient);
  if (!outcome.ok()) return outcome.status();
  Result<bool> new_identifier = links_.WriteIdentifiers(item.patient.patient_id, item.identifiers);
  if (!new_identifier.ok()) return new_identifier.status();
  sink_.Count(*outcome == WriteOutcome::kDuplicate && *new_identifier ? WriteOutcome::kUpdated : *outcome);
  return Status::Ok();
}

Status FhirImport::AddMedication(const FhirItem& item) {
  ++summary_.medications;
  Result<WriteOutcome> outcome = links_.WriteMedication(item.medication);
  if (!outcome.ok()) return outcome.status();
  sink_.Count(*outcome);
  return Status::Ok();
}

// Stores the dispense, rejects it, or (not `final`) holds it back while its patient or
// medication may still come.
Status FhirImport::Settle(FhirItem& item, std::string_view text, bool final) {
  std::string others;
  Result<Lookup> subject = links_.FindSubject(item, final, others);
  if (!subject.ok()) return subject.status();
  Result<Lookup> medication = links_.FindMedication(item, final);
  if (!medication.ok()) return medication.status();
  if (*subject == Lookup::kNotYet || *medication == Lookup::kNotYet) {
    if (pending_.size() >= kMaxPending) return Settle(item, text, true);
    pending_.push_back(Pending{item, std::string(text)});
    pending_.back().item.text = {};
    return Status::Ok();
  }
  const FhirSubject& named = item.subject;
  if (*subject == Lookup::kAmbiguous) {
    return Reject(item, text, "ambiguous_subject", SubjectPointer(named),
                  SubjectNamed(named) + " is an identifier of more than one Patient (" + others + ")");
  }
  if (*subject == Lookup::kUnknown) {
    return Reject(item, text, "unknown_subject", SubjectPointer(named),
                  SubjectNamed(named) + " names no Patient loaded (in this file or before) and no patient_id"
                                        " of the registry");
  }
  if (*medication == Lookup::kUnknown) {
    return Reject(item, text, "unknown_medication", "/medicationReference/reference",
                  QuoteForMessage("Medication/" + item.medication_reference) +
                      " names no Medication loaded (in this file or before), and there is no display");
  }
  Result<WriteOutcome> outcome = dispensings_.Write(item.dispense, item.line, true);
  if (!outcome.ok()) return outcome.status();
  if (*outcome != WriteOutcome::kDuplicate && !StatusCounts(item.dispense.status)) {
    ++summary_.not_counted[item.dispense.status];
  }
  return sink_.CountDispensing(item.dispense, item.line, *outcome);
}

Status FhirImport::Add(FhirItem& item) {
  if (item.kind != FhirItemKind::kRejected) {
    if (std::optional<RowFault> fault = ControlCharacterFault(summary_.file, item.line, item.text, true)) {
      item.kind = FhirItemKind::kRejected;
      item.fault = std::move(*fault);
    }
  }
  if (kind_ != InputKind::kDispensing &&
      (item.kind == FhirItemKind::kDispense || item.kind == FhirItemKind::kMedication)) {
    const std::string type = item.kind == FhirItemKind::kDispense ? "MedicationDispense" : "Medication";
    item.kind = FhirItemKind::kRejected;
    item.fault = {"unsupported_resource",
                  FaultMessage(summary_.file, item.line, "/resourceType",
                               type + " in a patients import (use 'import dispensing')")};
  }
  switch (item.kind) {
    case FhirItemKind::kRejected: return sink_.Reject(item.line, item.fault, item.text);
    case FhirItemKind::kPatient: return AddPatient(item);
    case FhirItemKind::kMedication: return AddMedication(item);
    case FhirItemKind::kDispense: return Settle(item, item.text, false);
  }
  return Status::Ok();
}

Status FhirImport::Finish() {
  std::vector<Pending> waiting = std::move(pending_);
  pending_.clear();
  for (Pending& pending : waiting) {
    if (Status status = Settle(pending.item, pending.text, true); !status.ok()) return status;
  }
  return Status::Ok();
}

}  // namespace

Status ImportFhirItems(InputKind kind, FhirReader& reader, sqlite3* db, WriteSource source, RowSink& sink,
                       ImportSummary& summary) {
  FhirImport import(kind, db, source, sink, summary);
  if (Status status = import.Prepare(); !status.ok()) return status;
  FhirItem item;
  while (reader.Next(item)) {
    sink.Tick();
    if (Status status = import.Add(item); !status.ok()) return status;
  }
  return import.Finish();
}

}  // namespace medload
