// Commands killed while they write their outputs: `review --output`, `report --out` and
// `import --rejects`, each killed at seeded random points; every file must afterwards be
// the previous version or the new one, whole. Runs the real binary (MEDLOAD_BINARY).
#include <doctest/doctest.h>
#include <signal.h>

#include <algorithm>
#include <chrono>
#include <filesystem>
#include <functional>
#include <map>
#include <random>
#include <thread>

#include "cli/medload_process.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

namespace fs = std::filesystem;
using Clock = std::chrono::steady_clock;

struct KillFigures {
  int tries = 0;
  int landed = 0;  // the child was killed, rather than done before the signal
  int torn = 0;    // a file that is neither the previous version nor the new one
};

// Runs `args` `tries` times, each killed after a seeded random delay between 0.2 and 1.1
// times `span` (how long one unkilled run took: most kills land late, while the outputs
// are written); `torn()` says after each try whether a file is torn.
KillFigures KillRepeatedly(const std::function<std::vector<std::string>(int)>& args, const ProcessOptions& run,
                           Clock::duration span, int tries, unsigned seed, const std::function<bool()>& torn) {
  std::mt19937 random(seed);
  const auto span_us = std::chrono::duration_cast<std::chrono::microseconds>(span).count();
  std::uniform_int_distribution<long> delay_us(span_us * 2 / 10, span_us * 11 / 10);
  KillFigures figures;
  for (int i = 0; i < tries; ++i) {
    CAPTURE(i);
    const pid_t child = StartMedload(args(i), run);
    REQUIRE(child > 0);
    std::this_thread::sleep_for(std::chrono::microseconds(delay_us(random)));
    kill(child, SIGKILL);
    const ProcessResult result = WaitMedload(child, run);
    CHECK((result.signal == SIGKILL || result.exit_code == 0));
    ++figures.tries;
    figures.landed += result.signal == SIGKILL ? 1 : 0;
    figures.torn += torn() ? 1 : 0;
  }
  return figures;
}

// Loads the bundled invented network into FOLDER/medload.db.
void ImportDemo(const ProcessOptions& run) {
  for (const char* kind : {"practices", "patients", "dispensing", "reviews"}) {
    const ProcessResult result =
        RunMedload({"--quiet", "import", kind, std::string(MEDLOAD_SOURCE_DEMO) + "/" + kind + ".csv"}, run);
    REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  }
}

// Every regular file under `dir` (names relative to it) with its content, run.json without
// its generation time; hidden temporary files are left out.
std::map<std::string, std::string> FolderContents(const std::string& dir) {
  std::map<std::string, std::string> files;
  std::error_code error;
  for (const fs::directory_entry& entry : fs::recursive_directory_iterator(dir, error)) {
    if (!entry.is_regular_file() || entry.path().filename().string().front() == '.') continue;
    std::string content = ReadWholeFile(entry.path().string());
    if (entry.path().filename() == "run.json") {
      const size_t at = content.find("\"generated_at\"");
      if (at != std::string::npos) content.erase(at, content.find(',', at) - at);
    }
    files[fs::relative(entry.path(), dir).string()] = content;
  }
  return files;
}

void Report(const std::string& what, const KillFigures& figures) {
  MESSAGE(what << ": " << figures.tries << " tries, " << figures.landed << " kills landed, " << figures.torn
               << " files torn");
}

}  // namespace

TEST_SUITE("cli/killed_outputs") {

TEST_CASE("a review killed while it writes --output leaves the previous worklist or the new one, whole") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  ImportDemo(run);
  const std::vector<std::string> review = {"--quiet", "review", "--on", "2026-10-31", "--at-least", "items=1"};
  std::vector<std::string> args = review;
  args.insert(args.end(), {"--output", "reference.txt"});
  REQUIRE(RunMedload(args, run).exit_code == 0);  // the first review after an import packs the store
  const auto started = Clock::now();
  REQUIRE(RunMedload(args, run).exit_code == 0);
  const auto span = Clock::now() - started;
  const std::string reference = ReadWholeFile(folder.File("reference.txt"));
  REQUIRE(reference.size() > 100000);  // a long worklist: its writing takes a while
  const std::string previous = "last month's worklist\n";
  folder.Write("worklist.txt", previous);
  args = review;
  args.insert(args.end(), {"--output", "worklist.txt"});
  const KillFigures figures = KillRepeatedly([&](int) { return args; }, run, span, 10, 20240917, [&] {
    const std::string now = ReadWholeFile(folder.File("worklist.txt"));
    return now != previous && now != reference;
  });
  Report("review --output", figures);
  CHECK(figures.torn == 0);
}

TEST_CASE("a report killed while it writes leaves every file of its folder the previous or the new one, whole") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  ImportDemo(run);
  const std::string config = std::string(MEDLOAD_SOURCE_DEMO) + "/network.json";
  folder.Write("earlier.json", R"({"title":"Invented","network":"Wrenfold Vale Care Network","on":"2026-08-31",)"
                               R"("months":6,"criteria":["items>=10","acb>=3"]})");
  REQUIRE(RunMedload({"--quiet", "report", "--config", "earlier.json", "--out", "earlier"}, run).exit_code == 0);
  const auto started = Clock::now();
  REQUIRE(RunMedload({"--quiet", "report", "--config", config, "--out", "reference"}, run).exit_code == 0);
  const auto span = Clock::now() - started;
  const auto earlier = FolderContents(folder.File("earlier"));
  const auto reference = FolderContents(folder.File("reference"));
  REQUIRE(RunMedload({"--quiet", "report", "--config", "earlier.json", "--out", "out"}, run).exit_code == 0);
  const KillFigures figures = KillRepeatedly(
      [&](int) { return std::vector<std::string>{"--quiet", "report", "--config", config, "--out", "out"}; }, run,
      span, 10, 20240918, [&] {
        bool torn = false;
        for (const auto& [name, content] : FolderContents(folder.File("out"))) {
          const bool as_before = earlier.count(name) != 0 && earlier.at(name) == content;
          const bool as_new = reference.count(name) != 0 && reference.at(name) == content;
          if (!as_before && !as_new) {
            MESSAGE("torn: " << name);
            torn = true;
          }
        }
        return torn;
      });
  Report("report --out", figures);
  CHECK(figures.torn == 0);
}

TEST_CASE("an import killed while it writes --rejects leaves no rejects file that looks complete") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  std::string text = "record_id,patient_id,dispensed_on,product,quantity\n";
  for (int i = 0; i < 20000; ++i) {
    const bool bad = i % 50 == 7;  // 2% rejected, under the default rate
    text += "K" + std::to_string(i) + ",P" + std::to_string(i % 300) + "," + (bad ? "2024-02-30" : "2024-02-03") +
            ",Amlodipine 5mg tablets,28\n";
  }
  const std::string file = folder.Write("d.csv", text);
  const auto started = Clock::now();
  REQUIRE(RunMedload({"--quiet", "--db", "reference.db", "import", "dispensing", file, "--rejects", "reference.csv"}, run)
              .exit_code == 0);
  const auto span = Clock::now() - started;
  const std::string reference = ReadWholeFile(folder.File("reference.csv"));
  REQUIRE(std::count(reference.begin(), reference.end(), '\n') == 402);  // caution, header, 400 rows
  const std::string previous = "# an earlier run's rejects\n";
  folder.Write("rejects.csv", previous);
  const KillFigures figures = KillRepeatedly(
      [&](int i) {
        return std::vector<std::string>{"--quiet", "--db", "k" + std::to_string(i) + ".db", "import", "dispensing",
                                        file,      "--rejects", "rejects.csv"};
      },
      run, span, 10, 20240919, [&] {
        const std::string now = ReadWholeFile(folder.File("rejects.csv"));
        return now != previous && now != reference;
      });
  Report("import --rejects", figures);
  CHECK(figures.torn == 0);
}

}  // TEST_SUITE

}  // namespace medload
