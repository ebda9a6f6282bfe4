// fulmar: designs the wing section for one airplane.
#include <CLI/CLI.hpp>

#include <exception>
#include <iostream>

#include "app/commands.h"
#include "common/error.h"

namespace {

// Convention for every command's description: its first paragraph is the summary shown in the
// parent's list of subcommands; the rest (details and the caution) is printed after the options.
void move_details_to_footer(CLI::App& app) {
  for (CLI::App* sub : app.get_subcommands([](CLI::App*) { return true; })) {
    const std::string text = sub->get_description();
    const auto cut = text.find("\n\n");
    if (cut != std::string::npos) {
      sub->description(text.substr(0, cut));
      sub->footer("\n" + text.substr(cut + 2));
    }
    move_details_to_footer(*sub);
  }
}

}  // namespace

int main(int argc, char** argv) {
  CLI::App app{
      "fulmar shapes the wing section for one airplane: least drag at the cruise lift "
      "coefficient, under maximum-lift, pitching-moment and thickness limits.\n\n" +
          std::string(fulmar::app::kCaution),
      "fulmar"};
  app.set_version_flag("--version", std::string("fulmar ") + FULMAR_VERSION);
  app.require_subcommand(1);
  app.fallthrough(false);

  fulmar::app::add_shape_command(app);
  fulmar::app::add_flight_command(app);
  fulmar::app::add_analyze_command(app);
  fulmar::app::add_polar_command(app);
  fulmar::app::add_export_command(app);
  fulmar::app::add_optimize_command(app);
  fulmar::app::add_study_command(app);
  move_details_to_footer(app);

  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    app.exit(e);
    return 2;
  } catch (const fulmar::InputError& e) {
    std::cerr << "fulmar: error: " << e.what() << "\n";
    return 2;
  } catch (const std::exception& e) {
    std::cerr << "fulmar: internal error: " << e.what() << "\n";
    return 1;
  }
  return 0;
}
