// Placeholder until the shape command lands; registers nothing.
#include "app/commands.h"

namespace fulmar::app {

void add_shape_command(CLI::App& /*app*/) {}

}  // namespace fulmar::app
