// Placeholder until the study command lands; registers nothing.
#include "app/commands.h"

namespace fulmar::app {

void add_study_command(CLI::App& /*app*/) {}

}  // namespace fulmar::app
