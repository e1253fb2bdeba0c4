// Files that hold patient-level data (worklists, one patient's medicines, rejected rows,
// the store) are created readable and writable by their owner only (mode 0600), whatever
// the umask. It does not decide which outputs are patient-level: the callers do.
#pragma once

#include <string>

#include "medload/core/status.h"

namespace medload {

// Who may read a file medload writes.
enum class FileAccess {
  kShared,     // the process's umask decides (practice- and network-level outputs)
  kOwnerOnly,  // mode 0600 (patient-level outputs)
};

// Makes `path` ready to be opened for writing as an owner-only file: a missing file is
// created empty with mode 0600; an existing regular file keeps its content and has its
// mode narrowed to 0600. A path that is not a regular file (a terminal, /dev/null, a pipe)
// is left alone. Fails with Input naming the path when the file cannot be created (missing
// folder, no permission) or its mode cannot be changed.
Status PreparePrivateFile(const std::string& path);

// PreparePrivateFile for kOwnerOnly; nothing for kShared.
Status PrepareOutputFile(const std::string& path, FileAccess access);

}  // namespace medload
