#include "medload/report/report_files.h"

#include <doctest/doctest.h>
#include <sys/stat.h>

#include <filesystem>
#include <fstream>

#include "store/temp_folder.h"

namespace medload {

TEST_SUITE("report/report_files") {

TEST_CASE("a practice code of safe characters is its own file name") {
  auto stem = SafeFileStem("WV001_a-b");
  REQUIRE(stem.ok());
  CHECK(*stem == "WV001_a-b");
}

TEST_CASE("unsafe characters are replaced and a hash suffix keeps different codes apart") {
  auto slash = SafeFileStem("A/B");
  auto space = SafeFileStem("A B");
  REQUIRE(slash.ok());
  REQUIRE(space.ok());
  CHECK(slash->rfind("A_B-", 0) == 0);
  CHECK(slash->size() == 4 + 8);
  CHECK(*slash != *space);
  auto climb = SafeFileStem("../../etc/passwd");
  REQUIRE(climb.ok());
  CHECK(climb->find('/') == std::string::npos);
  CHECK(climb->find("..") == std::string::npos);
  auto plain_underscore = SafeFileStem("A_B");
  REQUIRE(plain_underscore.ok());
  CHECK(*plain_underscore != *slash);  // "A_B" as given and "A/B" sanitised do not collide
}

TEST_CASE("an empty code cannot be a file name") {
  auto stem = SafeFileStem("");
  REQUIRE_FALSE(stem.ok());
  CHECK(stem.status().message() == "\"\" cannot be used as a file name");
}

TEST_CASE("files are written inside the folder and paths that leave it are refused") {
  TempFolder temp;
  auto folder = ReportFolder::Open(temp.File("out/nested"));
  REQUIRE(folder.ok());
  REQUIRE(folder->MakeSubfolder("digests").ok());
  CHECK(folder->WriteFile("digests/a.eml", "hello").ok());
  std::ifstream in(temp.File("out/nested/digests/a.eml"));
  std::string text;
  std::getline(in, text);
  CHECK(text == "hello");
  CHECK_FALSE(folder->WriteFile("../escape.txt", "x").ok());
  CHECK_FALSE(folder->WriteFile("/tmp/escape.txt", "x").ok());
  CHECK_FALSE(folder->WriteFile("digests/../../x", "x").ok());
  CHECK_FALSE(std::filesystem::exists(temp.File("out/escape.txt")));
}

TEST_CASE("a symbolic link inside the folder is never written through") {
  TempFolder temp;
  std::filesystem::create_directories(temp.File("elsewhere"));
  std::filesystem::create_directories(temp.File("out"));
  std::filesystem::create_directory_symlink(temp.File("elsewhere"), temp.File("out/digests"));
  std::filesystem::create_symlink(temp.File("elsewhere/target.html"), temp.File("out/index.html"));
  auto folder = ReportFolder::Open(temp.File("out"));
  REQUIRE(folder.ok());
  CHECK_FALSE(folder->MakeSubfolder("digests").ok());
  CHECK_FALSE(folder->WriteFile("digests/a.eml", "x").ok());
  const Status status = folder->WriteFile("index.html", "x");
  REQUIRE_FALSE(status.ok());
  CHECK(status.message().find("symbolic link") != std::string::npos);
  CHECK_FALSE(std::filesystem::exists(temp.File("elsewhere/a.eml")));
  CHECK_FALSE(std::filesystem::exists(temp.File("elsewhere/target.html")));
}

TEST_CASE("stale files of one suffix are removed from a sub-folder, others kept") {
  TempFolder temp;
  auto folder = ReportFolder::Open(temp.File("out"));
  REQUIRE(folder.ok());
  REQUIRE(folder->MakeSubfolder("digests").ok());
  REQUIRE(folder->WriteFile("digests/old.eml", "x").ok());
  REQUIRE(folder->WriteFile("digests/notes.txt", "x").ok());
  REQUIRE(folder->RemoveFiles("digests", ".eml").ok());
  CHECK_FALSE(std::filesystem::exists(temp.File("out/digests/old.eml")));
  CHECK(std::filesystem::exists(temp.File("out/digests/notes.txt")));
}

TEST_CASE("folders the report creates and every file it writes are owner-only; an existing folder keeps its mode") {
  TempFolder temp;
  std::filesystem::create_directories(temp.File("shared"));
  std::filesystem::permissions(temp.File("shared"), std::filesystem::perms(0755), std::filesystem::perm_options::replace);
  const mode_t old_mask = ::umask(0);  // the widest umask: the modes must not come from it
  auto folder = ReportFolder::Open(temp.File("shared/2026/09"));
  REQUIRE(folder.ok());
  REQUIRE(folder->MakeSubfolder("digests").ok());
  REQUIRE(folder->WriteFile("index.html", "x").ok());
  REQUIRE(folder->WriteFile("digests/A1.eml", "x").ok());
  ::umask(old_mask);
  auto mode = [](const std::string& path) {
    return std::filesystem::status(path).permissions() & std::filesystem::perms::all;
  };
  using std::filesystem::perms;
  CHECK(mode(temp.File("shared")) == perms(0755));
  CHECK(mode(temp.File("shared/2026")) == perms(0700));
  CHECK(mode(temp.File("shared/2026/09")) == perms(0700));
  CHECK(mode(temp.File("shared/2026/09/digests")) == perms(0700));
  CHECK(mode(temp.File("shared/2026/09/index.html")) == perms(0600));
  CHECK(mode(temp.File("shared/2026/09/digests/A1.eml")) == perms(0600));
}

TEST_CASE("an output path that is a file is refused") {
  TempFolder temp;
  const std::string file = temp.Write("plain.txt", "x");
  auto folder = ReportFolder::Open(file);
  REQUIRE_FALSE(folder.ok());
  CHECK(folder.status().message() == file + ": exists and is not a folder");
}

}

}  // namespace medload
