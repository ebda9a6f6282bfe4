// The rules of the viscous options: every field's range is enforced, and the message names the
// field, its value and the rule; the solve statuses round-trip through their names.
#include "solvers/viscous/viscous_options.h"

#include <gtest/gtest.h>

#include <functional>
#include <string>
#include <vector>

#include "common/error.h"

namespace fulmar::viscous {
namespace {

// The message of the InputError that Validate throws for `o` ("" when it does not throw).
std::string validation_message(const ViscousOptions& o) {
  try {
    o.Validate();
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

TEST(ViscousOptions, DefaultsAreValid) {
  EXPECT_NO_THROW(ViscousOptions{}.Validate());
}

TEST(ViscousOptions, ValidateNamesTheField) {
  ViscousOptions o;
  o.reynolds = -5.0;
  EXPECT_NE(validation_message(o).find("reynolds"), std::string::npos);
  o = ViscousOptions{};
  o.trip_upper = 1.5;
  EXPECT_THROW(o.Validate(), InputError);
  EXPECT_EQ(solve_status_from_string("not_converged"), SolveStatus::kNotConverged);
  EXPECT_THROW(solve_status_from_string("fine"), InputError);
}

TEST(ViscousOptions, StatusNamesRoundTrip) {
  for (SolveStatus s : {SolveStatus::kConverged, SolveStatus::kNotConverged, SolveStatus::kFailed})
    EXPECT_EQ(solve_status_from_string(to_string(s)), s);
}

// The ranges of the flow and iteration fields, at their bounds and just beyond.
TEST(ViscousOptions, RangesHoldAtTheirBounds) {
  struct Case {
    std::function<void(ViscousOptions&)> set;
    bool valid;
  };
  const std::vector<Case> cases = {
      {[](ViscousOptions& o) { o.reynolds = 1e4; }, true},
      {[](ViscousOptions& o) { o.reynolds = 1.1e9; }, false},
      {[](ViscousOptions& o) { o.mach = 0.7; }, true},
      {[](ViscousOptions& o) { o.mach = 0.71; }, false},
      {[](ViscousOptions& o) { o.n_crit = 0.4; }, false},
      {[](ViscousOptions& o) { o.trip_lower = -0.1; }, false},
      {[](ViscousOptions& o) { o.max_iterations = 500; }, true},
      {[](ViscousOptions& o) { o.max_iterations = 0; }, false},
      {[](ViscousOptions& o) { o.tolerance = 1e-14; }, true},
      {[](ViscousOptions& o) { o.tolerance = 2e-3; }, false},
      {[](ViscousOptions& o) { o.wake_length = 10.0; }, true},
      {[](ViscousOptions& o) { o.wake_length = 0.5; }, false},
  };
  for (std::size_t k = 0; k < cases.size(); ++k) {
    ViscousOptions o;
    cases[k].set(o);
    EXPECT_EQ(validation_message(o).empty(), cases[k].valid) << "case " << k;
  }
}

// Each Newton option out of its range: the message names "newton.<field>", the value and the
// rule.
TEST(NewtonOptions, ValidateNamesFieldValueAndRule) {
  struct Case {
    std::function<void(NewtonOptions&)> set;
    std::string field, value, rule;
  };
  const std::vector<Case> cases = {
      {[](NewtonOptions& n) { n.stall_iterations = 0; }, "newton.stall_iterations", "0",
       "[1, 500]"},
      {[](NewtonOptions& n) { n.stall_window = 13; }, "newton.stall_window", "13",
       "[1, newton.stall_iterations]"},
      {[](NewtonOptions& n) { n.stall_ratio = 1.5; }, "newton.stall_ratio", "1.5", "(0, 1]"},
      {[](NewtonOptions& n) { n.stall_residual = 0.0; }, "newton.stall_residual", "0", "(0, 1e3]"},
      {[](NewtonOptions& n) { n.max_settles = -1; }, "newton.max_settles", "-1", "[0, 10]"},
      {[](NewtonOptions& n) { n.settle_iterations = 0; }, "newton.settle_iterations", "0",
       "[1, 500]"},
      {[](NewtonOptions& n) { n.theta_change = 0.0; }, "newton.theta_change", "0", "(0, 10]"},
      {[](NewtonOptions& n) { n.mass_change = 11.0; }, "newton.mass_change", "11", "(0, 10]"},
      {[](NewtonOptions& n) { n.mass_change_theta = -0.1; }, "newton.mass_change_theta", "-0.1",
       "[0, 10]"},
      {[](NewtonOptions& n) { n.amplification_change = 25.0; }, "newton.amplification_change", "25",
       "(0, 20]"},
      {[](NewtonOptions& n) { n.shear_change = 0.0; }, "newton.shear_change", "0", "(0, 10]"},
      {[](NewtonOptions& n) { n.max_halvings = 0; }, "newton.max_halvings", "0", "[1, 60]"},
      {[](NewtonOptions& n) { n.floor_halvings = 21; }, "newton.floor_halvings", "21",
       "[0, newton.max_halvings]"},
      {[](NewtonOptions& n) { n.shape_drop_fraction = 1.0; }, "newton.shape_drop_fraction", "1",
       "[0, 1)"},
  };
  for (const Case& c : cases) {
    ViscousOptions o;
    c.set(o.newton);
    const std::string msg = validation_message(o);
    EXPECT_NE(msg.find(c.field + " = " + c.value), std::string::npos) << msg;
    EXPECT_NE(msg.find(c.rule), std::string::npos) << msg;
  }
}

// The documented defaults of the Newton options: the numbers the solver was measured with.
TEST(NewtonOptions, DefaultsAreTheMeasuredOnes) {
  const NewtonOptions n;
  EXPECT_EQ(n.stall_iterations, 12);
  EXPECT_EQ(n.stall_window, 6);
  EXPECT_EQ(n.stall_ratio, 0.5);
  EXPECT_EQ(n.stall_residual, 1e-3);
  EXPECT_EQ(n.max_settles, 2);
  EXPECT_EQ(n.settle_iterations, 8);
  EXPECT_EQ(n.theta_change, 0.5);
  EXPECT_EQ(n.mass_change, 0.5);
  EXPECT_EQ(n.mass_change_theta, 0.05);
  EXPECT_EQ(n.amplification_change, 2.0);
  EXPECT_EQ(n.shear_change, 0.5);
  EXPECT_EQ(n.max_halvings, 20);
  EXPECT_EQ(n.floor_halvings, 3);
  EXPECT_EQ(n.shape_drop_fraction, 0.3);
}

}  // namespace
}  // namespace fulmar::viscous
