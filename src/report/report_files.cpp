#include "medload/report/report_files.h"

#include <sys/stat.h>

#include <cerrno>
#include <cstring>
#include <filesystem>

#include "medload/core/hash.h"
#include "medload/format/output_file.h"

namespace medload {
namespace fs = std::filesystem;
namespace {

bool IsSafeByte(char c) {
  return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || (c >= '0' && c <= '9') || c == '_' ||
         c == '-';
}

bool IsSymlink(const fs::path& path) {
  std::error_code error;
  return fs::is_symlink(fs::symlink_status(path, error));
}

// True when `relative` is a plain relative path without "..", "." or empty parts.
bool IsPlainRelative(std::string_view relative) {
  if (relative.empty() || relative.front() == '/') return false;
  const fs::path path{std::string(relative)};
  for (const fs::path& part : path) {
    if (part == ".." || part == "." || part.empty()) return false;
  }
  return true;
}

}  // namespace

Result<std::string> SafeFileStem(std::string_view text) {
  std::string stem;
  bool changed = false;
  for (const char c : text) {
    stem += IsSafeByte(c) ? c : '_';
    changed = changed || !IsSafeByte(c);
  }
  if (changed) stem += "-" + Sha256Hex(text).substr(0, 8);
  if (stem.empty() || stem == "." || stem == "..") {
    return Status::Input("\"" + std::string(text) + "\" cannot be used as a file name");
  }
  return stem;
}

namespace {

// Creates the folder `path` with mode exactly 0700, or checks the one that is there: a
// folder (not a link to one when `no_link`) of this user.
Status PrivateFolder(const fs::path& path, bool no_link) {
  const std::string shown = path.string();
  if (no_link && IsSymlink(path)) return Status::Input(shown + ": is a symbolic link; refusing to write through it");
  std::error_code error;
  if (fs::exists(path, error)) {
    if (!fs::is_directory(path, error)) return Status::Input(shown + ": exists and is not a folder");
    return CheckOwnedByUser(shown);
  }
  if (::mkdir(shown.c_str(), 0700) != 0 && errno != EEXIST) {
    return Status::Input(shown + ": cannot be created (" + std::strerror(errno) + ")");
  }
  if (::chmod(shown.c_str(), 0700) != 0) {  // exactly 0700, whatever the umask
    return Status::Input(shown + ": cannot be made private (" + std::strerror(errno) + ")");
  }
  return CheckOwnedByUser(shown);
}

}  // namespace

Result<ReportFolder> ReportFolder::Open(const std::string& path) {
  std::error_code error;
  if (path.empty()) return Status::Usage("the report folder has no name (an empty path)");
  const fs::path folder(path);
  // Missing parents are private too ("out/2026/09": "out" and "2026" are made 0700).
  fs::path step;
  for (const fs::path& part : folder.lexically_normal().parent_path()) {
    step /= part;
    if (fs::exists(step, error)) continue;
    if (Status made = PrivateFolder(step, false); !made.ok()) return made;
  }
  // The folder the user named may be a link the user made: followed (not `no_link`).
  if (Status status = PrivateFolder(folder, false); !status.ok()) return status;
  return ReportFolder(path);
}

Status ReportFolder::MakeSubfolder(std::string_view name) const {
  if (!IsPlainRelative(name) || name.find('/') != std::string_view::npos) {
    return Status::Input("\"" + std::string(name) + "\" is not a plain folder name");
  }
  return PrivateFolder(fs::path(path_) / std::string(name), true);
}

Status ReportFolder::WriteFile(std::string_view relative, std::string_view content) const {
  if (!IsPlainRelative(relative)) {
    return Status::Input("\"" + std::string(relative) + "\" is not a file name inside the report folder");
  }
  const fs::path target = fs::path(path_) / std::string(relative);
  fs::path step = fs::path(path_);
  for (const fs::path& part : fs::path(std::string(relative))) {
    step /= part;
    if (IsSymlink(step)) {
      return Status::Input(step.string() + ": is a symbolic link; refusing to write through it");
    }
  }
  return WriteWholeFile(target.string(), content, FileAccess::kOwnerOnly);
}

Status ReportFolder::RemoveFiles(std::string_view name, std::string_view suffix) const {
  const fs::path sub = fs::path(path_) / std::string(name);
  std::error_code error;
  if (IsSymlink(sub) || !fs::is_directory(sub, error)) return Status::Ok();
  for (const fs::directory_entry& entry : fs::directory_iterator(sub, error)) {
    const std::string file = entry.path().filename().string();
    if (!entry.is_regular_file(error) || IsSymlink(entry.path())) continue;
    if (file.size() >= suffix.size() && file.compare(file.size() - suffix.size(), suffix.size(), suffix) == 0) {
      fs::remove(entry.path(), error);
    }
  }
  return Status::Ok();
}

}  // namespace medload
