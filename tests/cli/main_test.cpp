// The command line's handling of the store path and the --output file, as a process:
// missing, read-only and unwritable stores, and who may read what the commands write.
#include <doctest/doctest.h>
#include <sys/stat.h>

#include <filesystem>

#include "cli/medload_process.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

namespace fs = std::filesystem;

constexpr uid_t kNobody = 65534;

mode_t ModeOf(const std::string& path) {
  struct stat info {};
  REQUIRE(::stat(path.c_str(), &info) == 0);
  return info.st_mode & 0777;
}

// A store holding the import fixtures, in `folder`.
void ImportFixtures(const ProcessOptions& run) {
  for (const char* kind : {"practices", "patients", "dispensing", "reviews"}) {
    const ProcessResult result =
        RunMedload({"--quiet", "import", kind, std::string(MEDLOAD_TEST_DATA) + "/import/" + kind + ".csv",
                    "--max-reject-rate", "1"},
                   run);
    REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  }
}

// Permissions do not bind the superuser: as root, the command runs as nobody, in a
// folder that nobody may enter.
ProcessOptions Unprivileged(const TempFolder& folder) {
  ProcessOptions run = InFolder(folder.File(""));
  if (geteuid() == 0) {
    run.run_as = kNobody;
    ::chmod(folder.File("").c_str(), 0755);
  }
  return run;
}

const std::vector<std::vector<std::string>> kReadCommands = {
    {"review", "--on", "2024-01-31", "--at-least", "items=1"},
    {"meds", "WV-P0001", "--on", "2024-01-31"},
    {"cohort", "--on", "2024-01-31", "--at-least", "items=1"},
    {"timeline", "WV-P0001"},
    {"formulary", "unmatched"}};

}  // namespace

TEST_SUITE("cli/main") {

TEST_CASE("read commands on a store that does not exist fail with exit 2 naming it and create nothing") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  for (std::vector<std::string> args : kReadCommands) {
    CAPTURE(args[0]);
    args.insert(args.begin(), {"--db", "missing.db"});
    const ProcessResult result = RunMedload(args, run);
    CHECK(result.exit_code == 2);
    CHECK(result.err.find("no store at \"missing.db\"") != std::string::npos);
    CHECK_FALSE(fs::exists(folder.File("missing.db")));
    CHECK_FALSE(fs::exists(folder.File("missing.db-wal")));
  }
}

TEST_CASE("a read-only store file is read by the read commands, left unchanged, and refused for import") {
  TempFolder folder;
  ImportFixtures(InFolder(folder.File("")));
  const std::string db = folder.File("medload.db");
  REQUIRE(::chmod(db.c_str(), 0444) == 0);
  const auto size = fs::file_size(db);
  const ProcessOptions run = Unprivileged(folder);
  for (const std::vector<std::string>& args : kReadCommands) {
    CAPTURE(args[0]);
    const ProcessResult result = RunMedload(args, run);
    CHECK_MESSAGE(result.exit_code == 0, result.err);
    CHECK(result.out.find("CAUTION") != std::string::npos);
  }
  const ProcessResult import =
      RunMedload({"import", "dispensing", std::string(MEDLOAD_TEST_DATA) + "/import/dispensing.csv"}, run);
  CHECK(import.exit_code == 2);
  CHECK(import.err ==
        "medload: cannot write the store \"medload.db\": the file is read-only; run this command as a user who may "
        "write it, or give --db a store that can be written\n");
  CHECK(fs::file_size(db) == size);
  CHECK(ModeOf(db) == 0444);
}

TEST_CASE("a store in a folder that cannot be written is read by the read commands as written") {
  TempFolder folder;
  ImportFixtures(InFolder(folder.File("")));
  // What the commands give with the store writable, to compare with.
  std::vector<std::string> expected;
  for (const std::vector<std::string>& args : kReadCommands) {
    expected.push_back(RunMedload(args, InFolder(folder.File(""))).out);
  }
  const ProcessOptions run = Unprivileged(folder);
  if (run.run_as) REQUIRE(::chown(folder.File("medload.db").c_str(), kNobody, kNobody) == 0);
  // The store's -wal and -shm files cannot be made beside it.
  REQUIRE(::chmod(folder.File("").c_str(), 0555) == 0);
  const auto entries = std::distance(fs::directory_iterator(folder.File("")), fs::directory_iterator());
  for (size_t i = 0; i < kReadCommands.size(); ++i) {
    CAPTURE(kReadCommands[i][0]);
    const ProcessResult result = RunMedload(kReadCommands[i], run);
    CHECK_MESSAGE(result.exit_code == 0, result.err);
    CHECK(result.out == expected[i]);
  }
  REQUIRE(::chmod(folder.File("").c_str(), 0755) == 0);
  CHECK(std::distance(fs::directory_iterator(folder.File("")), fs::directory_iterator()) == entries);
}

TEST_CASE("read commands refuse a --db that is not a medload store, saying what it is") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  folder.Write("empty.db", "");
  folder.Write("notes.txt", "notes\n");
  for (const auto& [file, what] : std::vector<std::pair<std::string, std::string>>{
           {"empty.db", "is an empty file, not a medload store"},
           {"notes.txt", "is not a medload store: it is not a SQLite database"}}) {
    for (const std::vector<std::string>& command : kReadCommands) {
      const auto& store_file = file;  // clang 14 cannot capture a structured binding
      CAPTURE(store_file);
      CAPTURE(command[0]);
      std::vector<std::string> args = {"--db", file};
      args.insert(args.end(), command.begin(), command.end());
      const ProcessResult result = RunMedload(args, run);
      CHECK(result.exit_code == 2);
      CHECK(result.err.find("\"" + file + "\" " + what) != std::string::npos);
    }
  }
  CHECK(fs::file_size(folder.File("empty.db")) == 0);
}

TEST_CASE("store pack packs the histories once, and a read-only store then reads the packed copy") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  ImportFixtures(run);
  const ProcessResult first = RunMedload({"store", "pack"}, run);
  REQUIRE_MESSAGE(first.exit_code == 0, first.err);
  CHECK(first.out.rfind("medload.db: packed the histories of ", 0) == 0);
  const ProcessResult again = RunMedload({"store", "pack"}, run);
  CHECK(again.out.rfind("medload.db: the packed histories are already current\n", 0) == 0);
  const std::string expected = RunMedload(kReadCommands[0], run).out;
  REQUIRE(::chmod(folder.File("medload.db").c_str(), 0444) == 0);
  const ProcessResult read = RunMedload(kReadCommands[0], Unprivileged(folder));
  CHECK(read.exit_code == 0);
  CHECK(read.out == expected);
  CHECK(RunMedload({"--db", "missing.db", "store", "pack"}, run).exit_code == 2);
}

TEST_CASE("a store made by an import is readable by its owner only") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  const mode_t old_mask = ::umask(022);
  const ProcessResult result =
      RunMedload({"--quiet", "import", "practices", std::string(MEDLOAD_TEST_DATA) + "/import/practices.csv"}, run);
  ::umask(old_mask);
  REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  CHECK(ModeOf(folder.File("medload.db")) == 0600);
}

TEST_CASE("--output of a patient-level command is owner-only, of a practice-level one follows the umask") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  ImportFixtures(run);
  const mode_t old_mask = ::umask(022);
  const std::vector<std::pair<std::vector<std::string>, mode_t>> commands = {
      {{"meds", "WV-P0001", "--on", "2024-01-31", "--output", "meds.txt"}, 0600},
      {{"timeline", "WV-P0001", "--output", "timeline.txt"}, 0600},
      {{"review", "--on", "2024-01-31", "--at-least", "items=1", "--output", "review.txt"}, 0600},
      {{"cohort", "--on", "2024-01-31", "--at-least", "items=1", "--output", "cohort.txt"}, 0644}};
  for (const auto& [args, mode] : commands) {
    const auto& command_name = args[0];  // clang 14 cannot capture a structured binding
    CAPTURE(command_name);
    const ProcessResult result = RunMedload(args, run);
    CHECK_MESSAGE(result.exit_code == 0, result.err);
    CHECK(ModeOf(folder.File(args.back())) == mode);
  }
  // An existing file that others could read is narrowed when a worklist is written to it.
  folder.Write("old-review.txt", "old\n");
  REQUIRE(::chmod(folder.File("old-review.txt").c_str(), 0644) == 0);
  CHECK(RunMedload({"review", "--on", "2024-01-31", "--at-least", "items=1", "--output", "old-review.txt"}, run)
            .exit_code == 0);
  CHECK(ModeOf(folder.File("old-review.txt")) == 0600);
  ::umask(old_mask);
}

TEST_CASE("a command that fails before writing leaves --output as it was") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  folder.Write("review.txt", "last month's worklist\n");
  const ProcessResult result =
      RunMedload({"--db", "missing.db", "review", "--on", "2024-01-31", "--at-least", "items=1", "--output",
                  "review.txt"},
                 run);
  CHECK(result.exit_code == 2);
  CHECK(result.err.find("review.txt was left as it was") != std::string::npos);
  CHECK(ReadWholeFile(folder.File("review.txt")) == "last month's worklist\n");
  CHECK(std::distance(fs::directory_iterator(folder.File("")), fs::directory_iterator()) == 3);  // + .out, .err
}

TEST_CASE("patient-level output into another user's file is refused with exit 2 and the file kept") {
  if (geteuid() != 0) {
    MESSAGE("skipped: only the superuser can give a file to another user");
    return;
  }
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  ImportFixtures(run);
  for (const char* name : {"theirs.txt", "rejects.csv"}) {
    folder.Write(name, "theirs\n");
    REQUIRE(::chown(folder.File(name).c_str(), kNobody, kNobody) == 0);
  }
  const ProcessResult review =
      RunMedload({"review", "--on", "2024-01-31", "--at-least", "items=1", "--output", "theirs.txt"}, run);
  CHECK(review.exit_code == 2);
  CHECK(review.err.find("theirs.txt: belongs to another user (uid 65534)") != std::string::npos);
  const ProcessResult import = RunMedload({"import", "dispensing", std::string(MEDLOAD_TEST_DATA) + "/import/dispensing.csv",
                                           "--rejects", "rejects.csv"},
                                          run);
  CHECK(import.exit_code == 2);
  CHECK(import.err.find("rejects.csv: belongs to another user") != std::string::npos);
  for (const char* name : {"theirs.txt", "rejects.csv"}) {
    CAPTURE(name);
    CHECK(ReadWholeFile(folder.File(name)) == "theirs\n");
  }
  // Practice-level output is not refused.
  CHECK(RunMedload({"cohort", "--on", "2024-01-31", "--at-least", "items=1", "--output", "theirs.txt"}, run)
            .exit_code == 0);
}

TEST_CASE("control characters in a file name or identifier are shown escaped on the terminal") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  ImportFixtures(run);
  const ProcessResult missing = RunMedload({"import", "dispensing", "evil\x1b]0;owned\x07\r.csv"}, run);
  CHECK(missing.exit_code == 2);
  CHECK(missing.err.find('\x1b') == std::string::npos);
  CHECK(missing.err.find('\r') == std::string::npos);
  CHECK(missing.err.find("evil\\x1b]0;owned\\x07\\x0d.csv") != std::string::npos);
  const ProcessResult meds = RunMedload({"meds", "P\xE2\x80\xAE\x1b[2J", "--on", "2024-01-31"}, run);
  CHECK(meds.out.find('\x1b') == std::string::npos);
  CHECK(meds.err.find('\x1b') == std::string::npos);
  CHECK(meds.out.find("\xE2\x80\xAE") == std::string::npos);
  CHECK(meds.err.find("\xE2\x80\xAE") == std::string::npos);
}

}  // TEST_SUITE

}  // namespace medload
