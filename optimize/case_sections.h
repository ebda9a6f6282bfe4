#pragma once
// The readers of the sections of a case file, one per JSON object (see cases/README.md), shared by
// optimize/case_file.cpp, which reads the document in order. Each fails with InputError naming
// file, JSON path and rule. Internal to the case-file reader.
#include <filesystem>
#include <optional>
#include <vector>

#include "optimize/case_file.h"
#include "optimize/case_reader.h"

namespace fulmar::optimize::case_detail {

// case_flight.cpp: the airplane, transition, design points and landing point.

// /airplane; sets `wing_to_section` when the case gives it.
Airplane read_airplane(Reader r, double& wing_to_section);
// ncrit, trip_upper, trip_lower of a transition block or scenario, by the viscous analysis' rules.
void read_transition_values(Reader& r, TransitionScenario& s);
// One of /transition/scenarios, starting from the nominal transition `defaults`.
TransitionScenario read_scenario(Reader r, const TransitionScenario& defaults);
// /design_points/<index>: a flight point (needs the airplane) or cl, Reynolds and Mach.
DesignPoint read_point(Reader r, const std::optional<Airplane>& airplane, size_t index);
// /landing: a stall speed (needs the airplane; `factor` wing to section cl_max) or a Reynolds
// number.
LandingPoint read_landing(Reader r, const std::optional<Airplane>& airplane, double factor);

// case_limits.cpp: geometric and aerodynamic limits, the parameterization and the start shapes.

// min and max of a limit within [lo, hi] (at least one given; min <= max).
void read_min_max(Reader r, double& min, double& max, double lo, double hi);
// /constraints, checked against the design points and landing; `points_out` gets the design
// points with the case-wide cm limit filled in.
Constraints read_constraints(Reader r, const std::vector<DesignPoint>& points,
                             const LandingPoint& landing, std::vector<DesignPoint>& points_out);
// /parameterization.
Parameterization read_parameterization(Reader r);
// /baseline or /second_start: exactly one of naca, file (relative to `base_dir`) or cst.
Baseline read_baseline(Reader r, const std::filesystem::path& base_dir);

// case_options.cpp: the settings of the search, the analysis and the outputs.

// /optimizer; ranges by OptimizerOptions::Validate.
OptimizerOptions read_optimizer(Reader r);
// /analysis; ranges by AnalysisOptions::Validate.
AnalysisOptions read_analysis(Reader r);
// /outputs.
OutputOptions read_outputs(Reader r);
// Every flow the run will analyse (each design point and the landing point, under each
// transition scenario) as the viscous options of that analysis, checked by their Validate():
// what --check accepts, the run accepts. `r` is the document's root.
void check_analysis_options(const Reader& r, const Case& c);

}  // namespace fulmar::optimize::case_detail
