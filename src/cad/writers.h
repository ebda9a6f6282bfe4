#pragma once
// File writers for placed sections, each written here from the format's public specification:
//   DXF  - AutoCAD DXF Reference, release 2000 (AC1015): SPLINE and LWPOLYLINE entities.
//   IGES - Initial Graphics Exchange Specification 5.3 (ANS US PRO/IPO-100-1996): entity 126.
//   STEP - ISO 10303-21 exchange structure, AP214 (automotive_design) schema:
//          B_SPLINE_CURVE_WITH_KNOTS in a geometrically bounded wireframe representation.
//   CSV  - the placed section points; SVG - a drawing with chord line, labels and scale bar.
// The functions return the whole file as text; the caller writes it atomically.
#include <Eigen/Core>
#include <string>
#include <vector>

#include "cad/bspline.h"
#include "cad/placement.h"

namespace fulmar::cad {

// Everything a writer needs. Curves and points are placed (3-D, in placement.units); a polyline
// is a degree-1 curve whose control points are its vertices.
struct CadDrawing {
  std::string name;                      // the section's name (free text)
  Placement placement;                   // chord, units, twist, pivot, offset
  std::vector<BSplineCurve> curves;      // 1 (closed loop TE -> LE -> TE) or 2 (upper, lower)
  std::vector<std::string> curve_names;  // one per curve, e.g. "section", "upper", "lower"
  Eigen::MatrixXd section_points;        // #points by 3, the placed input points (CSV)
  Eigen::MatrixXd chord_line;            // 2 by 3: placed leading edge and trailing-edge midpoint
  double resolution = 0.0;               // intended accuracy in units (tolerance * chord)
  std::string timestamp;                 // UTC "YYYY-MM-DDTHH:MM:SS"
  std::string file_name;  // the target's file name, recorded in IGES and STEP headers
};

std::string dxf_text(const CadDrawing& drawing);
std::string iges_text(const CadDrawing& drawing);
std::string step_text(const CadDrawing& drawing);
std::string csv_text(const CadDrawing& drawing);
std::string svg_text(const CadDrawing& drawing);

// A real number with a decimal point always present and an upper-case exponent, the common form
// of DXF, IGES and ISO 10303-21 reals (e.g. "1.", "-0.25", "1.5E-05").
std::string format_real(double value);

// The current UTC time as "YYYY-MM-DDTHH:MM:SS".
std::string utc_timestamp();

}  // namespace fulmar::cad
