// Writing the report folder safely: file names made from data (practice codes) are
// sanitised so they cannot leave the folder or collide, files are written only inside the
// output folder, never through a symbolic link, each whole or not at all, and the folder
// is private (docs/report.md, "Who may read the report folder"). It does not decide what
// the files hold.
#pragma once

#include <string>
#include <string_view>

#include "medload/core/status.h"

namespace medload {

// A file-name stem from `text`: ASCII letters, digits, '_' and '-' are kept, every other
// byte becomes '_'. When anything was replaced, "-" and the first 8 hex digits of the
// SHA-256 of `text` are appended, so that two different codes never give the same stem.
// Returns Status::Input naming the text when the result would be empty, "." or "..".
Result<std::string> SafeFileStem(std::string_view text);

// The report's output folder: private to the user running medload. Practice pages and
// worklists name patients, so the whole folder is: created with mode 0700 whatever the
// umask, every file in it 0600.
class ReportFolder {
 public:
  // Creates `path` and its missing parents (mode 0700) or opens it when it exists (an
  // existing folder keeps its mode: it may be the working folder). Fails with Input when
  // it exists and is not a folder, belongs to another user, or cannot be created.
  static Result<ReportFolder> Open(const std::string& path);

  const std::string& path() const { return path_; }

  // Creates the sub-folder `name` (one level, no separators) with mode 0700. Refused with
  // Input when it exists as a symbolic link, a file, or a folder of another user.
  Status MakeSubfolder(std::string_view name) const;
  // Writes `content` to `relative` ("index.html", "digests/WV001.eml") with mode 0600,
  // through a temporary file that replaces the previous file only once complete
  // (OutputFile). Refused with Input when `relative` is absolute, contains "..", or the
  // file or its folder is a symbolic link or belongs to another user.
  Status WriteFile(std::string_view relative, std::string_view content) const;
  // Removes the regular files in sub-folder `name` whose names end in `suffix` (stale
  // digests from an earlier run), so a re-run leaves exactly this run's files.
  Status RemoveFiles(std::string_view name, std::string_view suffix) const;

 private:
  explicit ReportFolder(std::string path) : path_(std::move(path)) {}
  std::string path_;
};

}  // namespace medload
