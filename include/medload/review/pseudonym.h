// Keyed pseudonyms for patient identifiers: HMAC-SHA-256 (RFC 2104, FIPS 180-4) under a
// secret key read from a file, so that the same key always gives the same pseudonym and
// only the key holder can link a pseudonym back to a patient. No identifier is stored.
#pragma once

#include <string>
#include <string_view>

#include "medload/core/status.h"

namespace medload {

class Pseudonymiser {
 public:
  // Reads the key from `path` (its bytes, a trailing newline removed). Refused with
  // Status::Input when the file is missing, not a regular file (a folder, device, FIFO or
  // socket: each named as such), shorter than 16 bytes, or readable or writable by the
  // group or others (it must be chmod 600 or stricter).
  static Result<Pseudonymiser> FromKeyFile(const std::string& path);
  // REQUIRES: a non-empty key (tests build one directly).
  explicit Pseudonymiser(std::string key) : key_(std::move(key)) {}

  // "PX" followed by the first 20 hex digits (80 bits) of HMAC-SHA-256(key, identifier).
  std::string Pseudonym(std::string_view identifier) const;

 private:
  std::string key_;
};

}  // namespace medload
