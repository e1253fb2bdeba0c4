#include "cli/install_paths.h"

#include <system_error>

namespace medload::cli {

namespace fs = std::filesystem;

fs::path ProgramFolder() {
  std::error_code error;
  const fs::path program = fs::read_symlink("/proc/self/exe", error);
  return error ? fs::path() : program.parent_path();
}

std::string FindBundled(const fs::path& program_folder, std::string_view name, std::string_view marker,
                        const std::string& built_in) {
  if (!program_folder.empty()) {
    for (const fs::path& candidate : {program_folder / ".." / "share" / "medload" / name, program_folder / ".." / name}) {
      std::error_code error;
      if (fs::is_regular_file(candidate / marker, error)) return candidate.lexically_normal().string();
    }
  }
  return built_in;
}

std::string BundledFormulary() {
  return FindBundled(ProgramFolder(), "formulary", "ingredients.csv", MEDLOAD_SOURCE_FORMULARY);
}

std::string BundledDemo() { return FindBundled(ProgramFolder(), "demo-patients", "network.json", MEDLOAD_SOURCE_DEMO); }

}  // namespace medload::cli
