#include "cad/export.h"

#include <cmath>
#include <sstream>

#include "common/atomic_file.h"
#include "common/enum_names.h"
#include "common/error.h"

namespace fulmar::cad {

namespace {

const EnumNames<CadFormat> kFormats{{CadFormat::dxf, "dxf"},
                                    {CadFormat::iges, "iges"},
                                    {CadFormat::step, "step"},
                                    {CadFormat::csv, "csv"},
                                    {CadFormat::svg, "svg"}};

}  // namespace

std::string to_string(CadFormat format) {
  return kFormats.name(format);
}

CadFormat cad_format_from_string(const std::string& text, const std::string& what) {
  // The message of the option's rule ("must be one of"), not EnumNames' "unknown": the case
  // file and the command line re-word it by its rule.
  if (const auto value = kFormats.find(text)) return *value;
  throw InputError(what + " = '" + text + "': must be one of " + kFormats.list());
}

void ExportOptions::Validate() const {
  placement.Validate();
  FitOptions fit;
  fit.tolerance = tolerance;
  fit.degree = degree;
  fit.Validate();
}

nlohmann::json ExportReport::to_json() const {
  nlohmann::json j;
  j["format"] = to_string(format);
  j["path"] = path.string();
  j["kind"] = kind;
  j["tolerance_met"] = tolerance_met;
  j["max_deviation"] = max_deviation;
  j["max_deviation_length"] = max_deviation_length;
  j["tolerance"] = tolerance;
  j["units"] = units;
  j["curves"] = curves;
  j["control_points"] = control_points;
  j["history"] = history;
  j["message"] = message;
  return j;
}

namespace {

// A polyline as a degree-1 B-spline with its vertices as control points, parameterised by
// cumulative chord length scaled to [0, 1].
BSplineCurve polyline_curve(const Points& p) {
  const int n = static_cast<int>(p.rows());
  BSplineCurve c;
  c.degree = 1;
  c.control = p;
  c.knots.resize(n + 2);
  std::vector<double> s(n, 0.0);
  for (int i = 1; i < n; ++i) s[i] = s[i - 1] + (p.row(i) - p.row(i - 1)).norm();
  c.knots(0) = 0.0;
  for (int i = 0; i < n; ++i) c.knots(i + 1) = s[i] / s[n - 1];
  c.knots(n + 1) = 1.0;
  return c;
}

}  // namespace

CadDrawing build_drawing(const Section& input, const ExportOptions& options, ExportReport& report) {
  options.Validate();
  Section section = cleaned_section(input);
  if (options.close_te) section = close_trailing_edge(section);
  const Placement& pl = options.placement;
  CadDrawing d;
  d.name = section.name;
  d.placement = pl;
  d.timestamp = options.timestamp.empty() ? utc_timestamp() : options.timestamp;
  d.resolution = 1e-7 * pl.chord;
  d.section_points = placed_points(pl, section.points);
  const int le = leading_edge_index(section.points);
  const int n = static_cast<int>(section.points.rows());
  d.chord_line.resize(2, 3);
  d.chord_line.row(0) = placed_point(pl, section.points.row(le).transpose()).transpose();
  d.chord_line.row(1) =
      placed_point(pl, (0.5 * (section.points.row(0) + section.points.row(n - 1))).transpose())
          .transpose();

  report = ExportReport{};
  report.format = options.format;
  report.units = to_string(pl.units);
  const bool points_only = options.format == CadFormat::csv;
  if (points_only || options.polyline) {
    report.kind = points_only ? "points" : "polyline";
    report.tolerance_met = true;
    report.max_deviation = polyline_deviation(section);
    if (options.split) {
      d.curves.push_back(polyline_curve(section.points.topRows(le + 1)));
      d.curves.push_back(polyline_curve(section.points.bottomRows(n - le)));
      d.curve_names = {"upper", "lower"};
    } else {
      d.curves.push_back(polyline_curve(section.points));
      d.curve_names = {"section"};
    }
    for (BSplineCurve& c : d.curves) {
      c = placed_curve(pl, c);
      report.control_points += c.control_count();
    }
  } else {
    FitOptions fit_options;
    fit_options.tolerance = options.tolerance;
    fit_options.degree = options.degree;
    fit_options.split = options.split;
    const FittedSection fit = fit_section(section, fit_options);
    report.kind = "bspline";
    report.tolerance_met = fit.converged;
    report.max_deviation = fit.max_deviation;
    report.tolerance = options.tolerance;
    report.history = fit.history;
    report.control_points = fit.control_points;
    for (const BSplineCurve& c : fit.curves) d.curves.push_back(placed_curve(pl, c));
    d.curve_names = options.split ? std::vector<std::string>{"upper", "lower"}
                                  : std::vector<std::string>{"section"};
  }
  report.curves = static_cast<int>(d.curves.size());
  report.max_deviation_length = report.max_deviation * pl.chord;
  return d;
}

ExportReport export_section(const Section& section, const ExportOptions& options,
                            const std::filesystem::path& path) {
  options.Validate();
  require_writable(path);
  ExportReport report;
  CadDrawing d = build_drawing(section, options, report);
  d.file_name = path.filename().string();
  std::string text;
  switch (options.format) {
    case CadFormat::dxf:
      text = dxf_text(d);
      break;
    case CadFormat::iges:
      text = iges_text(d);
      break;
    case CadFormat::step:
      text = step_text(d);
      break;
    case CadFormat::csv:
      text = csv_text(d);
      break;
    case CadFormat::svg:
      text = svg_text(d);
      break;
  }
  write_file_atomically(path, text);
  report.path = path;
  std::ostringstream msg;
  msg.precision(3);
  msg << "wrote " << path.string() << " (" << to_string(options.format) << ", " << report.curves
      << (report.curves == 1 ? " " : " ") << report.kind
      << (report.curves == 1 ? " curve" : " curves") << ", " << report.control_points
      << (report.kind == "bspline" ? " control points" : " points") << "); largest deviation "
      << report.max_deviation << " chord = " << report.max_deviation_length << " " << report.units;
  if (report.kind == "bspline") {
    msg << (report.tolerance_met ? " <= " : " > ") << "tolerance " << report.tolerance << " chord";
    if (!report.tolerance_met) msg << ": TOLERANCE NOT MET";
  } else {
    msg << " (straight segments against the smooth section)";
  }
  report.message = msg.str();
  return report;
}

}  // namespace fulmar::cad
