// Placeholder until the optimize command lands; registers nothing.
#include "app/commands.h"

namespace fulmar::app {

void add_optimize_command(CLI::App& /*app*/) {}

}  // namespace fulmar::app
