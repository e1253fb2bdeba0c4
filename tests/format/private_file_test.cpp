#include "medload/format/private_file.h"

#include <doctest/doctest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <fstream>

#include "store/temp_folder.h"

namespace medload {
namespace {

mode_t ModeOf(const std::string& path) {
  struct stat info {};
  REQUIRE(::stat(path.c_str(), &info) == 0);
  return info.st_mode & 07777;
}

// Sets the umask for one test and puts the old one back.
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

TEST_SUITE("format/private_file") {

TEST_CASE("a new private file is created owner-only whatever the umask") {
  TempFolder folder;
  for (const mode_t mask : {mode_t{0}, mode_t{022}, mode_t{077}}) {
    CAPTURE(mask);
    UmaskScope scope(mask);
    const std::string path = folder.File("worklist-" + std::to_string(mask) + ".csv");
    REQUIRE(PreparePrivateFile(path).ok());
    CHECK(ModeOf(path) == 0600);
  }
}

TEST_CASE("an existing file keeps its content and is narrowed to owner-only") {
  TempFolder folder;
  const std::string path = folder.Write("meds.csv", "kept\n");
  REQUIRE(::chmod(path.c_str(), 0666) == 0);
  REQUIRE(PreparePrivateFile(path).ok());
  CHECK(ModeOf(path) == 0600);
  std::ifstream in(path);
  std::string line;
  std::getline(in, line);
  CHECK(line == "kept");
}

TEST_CASE("a path that is not a regular file is left as it is") {
  const mode_t before = ModeOf("/dev/null");
  CHECK(PreparePrivateFile("/dev/null").ok());
  CHECK(ModeOf("/dev/null") == before);
}

TEST_CASE("a file in a missing folder is an input error naming the path") {
  TempFolder folder;
  const std::string path = folder.File("no-such-folder/out.csv");
  const Status status = PreparePrivateFile(path);
  REQUIRE_FALSE(status.ok());
  CHECK(status.code() == StatusCode::kInput);
  CHECK(status.message() == path + ": cannot be created (No such file or directory)");
}

TEST_CASE("shared access leaves the file to the umask") {
  TempFolder folder;
  UmaskScope scope(022);
  const std::string path = folder.File("cohort.csv");
  REQUIRE(PrepareOutputFile(path, FileAccess::kShared).ok());
  CHECK(::access(path.c_str(), F_OK) != 0);  // nothing created: the writer creates it
  REQUIRE(PrepareOutputFile(path, FileAccess::kOwnerOnly).ok());
  CHECK(ModeOf(path) == 0600);
}

}  // TEST_SUITE

}  // namespace medload
