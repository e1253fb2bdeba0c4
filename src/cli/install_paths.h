// Where the data bundled with medload (the formulary tables, the demo network) are found
// at run time, so that an installed program and a moved checkout both find them: beside
// an installed program (PREFIX/bin/medload -> PREFIX/share/medload/NAME), beside a build
// folder inside the source tree (build/medload -> NAME), else the source tree the program
// was built from. Private to cli/; it reads no file other than to test that one exists.
#pragma once

#include <filesystem>
#include <string>
#include <string_view>

namespace medload::cli {

// The folder holding the running program (from /proc/self/exe); empty when unknown.
std::filesystem::path ProgramFolder();

// The first of `program_folder`/../share/medload/NAME, `program_folder`/../NAME and
// `built_in` that holds `marker` (a file every copy has: "ingredients.csv" for the
// formulary, "network.json" for the demo); `built_in` when none does, so that the fault
// names a path.
std::string FindBundled(const std::filesystem::path& program_folder, std::string_view name,
                        std::string_view marker, const std::string& built_in);

// FindBundled for the running program: the default --formulary and demo --data.
std::string BundledFormulary();
std::string BundledDemo();

}  // namespace medload::cli
