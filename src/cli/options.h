// Parsing of a command's own options with Boost.Program_options, the same way for every
// command: `--help` prints them, an unknown or malformed option is a usage error (exit 1).
#pragma once

#include <boost/program_options.hpp>
#include <optional>
#include <string>
#include <vector>

#include "cli/context.h"

namespace medload::cli {

namespace po = boost::program_options;

// Parses `args` against `options`, with the positional arguments named in `positional`
// (name, max count; -1 for any number). Returns the variables, or nullopt after printing
// help (exit_code 0) or a usage error (exit_code 1) to the context's streams.
std::optional<po::variables_map> ParseOptions(Context& context, const char* usage,
                                              const po::options_description& options,
                                              const std::vector<std::pair<const char*, int>>& positional,
                                              const std::vector<std::string>& args,
                                              int& exit_code);

}  // namespace medload::cli
