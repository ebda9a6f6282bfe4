// Exported files read back by independent readers from Debian's packages: OpenCASCADE for IGES
// and STEP (tests/cad/occt_probe.cpp), ezdxf for DXF (tests/cad/dxf_probe.py). The curve each
// reader finds is sampled and checked against the section it came from, at the requested chord,
// units, twist and offset, with the placement recomputed here from its definition (not with the
// library's code):
//  1. every section point lies within the tolerance of the curve read back;
//  2. every sample of the curve read back lies within the tolerance of the analytic section
//     (NACA Report 460 formula) the points were taken from, in the plane z = offset z.
#include <gtest/gtest.h>

#include <unistd.h>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <iostream>
#include <map>
#include <numbers>
#include <sstream>

#include "cad/export.h"
#include "cad/naca_test_section.h"

namespace fulmar::cad {
namespace {

struct ReadBack {
  int curves = -1;
  std::vector<std::string> curve_lines;
  std::map<int, std::vector<Eigen::Vector3d>> samples;
  std::vector<double> distances;
  std::map<std::string, std::string> info;  // first word -> rest of line (units, audit, ...)
};

std::string run(const std::string& command) {
  std::string out;
  FILE* pipe = ::popen(command.c_str(), "r");
  if (!pipe) return out;
  char buf[4096];
  while (size_t n = std::fread(buf, 1, sizeof buf, pipe)) out.append(buf, n);
  const int status = ::pclose(pipe);
  if (status != 0) out += "\nEXIT " + std::to_string(status);
  return out;
}

ReadBack parse(const std::string& text) {
  ReadBack r;
  std::istringstream in(text);
  for (std::string line; std::getline(in, line);) {
    std::istringstream ls(line);
    std::string word;
    ls >> word;
    if (word == "sample") {
      int i;
      double x, y, z;
      ls >> i >> x >> y >> z;
      r.samples[i].emplace_back(x, y, z);
    } else if (word == "distance") {
      int j;
      double d;
      ls >> j >> d;
      r.distances.push_back(d);
    } else if (word == "curves") {
      ls >> r.curves;
    } else if (word == "curve") {
      r.curve_lines.push_back(line);
    } else if (!word.empty()) {
      std::string rest;
      std::getline(ls, rest);
      r.info[word] = rest;
    }
  }
  return r;
}

struct Case {
  const char* label;
  CadFormat format;
  LengthUnit units;
  double chord;
  double twist;
  double pivot;
  Eigen::Vector3d offset;
  bool split;
  bool polyline;
  double tolerance;
  const char* digits;
};

std::ostream& operator<<(std::ostream& o, const Case& c) {
  return o << c.label;
}

double mm_per(LengthUnit u) {
  return u == LengthUnit::mm ? 1.0 : u == LengthUnit::m ? 1000.0 : 25.4;
}

// The placement from its documented definition: scale by the chord, turn nose up (clockwise seen
// from +z) by the twist about (pivot, 0), translate by the offset; result in `units`.
Eigen::Vector3d expected_point(const Case& c, const Eigen::Vector2d& q) {
  const double a = c.twist * std::numbers::pi / 180.0;
  const double dx = q.x() - c.pivot;
  const double dy = q.y();
  const double x = c.pivot + std::cos(a) * dx + std::sin(a) * dy;
  const double y = -std::sin(a) * dx + std::cos(a) * dy;
  return c.offset + c.chord * Eigen::Vector3d(x, y, 0.0);
}

// Back from the model (in `units`) to the chord frame.
Eigen::Vector2d chord_frame(const Case& c, const Eigen::Vector3d& p) {
  const double a = c.twist * std::numbers::pi / 180.0;
  const double x = (p.x() - c.offset.x()) / c.chord - c.pivot;
  const double y = (p.y() - c.offset.y()) / c.chord;
  return {c.pivot + std::cos(a) * x - std::sin(a) * y, std::sin(a) * x + std::cos(a) * y};
}

// Distance from q to the polyline through samples, less the sagitta the true curve can have
// between two samples (|second difference| / 8, elementary geometry for a smooth arc).
double distance_to_sampled_curve(const Eigen::Vector3d& q, const std::vector<Eigen::Vector3d>& s,
                                 bool exact_segments) {
  double best = 1e300;
  for (size_t k = 0; k + 1 < s.size(); ++k) {
    const Eigen::Vector3d ab = s[k + 1] - s[k];
    const double t = std::clamp((q - s[k]).dot(ab) / std::max(ab.squaredNorm(), 1e-300), 0.0, 1.0);
    double d = (s[k] + t * ab - q).norm();
    if (!exact_segments) {
      double sag = 0.0;
      if (k > 0) sag = std::max(sag, (s[k + 1] - 2 * s[k] + s[k - 1]).norm() / 8);
      if (k + 2 < s.size()) sag = std::max(sag, (s[k + 2] - 2 * s[k + 1] + s[k]).norm() / 8);
      d = std::max(0.0, d - sag);
    }
    best = std::min(best, d);
  }
  return best;
}

class ReaderCheck : public ::testing::TestWithParam<Case> {};

TEST_P(ReaderCheck, CurveReadBackMatchesTheSection) {
  const Case c = GetParam();
  const Section section = testing::naca4_section(c.digits, 200);
  const double m = (c.digits[0] - '0') / 100.0;
  const double p = (c.digits[1] - '0') / 10.0;
  const double t = std::stod(std::string(c.digits).substr(2)) / 100.0;

  const auto dir = std::filesystem::temp_directory_path() /
                   ("fulmar_reader_check_" + std::to_string(::getpid()));
  std::filesystem::create_directories(dir);
  const std::string ext = c.format == CadFormat::iges   ? "igs"
                          : c.format == CadFormat::step ? "stp"
                                                        : "dxf";
  const auto file = dir / (std::string(c.label) + "." + ext);
  ExportOptions o;
  o.format = c.format;
  o.placement.chord = c.chord;
  o.placement.units = c.units;
  o.placement.twist_deg = c.twist;
  o.placement.pivot = c.pivot;
  o.placement.offset = c.offset;
  o.split = c.split;
  o.polyline = c.polyline;
  o.tolerance = c.tolerance;
  const ExportReport report = export_section(section, o, file);
  ASSERT_TRUE(report.tolerance_met) << report.message;

  // Readers report lengths in mm (OpenCASCADE converts to its session unit, set to mm) or in the
  // file's own units (ezdxf).
  const bool occt = c.format != CadFormat::dxf;
  const double scale = occt ? mm_per(c.units) : 1.0;
  const auto points_file = dir / (std::string(c.label) + ".points");
  {
    std::ofstream pf(points_file);
    pf.precision(17);
    for (Eigen::Index i = 0; i < section.points.rows(); ++i) {
      const Eigen::Vector3d e = scale * expected_point(c, section.points.row(i).transpose());
      pf << e.x() << " " << e.y() << " " << e.z() << "\n";
    }
  }
  constexpr int kSamples = 2001;
  const std::string command =
      occt ? std::string(FULMAR_CAD_OCCT_PROBE) + " " +
                 (c.format == CadFormat::iges ? "iges" : "step") + " '" + file.string() + "' " +
                 std::to_string(kSamples) + " '" + points_file.string() + "' 2>&1"
           : std::string(FULMAR_CAD_PYTHON) + " " + FULMAR_CAD_DXF_PROBE + " '" + file.string() +
                 "' " + std::to_string(kSamples) + " 2>&1";
  const std::string out = run(command);
  ASSERT_EQ(out.find("EXIT"), std::string::npos) << command << "\n" << out;
  const ReadBack r = parse(out);
  ASSERT_EQ(r.curves, c.split ? 2 : 1) << out.substr(0, 2000);

  // What the reader says the curves are.
  const int degree = c.polyline ? 1 : 3;
  int poles = 0;
  for (const std::string& line : r.curve_lines) {
    std::istringstream ls(line);
    std::string w, type, dw, pw;
    int i, deg, np;
    ls >> w >> i >> w >> type >> dw >> deg >> pw >> np;
    EXPECT_EQ(deg, degree) << line;
    if (!c.polyline) {
      EXPECT_TRUE(type == "bspline" || type == "spline") << line;
    }
    poles += np;
  }
  EXPECT_EQ(poles, report.control_points);
  if (!occt) {
    EXPECT_EQ(r.info.at("audit"), " errors 0 fixes 0") << out.substr(0, 2000);
    EXPECT_EQ(r.info.at("version"), " AC1015");
    const int insunits = c.units == LengthUnit::mm ? 4 : c.units == LengthUnit::m ? 6 : 1;
    EXPECT_EQ(std::stoi(r.info.at("units")), insunits);
  }

  const double tol = c.tolerance * c.chord * scale;  // in the reader's length unit
  // 1. Section points to the curve read back.
  double worst_points = 0.0;
  if (occt) {
    ASSERT_EQ(r.distances.size(), static_cast<size_t>(section.points.rows()));
    for (double d : r.distances) worst_points = std::max(worst_points, d);
  } else {
    for (Eigen::Index i = 0; i < section.points.rows(); ++i) {
      const Eigen::Vector3d e = scale * expected_point(c, section.points.row(i).transpose());
      double best = 1e300;
      for (const auto& [k, s] : r.samples)
        best = std::min(best, distance_to_sampled_curve(e, s, c.polyline));
      worst_points = std::max(worst_points, best);
    }
  }
  // A polyline passes through the points: only the 15-digit numbers of the file remain.
  EXPECT_LE(worst_points, c.polyline ? 1e-9 * c.chord * scale : tol) << "points to curve";

  // 2. Curve samples to the analytic section, in the plane z = offset z.
  double worst_samples = 0.0;
  double worst_z = 0.0;
  for (const auto& [k, s] : r.samples) {
    for (const Eigen::Vector3d& q : s) {
      const Eigen::Vector3d model = q / scale;
      worst_z = std::max(worst_z, std::abs(model.z() - c.offset.z()));
      if (c.polyline) continue;  // straight segments cut the arcs by design
      worst_samples =
          std::max(worst_samples, testing::distance_to_naca(chord_frame(c, model), m, p, t, false));
    }
  }
  EXPECT_LE(worst_z, 1e-12 * (c.chord + std::abs(c.offset.z())));
  // The exported curve is fitted to the interpolant of 401 points, which itself differs from the
  // formula by the interpolation error of a natural cubic spline (measured in
  // cad_section_fit_test, below 1e-6 chord): that is the only allowance beyond the tolerance.
  if (!c.polyline) {
    EXPECT_LE(worst_samples, c.tolerance + 1e-6) << "curve to formula (chord)";
  }

  std::cout << "[ measured ] " << c.label << ": fit " << report.max_deviation
            << " chord; reader: points->curve " << worst_points / (c.chord * scale)
            << " chord, curve->formula " << worst_samples << " chord, |z - offset| " << worst_z
            << " " << to_string(c.units) << "\n";
  RecordProperty("points_to_curve_chord", std::to_string(worst_points / (c.chord * scale)));
  RecordProperty("curve_to_formula_chord", std::to_string(worst_samples));
  std::filesystem::remove(file);
  std::filesystem::remove(points_file);
}

const Eigen::Vector3d kZero = Eigen::Vector3d::Zero();

INSTANTIATE_TEST_SUITE_P(
    Formats, ReaderCheck,
    ::testing::Values(Case{"iges_mm", CadFormat::iges, LengthUnit::mm, 250, 0, 0.25, kZero, false,
                           false, 1e-5, "2412"},
                      Case{"iges_in_twist_split", CadFormat::iges, LengthUnit::in, 10, 3, 0.25,
                           Eigen::Vector3d(1, 2, 30), true, false, 1e-5, "2412"},
                      Case{"iges_m_tight", CadFormat::iges, LengthUnit::m, 1.1, -2, 0.3,
                           Eigen::Vector3d(0, 0, 2.5), false, false, 1e-6, "0012"},
                      Case{"step_mm_twist_offset", CadFormat::step, LengthUnit::mm, 250, -2, 0.25,
                           Eigen::Vector3d(5, -3, 1200), false, false, 1e-5, "2412"},
                      Case{"step_m_split", CadFormat::step, LengthUnit::m, 0.3, 4, 0.4,
                           Eigen::Vector3d(0.1, 0, 1), true, false, 1e-5, "4415"},
                      Case{"step_in_polyline", CadFormat::step, LengthUnit::in, 12, 1, 0.25,
                           Eigen::Vector3d(0, 0, 40), false, true, 1e-5, "2412"},
                      Case{"dxf_mm_twist", CadFormat::dxf, LengthUnit::mm, 250, 2.5, 0.25,
                           Eigen::Vector3d(0, 0, 500), false, false, 1e-5, "2412"},
                      Case{"dxf_m_split", CadFormat::dxf, LengthUnit::m, 1.2, -1, 0.5,
                           Eigen::Vector3d(0.2, 0.1, 3), true, false, 1e-5, "0012"},
                      Case{"dxf_in_polyline", CadFormat::dxf, LengthUnit::in, 8, 0, 0.25,
                           Eigen::Vector3d(0, 0, 20), false, true, 1e-5, "2412"}),
    [](const ::testing::TestParamInfo<Case>& info) { return std::string(info.param.label); });

}  // namespace
}  // namespace fulmar::cad
