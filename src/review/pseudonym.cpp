#include "medload/review/pseudonym.h"

#include <sys/stat.h>

#include <fstream>
#include <sstream>

#include "medload/core/hash.h"

namespace medload {

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
