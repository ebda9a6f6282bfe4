// Placeholder until the analyze command lands; registers nothing.
#include "app/commands.h"

namespace fulmar::app {

void add_analyze_command(CLI::App& /*app*/) {}

}  // namespace fulmar::app
