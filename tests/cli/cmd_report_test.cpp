// Hostile names and privacy across the commands that write files for others to read: the
// report folder, and the HTML and CSV outputs of meds, review, timeline and cohort. Runs
// the real binary (MEDLOAD_BINARY) on a small invented network whose identifiers, names
// and products carry markup, formula cells and path parts.
#include <doctest/doctest.h>
#include <sys/stat.h>

#include <filesystem>

#include "cli/medload_process.h"
#include "cli/output_checks.h"
#include "format/csv_checks.h"
#include "medload/core/caution.h"
#include "store/temp_folder.h"

namespace medload {
namespace {

namespace fs = std::filesystem;

// Patient identifiers chosen to be found easily if they leak into an output.
const std::vector<std::string> kPatients = {"=HYPERLINK(1)", "<script>alert(1)</script>", "ZQ7001",
                                            "@ZQ7002", "ZQ7003/../x"};

// A store with two practices ("../up" and "+X2" as codes) whose patients all take
// enough medicines to be on every worklist, and a report config for it.
void BuildNetwork(const TempFolder& folder, const ProcessOptions& run) {
  folder.Write("practices.csv",
               "practice,name,network,list_size\n"
               "../up,<b>Invented</b> Alder & Sons,Invented Net,900\n"
               "+X2,=Invented Birch,Invented Net,800\n");
  std::string patients = "patient_id,birth_date,sex,practice\n";
  std::string dispensing = "patient_id,practice,dispensed_on,product,quantity,days_supply\n";
  for (size_t i = 0; i < kPatients.size(); ++i) {
    const std::string id = "\"" + kPatients[i] + "\"";
    const std::string practice = i % 2 == 0 ? "../up" : "+X2";
    patients += id + ",1940," + (i % 2 == 0 ? "F" : "M") + "," + practice + "\n";
    // An earlier course, so that the practices' data begin months before the census dates
    // (a date in the first days of the data has no change computed against it).
    dispensing += id + "," + practice + ",2023-09-01,Ramipril 5mg capsules,28,28\n";
    for (const char* product : {"Amitriptyline 10mg tablets", "Oxybutynin 5mg tablets",
                                "<img src=x onerror=alert(1)> 5mg tablets", "-2+3 tablets"}) {
      dispensing += id + "," + practice + ",2024-03-01,\"" + std::string(product) + "\",28,28\n";
    }
  }
  folder.Write("patients.csv", patients);
  folder.Write("dispensing.csv", dispensing);
  for (const char* kind : {"practices", "patients", "dispensing"}) {
    const ProcessResult result = RunMedload(
        {"--quiet", "import", kind, folder.File(std::string(kind) + ".csv"), "--max-reject-rate", "1"}, run);
    REQUIRE_MESSAGE(result.exit_code == 0, result.err);
  }
  folder.Write("network.json",
               R"({"title":"Invented <i>Net</i>","network":"Invented Net","on":"2024-03-10","months":2,)"
               R"("criteria":["items>=1","acb>=3"],"digests":{"to":["team@example.invalid"],)"
               R"("triggers":{"rise_patients":1}}})");
}

mode_t ModeOf(const std::string& path) {
  struct stat info {};
  REQUIRE(::stat(path.c_str(), &info) == 0);
  return info.st_mode & 0777;
}

void CheckNoRawMarkup(const std::string& html) {
  CHECK(html.find("<script>") == std::string::npos);
  CHECK(html.find("<img") == std::string::npos);
  CHECK(html.find("<b>Invented") == std::string::npos);
  CHECK(html.find("<i>Net") == std::string::npos);
}

}  // namespace

TEST_SUITE("cli/cmd_report") {

TEST_CASE("markup in names, identifiers and products is escaped in every HTML output") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  ProcessResult report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", "out"}, run);
  REQUIRE_MESSAGE(report.exit_code == 0, report.err);
  size_t pages = 0;
  for (const fs::directory_entry& entry : fs::recursive_directory_iterator(folder.File("out"))) {
    if (entry.path().extension() != ".html") continue;
    CAPTURE(entry.path().string());
    CheckNoRawMarkup(ReadWholeFile(entry.path().string()));
    ++pages;
  }
  CHECK(pages == 3);  // the overview and two practice pages
  CHECK(ReadWholeFile(folder.File("out/index.html")).find("&lt;b&gt;Invented&lt;/b&gt; Alder &amp; Sons") !=
        std::string::npos);
  const std::vector<std::vector<std::string>> commands = {
      {"--format", "html", "meds", kPatients[1], "--on", "2024-03-10"},
      {"--format", "html", "review", "--on", "2024-03-10", "--at-least", "items=1"},
      {"--format", "html", "timeline", kPatients[1], "--to", "2024-03-10"},
      {"--format", "html", "cohort", "--on", "2024-03-10", "--at-least", "items=1"},
      {"--format", "html", "import", "dispensing", folder.File("dispensing.csv"), "--max-reject-rate", "1"}};
  for (const std::vector<std::string>& args : commands) {
    CAPTURE(args[2]);
    ProcessResult result = RunMedload(args, run);
    REQUIRE_MESSAGE(result.exit_code == 0, result.err);
    CHECK(result.out.find("<!DOCTYPE html>") == 0);
    CheckNoRawMarkup(result.out);
  }
}

TEST_CASE("no CSV output starts a cell with a formula character") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  ProcessResult report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", "out"}, run);
  REQUIRE_MESSAGE(report.exit_code == 0, report.err);
  size_t files = 0;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder.File("out"))) {
    if (entry.path().extension() != ".csv") continue;
    CAPTURE(entry.path().string());
    const std::string csv = ReadWholeFile(entry.path().string());
    CHECK_FALSE(HasFormulaCell(csv));
    const testing::CsvLayout layout = testing::ReadCsvLayout(csv);
    CHECK(layout.comment_fields == layout.comments.size());
    CHECK(layout.ragged_rows == 0);
    ++files;
  }
  CHECK(files == 3);  // cohort.csv and a worklist per practice
  const std::vector<std::vector<std::string>> commands = {
      {"--format", "csv", "meds", kPatients[0], "--on", "2024-03-10"},
      {"--format", "csv", "review", "--on", "2024-03-10", "--at-least", "items=1"},
      {"--format", "csv", "timeline", kPatients[0], "--to", "2024-03-10"},
      {"--format", "csv", "cohort", "--on", "2024-03-10", "--at-least", "items=1"},
      {"--format", "csv", "formulary", "unmatched"},
      {"--format", "csv", "import", "dispensing", folder.File("dispensing.csv"), "--max-reject-rate", "1"}};
  for (const std::vector<std::string>& args : commands) {
    CAPTURE(args[2]);
    ProcessResult result = RunMedload(args, run);
    REQUIRE_MESSAGE(result.exit_code == 0, result.err);
    CHECK(result.out.rfind("\"# CAUTION: ", 0) == 0);
    CHECK_FALSE(HasFormulaCell(result.out));
    // Read as a spreadsheet would: each comment line is one cell, the header follows, and
    // every data row has the header's columns.
    const testing::CsvLayout layout = testing::ReadCsvLayout(result.out);
    REQUIRE_FALSE(layout.comments.empty());
    CHECK(layout.comments[0] == "# " + std::string(kCaution));
    CHECK(layout.comment_fields == layout.comments.size());
    CHECK(layout.header.size() > 1);
    CHECK(layout.ragged_rows == 0);
  }
  // The checker itself finds what it is looking for.
  CHECK(HasFormulaCell("a,=b\n"));
  CHECK(HasFormulaCell("\"@x\",1\n"));
  CHECK(HasFormulaCell("-x\n"));
  CHECK_FALSE(HasFormulaCell("-1.5,'=b\n"));
}

TEST_CASE("practice codes with path parts give file names inside the report folder") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  fs::create_directories(folder.File("deep/down"));
  ProcessResult report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", "deep/down/out"}, run);
  REQUIRE_MESSAGE(report.exit_code == 0, report.err);
  for (const fs::directory_entry& entry : fs::recursive_directory_iterator(folder.File("deep/down/out"))) {
    CAPTURE(entry.path().string());
    const std::string name = entry.path().filename().string();
    CHECK(name.find("..") == std::string::npos);
    CHECK(name.find('+') == std::string::npos);
  }
  CHECK_FALSE(fs::exists(folder.File("deep/down/up")));
  CHECK_FALSE(fs::exists(folder.File("deep/up")));
  CHECK_FALSE(fs::exists(folder.File("deep/down/practice-")));
  size_t pages = 0;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder.File("deep/down/out"))) {
    if (entry.path().filename().string().rfind("practice-", 0) == 0) ++pages;
  }
  CHECK(pages == 2);
}

TEST_CASE("a symbolic link inside the report folder is refused and nothing is written through it") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  fs::create_directories(folder.File("elsewhere"));
  fs::create_directories(folder.File("out"));
  fs::create_symlink(folder.File("elsewhere/stolen.html"), folder.File("out/index.html"));
  ProcessResult report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", "out"}, run);
  CHECK(report.exit_code == 2);
  CHECK(report.err.find("index.html: is a symbolic link; refusing to write through it") != std::string::npos);
  CHECK_FALSE(fs::exists(folder.File("elsewhere/stolen.html")));
}

TEST_CASE("network-level outputs carry no patient identifier") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  ProcessResult report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", "out"}, run);
  REQUIRE_MESSAGE(report.exit_code == 0, report.err);
  std::vector<std::string> network_level = {"out/index.html", "out/cohort.csv", "out/cohort.json", "out/run.json"};
  for (const fs::directory_entry& entry : fs::directory_iterator(folder.File("out/digests"))) {
    network_level.push_back(fs::relative(entry.path(), folder.File("")).string());
  }
  CHECK(network_level.size() > 4);  // at least one digest was written
  std::vector<std::string> texts;
  for (const std::string& name : network_level) texts.push_back(ReadWholeFile(folder.File(name)));
  for (const char* format : {"text", "csv", "json", "html"}) {
    texts.push_back(RunMedload({"--format", format, "cohort", "--on", "2024-03-10", "--at-least", "items=1"}, run).out);
  }
  // The practice pages do name them: the check can find what it looks for.
  bool practice_page_names_a_patient = false;
  for (const fs::directory_entry& entry : fs::directory_iterator(folder.File("out"))) {
    if (entry.path().filename().string().rfind("worklist-", 0) != 0) continue;
    practice_page_names_a_patient =
        practice_page_names_a_patient || ReadWholeFile(entry.path().string()).find("ZQ700") != std::string::npos;
  }
  CHECK(practice_page_names_a_patient);
  for (size_t i = 0; i < texts.size(); ++i) {
    CAPTURE(i < network_level.size() ? network_level[i] : "cohort output");
    CHECK_FALSE(texts[i].empty());
    for (const char* id : {"ZQ7001", "ZQ7002", "ZQ7003", "HYPERLINK", "alert(1)"}) {
      CAPTURE(id);
      CHECK(texts[i].find(id) == std::string::npos);
    }
  }
}

TEST_CASE("control characters and bidi controls in the report title reach no output raw") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  // An escape sequence and U+202E RIGHT-TO-LEFT OVERRIDE (Unicode Standard Annex #9).
  folder.Write("hostile.json",
               "{\"title\":\"Invented \\u001b]0;owned\\u0007 \\u202e Net\",\"network\":\"Invented Net\","
               "\"on\":\"2024-03-10\",\"months\":2,\"criteria\":[\"items>=1\"],"
               "\"digests\":{\"to\":[\"team@example.invalid\"],\"triggers\":{\"rise_patients\":1}}}");
  const ProcessResult report = RunMedload({"report", "--config", "hostile.json", "--out", "out"}, run);
  REQUIRE_MESSAGE(report.exit_code == 0, report.err);
  std::vector<std::pair<std::string, std::string>> outputs = {{"stdout", report.out}, {"stderr", report.err}};
  for (const fs::directory_entry& entry : fs::recursive_directory_iterator(folder.File("out"))) {
    if (entry.is_regular_file()) outputs.emplace_back(entry.path().string(), ReadWholeFile(entry.path().string()));
  }
  size_t shown = 0;
  for (const auto& [name, text] : outputs) {
    const auto& output_name = name;  // clang 14 cannot capture a structured binding
    CAPTURE(output_name);
    CHECK(text.find('\x1b') == std::string::npos);
    CHECK(text.find('\x07') == std::string::npos);
    CHECK(text.find("\xE2\x80\xAE") == std::string::npos);
    if (text.find("\\x1b]0;owned") != std::string::npos || text.find("\\u001b]0;owned") != std::string::npos) ++shown;
  }
  CHECK(shown >= 4);  // stdout, the overview, a practice page and a digest at least
}

TEST_CASE("a report folder is private whatever the umask: the folder 0700, every file 0600") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  for (const mode_t mask : {mode_t{0}, mode_t{022}}) {
    CAPTURE(mask);
    const std::string out = "out" + std::to_string(mask);
    const mode_t old_mask = ::umask(mask);
    ProcessResult report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", out}, run);
    ::umask(old_mask);
    REQUIRE_MESSAGE(report.exit_code == 0, report.err);
    CHECK(ModeOf(folder.File(out)) == 0700);
    CHECK(ModeOf(folder.File(out + "/digests")) == 0700);
    size_t files = 0;
    for (const fs::directory_entry& entry : fs::recursive_directory_iterator(folder.File(out))) {
      const std::string name = entry.path().filename().string();
      CAPTURE(name);
      if (!entry.is_regular_file()) continue;
      CHECK(ModeOf(entry.path().string()) == 0600);
      CHECK(name.find(".medload-") == std::string::npos);  // no temporary file left
      ++files;
    }
    CHECK(files >= 9);  // index, cohort csv and json, run.json, two pages, two worklists, digests
  }
  // A re-run replaces a worklist that was made readable by others in the meantime.
  const std::string worklist = [&] {
    for (const fs::directory_entry& entry : fs::directory_iterator(folder.File("out0"))) {
      if (entry.path().filename().string().rfind("worklist-", 0) == 0) return entry.path().string();
    }
    return std::string();
  }();
  REQUIRE(::chmod(worklist.c_str(), 0644) == 0);
  REQUIRE(RunMedload({"--quiet", "report", "--config", "network.json", "--out", "out0"}, run).exit_code == 0);
  CHECK(ModeOf(worklist) == 0600);
}

TEST_CASE("a report folder or file of another user is refused with exit 2 and left unchanged") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  constexpr uid_t kNobody = 65534;
  if (geteuid() != 0) {
    MESSAGE("skipped: only the superuser can give a file to another user");
    return;
  }
  fs::create_directories(folder.File("theirs"));
  REQUIRE(::chown(folder.File("theirs").c_str(), kNobody, kNobody) == 0);
  ProcessResult report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", "theirs"}, run);
  CHECK(report.exit_code == 2);
  CHECK(report.err.find("theirs: belongs to another user (uid 65534); medload writes patient-level data only") !=
        std::string::npos);
  CHECK(fs::is_empty(folder.File("theirs")));
  // A file of another user inside the user's own report folder.
  REQUIRE(RunMedload({"--quiet", "report", "--config", "network.json", "--out", "mine"}, run).exit_code == 0);
  REQUIRE(::chown(folder.File("mine/index.html").c_str(), kNobody, kNobody) == 0);
  report = RunMedload({"--quiet", "report", "--config", "network.json", "--out", "mine"}, run);
  CHECK(report.exit_code == 2);
  CHECK(report.err.find("index.html: belongs to another user") != std::string::npos);
}

TEST_CASE("an unknown scale in the config is a config fault: exit 2, naming the file and the key") {
  TempFolder folder;
  ProcessOptions run = InFolder(folder.File(""));
  BuildNetwork(folder, run);
  folder.Write("scale.json", R"({"title":"T","network":"Invented Net","criteria":["items>=1"],"scale":"nosuch"})");
  const ProcessResult report = RunMedload({"--quiet", "report", "--config", "scale.json", "--out", "out"}, run);
  CHECK(report.exit_code == 2);
  CHECK(report.err == "medload: scale.json: /scale: \"nosuch\" is not a scale in " MEDLOAD_SOURCE_FORMULARY
                      "/anticholinergic/ (known: acb, ars); set \"scale\" to one of them\n");
  CHECK_FALSE(fs::exists(folder.File("out")));
}

}  // TEST_SUITE

}  // namespace medload
