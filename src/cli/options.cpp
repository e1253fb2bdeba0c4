#include "cli/options.h"

#include <iostream>

#include "medload/core/caution.h"

namespace medload::cli {

std::optional<po::variables_map> ParseOptions(Context& context, const char* usage,
                                              const po::options_description& options,
                                              const std::vector<std::pair<const char*, int>>& positional,
                                              const std::vector<std::string>& args,
                                              int& exit_code) {
  po::options_description all;
  all.add(options);
  all.add_options()("help,h", "show this help");
  po::options_description hidden;
  po::positional_options_description positions;
  for (const auto& [name, count] : positional) {
    hidden.add_options()(name, po::value<std::vector<std::string>>());
    positions.add(name, count);
  }
  all.add(hidden);
  po::variables_map vm;
  try {
    po::store(po::command_line_parser(args).options(all).positional(positions).run(), vm);
    po::notify(vm);
  } catch (const po::error& e) {
    *context.err << "medload: " << e.what() << "\nusage: " << usage << "\n";
    exit_code = 1;
    return std::nullopt;
  }
  if (vm.count("help") != 0U) {
    std::cout << "usage: " << usage << "\n\n" << options << "\n" << kCautionLine << "\n";
    exit_code = 0;
    return std::nullopt;
  }
  exit_code = 0;
  return vm;
}

}  // namespace medload::cli
