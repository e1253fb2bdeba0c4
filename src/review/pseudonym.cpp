#include "medload/review/pseudonym.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

#include "medload/core/hash.h"

namespace medload {
namespace {

// What a path that is not a regular file is, for the refusal.
std::string KindOf(mode_t mode) {
  if (S_ISDIR(mode)) return "a folder";
  if (S_ISFIFO(mode)) return "a named pipe (FIFO)";
  if (S_ISCHR(mode) || S_ISBLK(mode)) return "a device";
  if (S_ISSOCK(mode)) return "a socket";
  return "not a regular file";
}

}  // namespace

Result<Pseudonymiser> Pseudonymiser::FromKeyFile(const std::string& path) {
  // Opened before it is looked at, without blocking (a FIFO would wait for a writer), so
  // that the checks and the read are of the same file.
  const int fd = ::open(path.c_str(), O_RDONLY | O_NONBLOCK | O_CLOEXEC);
  if (fd < 0) {
    return Status::Input(path + ": the pseudonymisation key file cannot be opened (" + std::strerror(errno) +
                         "); give the path of a file holding the key");
  }
  struct stat info {};
  std::string key;
  std::string fault;
  if (::fstat(fd, &info) != 0 || !S_ISREG(info.st_mode)) {
    fault = "is " + KindOf(info.st_mode) + ", not a key file; give the path of a regular file holding the key";
  } else if ((info.st_mode & (S_IRWXG | S_IRWXO)) != 0) {
    fault = "the key file can be read or changed by others; run 'chmod 600 " + path + "'";
  } else {
    char buffer[4096];
    ssize_t got = 0;
    while ((got = ::read(fd, buffer, sizeof buffer)) > 0 && key.size() < (1U << 20)) {
      key.append(buffer, static_cast<size_t>(got));
    }
    if (got < 0) fault = std::string("the pseudonymisation key file cannot be read (") + std::strerror(errno) + ")";
  }
  ::close(fd);
  if (!fault.empty()) return Status::Input(path + ": " + fault);
  while (!key.empty() && (key.back() == '\n' || key.back() == '\r')) key.pop_back();
  if (key.size() < 16) return Status::Input(path + ": the key is shorter than 16 bytes; use a long random key");
  return Pseudonymiser(std::move(key));
}

std::string Pseudonymiser::Pseudonym(std::string_view identifier) const {
  return "PX" + HmacSha256Hex(key_, identifier).substr(0, 20);
}

}  // namespace medload
