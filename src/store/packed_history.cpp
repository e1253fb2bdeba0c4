#include "store/packed_history.h"

#include <cstdint>
#include <cstring>
#include <unordered_map>

namespace medload {
namespace {

// The first byte of every packed history; a later layout takes another (2: the unit of
// the structured dose).
constexpr char kLayout = 2;

// Flags of one record.
constexpr uint8_t kHasDaysSupply = 1;
constexpr uint8_t kHasStructuredUnits = 2;
constexpr uint8_t kStructuredAsNeeded = 4;

void PutVarint(std::string& out, uint64_t value) {
  while (value >= 0x80) {
    out.push_back(static_cast<char>(static_cast<uint8_t>(value) | 0x80));
    value >>= 7;
  }
  out.push_back(static_cast<char>(value));
}

template <typename T>
void PutFixed(std::string& out, T value) {
  char bytes[sizeof(T)];
  std::memcpy(bytes, &value, sizeof(T));
  out.append(bytes, sizeof(T));
}

// Numbers the distinct strings of one history in first-seen order.
class StringTable {
 public:
  uint64_t IndexOf(const std::string& text) {
    auto [it, inserted] = index_.try_emplace(text, strings_.size());
    if (inserted) strings_.push_back(&text);
    return it->second;
  }
  const std::vector<const std::string*>& strings() const { return strings_; }

 private:
  std::unordered_map<std::string_view, uint64_t> index_;
  std::vector<const std::string*> strings_;
};

// Reads the packed bytes front to back; any read past the end or out of range sets
// `failed` and yields zeros, so that one check at the end covers them all.
class Reader {
 public:
  explicit Reader(std::string_view bytes) : bytes_(bytes) {}

  uint64_t Varint() {
    uint64_t value = 0;
    for (int shift = 0; shift < 64; shift += 7) {
      if (at_ >= bytes_.size()) break;
      const auto byte = static_cast<uint8_t>(bytes_[at_++]);
      value |= static_cast<uint64_t>(byte & 0x7f) << shift;
      if ((byte & 0x80) == 0) return value;
    }
    failed = true;
    return 0;
  }

  std::string_view Bytes(uint64_t length) {
    if (length > bytes_.size() - at_) {
      failed = true;
      return {};
    }
    const std::string_view bytes = bytes_.substr(at_, length);
    at_ += length;
    return bytes;
  }

  template <typename T>
  T Fixed() {
    T value{};
    const std::string_view bytes = Bytes(sizeof(T));
    if (!failed) std::memcpy(&value, bytes.data(), sizeof(T));
    return value;
  }

  bool AtEnd() const { return at_ == bytes_.size(); }

  bool failed = false;

 private:
  std::string_view bytes_;
  size_t at_ = 0;
};

}  // namespace

std::string PackHistory(std::span<const DispensingRecord> records) {
  StringTable table;
  std::string body;
  for (const DispensingRecord& record : records) {
    PutVarint(body, record.record_id.size());
    body += record.record_id;
    PutFixed<int32_t>(body, record.dispensed_on.days());
    PutFixed<double>(body, record.quantity);
    uint8_t flags = 0;
    if (record.days_supply) flags |= kHasDaysSupply;
    if (record.structured_units_per_day) flags |= kHasStructuredUnits;
    if (record.structured_as_needed) flags |= kStructuredAsNeeded;
    body.push_back(static_cast<char>(flags));
    if (record.days_supply) PutVarint(body, static_cast<uint32_t>(*record.days_supply));
    if (record.structured_units_per_day) PutFixed<double>(body, *record.structured_units_per_day);
    for (const std::string* field : {&record.practice, &record.product, &record.code,
                                     &record.code_system, &record.unit, &record.dosage,
                                     &record.status, &record.structured_unit}) {
      PutVarint(body, table.IndexOf(*field));
    }
  }
  std::string packed(1, kLayout);
  PutVarint(packed, table.strings().size());
  for (const std::string* text : table.strings()) {
    PutVarint(packed, text->size());
    packed += *text;
  }
  PutVarint(packed, records.size());
  packed += body;
  return packed;
}

Status UnpackHistory(std::string_view packed, std::string_view patient_id,
                     std::vector<DispensingRecord>& into, std::vector<DispensingRecord>& spare) {
  const auto damaged = [&] {
    return Status::Input("store: the packed history of patient \"" + std::string(patient_id) +
                         "\" is damaged; delete the store's packed_histories_state row to have"
                         " every history packed again from the dispensings");
  };
  if (packed.empty() || packed[0] != kLayout) return damaged();
  Reader reader(packed.substr(1));
  const uint64_t string_count = reader.Varint();
  if (string_count > packed.size()) return damaged();
  std::vector<std::string_view> strings;
  strings.reserve(string_count);
  for (uint64_t i = 0; i < string_count && !reader.failed; ++i) {
    strings.push_back(reader.Bytes(reader.Varint()));
  }
  const uint64_t count = reader.Varint();
  if (reader.failed || count > packed.size()) return damaged();
  const auto text = [&](std::string& field) {
    const uint64_t index = reader.Varint();
    if (index >= strings.size()) {
      reader.failed = true;
      return;
    }
    field.assign(strings[index]);
  };
  while (into.size() > count) {
    spare.push_back(std::move(into.back()));
    into.pop_back();
  }
  into.reserve(count);
  while (into.size() < count) {
    if (spare.empty()) {
      into.emplace_back();
    } else {
      into.push_back(std::move(spare.back()));
      spare.pop_back();
    }
  }
  for (DispensingRecord& record : into) {
    record.record_id.assign(reader.Bytes(reader.Varint()));
    record.patient_id.assign(patient_id);
    record.dispensed_on = Date::FromDays(reader.Fixed<int32_t>());
    record.quantity = reader.Fixed<double>();
    const auto flags = reader.Fixed<uint8_t>();
    record.days_supply.reset();
    if ((flags & kHasDaysSupply) != 0) record.days_supply = static_cast<int>(reader.Varint());
    record.structured_units_per_day.reset();
    if ((flags & kHasStructuredUnits) != 0) record.structured_units_per_day = reader.Fixed<double>();
    record.structured_as_needed = (flags & kStructuredAsNeeded) != 0;
    text(record.practice);
    text(record.product);
    text(record.code);
    text(record.code_system);
    text(record.unit);
    text(record.dosage);
    text(record.status);
    text(record.structured_unit);
    if (reader.failed) return damaged();
  }
  if (!reader.AtEnd()) return damaged();
  return Status::Ok();
}

}  // namespace medload
