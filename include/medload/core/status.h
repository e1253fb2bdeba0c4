// Status and Result<T>: expected failures (a bad row, a missing file, a bad table) as
// values. Exceptions are for programming errors only; adapters catch library exceptions
// and return a Status with context. A code says what kind of failure it is; the command
// line, not the library, decides the exit code for it.
#pragma once

#include <string>
#include <utility>
#include <variant>

namespace medload {

// What kind of failure (src/cli/main.cpp maps each to an exit code).
enum class StatusCode {
  kOk,
  kUsage,     // a bad option, argument or setting
  kInput,     // a file missing, unreadable or malformed; a bad config or table
  kRejected,  // too many rows rejected: the import was rolled back
};

class [[nodiscard]] Status {
 public:
  Status() = default;
  static Status Ok() { return Status(); }
  static Status Usage(std::string message) { return Status(StatusCode::kUsage, std::move(message)); }
  static Status Input(std::string message) { return Status(StatusCode::kInput, std::move(message)); }
  static Status Rejected(std::string message) {
    return Status(StatusCode::kRejected, std::move(message));
  }

  bool ok() const { return code_ == StatusCode::kOk; }
  StatusCode code() const { return code_; }
  const std::string& message() const { return message_; }

 private:
  Status(StatusCode code, std::string message) : code_(code), message_(std::move(message)) {}
  StatusCode code_ = StatusCode::kOk;
  std::string message_;
};

// A value or the Status that explains why there is none.
// REQUIRES: the Status given on failure is not ok().
template <typename T>
class [[nodiscard]] Result {
 public:
  Result(T value) : data_(std::move(value)) {}            // NOLINT: implicit by design
  Result(Status status) : data_(std::move(status)) {}     // NOLINT: implicit by design

  bool ok() const { return std::holds_alternative<T>(data_); }
  const Status& status() const {
    static const Status kOkStatus;
    return ok() ? kOkStatus : std::get<Status>(data_);
  }
  // REQUIRES: ok().
  T& value() & { return std::get<T>(data_); }
  const T& value() const& { return std::get<T>(data_); }
  T&& value() && { return std::get<T>(std::move(data_)); }
  T* operator->() { return &value(); }
  const T* operator->() const { return &value(); }
  T& operator*() & { return value(); }
  const T& operator*() const& { return value(); }

 private:
  std::variant<T, Status> data_;
};

}  // namespace medload
