// `medload demo` as a process: who may read the files it writes.
#include <doctest/doctest.h>
#include <sys/stat.h>

#include <filesystem>

#include "cli/medload_process.h"
#include "store/temp_folder.h"

namespace medload {

TEST_SUITE("cli/cmd_demo") {

TEST_CASE("the demo's folder is private like a report folder: 0700, every file 0600") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const mode_t old_mask = ::umask(0);
  const ProcessResult result = RunMedload({"--quiet", "demo", "--out", "demo"}, run);
  ::umask(old_mask);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  const std::pair<const char*, mode_t> files[] = {{"demo", 0700},
                                                  {"demo/digests", 0700},
                                                  {"demo/network-worklist.csv", 0600},
                                                  {"demo/network-worklist.html", 0600},
                                                  {"demo/cohort.csv", 0600},
                                                  {"demo/index.html", 0600},
                                                  {"demo", 0700},
                                                  {"demo/digests", 0700}};
  for (const auto& [name, mode] : files) {
    const auto& file_name = name;  // clang 14 cannot capture a structured binding
    CAPTURE(file_name);
    struct stat info {};
    REQUIRE(::stat(folder.File(name).c_str(), &info) == 0);
    CHECK((info.st_mode & 0777) == mode);
  }
}

TEST_CASE("the demo does not write its network worklist through a symbolic link") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  std::filesystem::create_directories(folder.File("demo"));
  std::filesystem::create_symlink(folder.File("stolen.csv"), folder.File("demo/network-worklist.csv"));
  const ProcessResult result = RunMedload({"--quiet", "demo", "--out", "demo"}, run);
  CHECK(result.exit_code == 2);
  CHECK(result.err.find("network-worklist.csv: is a symbolic link; refusing to write through it") != std::string::npos);
  CHECK_FALSE(std::filesystem::exists(folder.File("stolen.csv")));
}

}  // TEST_SUITE

}  // namespace medload
