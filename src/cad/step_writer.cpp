#include "cad/writers.h"

#include <sstream>
#include <vector>

#include "cad/writer_parts.h"

namespace fulmar::cad {

using detail::ascii;
using detail::closed_curve;

// --------------------------------------------------------------------------------------------
// STEP, ISO 10303-21 with the AP214 (automotive_design) schema.

namespace {

std::string step_string(const std::string& text) {
  std::string out = "'";
  for (char c : ascii(text)) {
    out += c;
    if (c == '\'') out += '\'';
    if (c == '\\') out += '\\';
  }
  return out + "'";
}

class Step {
 public:
  int add(const std::string& entity) {
    const int id = ++last_;
    body_ << "#" << id << "=" << entity << ";\n";
    return id;
  }
  std::string body() const { return body_.str(); }
  static std::string ref(int id) {
    std::string s(1, '#');
    s.append(std::to_string(id));
    return s;
  }

 private:
  std::ostringstream body_;
  int last_ = 0;
};

std::string join(const std::vector<std::string>& items, size_t per_line = 0) {
  std::string s = "(";
  for (size_t i = 0; i < items.size(); ++i) {
    if (i > 0) s += (per_line > 0 && i % per_line == 0) ? ",\n  " : ",";
    s += items[i];
  }
  return s + ")";
}

}  // namespace

std::string step_text(const CadDrawing& d) {
  Step s;
  const auto R = Step::ref;
  const int app = s.add("APPLICATION_CONTEXT('automotive design')");
  s.add("APPLICATION_PROTOCOL_DEFINITION('international standard','automotive_design',2000," +
        R(app) + ")");
  const int pctx = s.add("PRODUCT_CONTEXT(''," + R(app) + ",'mechanical')");
  const int product =
      s.add("PRODUCT('fulmar-section'," + step_string(d.name) + ",''," + "(" + R(pctx) + "))");
  s.add("PRODUCT_RELATED_PRODUCT_CATEGORY('part',$,(" + R(product) + "))");
  const int formation = s.add("PRODUCT_DEFINITION_FORMATION('',''," + R(product) + ")");
  const int pdctx = s.add("PRODUCT_DEFINITION_CONTEXT('part definition'," + R(app) + ",'design')");
  const int pdef = s.add("PRODUCT_DEFINITION('design',''," + R(formation) + "," + R(pdctx) + ")");
  const int pshape = s.add("PRODUCT_DEFINITION_SHAPE('',''," + R(pdef) + ")");

  int length_unit = 0;
  switch (d.placement.units) {
    case LengthUnit::mm:
      length_unit = s.add("(LENGTH_UNIT()NAMED_UNIT(*)SI_UNIT(.MILLI.,.METRE.))");
      break;
    case LengthUnit::m:
      length_unit = s.add("(LENGTH_UNIT()NAMED_UNIT(*)SI_UNIT($,.METRE.))");
      break;
    case LengthUnit::in: {
      const int mm = s.add("(LENGTH_UNIT()NAMED_UNIT(*)SI_UNIT(.MILLI.,.METRE.))");
      const int factor = s.add("LENGTH_MEASURE_WITH_UNIT(LENGTH_MEASURE(25.4)," + R(mm) + ")");
      const int dims = s.add("DIMENSIONAL_EXPONENTS(1.,0.,0.,0.,0.,0.,0.)");
      length_unit = s.add("(CONVERSION_BASED_UNIT('INCH'," + R(factor) +
                          ")LENGTH_UNIT()NAMED_UNIT(" + R(dims) + "))");
      break;
    }
  }
  const int angle_unit = s.add("(NAMED_UNIT(*)PLANE_ANGLE_UNIT()SI_UNIT($,.RADIAN.))");
  const int solid_unit = s.add("(NAMED_UNIT(*)SI_UNIT($,.STERADIAN.)SOLID_ANGLE_UNIT())");
  const int uncertainty =
      s.add("UNCERTAINTY_MEASURE_WITH_UNIT(LENGTH_MEASURE(" + format_real(d.resolution) + ")," +
            R(length_unit) + ",'distance_accuracy_value','smallest distance the file resolves')");
  const int context =
      s.add("(GEOMETRIC_REPRESENTATION_CONTEXT(3)GLOBAL_UNCERTAINTY_ASSIGNED_CONTEXT((" +
            R(uncertainty) + "))GLOBAL_UNIT_ASSIGNED_CONTEXT((" + R(length_unit) + "," +
            R(angle_unit) + "," + R(solid_unit) + "))REPRESENTATION_CONTEXT('section','3D'))");

  std::vector<std::string> curve_refs;
  for (size_t e = 0; e < d.curves.size(); ++e) {
    const BSplineCurve& c = d.curves[e];
    std::vector<std::string> points;
    for (int k = 0; k < c.control_count(); ++k) {
      points.push_back(R(s.add("CARTESIAN_POINT(''," +
                               join({format_real(c.control(k, 0)), format_real(c.control(k, 1)),
                                     format_real(c.control(k, 2))}) +
                               ")")));
    }
    std::vector<std::string> mult, knots;
    for (Eigen::Index k = 0; k < c.knots.size();) {
      Eigen::Index j = k;
      while (j < c.knots.size() && c.knots(j) == c.knots(k)) ++j;
      mult.push_back(std::to_string(j - k));
      knots.push_back(format_real(c.knots(k)));
      k = j;
    }
    const std::string name = e < d.curve_names.size() ? d.curve_names[e] : "curve";
    curve_refs.push_back(
        R(s.add("B_SPLINE_CURVE_WITH_KNOTS(" + step_string(name) + "," + std::to_string(c.degree) +
                "," + join(points, 8) + ",.UNSPECIFIED.," + (closed_curve(c) ? ".T." : ".F.") +
                ",.F.," + join(mult, 16) + "," + join(knots, 8) + ",.UNSPECIFIED.)")));
  }
  const int set = s.add("GEOMETRIC_CURVE_SET('section'," + join(curve_refs) + ")");
  const int rep = s.add("GEOMETRICALLY_BOUNDED_WIREFRAME_SHAPE_REPRESENTATION(" +
                        step_string(d.name) + ",(" + R(set) + ")," + R(context) + ")");
  s.add("SHAPE_DEFINITION_REPRESENTATION(" + R(pshape) + "," + R(rep) + ")");

  std::ostringstream out;
  out << "ISO-10303-21;\nHEADER;\n"
      << "FILE_DESCRIPTION((" << step_string("fulmar wing section " + d.name) << "),'2;1');\n"
      << "FILE_NAME(" << step_string(d.file_name) << "," << step_string(d.timestamp)
      << ",('fulmar'),(''),'fulmar " FULMAR_VERSION "','fulmar','');\n"
      << "FILE_SCHEMA(('AUTOMOTIVE_DESIGN { 1 0 10303 214 1 1 1 1 }'));\n"
      << "ENDSEC;\nDATA;\n"
      << s.body() << "ENDSEC;\nEND-ISO-10303-21;\n";
  return out.str();
}

}  // namespace fulmar::cad
