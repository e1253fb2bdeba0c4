#include "medload/report/report_files.h"


#include <filesystem>
#include <fstream>

#include "medload/core/hash.h"

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

// Creates folder `path` with mode 0700 (exactly: the umask is not applied).
std::error_code MakeOwnerOnlyFolder(const fs::path& path) {
  std::error_code error;
  fs::create_directory(path, error);
  if (!error) fs::permissions(path, fs::perms::owner_all, fs::perm_options::replace, error);
  return error;
}

// Creates `path` and its missing parents, each with mode 0700.
std::error_code MakeOwnerOnlyFolders(const fs::path& path) {
  std::error_code error;
  fs::path step;
  for (const fs::path& part : path) {
    step /= part;
    if (fs::exists(step, error)) continue;
    if (std::error_code made = MakeOwnerOnlyFolder(step)) return made;
  }
  return error;
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

Result<ReportFolder> ReportFolder::Open(const std::string& path) {
  std::error_code error;
  if (path.empty()) return Status::Usage("the report folder has no name (an empty path)");
  if (fs::exists(path, error) && !fs::is_directory(path, error)) {
    return Status::Input(path + ": exists and is not a folder");
  }
  error = MakeOwnerOnlyFolders(fs::path(path).lexically_normal());
  if (error) return Status::Input(path + ": cannot be created (" + error.message() + ")");
  return ReportFolder(path);
}

Status ReportFolder::MakeSubfolder(std::string_view name) const {
  if (!IsPlainRelative(name) || name.find('/') != std::string_view::npos) {
    return Status::Input("\"" + std::string(name) + "\" is not a plain folder name");
  }
  const fs::path sub = fs::path(path_) / std::string(name);
  if (IsSymlink(sub)) return Status::Input(sub.string() + ": is a symbolic link; refusing to write through it");
  std::error_code error;
  if (fs::exists(sub, error) && !fs::is_directory(sub, error)) {
    return Status::Input(sub.string() + ": exists and is not a folder");
  }
  if (!fs::exists(sub, error)) error = MakeOwnerOnlyFolder(sub);
  if (error) return Status::Input(sub.string() + ": cannot be created (" + error.message() + ")");
  return Status::Ok();
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
  if (Status status = PreparePrivateFile(target.string()); !status.ok()) return status;
  std::ofstream out(target, std::ios::binary | std::ios::trunc);
  out.write(content.data(), static_cast<std::streamsize>(content.size()));
  out.close();
  if (!out) return Status::Input(target.string() + ": cannot be written");
  return Status::Ok();
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
