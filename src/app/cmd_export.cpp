// `fulmar export`: a section to CAD (DXF, IGES, STEP) or to points (CSV) and a drawing (SVG).
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "app/commands.h"
#include "cad/export.h"
#include "common/number_text.h"
#include "common/rule_check.h"
#include "geometry/shape_source.h"

namespace fulmar::app {
namespace {

struct ExportArgs {
  std::string shape;
  std::string format;
  double chord = 0.0;
  std::string units = "mm";
  double twist = 0.0;
  double pivot = 0.25;
  std::vector<double> offset{0.0, 0.0, 0.0};  // X Y Z
  double tolerance = 1e-5;
  int degree = 3;
  bool polyline = false;
  bool close_te = false;
  bool split = false;
  bool json = false;
  std::string output;
};

// Each number by the rule of cad::ExportOptions::Validate (placement and fit); the error names
// the option.
void check_export_args(const ExportArgs& a) {
  auto check = [](const char* option, double value, auto&& set) {
    check_at(option, general_text(value, 10), [&] {
      cad::ExportOptions probe;
      set(probe);
      probe.Validate();
    });
  };
  check("--chord", a.chord, [&](cad::ExportOptions& p) { p.placement.chord = a.chord; });
  check("--twist", a.twist, [&](cad::ExportOptions& p) { p.placement.twist_deg = a.twist; });
  check("--pivot", a.pivot, [&](cad::ExportOptions& p) { p.placement.pivot = a.pivot; });
  check("--tolerance", a.tolerance, [&](cad::ExportOptions& p) { p.tolerance = a.tolerance; });
  check("--degree", a.degree, [&](cad::ExportOptions& p) { p.degree = a.degree; });
}

void run_export(const ExportArgs& a) {
  check_export_args(a);
  cad::ExportOptions o;
  o.format = cad::cad_format_from_string(a.format, "--format");
  o.placement.units = cad::length_unit_from_string(a.units, "--units");
  o.placement.chord = a.chord;
  o.placement.twist_deg = a.twist;
  o.placement.pivot = a.pivot;
  o.placement.offset = Eigen::Vector3d(a.offset[0], a.offset[1], a.offset[2]);
  o.tolerance = a.tolerance;
  o.degree = a.degree;
  o.polyline = a.polyline;
  o.close_te = a.close_te;
  o.split = a.split;
  o.Validate();
  const Section section = load_shape(a.shape);
  const cad::ExportReport r = cad::export_section(section, o, a.output);
  if (a.json) {
    std::cout << r.to_json().dump(2) << "\n";
  } else {
    std::cout << r.message << "\n";
  }
  if (!r.tolerance_met) {
    std::cerr << "fulmar: warning: the B-spline misses the tolerance (" << r.message
              << "); try a larger --tolerance or --degree\n";
  }
}

}  // namespace

void add_export_command(CLI::App& app) {
  auto a = std::make_shared<ExportArgs>();
  CLI::App* cmd = app.add_subcommand(
      "export",
      "Write a section for CAD: B-spline curves fitted to the section (least squares, knots added "
      "where the curve is furthest off until the largest deviation is within --tolerance; the "
      "deviation reached is printed), or straight segments with --polyline. DXF (R2000, SPLINE / "
      "LWPOLYLINE), IGES 5.3 (entity 126), STEP AP214 (B_SPLINE_CURVE_WITH_KNOTS), CSV points, "
      "SVG drawing.\n\n"
      "Axes: the section lies in the x-y plane at z = offset z; x from the leading edge to the "
      "trailing edge, y up (towards the upper surface), z along the span. Positive twist is nose "
      "up: the section turns about the axis through x/c = --pivot on the chord line, parallel "
      "to z, so that the leading edge rises. At zero twist the leading edge is at the offset "
      "point. Lengths (chord, offset) are in --units, and so is the file.\n\n" +
          std::string(kCaution));
  cmd->add_option("SHAPE", a->shape,
                  "Section: NACA designation (naca2412), CST JSON written by fulmar, or "
                  "coordinate file")
      ->required();
  cmd->add_option("--format", a->format, "dxf, iges, step, csv or svg")->required();
  cmd->add_option("--chord", a->chord, "Chord length, in --units")->required();
  cmd->add_option("--units", a->units,
                  "Length unit of chord, offset and file: mm (default), m, in");
  cmd->add_option("--twist", a->twist, "Twist, degrees, positive nose up (default 0)");
  cmd->add_option("--pivot", a->pivot, "Twist axis position, x/c on the chord line (default 0.25)");
  cmd->add_option("--offset", a->offset,
                  "Position X Y Z of the leading edge (untwisted), in --units")
      ->expected(3);
  cmd->add_option("--tolerance", a->tolerance,
                  "Largest deviation of the B-spline from the section, fraction of the chord "
                  "(default 1e-5)");
  cmd->add_option("--degree", a->degree, "B-spline degree, 3 (default) to 7");
  cmd->add_flag("--polyline", a->polyline, "Straight segments through the section points");
  cmd->add_flag("--close-te", a->close_te,
                "Close the trailing-edge gap (each surface moves by half the gap times x/c)");
  cmd->add_flag("--split", a->split,
                "Upper and lower surfaces as two curves meeting at the leading edge");
  cmd->add_flag("--json", a->json, "Print the export report as one JSON object");
  cmd->add_option("-o,--output", a->output, "File to write (replaced atomically)")->required();
  cmd->callback([a]() { run_export(*a); });
}

}  // namespace fulmar::app
