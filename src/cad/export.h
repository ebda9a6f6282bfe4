#pragma once
// Export of a wing section to CAD files: the entry point the export command, the optimizer and
// the study outputs call.
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "cad/placement.h"
#include "cad/section_fit.h"
#include "cad/writers.h"
#include "geometry/section.h"

namespace fulmar::cad {

enum class CadFormat { dxf, iges, step, csv, svg };

std::string to_string(CadFormat format);  // "dxf", "iges", "step", "csv", "svg"
// Parses a format name; throws InputError naming `what` and the accepted names otherwise.
CadFormat cad_format_from_string(const std::string& text, const std::string& what = "format");

struct ExportOptions {
  CadFormat format = CadFormat::step;
  Placement placement;      // chord (in units), units, twist (deg, nose up +), pivot, offset
  double tolerance = 1e-5;  // largest deviation of the exported curve from the section, chord
                            // fractions (see FitOptions for the exact stopping rule)
  int degree = 3;           // B-spline degree, 3..7
  bool polyline = false;    // straight segments through the section points instead of splines
  bool close_te = false;    // close the trailing-edge gap first (close_trailing_edge)
  bool split = false;       // upper and lower surfaces as two curves meeting at the LE
  std::string timestamp;    // UTC "YYYY-MM-DDTHH:MM:SS" for the file headers; empty: now
  void Validate() const;    // throws InputError naming the field, its value and the rule
};

struct ExportReport {
  CadFormat format = CadFormat::step;
  std::filesystem::path path;
  std::string kind;                   // "bspline", "polyline" or "points"
  bool tolerance_met = false;         // B-splines: largest deviation <= tolerance; else true
  double max_deviation = 0.0;         // chord fractions, from the section's interpolant and points
  double max_deviation_length = 0.0;  // the same in the export units
  double tolerance = 0.0;             // chord fractions (B-splines only; 0 otherwise)
  int curves = 0;
  int control_points = 0;       // total; vertices for a polyline
  std::vector<double> history;  // B-splines: largest deviation after each refinement round
  std::string units;            // "mm", "m", "in"
  std::string message;          // what was written and the measured deviation
  nlohmann::json to_json() const;
};

// The drawing (placed curves and points) and the fit behind it, without writing anything.
// Throws InputError for bad options or a section that cannot be exported.
CadDrawing build_drawing(const Section& section, const ExportOptions& options,
                         ExportReport& report);

// Writes `section` (chord-normalised, TE upper -> LE -> TE lower) to `path` in options.format,
// atomically. Bad options, a bad section or an unwritable path throw InputError before anything
// is written. A fit that misses the tolerance is still written; report.tolerance_met says so.
ExportReport export_section(const Section& section, const ExportOptions& options,
                            const std::filesystem::path& path);

}  // namespace fulmar::cad
