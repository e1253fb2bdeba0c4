// SHA-256 digests as lower-case hexadecimal text: the formulary checksum, file-name
// suffixes and the keyed pseudonyms (HMAC-SHA-256). OpenSSL's libcrypto does the work;
// this header keeps it out of every caller. It does not manage keys.
#pragma once

#include <string>
#include <string_view>

namespace medload {

// The SHA-256 digest of `data` as 64 lower-case hex digits; empty if libcrypto fails.
std::string Sha256Hex(std::string_view data);

// The HMAC-SHA-256 of `message` under `key` as 64 lower-case hex digits (RFC 2104).
std::string HmacSha256Hex(std::string_view key, std::string_view message);

}  // namespace medload
