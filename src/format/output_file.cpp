// Outputs written through a temporary file and a rename: POSIX rename() replaces the
// target in one step, so a reader (or a later run) sees the old file or the new one,
// never part of one.
#include "medload/format/output_file.h"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <array>
#include <cerrno>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <streambuf>

namespace medload {
namespace {

namespace fs = std::filesystem;

Status Fault(const std::string& path, std::string_view what) {
  return Status::Input(path + ": " + std::string(what) + " (" + std::strerror(errno) + ")");
}

mode_t CurrentUmask() {
  const mode_t mask = ::umask(0);
  ::umask(mask);
  return mask;
}

// A stream buffer writing to a file descriptor, which it does not own.
class FdBuffer : public std::streambuf {
 public:
  explicit FdBuffer(int fd) : fd_(fd) { setp(buffer_.data(), buffer_.data() + buffer_.size()); }
  bool failed() const { return failed_; }
  size_t written() const { return written_ + static_cast<size_t>(pptr() - pbase()); }

 protected:
  int_type overflow(int_type ch) override {
    if (!Drain()) return traits_type::eof();
    if (!traits_type::eq_int_type(ch, traits_type::eof())) {
      *pptr() = traits_type::to_char_type(ch);
      pbump(1);
    }
    return traits_type::not_eof(ch);
  }
  int sync() override { return Drain() ? 0 : -1; }

 private:
  bool Drain() {
    const char* data = pbase();
    auto size = static_cast<size_t>(pptr() - pbase());
    while (size > 0 && !failed_) {
      const ssize_t done = ::write(fd_, data, size);
      if (done < 0 && errno == EINTR) continue;
      if (done <= 0) {
        failed_ = true;
        break;
      }
      data += done;
      size -= static_cast<size_t>(done);
      written_ += static_cast<size_t>(done);
    }
    setp(buffer_.data(), buffer_.data() + buffer_.size());
    return !failed_;
  }

  int fd_;
  bool failed_ = false;
  size_t written_ = 0;
  std::array<char, 64 * 1024> buffer_{};
};

// The file a path names: the target of a symbolic link, else the path itself.
std::string TargetOf(const std::string& path) {
  struct stat link {};
  if (::lstat(path.c_str(), &link) != 0 || !S_ISLNK(link.st_mode)) return path;
  std::error_code error;
  const fs::path target = fs::weakly_canonical(path, error);
  return error ? path : target.string();
}

}  // namespace

struct OutputFile::State {
  State(std::string shown_path, std::string target_path, std::string temp_path, int descriptor)
      : shown(std::move(shown_path)),
        target(std::move(target_path)),
        temp(std::move(temp_path)),
        fd(descriptor),
        buffer(descriptor),
        stream(&buffer) {}
  ~State() {
    if (fd >= 0) ::close(fd);
    if (!committed && !temp.empty()) ::unlink(temp.c_str());
  }
  State(const State&) = delete;
  State& operator=(const State&) = delete;

  std::string shown;   // the path as the caller named it, for messages
  std::string target;  // where the file goes
  std::string temp;    // the temporary file; empty when written in place
  int fd;
  FdBuffer buffer;
  std::ostream stream;
  bool committed = false;
};

Status CheckOwnedByUser(const std::string& path) {
  struct stat info {};
  if (::stat(path.c_str(), &info) != 0) return Status::Ok();
  if (info.st_uid == ::geteuid()) return Status::Ok();
  return Status::Input(path + ": belongs to another user (uid " + std::to_string(info.st_uid) +
                       "); medload writes patient-level data only into files and folders of its own "
                       "user: remove it, or choose another path");
}

Result<OutputFile> OutputFile::Open(const std::string& path, FileAccess access) {
  const std::string target = TargetOf(path);
  struct stat info {};
  if (::stat(target.c_str(), &info) == 0) {
    if (S_ISDIR(info.st_mode)) return Status::Input(path + ": is a folder; name a file to write");
    if (!S_ISREG(info.st_mode)) {  // a terminal, a device, a pipe: written as it is
      const int fd = ::open(target.c_str(), O_WRONLY | O_CLOEXEC | O_NOCTTY);
      if (fd < 0) return Fault(path, "cannot be written");
      return OutputFile(std::make_unique<State>(path, target, "", fd));
    }
    if (access == FileAccess::kOwnerOnly) {
      if (Status owned = CheckOwnedByUser(target); !owned.ok()) return owned;
    }
  } else if (errno != ENOENT) {
    return Fault(path, "cannot be written");
  }
  fs::path folder = fs::path(target).parent_path();
  if (folder.empty()) folder = ".";
  std::string temp = (folder / ("." + fs::path(target).filename().string() + ".medload-XXXXXX")).string();
  const int fd = ::mkostemp(temp.data(), O_CLOEXEC);  // created with mode 0600
  if (fd < 0) return Fault(path, "cannot be written (does its folder exist, and may it be written?)");
  auto state = std::make_unique<State>(path, target, temp, fd);
  const mode_t mode = access == FileAccess::kOwnerOnly ? mode_t{0600} : (0666 & ~CurrentUmask());
  if (::fchmod(fd, mode) != 0) return Fault(path, "cannot set the file's permissions");
  return OutputFile(std::move(state));
}

OutputFile::OutputFile(std::unique_ptr<State> state) : state_(std::move(state)) {}
OutputFile::OutputFile(OutputFile&& other) noexcept = default;
OutputFile& OutputFile::operator=(OutputFile&& other) noexcept = default;
OutputFile::~OutputFile() = default;

std::ostream& OutputFile::stream() { return state_->stream; }

size_t OutputFile::bytes_written() const { return state_->buffer.written(); }

Status OutputFile::Commit() {
  State& state = *state_;
  state.stream.flush();
  if (!state.stream || state.buffer.failed()) {
    return Fault(state.shown, "writing failed; the file was left as it was");
  }
  if (state.temp.empty()) {
    state.committed = true;
    return Status::Ok();
  }
  // Synced before the rename, so that after a power cut the name holds the old content
  // or the new, not an empty file.
  if (::fsync(state.fd) != 0) return Fault(state.shown, "writing failed; the file was left as it was");
  ::close(state.fd);
  state.fd = -1;
  if (::rename(state.temp.c_str(), state.target.c_str()) != 0) {
    return Fault(state.shown, "cannot be replaced; the file was left as it was");
  }
  state.committed = true;
  return Status::Ok();
}

void OutputFile::Discard() { state_.reset(); }

Status WriteWholeFile(const std::string& path, std::string_view content, FileAccess access) {
  Result<OutputFile> file = OutputFile::Open(path, access);
  if (!file.ok()) return file.status();
  file->stream().write(content.data(), static_cast<std::streamsize>(content.size()));
  return file->Commit();
}

}  // namespace medload
