#pragma once
// Option validators shared by the subcommands, with messages a designer can read
// (CLI11 prefixes the option name: "--mass: must be a positive number, got '-1'").
#include <CLI/CLI.hpp>

#include <cmath>
#include <string>

namespace fulmar::app {

// Accepts a finite number > 0.
inline CLI::Validator positive() {
  return CLI::Validator(
      [](std::string& text) -> std::string {
        double v = 0;
        if (!CLI::detail::lexical_cast(text, v) || !std::isfinite(v) || v <= 0.0) {
          return "must be a positive number, got '" + text + "'";
        }
        return {};
      },
      "POSITIVE");
}

// Accepts a finite number in [lo, hi].
inline CLI::Validator within(double lo, double hi) {
  return CLI::Validator(
      [lo, hi](std::string& text) -> std::string {
        double v = 0;
        if (!CLI::detail::lexical_cast(text, v) || !std::isfinite(v) || v < lo || v > hi) {
          return "must be a number from " + CLI::detail::to_string(lo) + " to " +
                 CLI::detail::to_string(hi) + ", got '" + text + "'";
        }
        return {};
      },
      "[" + CLI::detail::to_string(lo) + ", " + CLI::detail::to_string(hi) + "]");
}

}  // namespace fulmar::app
