#pragma once
// The case file: everything one optimization needs, read from JSON and validated before any work
// starts. The schema is documented in cases/README.md. Every error is an InputError whose message
// names the file, the JSON path (RFC 6901 pointer, e.g. /constraints/cl_max/min) and the rule.
#include <filesystem>
#include <limits>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "flight/flight_conditions.h"
#include "optimize/search_options.h"

namespace fulmar::optimize {

// The schema version this build reads (the case file's "schema_version").
inline constexpr int kCaseSchemaVersion = 1;

inline constexpr double kNone = std::numeric_limits<double>::quiet_NaN();

// Where the flow leaves laminar: the critical amplification factor of the e^N method and the
// forced transition x/c on each surface (1 = free transition). One scenario of the robustness set.
struct TransitionScenario {
  std::string name = "free";
  double ncrit = 9.0;       // critical N, (0, 20]
  double trip_upper = 1.0;  // x/c of a trip on the upper surface, (0, 1]; 1 = none
  double trip_lower = 1.0;  // same, lower surface
  double weight = 1.0;      // share in the drag objective, > 0
};

// One design point: the section must give `cl` here, and its drag counts with `weight`.
struct DesignPoint {
  std::string name;
  double cl = 0;          // section lift coefficient
  double reynolds = 0;    // chord Reynolds number
  double mach = 0;        // free-stream Mach number, [0, 0.7)
  double weight = 1.0;    // share in the objective, > 0
  double cm_min = kNone;  // cm about c/4 must be >= this here (NaN: no limit)
  // Filled when the point came from a flight point of the airplane (for the report):
  bool from_airplane = false;
  double speed = kNone;           // m/s true airspeed
  double altitude = kNone;        // m
  double temperature_offset = 0;  // K
};

// The landing (stall) condition where cl_max is required.
struct LandingPoint {
  bool present = false;
  double reynolds = 0;
  double mach = 0;
  double cl_max_required = kNone;  // from the stall speed (NaN when Re/M were given directly)
  double stall_speed = kNone;      // m/s, when given
  double altitude = kNone;         // m, when given
  double wing_to_section = kWingToSectionFactor;
};

// Limits on the section. NaN means "no limit". Lengths are chord fractions.
struct SparLimit {
  double x = 0;    // chord station, (0, 1)
  double min = 0;  // thickness there must be >= min, > 0
};
struct Constraints {
  double cl_max_min = kNone;  // cl_max at the landing point >= (resolved: explicit or from stall)
  double thickness_min = kNone;
  std::vector<SparLimit> spars;
  double te_gap_min = kNone, te_gap_max = kNone;
  double te_angle_min_deg = kNone;
  double le_radius_min = kNone;
  double area_min = kNone;
  double thickness_x_min = kNone, thickness_x_max = kNone;
  // Geometric validity (always on): positive thickness everywhere and at most this many changes of
  // sign of the curvature on each surface (a smooth section has none on the upper surface and at
  // most one on the lower surface of an aft-loaded section).
  int max_reversals_upper = 0;
  int max_reversals_lower = 1;
};

// CST design space: Bernstein degree per surface (coefficients = order + 1), the coefficient bounds
// and the trailing-edge thickness (held fixed).
struct Parameterization {
  int order_upper = 5;
  int order_lower = 5;
  double margin = 0.15;  // each coefficient may move this far (absolute) from the baseline
  double upper_min = kNone, upper_max = kNone;  // optional absolute bounds of upper coefficients
  double lower_min = kNone, lower_max = kNone;  // same for the lower surface
  double te_gap = kNone;  // total trailing-edge thickness / c; NaN: that of the baseline fit
};

// Where the search starts.
struct Baseline {
  enum class Kind { naca, file, cst };
  Kind kind = Kind::naca;
  std::string naca;            // designation digits, e.g. "2412"
  std::filesystem::path file;  // coordinate file (resolved against the case file's folder)
  nlohmann::json cst;          // CST JSON as written by fulmar (a SHAPE)
  std::string json_path;       // for messages about the baseline found later
};

// Resolution of the analyses.
struct AnalysisOptions {
  int panels = 160;         // panels during the search
  int verify_panels = 240;  // panels of the final re-verification (finer)
  // The search asks for cl_max >= limit + this margin (absolute); the verification judges the
  // limit itself. Covers the difference between the search's and the verification's panelling
  // near stall (measured 0.002-0.005 on the demo's optima), so that the search's best design
  // still meets the limit when verified. 0 to 0.2.
  double search_cl_max_margin = 0.005;
  double polar_alpha_min = -6, polar_alpha_max = 18, polar_alpha_step = 0.5;  // degrees
  void Validate() const;
};

struct OutputOptions {
  int points = 161;    // points per written coordinate file
  bool plots = true;   // SVG plots
  bool report = true;  // Markdown report
  bool polars = true;  // polar CSV files
  // CAD files of the optimized section ("outputs": {"cad": {"formats": ["step", "dxf"],
  // "chord": 1350, "units": "mm"}}): one file per format, B-splines within 1e-5 chord. The chord
  // defaults to the airplane's chord in the chosen units.
  std::vector<std::string> cad_formats;  // "dxf", "iges", "step", "svg", "csv"
  double cad_chord = 0;                  // in cad_units; 0: the airplane's chord
  std::string cad_units = "mm";          // "mm", "m" or "in"
};

struct Case {
  std::filesystem::path path;  // the case file
  std::string name;
  std::string description;
  std::optional<Airplane> airplane;
  std::vector<DesignPoint> points;
  std::vector<TransitionScenario> scenarios;  // at least one; the first is the nominal one
  LandingPoint landing;
  Constraints constraints;
  Parameterization parameterization;
  Baseline baseline;
  // Where a second local search starts (same forms as the baseline), after the one from the
  // baseline; each gets half the evaluation budget and the result is the best design of both.
  // A trade study keeps it for every point, whose baseline is its neighbour's optimum, so every
  // point also searches from this fixed design.
  std::optional<Baseline> second_start;
  OptimizerOptions optimizer;
  AnalysisOptions analysis;
  OutputOptions outputs;
  nlohmann::json source;  // the case JSON as read (its dump fingerprints checkpoints)
};

// Reads and validates a case file. Resolves flight points through the standard atmosphere and the
// lift equation, the stall speed into the required cl_max, relative baseline paths against the
// case file's folder. Throws InputError "FILE: /json/path: rule" at the first problem.
Case load_case(const std::filesystem::path& path);

// Same, from JSON text already read (`label` is the name used in messages; relative paths resolve
// against `base_dir`).
Case parse_case(const std::string& text, const std::string& label,
                const std::filesystem::path& base_dir);

// The folder that holds `file`: its parent path, or "." for a bare file name, so that paths
// relative to it resolve and it can be made absolute (an empty path cannot).
std::filesystem::path folder_of(const std::filesystem::path& file);

}  // namespace fulmar::optimize
