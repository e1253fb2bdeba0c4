// The command table: one line per command; each command lives in its own cmd_*.cpp.
#include "cli/context.h"

namespace medload::cli {

// Entry points, one per command (declared here, defined in the cmd_*.cpp files).

const std::vector<Command>& Commands() {
  static const std::vector<Command> kCommands = {
  };
  return kCommands;
}

}  // namespace medload::cli
