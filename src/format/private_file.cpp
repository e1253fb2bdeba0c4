#include "medload/format/private_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>

namespace medload {
namespace {

constexpr mode_t kOwnerReadWrite = S_IRUSR | S_IWUSR;

Status Fault(const std::string& path, std::string_view what) {
  return Status::Input(path + ": " + std::string(what) + " (" + std::strerror(errno) + ")");
}

}  // namespace

Status PreparePrivateFile(const std::string& path) {
  // O_EXCL: the file is created here with the narrow mode, so it is never readable by
  // others, not even for a moment. When it already exists the mode is narrowed instead.
  const int fd = ::open(path.c_str(), O_WRONLY | O_CREAT | O_EXCL | O_CLOEXEC, kOwnerReadWrite);
  if (fd >= 0) {
    // The umask can only take bits away; fchmod makes the mode exactly 0600 all the same.
    const bool narrowed = ::fchmod(fd, kOwnerReadWrite) == 0;
    ::close(fd);
    return narrowed ? Status::Ok() : Fault(path, "cannot make the file private");
  }
  if (errno != EEXIST) return Fault(path, "cannot be created");
  struct stat info {};
  if (::stat(path.c_str(), &info) != 0) return Fault(path, "cannot be created");
  if (!S_ISREG(info.st_mode)) return Status::Ok();
  if ((info.st_mode & 07777) == kOwnerReadWrite) return Status::Ok();
  if (::chmod(path.c_str(), kOwnerReadWrite) != 0) return Fault(path, "cannot make the file private");
  return Status::Ok();
}

Status PrepareOutputFile(const std::string& path, FileAccess access) {
  return access == FileAccess::kOwnerOnly ? PreparePrivateFile(path) : Status::Ok();
}

}  // namespace medload
