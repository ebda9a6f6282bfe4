// The rules of the viscous options.
#include "solvers/viscous/viscous_options.h"

#include "common/error.h"
#include "common/rule_check.h"

namespace fulmar::viscous {

namespace {

void require(bool ok, const std::string& field, double value, const std::string& rule) {
  require_rule(ok, "viscous option " + field, value, rule);
}

}  // namespace

void NewtonOptions::Validate() const {
  require(stall_iterations >= 1 && stall_iterations <= 500, "newton.stall_iterations",
          stall_iterations, "must be in [1, 500]");
  require(stall_window >= 1 && stall_window <= stall_iterations, "newton.stall_window",
          stall_window, "must be in [1, newton.stall_iterations]");
  require(stall_ratio > 0.0 && stall_ratio <= 1.0, "newton.stall_ratio", stall_ratio,
          "must be in (0, 1]");
  require(stall_residual > 0.0 && stall_residual <= 1e3, "newton.stall_residual", stall_residual,
          "must be in (0, 1e3]");
  require(max_settles >= 0 && max_settles <= 10, "newton.max_settles", max_settles,
          "must be in [0, 10]");
  require(settle_iterations >= 1 && settle_iterations <= 500, "newton.settle_iterations",
          settle_iterations, "must be in [1, 500]");
  require(theta_change > 0.0 && theta_change <= 10.0, "newton.theta_change", theta_change,
          "must be in (0, 10]");
  require(mass_change > 0.0 && mass_change <= 10.0, "newton.mass_change", mass_change,
          "must be in (0, 10]");
  require(mass_change_theta >= 0.0 && mass_change_theta <= 10.0, "newton.mass_change_theta",
          mass_change_theta, "must be in [0, 10]");
  require(amplification_change > 0.0 && amplification_change <= 20.0, "newton.amplification_change",
          amplification_change, "must be in (0, 20]");
  require(shear_change > 0.0 && shear_change <= 10.0, "newton.shear_change", shear_change,
          "must be in (0, 10]");
  require(max_halvings >= 1 && max_halvings <= 60, "newton.max_halvings", max_halvings,
          "must be in [1, 60]");
  require(floor_halvings >= 0 && floor_halvings <= max_halvings, "newton.floor_halvings",
          floor_halvings, "must be in [0, newton.max_halvings]");
  require(shape_drop_fraction >= 0.0 && shape_drop_fraction < 1.0, "newton.shape_drop_fraction",
          shape_drop_fraction, "must be in [0, 1)");
}

void ViscousOptions::Validate() const {
  require(reynolds >= 1e4 && reynolds <= 1e9, "reynolds", reynolds, "must be in [1e4, 1e9]");
  require(mach >= 0.0 && mach <= 0.7, "mach", mach, "must be in [0, 0.7]");
  require(n_crit >= 0.5 && n_crit <= 20.0, "n_crit", n_crit, "must be in [0.5, 20]");
  require(trip_upper >= 0.0 && trip_upper <= 1.0, "trip_upper", trip_upper,
          "must be an x/c in [0, 1]");
  require(trip_lower >= 0.0 && trip_lower <= 1.0, "trip_lower", trip_lower,
          "must be an x/c in [0, 1]");
  require(max_iterations >= 1 && max_iterations <= 500, "max_iterations", max_iterations,
          "must be in [1, 500]");
  require(tolerance >= 1e-14 && tolerance <= 1e-3, "tolerance", tolerance,
          "must be in [1e-14, 1e-3]");
  require(wake_length >= 1.0 && wake_length <= 10.0, "wake_length", wake_length,
          "must be in [1, 10] chords");
  newton.Validate();
}

}  // namespace fulmar::viscous
