#include "medload/review/pseudonym.h"

#include <doctest/doctest.h>
#include <sys/stat.h>

#include <cstdio>
#include <filesystem>
#include <fstream>

namespace medload {

TEST_SUITE("review/pseudonym") {

TEST_CASE("the same key gives the same pseudonym and another key another one") {
  const Pseudonymiser a("a-long-secret-key-for-tests");
  const Pseudonymiser b("another-long-secret-key-here");
  CHECK(a.Pseudonym("Q1234567") == a.Pseudonym("Q1234567"));
  CHECK(a.Pseudonym("Q1234567") != a.Pseudonym("Q1234568"));
  CHECK(a.Pseudonym("Q1234567") != b.Pseudonym("Q1234567"));
  CHECK(a.Pseudonym("Q1234567").size() == 22);
  CHECK(a.Pseudonym("Q1234567").find("1234567") == std::string::npos);
}

TEST_CASE("a key file readable by others is refused") {
  const auto path = std::filesystem::temp_directory_path() / "medload_pseudonym_key_test";
  { std::ofstream(path) << "0123456789abcdef0123456789abcdef\n"; }
  ::chmod(path.c_str(), 0644);
  auto open = Pseudonymiser::FromKeyFile(path.string());
  REQUIRE_FALSE(open.ok());
  CHECK(open.status().message() == path.string() + ": the key file can be read or changed by others; run 'chmod 600 " +
                                       path.string() + "'");
  ::chmod(path.c_str(), 0600);
  auto ok = Pseudonymiser::FromKeyFile(path.string());
  REQUIRE(ok.ok());
  CHECK(ok->Pseudonym("x") == Pseudonymiser("0123456789abcdef0123456789abcdef").Pseudonym("x"));
  std::filesystem::remove(path);
  CHECK_FALSE(Pseudonymiser::FromKeyFile(path.string()).ok());
}

TEST_CASE("a folder, a device or a named pipe given as the key file is refused as what it is") {
  const auto folder = std::filesystem::temp_directory_path() / "medload_pseudonym_key_folder";
  std::filesystem::create_directories(folder);
  ::chmod(folder.c_str(), 0700);
  const auto fifo = std::filesystem::temp_directory_path() / "medload_pseudonym_key_fifo";
  std::filesystem::remove(fifo);
  REQUIRE(::mkfifo(fifo.c_str(), 0600) == 0);
  const struct {
    std::string path;
    std::string kind;
  } cases[] = {{folder.string(), "a folder"}, {"/dev/null", "a device"}, {fifo.string(), "a named pipe (FIFO)"}};
  for (const auto& c : cases) {
    CAPTURE(c.path);
    auto open = Pseudonymiser::FromKeyFile(c.path);  // a FIFO without a writer must not block
    REQUIRE_FALSE(open.ok());
    CHECK(open.status().code() == StatusCode::kInput);
    CHECK(open.status().message() ==
          c.path + ": is " + c.kind + ", not a key file; give the path of a regular file holding the key");
  }
  std::filesystem::remove(folder);
  std::filesystem::remove(fifo);
  auto missing = Pseudonymiser::FromKeyFile(folder.string());
  REQUIRE_FALSE(missing.ok());
  CHECK(missing.status().message() == folder.string() +
                                          ": the pseudonymisation key file cannot be opened (No such file or "
                                          "directory); give the path of a file holding the key");
}

}  // TEST_SUITE

}  // namespace medload
