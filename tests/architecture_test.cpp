// The layer rule of docs/architecture.md, checked from the source tree: every include
// line under src/ and include/medload/ names a folder at or below the includer's own in
// the documented order, and every test file's suite is named after its path.
#include <doctest/doctest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <optional>
#include <regex>
#include <sstream>
#include <string>
#include <vector>

namespace medload {
namespace {

namespace fs = std::filesystem;

// The repository's root: the parent of the bundled formulary/ folder.
fs::path RepositoryRoot() { return fs::path(MEDLOAD_SOURCE_FORMULARY).parent_path(); }

std::string ReadWhole(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream content;
  content << in.rdbuf();
  return content.str();
}

// The folders, bottom first, from the doc's line "Layer order, bottom first: a, b, ...".
std::vector<std::string> DocumentedOrder(const std::string& doc) {
  static const std::regex kLine(R"(Layer order, bottom first: ([a-z_, ]+)\.)");
  std::smatch match;
  if (!std::regex_search(doc, match, kLine)) return {};
  std::vector<std::string> order;
  std::istringstream names(match[1].str());
  for (std::string name; std::getline(names, name, ',');) {
    name.erase(0, name.find_first_not_of(' '));
    order.push_back(name);
  }
  return order;
}

// An include line's folder: "medload/burden/x.h" and "burden/x.h" (a private header
// beside its .cpp) both name burden; angle-bracket includes name none.
std::optional<std::string> IncludedFolder(const std::string& line) {
  static const std::regex kInclude(R"(^\s*#\s*include\s+"(?:medload/)?([a-z_]+)/)");
  std::smatch match;
  if (!std::regex_search(line, match, kInclude)) return std::nullopt;
  return match[1].str();
}

struct Fault {
  std::string where;  // file:line
  std::string what;
};

// Every include line of the files under `root`, whose first folder is the includer's.
void CheckIncludes(const fs::path& root, const std::vector<std::string>& order, std::vector<Fault>& faults) {
  auto rank = [&](const std::string& folder) -> std::optional<size_t> {
    const auto it = std::find(order.begin(), order.end(), folder);
    if (it == order.end()) return std::nullopt;
    return static_cast<size_t>(it - order.begin());
  };
  for (const fs::directory_entry& entry : fs::recursive_directory_iterator(root)) {
    if (!entry.is_regular_file()) continue;
    const fs::path relative = fs::relative(entry.path(), root);
    const std::string folder = relative.begin()->string();
    const std::string name = (root.filename() / relative).string();
    if (relative.begin() == --relative.end()) continue;  // not in a folder
    const std::optional<size_t> own = rank(folder);
    if (!own) {
      faults.push_back({name, "folder " + folder + " is not in the documented layer order"});
      continue;
    }
    std::istringstream lines(ReadWhole(entry.path()));
    int number = 0;
    for (std::string line; std::getline(lines, line);) {
      ++number;
      const std::optional<std::string> included = IncludedFolder(line);
      if (!included || *included == folder) continue;
      const std::optional<size_t> theirs = rank(*included);
      const std::string where = name + ":" + std::to_string(number);
      if (!theirs) {
        faults.push_back({where, "includes " + *included + "/, which is not in the documented layer order"});
      } else if (*theirs > *own) {
        faults.push_back({where, folder + "/ includes " + *included + "/, a folder above it"});
      }
    }
  }
}

TEST_SUITE("architecture") {

TEST_CASE("docs/architecture.md states the layer order with every source folder in it") {
  const std::vector<std::string> order = DocumentedOrder(ReadWhole(RepositoryRoot() / "docs" / "architecture.md"));
  REQUIRE_FALSE(order.empty());
  CHECK(order.front() == "core");
  CHECK(order.back() == "cli");
  for (const fs::directory_entry& entry : fs::directory_iterator(RepositoryRoot() / "src")) {
    if (!entry.is_directory()) continue;
    CAPTURE(entry.path().filename().string());
    CHECK(std::find(order.begin(), order.end(), entry.path().filename().string()) != order.end());
  }
}

TEST_CASE("every include line under src/ and include/ points at its own folder or one below it") {
  const std::vector<std::string> order = DocumentedOrder(ReadWhole(RepositoryRoot() / "docs" / "architecture.md"));
  REQUIRE_FALSE(order.empty());
  std::vector<Fault> faults;
  CheckIncludes(RepositoryRoot() / "src", order, faults);
  CheckIncludes(RepositoryRoot() / "include" / "medload", order, faults);
  for (const Fault& fault : faults) CAPTURE(fault.where + ": " + fault.what);
  for (const Fault& fault : faults) FAIL_CHECK(fault.where << ": " << fault.what);
  CHECK(faults.empty());
}

TEST_CASE("an include of a folder above the includer is found") {
  // The checker itself, on lines of the kinds it must tell apart.
  CHECK(IncludedFolder("#include \"medload/burden/timeline.h\"") == std::optional<std::string>("burden"));
  CHECK(IncludedFolder("#include \"store/sqlite.h\"") == std::optional<std::string>("store"));
  CHECK(IncludedFolder("  #  include \"medload/core/date.h\"") == std::optional<std::string>("core"));
  CHECK_FALSE(IncludedFolder("#include <nlohmann/json.hpp>").has_value());
  CHECK_FALSE(IncludedFolder("// #include is explained here").has_value());
  const fs::path temp = fs::temp_directory_path() / "medload-architecture-test";
  fs::remove_all(temp);
  fs::create_directories(temp / "store");
  { std::ofstream(temp / "store" / "x.cpp") << "#include \"medload/core/date.h\"\n#include \"medload/report/report.h\"\n"; }
  std::vector<Fault> faults;
  CheckIncludes(temp, {"core", "store", "report"}, faults);
  REQUIRE(faults.size() == 1);
  CHECK(faults[0].where == "medload-architecture-test/store/x.cpp:2");
  CHECK(faults[0].what == "store/ includes report/, a folder above it");
  fs::remove_all(temp);
}

TEST_CASE("every test file's suite is named after its path under tests/") {
  const fs::path tests = RepositoryRoot() / "tests";
  static const std::regex kSuite(R"re(TEST_SUITE\("([^"]*)"\))re");
  for (const fs::directory_entry& entry : fs::recursive_directory_iterator(tests)) {
    const std::string file = entry.path().filename().string();
    if (!entry.is_regular_file() || file.size() < 9 || file.substr(file.size() - 9) != "_test.cpp") continue;
    std::string expected = fs::relative(entry.path(), tests).string();
    expected.resize(expected.size() - 9);
    const std::string content = ReadWhole(entry.path());
    std::smatch match;
    CAPTURE(expected);
    REQUIRE(std::regex_search(content, match, kSuite));
    CHECK(match[1].str() == expected);
  }
}

}  // TEST_SUITE

}  // namespace
}  // namespace medload
