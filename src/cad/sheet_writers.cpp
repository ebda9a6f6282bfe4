#include "cad/writers.h"

#include <cmath>
#include <sstream>

#include "cad/writer_parts.h"
#include "common/number_text.h"
#include "common/xml_text.h"

namespace fulmar::cad {

using detail::Box;
using detail::curve_samples;
using detail::drawing_box;

// The CSV point list and the SVG drawing sheet: the two formats meant for people and
// spreadsheets rather than CAD systems.

std::string csv_text(const CadDrawing& d) {
  const std::string u = to_string(d.placement.units);
  std::ostringstream s;
  s << "x_" << u << ",y_" << u << ",z_" << u << "\n";
  for (Eigen::Index i = 0; i < d.section_points.rows(); ++i) {
    s << format_real(d.section_points(i, 0)) << "," << format_real(d.section_points(i, 1)) << ","
      << format_real(d.section_points(i, 2)) << "\n";
  }
  return s.str();
}

std::string svg_text(const CadDrawing& d) {
  // Drawing coordinates are the model's x and -y (SVG's y points down), in the export units;
  // for mm and in the sheet is true to scale.
  const Box box = drawing_box(d);
  const double chord = d.placement.chord;
  const double margin = 0.08 * chord;
  const double text_size = 0.03 * chord;
  const double x0 = box.lo.x() - margin;
  const double width = box.hi.x() - box.lo.x() + 2 * margin;
  const double y_top = -box.hi.y() - margin - 3.5 * text_size;
  const double height = box.hi.y() - box.lo.y() + 2 * margin + 6.5 * text_size;
  const std::string u = to_string(d.placement.units);
  const std::string sheet_unit = d.placement.units == LengthUnit::m ? "mm" : u;
  const double sheet_scale = d.placement.units == LengthUnit::m ? 1000.0 : 1.0;
  const double stroke = 0.0015 * chord;

  std::ostringstream s;
  s << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    << "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\""
    << general_text(width * sheet_scale) << sheet_unit << "\" height=\""
    << general_text(height * sheet_scale) << sheet_unit << "\" viewBox=\"" << general_text(x0)
    << " " << general_text(y_top) << " " << general_text(width) << " " << general_text(height)
    << "\">\n"
    << "<title>" << xml_escaped(d.name) << "</title>\n"
    << "<rect x=\"" << general_text(x0) << "\" y=\"" << general_text(y_top) << "\" width=\""
    << general_text(width) << "\" height=\"" << general_text(height) << "\" fill=\"white\"/>\n";
  // Chord line, dashed.
  s << "<line x1=\"" << general_text(d.chord_line(0, 0)) << "\" y1=\""
    << general_text(-d.chord_line(0, 1)) << "\" x2=\"" << general_text(d.chord_line(1, 0))
    << "\" y2=\"" << general_text(-d.chord_line(1, 1)) << "\" stroke=\"#7a7a7a\" stroke-width=\""
    << general_text(stroke * 0.6) << "\" stroke-dasharray=\"" << general_text(chord * 0.02) << " "
    << general_text(chord * 0.01) << "\"/>\n";
  for (const BSplineCurve& c : d.curves) {
    const Eigen::MatrixXd p = curve_samples(c, 1500);
    s << "<path fill=\"none\" stroke=\"#10243e\" stroke-width=\"" << general_text(stroke)
      << "\" stroke-linejoin=\"round\" d=\"";
    for (Eigen::Index k = 0; k < p.rows(); ++k) {
      s << (k == 0 ? "M" : " L") << general_text(p(k, 0)) << " " << general_text(-p(k, 1));
    }
    s << "\"/>\n";
  }
  // Twist pivot marker.
  const Eigen::Vector3d pivot = placed_point(d.placement, Eigen::Vector2d(d.placement.pivot, 0.0));
  s << "<circle cx=\"" << general_text(pivot.x()) << "\" cy=\"" << general_text(-pivot.y())
    << "\" r=\"" << general_text(stroke * 2.5) << "\" fill=\"#b03a2e\"/>\n";
  // Labels above the section.
  std::ostringstream line1, line2;
  line1 << xml_escaped(d.name) << " - chord " << general_text(chord) << " " << u;
  line2 << "twist " << general_text(d.placement.twist_deg) << " deg (nose up +) about x/c "
        << general_text(d.placement.pivot)
        << " (dot); plane z = " << general_text(d.placement.offset.z()) << " " << u;
  s << "<g font-family=\"sans-serif\" fill=\"#10243e\" font-size=\"" << general_text(text_size)
    << "\">\n"
    << "<text x=\"" << general_text(x0 + margin) << "\" y=\""
    << general_text(y_top + 1.5 * text_size) << "\">" << line1.str() << "</text>\n"
    << "<text x=\"" << general_text(x0 + margin) << "\" y=\""
    << general_text(y_top + 2.8 * text_size) << "\" font-size=\"" << general_text(0.75 * text_size)
    << "\">" << line2.str() << "</text>\n";
  // Scale bar: a round length near a fifth of the chord, below the section.
  const double target = chord / 5.0;
  const double decade = std::pow(10.0, std::floor(std::log10(target)));
  double bar = decade;
  for (double f : {2.0, 5.0, 10.0}) {
    if (f * decade <= target) bar = f * decade;
  }
  const double bar_y = -box.lo.y() + margin + 1.0 * text_size;
  const double bar_x = x0 + margin;
  s << "<line x1=\"" << general_text(bar_x) << "\" y1=\"" << general_text(bar_y) << "\" x2=\""
    << general_text(bar_x + bar) << "\" y2=\"" << general_text(bar_y)
    << "\" stroke=\"#10243e\" stroke-width=\"" << general_text(stroke * 1.5) << "\"/>\n"
    << "<text x=\"" << general_text(bar_x + bar + 0.5 * text_size) << "\" y=\""
    << general_text(bar_y + 0.35 * text_size) << "\" font-size=\"" << general_text(0.75 * text_size)
    << "\">" << general_text(bar) << " " << u << "</text>\n"
    << "</g>\n</svg>\n";
  return s.str();
}

}  // namespace fulmar::cad
