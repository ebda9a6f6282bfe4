// `fulmar shape`: section geometry from a NACA designation, a CST JSON or a coordinate file.
#include <cmath>
#include <cstdio>
#include <iostream>
#include <memory>
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "app/cli_checks.h"
#include "app/commands.h"
#include "common/atomic_file.h"
#include "common/error.h"
#include "common/rule_check.h"
#include "geometry/coordinates_io.h"
#include "geometry/cst.h"
#include "geometry/metrics.h"
#include "geometry/naca.h"
#include "geometry/shape_source.h"

namespace fulmar::app {
namespace {

constexpr const char* kShapeHelp =
    "SHAPE is a NACA designation (naca2412, naca23012, naca0012), a CST JSON file written by "
    "'fulmar shape fit', or a coordinate file: plain text 'x y' rows (optional name line, '#' "
    "comments) or CSV with x and y columns, from the trailing edge over one surface to the "
    "leading edge and back.";

struct NacaArgs {
  std::string digits;
  int points = 120;
  bool closed_te = false;
  std::string output;
  bool json = false;
};

struct InfoArgs {
  std::string shape;
  std::optional<double> at;
  bool json = false;
};

struct FitArgs {
  std::string shape;
  int order = 8;
  std::optional<int> order_upper, order_lower;
  std::string output;
  bool json = false;
};

double finite(double v, const std::string& what, const std::string& shape) {
  if (!std::isfinite(v)) {
    throw InputError("shape '" + shape + "': the " + what +
                     " is not a finite number; the section is degenerate");
  }
  return v;
}

void run_naca(const NacaArgs& a) {
  // --points by naca_section's own rule (a probe on a plain section names the option).
  check_at("--points", std::to_string(a.points), [&] { naca_section("0012", a.points, false); });
  require_writable(a.output);
  const Section s = naca_section(a.digits, a.points, a.closed_te);
  write_coordinates(a.output, s);
  if (a.json) {
    std::cout << nlohmann::json{{"name", s.name},
                                {"points", s.points.rows()},
                                {"closed_te", a.closed_te},
                                {"output", a.output}}
                     .dump(2)
              << "\n";
  } else {
    std::printf("%s: %d points written to %s\n", s.name.c_str(), static_cast<int>(s.points.rows()),
                a.output.c_str());
  }
}

void run_info(const InfoArgs& a) {
  const ShapeSource src = load_shape_source(a.shape);
  const Section& s = src.section;
  const SectionMetrics m = section_metrics(s);
  const CurvatureReversals rev = curvature_reversals(s);
  const bool crossing = self_intersects(s);
  std::optional<double> t_at;
  if (a.at) t_at = finite(thickness_at(s, *a.at), "thickness at x/c", a.shape);
  nlohmann::json j{{"name", s.name},
                   {"source", to_string(src.kind)},
                   {"points", s.points.rows()},
                   {"thickness", finite(m.thickness, "maximum thickness", a.shape)},
                   {"thickness_x", finite(m.thickness_x, "maximum thickness position", a.shape)},
                   {"camber", finite(m.camber, "maximum camber", a.shape)},
                   {"camber_x", finite(m.camber_x, "maximum camber position", a.shape)},
                   {"le_radius", finite(m.le_radius, "leading-edge radius", a.shape)},
                   {"te_gap", finite(m.te_gap, "trailing-edge gap", a.shape)},
                   {"te_angle_deg", finite(m.te_angle_deg, "trailing-edge angle", a.shape)},
                   {"area", finite(m.area, "area", a.shape)},
                   {"self_intersects", crossing},
                   {"curvature_reversals", {{"upper", rev.upper}, {"lower", rev.lower}}}};
  if (t_at) {
    j["at"] = *a.at;
    j["thickness_at"] = *t_at;
  }
  if (src.normalisation) {
    const Normalisation& n = *src.normalisation;
    j["normalisation"] = {{"applied", n.applied},
                          {"chord", n.chord},
                          {"rotation_deg", n.rotation_deg},
                          {"leading_edge", {n.leading_edge.x(), n.leading_edge.y()}},
                          {"reversed", n.reversed},
                          {"repeats_dropped", n.repeats_dropped}};
  }
  if (a.json) {
    std::cout << j.dump(2) << "\n";
    return;
  }
  std::printf("%s (%s, %d points)\n", s.name.c_str(), to_string(src.kind).c_str(),
              static_cast<int>(s.points.rows()));
  std::printf("  maximum thickness  %9.5f c  at x/c = %.4f\n", m.thickness, m.thickness_x);
  std::printf("  maximum camber     %9.5f c  at x/c = %.4f\n", m.camber, m.camber_x);
  if (t_at) std::printf("  thickness at x/c = %.4f: %.5f c\n", *a.at, *t_at);
  std::printf("  leading-edge radius %8.5f c\n", m.le_radius);
  std::printf("  trailing-edge gap  %9.5f c, wedge angle %.2f deg\n", m.te_gap, m.te_angle_deg);
  std::printf("  area               %9.5f c^2\n", m.area);
  std::printf("  curvature reversals: upper %d, lower %d\n", rev.upper, rev.lower);
  std::printf("  self-intersecting: %s\n", crossing ? "YES" : "no");
  if (src.normalisation) {
    const Normalisation& n = *src.normalisation;
    if (n.applied) {
      std::printf(
          "  normalised: chord %.6g file units, rotated %.4f deg, leading edge was at "
          "(%.6g, %.6g)\n",
          n.chord, n.rotation_deg, n.leading_edge.x(), n.leading_edge.y());
    } else {
      std::printf("  already on the unit chord: no normalisation applied\n");
    }
    if (n.reversed) std::printf("  point order reversed (file ran lower surface first)\n");
    if (n.repeats_dropped > 0) std::printf("  repeated points dropped: %d\n", n.repeats_dropped);
  }
  std::printf("\n%s\n", kCaution);
}

void run_fit(const FitArgs& a) {
  require_writable(a.output);
  const int ou = a.order_upper.value_or(a.order), ol = a.order_lower.value_or(a.order);
  // The orders by fit_cst's own rule, tried on a plain section so that the error names the option.
  const Section probe = naca_section("0012", 60, false);
  check_at(a.order_upper ? "--order-upper" : "--order", std::to_string(ou),
           [&] { fit_cst(probe, ou, ou); });
  check_at(a.order_lower ? "--order-lower" : "--order", std::to_string(ol),
           [&] { fit_cst(probe, ol, ol); });
  const Section s = load_shape(a.shape);
  const CstFit fit = fit_cst(s, ou, ol);
  const double dev = finite(fit.max_deviation, "fit deviation", a.shape);
  nlohmann::json file = cst_to_json(fit.shape, s.name);
  file["fit"] = {{"source", a.shape},
                 {"max_deviation", dev},
                 {"max_vertical_deviation", fit.max_vertical_deviation},
                 {"nose_offset", {fit.le_x, fit.le_y}},
                 {"scale", fit.scale}};
  write_file_atomically(a.output, file.dump(2) + "\n");
  if (a.json) {
    std::cout << nlohmann::json{{"name", s.name},
                                {"order_upper", ou},
                                {"order_lower", ol},
                                {"max_deviation", dev},
                                {"max_vertical_deviation", fit.max_vertical_deviation},
                                {"nose_offset", {fit.le_x, fit.le_y}},
                                {"scale", fit.scale},
                                {"output", a.output}}
                     .dump(2)
              << "\n";
  } else {
    std::printf(
        "%s: CST of order %d (upper) / %d (lower), largest deviation %.3g chord; "
        "written to %s\n",
        s.name.c_str(), ou, ol, dev, a.output.c_str());
  }
}

}  // namespace

void add_shape_command(CLI::App& app) {
  CLI::App* shape =
      app.add_subcommand("shape",
                         "Section geometry: NACA sections, CST fits, coordinate files and their "
                         "measures.\n\n" +
                             std::string(kShapeHelp) + "\n\n" + std::string(kCaution));
  shape->require_subcommand(1);

  auto na = std::make_shared<NacaArgs>();
  CLI::App* naca = shape->add_subcommand(
      "naca",
      "Write the coordinates of a NACA four-digit (Report 460) or five-digit (Report "
      "537, mean lines 210..250) section, cosine-spaced, upper trailing edge first.\n\n" +
          std::string(kCaution));
  naca->add_option("DIGITS", na->digits, "Designation, e.g. 2412, 0012, 23012 (or naca2412)")
      ->required();
  naca->add_option("--points", na->points,
                   "Points per surface, leading and trailing edges "
                   "included (default 120)");
  naca->add_flag("--closed-te", na->closed_te,
                 "Closed trailing edge (thickness coefficient -0.1036 instead of -0.1015)");
  naca->add_option("-o,--output", na->output,
                   "Output file: CSV if it ends in .csv, else "
                   "plain text 'x y' rows with a name line")
      ->required();
  naca->add_flag("--json", na->json, "Print one JSON object");
  naca->callback([na]() { run_naca(*na); });

  auto ia = std::make_shared<InfoArgs>();
  CLI::App* info = shape->add_subcommand(
      "info",
      "Measures of a section: maximum thickness and camber with their positions, "
      "leading-edge radius, trailing-edge gap and wedge angle, area, curvature "
      "reversals, self-intersection; thickness at a chord station with --at.\n\n" +
          std::string(kShapeHelp) + "\n\n" + std::string(kCaution));
  info->add_option("SHAPE", ia->shape, "The section")->required();
  info->add_option("--at", ia->at, "Chord station x/c for the thickness (spar depth), 0 to 1")
      ->check(within(0.0, 1.0));
  info->add_flag("--json", ia->json,
                 "Print one JSON object (keys thickness, thickness_x, camber, camber_x, "
                 "le_radius, te_gap, te_angle_deg, area, thickness_at; chord fractions)");
  info->callback([ia]() { run_info(*ia); });

  auto fa = std::make_shared<FitArgs>();
  CLI::App* fit = shape->add_subcommand(
      "fit",
      "Fit a CST (Kulfan class/shape, Bernstein) representation to a section by least "
      "squares and write it as a CST JSON file, itself usable as SHAPE.\n\n" +
          std::string(kShapeHelp) + "\n\n" + std::string(kCaution));
  fit->add_option("SHAPE", fa->shape, "The section to fit")->required();
  fit->add_option("--order", fa->order, "Bernstein order of both surfaces (default 8)");
  fit->add_option("--order-upper", fa->order_upper, "Bernstein order of the upper surface");
  fit->add_option("--order-lower", fa->order_lower, "Bernstein order of the lower surface");
  fit->add_option("-o,--output", fa->output, "CST JSON file to write")->required();
  fit->add_flag("--json", fa->json, "Print one JSON object (key max_deviation, chord fractions)");
  fit->callback([fa]() { run_fit(*fa); });
}

}  // namespace fulmar::app
