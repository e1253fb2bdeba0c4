// An output file written whole or not at all: the content goes to a temporary file in
// the target's folder and replaces the target (rename) only when complete, so that a
// killed or failed run leaves the previous file, never a truncated one. It also sets who
// may read the file and refuses patient-level output into another user's file. It does
// not decide which outputs are patient-level: the callers do.
#pragma once

#include <memory>
#include <ostream>
#include <string>
#include <string_view>

#include "medload/core/status.h"
#include "medload/format/private_file.h"

namespace medload {

class OutputFile {
 public:
  // Prepares to write `path`. A regular file (or a path that does not exist yet) is
  // written to a temporary file ".NAME.medload-XXXXXX" beside it: mode 0600 for
  // kOwnerOnly, else 0666 less the umask. A symbolic link is followed to its target. A
  // path that is not a regular file (a terminal, /dev/null, a pipe) is written in place.
  // Fails with Input naming the path when it is a folder, when its folder is missing or
  // cannot be written, or, for kOwnerOnly, when the file exists and belongs to another
  // user (so that patient-level data never lands in a file someone else owns).
  static Result<OutputFile> Open(const std::string& path, FileAccess access);

  OutputFile(OutputFile&& other) noexcept;
  OutputFile& operator=(OutputFile&& other) noexcept;
  OutputFile(const OutputFile&) = delete;
  OutputFile& operator=(const OutputFile&) = delete;
  // Removes the temporary file unless Commit succeeded.
  ~OutputFile();

  // Where the content goes until Commit or Discard.
  std::ostream& stream();
  // Bytes written to stream() so far.
  size_t bytes_written() const;
  // Writes out what is buffered, syncs it to the disk and puts the file in place of the
  // target. Fails with Input naming the path when a write failed (a full disk); the
  // target is then left as it was.
  Status Commit();
  // Drops what was written: the target is left as it was.
  void Discard();

 private:
  struct State;
  explicit OutputFile(std::unique_ptr<State> state);
  std::unique_ptr<State> state_;
};

// Writes `content` to `path` whole, through OutputFile.
Status WriteWholeFile(const std::string& path, std::string_view content, FileAccess access);

// Fails with Input when `path` exists and belongs to another user than the one running:
// "PATH: belongs to another user (uid N); medload writes patient-level data only into
// files and folders of its own user". Ok when it does not exist.
Status CheckOwnedByUser(const std::string& path);

}  // namespace medload
