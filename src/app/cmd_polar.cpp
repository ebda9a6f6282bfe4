// Placeholder until the polar command lands; registers nothing.
#include "app/commands.h"

namespace fulmar::app {

void add_polar_command(CLI::App& /*app*/) {}

}  // namespace fulmar::app
