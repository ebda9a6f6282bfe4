#pragma once
// The drawing every writer test writes: NACA 2412 at 250 mm chord, 2 deg twist, placed at
// (1, 2, 300), with a fixed timestamp and file name.
#include <sstream>
#include <string>
#include <vector>

#include "cad/export.h"
#include "cad/naca_test_section.h"
#include "cad/writers.h"

namespace fulmar::cad::testing {

inline CadDrawing drawing(bool split, bool polyline = false, LengthUnit units = LengthUnit::mm) {
  ExportOptions o;
  o.placement.chord = 250;
  o.placement.units = units;
  o.placement.twist_deg = 2;
  o.placement.offset = Eigen::Vector3d(1, 2, 300);
  o.split = split;
  o.polyline = polyline;
  o.timestamp = "2026-12-01T18:00:00";
  ExportReport r;
  CadDrawing d = build_drawing(naca4_section("2412", 80), o, r);
  d.file_name = "wing_root.igs";
  return d;
}

inline std::vector<std::string> lines_of(const std::string& text) {
  std::vector<std::string> out;
  std::istringstream s(text);
  for (std::string l; std::getline(s, l);) out.push_back(l);
  return out;
}

}  // namespace fulmar::cad::testing
