// Placeholder until the flight command lands; registers nothing.
#include "app/commands.h"

namespace fulmar::app {

void add_flight_command(CLI::App& /*app*/) {}

}  // namespace fulmar::app
