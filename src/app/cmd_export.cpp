// Placeholder until the export command lands; registers nothing.
#include "app/commands.h"

namespace fulmar::app {

void add_export_command(CLI::App& /*app*/) {}

}  // namespace fulmar::app
