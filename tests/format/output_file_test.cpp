#include "medload/format/output_file.h"

#include <doctest/doctest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <filesystem>

#include "cli/medload_process.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

namespace fs = std::filesystem;

mode_t ModeOf(const std::string& path) {
  struct stat info {};
  REQUIRE(::stat(path.c_str(), &info) == 0);
  return info.st_mode & 07777;
}

// The names in `folder` other than those listed.
std::vector<std::string> Leftovers(const TempFolder& folder, const std::vector<std::string>& expected) {
  std::vector<std::string> names;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder.File(""))) {
    const std::string name = entry.path().filename().string();
    if (std::find(expected.begin(), expected.end(), name) == expected.end()) names.push_back(name);
  }
  return names;
}

class UmaskScope {
 public:
  explicit UmaskScope(mode_t mask) : old_(::umask(mask)) {}
  ~UmaskScope() { ::umask(old_); }
  UmaskScope(const UmaskScope&) = delete;
  UmaskScope& operator=(const UmaskScope&) = delete;

 private:
  mode_t old_;
};

}  // namespace

TEST_SUITE("format/output_file") {

TEST_CASE("the target holds the old content until the commit, then the new content whole") {
  TempFolder folder;
  const std::string path = folder.Write("worklist.csv", "old\n");
  Result<OutputFile> file = OutputFile::Open(path, FileAccess::kOwnerOnly);
  REQUIRE(file.ok());
  file->stream() << std::string(200000, 'x') << "\n";
  CHECK(ReadWholeFile(path) == "old\n");
  CHECK(file->bytes_written() == 200001);
  REQUIRE(file->Commit().ok());
  CHECK(ReadWholeFile(path) == std::string(200000, 'x') + "\n");
  CHECK(Leftovers(folder, {"worklist.csv"}).empty());
}

TEST_CASE("an output dropped before its commit leaves the old file and no temporary file") {
  TempFolder folder;
  const std::string path = folder.Write("worklist.csv", "old\n");
  {
    Result<OutputFile> file = OutputFile::Open(path, FileAccess::kOwnerOnly);
    REQUIRE(file.ok());
    file->stream() << "half of a worklist";
  }
  CHECK(ReadWholeFile(path) == "old\n");
  Result<OutputFile> discarded = OutputFile::Open(path, FileAccess::kShared);
  REQUIRE(discarded.ok());
  discarded->stream() << "another";
  discarded->Discard();
  CHECK(ReadWholeFile(path) == "old\n");
  CHECK(Leftovers(folder, {"worklist.csv"}).empty());
  // A new file that is never committed does not appear at all.
  { REQUIRE(OutputFile::Open(folder.File("new.csv"), FileAccess::kOwnerOnly).ok()); }
  CHECK_FALSE(fs::exists(folder.File("new.csv")));
}

TEST_CASE("owner-only outputs are 0600 and shared ones follow the umask, new or replaced") {
  TempFolder folder;
  for (const mode_t mask : {mode_t{0}, mode_t{022}, mode_t{077}}) {
    CAPTURE(mask);
    UmaskScope scope(mask);
    const std::string mine = folder.Write("mine-" + std::to_string(mask), "old");
    REQUIRE(::chmod(mine.c_str(), 0666) == 0);
    REQUIRE(WriteWholeFile(mine, "new", FileAccess::kOwnerOnly).ok());
    CHECK(ModeOf(mine) == 0600);
    const std::string shared = folder.File("shared-" + std::to_string(mask));
    REQUIRE(WriteWholeFile(shared, "new", FileAccess::kShared).ok());
    CHECK(ModeOf(shared) == (0666 & ~mask));
  }
}

TEST_CASE("a device is written in place and a write it refuses is a fault") {
  CHECK(WriteWholeFile("/dev/null", "anything", FileAccess::kOwnerOnly).ok());
  const Status full = WriteWholeFile("/dev/full", std::string(100000, 'x'), FileAccess::kOwnerOnly);
  CHECK(full.code() == StatusCode::kInput);
  CHECK(full.message() == "/dev/full: writing failed; the file was left as it was (No space left on device)");
}

TEST_CASE("a folder, a missing folder and another user's file are refused with the path named") {
  TempFolder folder;
  Result<OutputFile> dir = OutputFile::Open(folder.File(""), FileAccess::kShared);
  REQUIRE_FALSE(dir.ok());
  CHECK(dir.status().message() == folder.File("") + ": is a folder; name a file to write");
  Result<OutputFile> missing = OutputFile::Open(folder.File("no/such/file.csv"), FileAccess::kShared);
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.status().message().rfind(folder.File("no/such/file.csv") + ": cannot be written", 0) == 0);
  if (geteuid() != 0) {
    MESSAGE("skipped: only the superuser can give a file to another user");
    return;
  }
  const std::string theirs = folder.Write("theirs.csv", "theirs\n");
  REQUIRE(::chown(theirs.c_str(), 65534, 65534) == 0);
  Result<OutputFile> refused = OutputFile::Open(theirs, FileAccess::kOwnerOnly);
  REQUIRE_FALSE(refused.ok());
  CHECK(refused.status().message() ==
        theirs + ": belongs to another user (uid 65534); medload writes patient-level data only into files and "
                 "folders of its own user: remove it, or choose another path");
  CHECK(ReadWholeFile(theirs) == "theirs\n");
  CHECK(OutputFile::Open(theirs, FileAccess::kShared).ok());  // practice-level output
}

TEST_CASE("a symbolic link is followed to the file it names, which is replaced") {
  TempFolder folder;
  const std::string real = folder.Write("real.csv", "old");
  fs::create_symlink(real, folder.File("link.csv"));
  REQUIRE(WriteWholeFile(folder.File("link.csv"), "new", FileAccess::kOwnerOnly).ok());
  CHECK(fs::is_symlink(folder.File("link.csv")));
  CHECK(ReadWholeFile(real) == "new");
}

}  // TEST_SUITE

}  // namespace medload
