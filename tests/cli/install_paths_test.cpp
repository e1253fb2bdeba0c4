#include "cli/install_paths.h"

#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>

#include "store/temp_folder.h"

namespace medload::cli {
namespace {

namespace fs = std::filesystem;

void Touch(const fs::path& file) {
  fs::create_directories(file.parent_path());
  std::ofstream(file) << "x\n";
}

}  // namespace

TEST_SUITE("cli/install_paths") {

TEST_CASE("bundled data are found beside an installed program, then beside a build folder, then built in") {
  TempFolder folder;
  const fs::path root = folder.File("");
  const fs::path bin = root / "prefix" / "bin";
  fs::create_directories(bin);
  // Nothing beside the program: the built-in path.
  CHECK(FindBundled(bin, "formulary", "ingredients.csv", "/built/in/formulary") == "/built/in/formulary");
  // A checkout with a build folder: build/medload finds formulary/ beside build/.
  Touch(root / "prefix" / "formulary" / "ingredients.csv");
  CHECK(FindBundled(bin, "formulary", "ingredients.csv", "/built/in") == (root / "prefix" / "formulary").string());
  // An installed program: PREFIX/share/medload/formulary comes first.
  Touch(root / "prefix" / "share" / "medload" / "formulary" / "ingredients.csv");
  CHECK(FindBundled(bin, "formulary", "ingredients.csv", "/built/in") ==
        (root / "prefix" / "share" / "medload" / "formulary").string());
  // A folder without the marker file does not count.
  fs::create_directories(root / "prefix" / "share" / "medload" / "demo-patients");
  CHECK(FindBundled(bin, "demo-patients", "network.json", "/built/in/demo") == "/built/in/demo");
  CHECK(FindBundled(fs::path(), "formulary", "ingredients.csv", "/built/in") == "/built/in");
}

TEST_CASE("the running program's folder is known") {
  const fs::path folder = ProgramFolder();
  CHECK_FALSE(folder.empty());
  CHECK(fs::is_directory(folder));
}

}  // TEST_SUITE

}  // namespace medload::cli
