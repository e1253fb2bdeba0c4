#include "medload/review/pseudonym.h"

#include <openssl/evp.h>
#include <openssl/hmac.h>
#include <sys/stat.h>

#include <fstream>
#include <sstream>

namespace medload {

std::string HmacSha256Hex(std::string_view key, std::string_view message) {
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int length = 0;
  HMAC(EVP_sha256(), key.data(), static_cast<int>(key.size()),
       reinterpret_cast<const unsigned char*>(message.data()), message.size(), digest, &length);
  static constexpr char kHex[] = "0123456789abcdef";
  std::string hex;
  for (unsigned int i = 0; i < length; ++i) {
    hex += kHex[digest[i] >> 4];
    hex += kHex[digest[i] & 0xF];
  }
  return hex;
}

Result<Pseudonymiser> Pseudonymiser::FromKeyFile(const std::string& path) {
  struct stat info {};
  if (::stat(path.c_str(), &info) != 0) return Status::Input(path + ": the pseudonymisation key file cannot be read");
  if ((info.st_mode & (S_IRWXG | S_IRWXO)) != 0) {
    return Status::Input(path + ": the key file can be read or changed by others; run 'chmod 600 " + path + "'");
  }
  std::ifstream in(path, std::ios::binary);
  std::ostringstream content;
  content << in.rdbuf();
  std::string key = content.str();
  while (!key.empty() && (key.back() == '\n' || key.back() == '\r')) key.pop_back();
  if (!in && !in.eof()) return Status::Input(path + ": the pseudonymisation key file cannot be read");
  if (key.size() < 16) return Status::Input(path + ": the key is shorter than 16 bytes; use a long random key");
  return Pseudonymiser(std::move(key));
}

std::string Pseudonymiser::Pseudonym(std::string_view identifier) const {
  return "PX" + HmacSha256Hex(key_, identifier).substr(0, 20);
}

}  // namespace medload
