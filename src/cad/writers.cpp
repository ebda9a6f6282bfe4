#include "cad/writers.h"

#include "common/xml_text.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <ctime>
#include <iomanip>
#include <sstream>

namespace fulmar::cad {

std::string format_real(double value) {
  if (value == 0.0) value = 0.0;  // no "-0."
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.15G", value);
  std::string s(buf);
  const size_t e = s.find('E');
  const std::string mantissa = s.substr(0, e);
  const std::string exponent = e == std::string::npos ? "" : s.substr(e);
  if (mantissa.find('.') == std::string::npos) return mantissa + "." + exponent;
  return s;
}

std::string utc_timestamp() {
  const std::time_t now = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&now, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%S", &tm);
  return buf;
}

namespace {

// Printable ASCII only: the formats below are ASCII files and names are free text.
std::string ascii(const std::string& text) {
  std::string out;
  for (unsigned char c : text) out += (c >= 32 && c < 127) ? static_cast<char>(c) : '?';
  return out;
}

bool closed_curve(const BSplineCurve& c) {
  return (c.control.row(0) - c.control.row(c.control_count() - 1)).norm() <=
         1e-12 * (1.0 + c.control.cwiseAbs().maxCoeff());
}

struct Box {
  Eigen::Vector3d lo = Eigen::Vector3d::Constant(1e300);
  Eigen::Vector3d hi = Eigen::Vector3d::Constant(-1e300);
  void add(const Eigen::MatrixXd& pts) {
    for (Eigen::Index i = 0; i < pts.rows(); ++i) {
      lo = lo.cwiseMin(pts.row(i).transpose());
      hi = hi.cwiseMax(pts.row(i).transpose());
    }
  }
};

Eigen::MatrixXd curve_samples(const BSplineCurve& c, int count) {
  if (c.degree == 1) return c.control;
  return sample_uniform(c, count);
}

Box drawing_box(const CadDrawing& d) {
  Box b;
  for (const BSplineCurve& c : d.curves) b.add(curve_samples(c, 400));
  return b;
}

// ------------------------------------------------------------------------------------------
// DXF (ASCII, AC1015). Group codes right-justified in three columns as AutoCAD writes them.

class Dxf {
 public:
  void pair(int code, const std::string& value) {
    out_ << std::setw(3) << code << "\n" << value << "\n";
  }
  void pair(int code, int value) { pair(code, std::to_string(value)); }
  void real(int code, double value) { pair(code, format_real(value)); }
  int handle() { return next_++; }
  static std::string hex(int h) {
    std::ostringstream s;
    s << std::uppercase << std::hex << h;
    return s.str();
  }
  int next() const { return next_; }
  std::string text() const { return out_.str(); }

 private:
  std::ostringstream out_;
  int next_ = 1;
};

}  // namespace

std::string dxf_text(const CadDrawing& d) {
  Dxf x;
  // Handles first: $HANDSEED in the header must exceed every handle in the file.
  const int vport_table = x.handle(), vport_active = x.handle();
  const int ltype_table = x.handle(), lt_byblock = x.handle(), lt_bylayer = x.handle(),
            lt_continuous = x.handle();
  const int layer_table = x.handle(), layer_0 = x.handle(), layer_section = x.handle();
  const int style_table = x.handle(), style_standard = x.handle();
  const int view_table = x.handle(), ucs_table = x.handle();
  const int appid_table = x.handle(), appid_acad = x.handle();
  const int dimstyle_table = x.handle(), dimstyle_standard = x.handle();
  const int record_table = x.handle(), record_model = x.handle(), record_paper = x.handle();
  const int block_model = x.handle(), endblk_model = x.handle(), block_paper = x.handle(),
            endblk_paper = x.handle();
  std::vector<int> entity_handles;
  for (size_t i = 0; i < d.curves.size(); ++i) entity_handles.push_back(x.handle());
  const int root_dict = x.handle(), group_dict = x.handle();
  const auto H = [](int h) { return Dxf::hex(h); };
  const Box box = drawing_box(d);
  int insunits = 4;  // DXF $INSUNITS: 1 inches, 4 millimetres, 6 metres
  if (d.placement.units == LengthUnit::in) insunits = 1;
  if (d.placement.units == LengthUnit::m) insunits = 6;

  x.pair(999, "fulmar wing section " + ascii(d.name));
  x.pair(0, "SECTION");
  x.pair(2, "HEADER");
  x.pair(9, "$ACADVER");
  x.pair(1, "AC1015");
  x.pair(9, "$HANDSEED");
  x.pair(5, H(x.next()));
  x.pair(9, "$INSUNITS");
  x.pair(70, insunits);
  x.pair(9, "$MEASUREMENT");
  x.pair(70, d.placement.units == LengthUnit::in ? 0 : 1);
  x.pair(9, "$LUNITS");
  x.pair(70, 2);
  x.pair(9, "$LUPREC");
  x.pair(70, 6);
  x.pair(9, "$EXTMIN");
  x.real(10, box.lo.x());
  x.real(20, box.lo.y());
  x.real(30, box.lo.z());
  x.pair(9, "$EXTMAX");
  x.real(10, box.hi.x());
  x.real(20, box.hi.y());
  x.real(30, box.hi.z());
  x.pair(0, "ENDSEC");
  x.pair(0, "SECTION");
  x.pair(2, "CLASSES");
  x.pair(0, "ENDSEC");

  x.pair(0, "SECTION");
  x.pair(2, "TABLES");
  const auto table = [&](const std::string& name, int h, int count) {
    x.pair(0, "TABLE");
    x.pair(2, name);
    x.pair(5, H(h));
    x.pair(330, "0");
    x.pair(100, "AcDbSymbolTable");
    x.pair(70, count);
  };
  const auto record = [&](const std::string& type, int h, int owner, const std::string& subclass,
                          const std::string& name) {
    x.pair(0, type);
    x.pair(type == "DIMSTYLE" ? 105 : 5, H(h));
    x.pair(330, H(owner));
    x.pair(100, "AcDbSymbolTableRecord");
    x.pair(100, subclass);
    x.pair(2, name);
    x.pair(70, 0);
  };
  table("VPORT", vport_table, 1);
  record("VPORT", vport_active, vport_table, "AcDbViewportTableRecord", "*ACTIVE");
  {
    const double w = box.hi.x() - box.lo.x();
    const double h = box.hi.y() - box.lo.y();
    const double aspect = 1.6;
    x.real(10, 0.0);
    x.real(20, 0.0);
    x.real(11, 1.0);
    x.real(21, 1.0);
    x.real(12, 0.5 * (box.lo.x() + box.hi.x()));
    x.real(22, 0.5 * (box.lo.y() + box.hi.y()));
    x.real(13, 0.0);
    x.real(23, 0.0);
    x.real(14, 1.0);
    x.real(24, 1.0);
    x.real(15, 1.0);
    x.real(25, 1.0);
    x.real(16, 0.0);
    x.real(26, 0.0);
    x.real(36, 1.0);
    x.real(17, 0.0);
    x.real(27, 0.0);
    x.real(37, 0.0);
    x.real(40, 1.2 * std::max(h, w / aspect));
    x.real(41, aspect);
    x.real(42, 50.0);
    x.real(43, 0.0);
    x.real(44, 0.0);
    x.real(50, 0.0);
    x.real(51, 0.0);
    x.pair(71, 0);
    x.pair(72, 100);
    x.pair(73, 1);
    x.pair(74, 3);
    x.pair(75, 0);
    x.pair(76, 0);
    x.pair(77, 0);
    x.pair(78, 0);
  }
  x.pair(0, "ENDTAB");

  table("LTYPE", ltype_table, 3);
  for (const auto& [h, name] : {std::pair{lt_byblock, "ByBlock"}, std::pair{lt_bylayer, "ByLayer"},
                                std::pair{lt_continuous, "Continuous"}}) {
    record("LTYPE", h, ltype_table, "AcDbLinetypeTableRecord", name);
    x.pair(3, name == std::string("Continuous") ? "Solid line" : "");
    x.pair(72, 65);
    x.pair(73, 0);
    x.real(40, 0.0);
  }
  x.pair(0, "ENDTAB");

  table("LAYER", layer_table, 2);
  for (const auto& [h, name] : {std::pair{layer_0, "0"}, std::pair{layer_section, "SECTION"}}) {
    record("LAYER", h, layer_table, "AcDbLayerTableRecord", name);
    x.pair(62, 7);
    x.pair(6, "Continuous");
  }
  x.pair(0, "ENDTAB");

  table("STYLE", style_table, 1);
  record("STYLE", style_standard, style_table, "AcDbTextStyleTableRecord", "Standard");
  x.real(40, 0.0);
  x.real(41, 1.0);
  x.real(50, 0.0);
  x.pair(71, 0);
  x.real(42, 2.5);
  x.pair(3, "txt");
  x.pair(4, "");
  x.pair(0, "ENDTAB");

  table("VIEW", view_table, 0);
  x.pair(0, "ENDTAB");
  table("UCS", ucs_table, 0);
  x.pair(0, "ENDTAB");

  table("APPID", appid_table, 1);
  record("APPID", appid_acad, appid_table, "AcDbRegAppTableRecord", "ACAD");
  x.pair(0, "ENDTAB");

  x.pair(0, "TABLE");
  x.pair(2, "DIMSTYLE");
  x.pair(5, H(dimstyle_table));
  x.pair(330, "0");
  x.pair(100, "AcDbSymbolTable");
  x.pair(70, 1);
  x.pair(100, "AcDbDimStyleTable");
  x.pair(71, 0);
  record("DIMSTYLE", dimstyle_standard, dimstyle_table, "AcDbDimStyleTableRecord", "Standard");
  x.pair(0, "ENDTAB");

  table("BLOCK_RECORD", record_table, 2);
  record("BLOCK_RECORD", record_model, record_table, "AcDbBlockTableRecord", "*Model_Space");
  record("BLOCK_RECORD", record_paper, record_table, "AcDbBlockTableRecord", "*Paper_Space");
  x.pair(0, "ENDTAB");
  x.pair(0, "ENDSEC");

  x.pair(0, "SECTION");
  x.pair(2, "BLOCKS");
  for (const auto& [begin, end, owner, name, paper] :
       {std::tuple{block_model, endblk_model, record_model, "*Model_Space", false},
        std::tuple{block_paper, endblk_paper, record_paper, "*Paper_Space", true}}) {
    x.pair(0, "BLOCK");
    x.pair(5, H(begin));
    x.pair(330, H(owner));
    x.pair(100, "AcDbEntity");
    if (paper) x.pair(67, 1);
    x.pair(8, "0");
    x.pair(100, "AcDbBlockBegin");
    x.pair(2, name);
    x.pair(70, 0);
    x.real(10, 0.0);
    x.real(20, 0.0);
    x.real(30, 0.0);
    x.pair(3, name);
    x.pair(1, "");
    x.pair(0, "ENDBLK");
    x.pair(5, H(end));
    x.pair(330, H(owner));
    x.pair(100, "AcDbEntity");
    if (paper) x.pair(67, 1);
    x.pair(8, "0");
    x.pair(100, "AcDbBlockEnd");
  }
  x.pair(0, "ENDSEC");

  x.pair(0, "SECTION");
  x.pair(2, "ENTITIES");
  for (size_t i = 0; i < d.curves.size(); ++i) {
    const BSplineCurve& c = d.curves[i];
    if (c.degree == 1) {
      // LWPOLYLINE: 2-D vertices in the object coordinate system; with the default extrusion
      // (0, 0, 1) that is the world x-y plane, at the elevation z.
      x.pair(0, "LWPOLYLINE");
      x.pair(5, H(entity_handles[i]));
      x.pair(330, H(record_model));
      x.pair(100, "AcDbEntity");
      x.pair(8, "SECTION");
      x.pair(100, "AcDbPolyline");
      x.pair(90, c.control_count());
      x.pair(70, 0);
      x.real(38, c.control(0, 2));
      for (int k = 0; k < c.control_count(); ++k) {
        x.real(10, c.control(k, 0));
        x.real(20, c.control(k, 1));
      }
    } else {
      x.pair(0, "SPLINE");
      x.pair(5, H(entity_handles[i]));
      x.pair(330, H(record_model));
      x.pair(100, "AcDbEntity");
      x.pair(8, "SECTION");
      x.pair(100, "AcDbSpline");
      x.real(210, 0.0);
      x.real(220, 0.0);
      x.real(230, 1.0);
      x.pair(70, 8);  // planar, open, non-rational, non-periodic
      x.pair(71, c.degree);
      x.pair(72, static_cast<int>(c.knots.size()));
      x.pair(73, c.control_count());
      x.pair(74, 0);
      x.real(42, 1e-10);
      x.real(43, 1e-10);
      for (Eigen::Index k = 0; k < c.knots.size(); ++k) x.real(40, c.knots(k));
      for (int k = 0; k < c.control_count(); ++k) {
        x.real(10, c.control(k, 0));
        x.real(20, c.control(k, 1));
        x.real(30, c.control(k, 2));
      }
    }
  }
  x.pair(0, "ENDSEC");

  x.pair(0, "SECTION");
  x.pair(2, "OBJECTS");
  x.pair(0, "DICTIONARY");
  x.pair(5, H(root_dict));
  x.pair(330, "0");
  x.pair(100, "AcDbDictionary");
  x.pair(281, 1);
  x.pair(3, "ACAD_GROUP");
  x.pair(350, H(group_dict));
  x.pair(0, "DICTIONARY");
  x.pair(5, H(group_dict));
  x.pair(330, H(root_dict));
  x.pair(100, "AcDbDictionary");
  x.pair(281, 1);
  x.pair(0, "ENDSEC");
  x.pair(0, "EOF");
  return x.text();
}

// --------------------------------------------------------------------------------------------
// IGES 5.3. Fixed 80-column records: columns 1-72 data, 73 the section letter, 74-80 the
// sequence number. Parameter records use columns 1-64 for data and 65-72 for the pointer back to
// the entity's directory entry.

namespace {

std::string hollerith(const std::string& text) {
  const std::string a = ascii(text);
  return std::to_string(a.size()) + "H" + a;
}

std::string iges_record(const std::string& data, char section, int sequence) {
  std::ostringstream s;
  s << std::left << std::setw(72) << data.substr(0, 72) << section << std::right << std::setw(7)
    << sequence << "\n";
  return s.str();
}

std::string field8(const std::string& v) {
  std::ostringstream s;
  s << std::right << std::setw(8) << v.substr(0, 8);
  return s.str();
}
std::string field8(int v) {
  return field8(std::to_string(v));
}

// Packs tokens (each followed by its delimiter) into lines of at most `width` characters.
std::vector<std::string> pack(const std::vector<std::string>& tokens, size_t width, char delimiter,
                              char terminator) {
  std::vector<std::string> lines;
  std::string line;
  for (size_t i = 0; i < tokens.size(); ++i) {
    const std::string t = tokens[i] + (i + 1 == tokens.size() ? terminator : delimiter);
    if (!line.empty() && line.size() + t.size() > width) {
      lines.push_back(line);
      line.clear();
    }
    line += t;
  }
  if (!line.empty()) lines.push_back(line);
  return lines;
}

// "YYYY-MM-DDTHH:MM:SS" -> IGES "YYYYMMDD.HHNNSS".
std::string iges_date(const std::string& ts) {
  std::string digits;
  for (char c : ts) {
    if (c >= '0' && c <= '9') digits += c;
  }
  digits.resize(14, '0');
  return digits.substr(0, 8) + "." + digits.substr(8, 6);
}

}  // namespace

std::string iges_text(const CadDrawing& d) {
  std::string out;
  // Start section: human-readable description.
  std::ostringstream desc;
  desc << "fulmar wing section " << ascii(d.name) << ", chord " << d.placement.chord << " "
       << to_string(d.placement.units) << ", twist " << d.placement.twist_deg
       << " deg (nose up +) about x/c " << d.placement.pivot
       << ", in the plane z = " << d.placement.offset.z() << " " << to_string(d.placement.units)
       << ".";
  std::vector<std::string> start_lines;
  {
    const std::string text = desc.str();
    for (size_t i = 0; i < text.size(); i += 72) start_lines.push_back(text.substr(i, 72));
  }
  int seq = 0;
  for (const std::string& l : start_lines) out += iges_record(l, 'S', ++seq);
  const int s_count = seq;

  // Global section (IGES 5.3 section 2.2.4, parameters 1..25).
  int unit_flag = 2;  // 1 inches, 2 millimetres, 6 metres
  std::string unit_name = "MM";
  if (d.placement.units == LengthUnit::in) {
    unit_flag = 1;
    unit_name = "INCH";
  } else if (d.placement.units == LengthUnit::m) {
    unit_flag = 6;
    unit_name = "M";
  }
  double max_coordinate = 0.0;
  for (const BSplineCurve& c : d.curves) {
    max_coordinate = std::max(max_coordinate, c.control.cwiseAbs().maxCoeff());
  }
  const std::string date = iges_date(d.timestamp);
  const std::vector<std::string> global = {"1H,",
                                           "1H;",
                                           hollerith("fulmar section " + d.name),
                                           hollerith(d.file_name),
                                           hollerith("fulmar " FULMAR_VERSION),
                                           hollerith("fulmar IGES writer"),
                                           "32",
                                           "38",
                                           "6",
                                           "308",
                                           "15",
                                           hollerith("fulmar section " + d.name),
                                           "1.",
                                           std::to_string(unit_flag),
                                           hollerith(unit_name),
                                           "1",
                                           format_real(d.placement.chord * 0.001),
                                           hollerith(date),
                                           format_real(d.resolution),
                                           format_real(max_coordinate),
                                           hollerith("fulmar"),
                                           "",
                                           "11",
                                           "0",
                                           hollerith(date)};
  int g_count = 0;
  for (const std::string& l : pack(global, 72, ',', ';')) out += iges_record(l, 'G', ++g_count);

  // Parameter data first (the directory needs the line counts), then the directory.
  std::vector<std::vector<std::string>> params;
  for (const BSplineCurve& c : d.curves) {
    const int n = c.control_count();
    std::vector<std::string> t = {"126",
                                  std::to_string(n - 1),
                                  std::to_string(c.degree),
                                  "1",                          // planar
                                  closed_curve(c) ? "1" : "0",  // closed
                                  "1",                          // polynomial (all weights equal)
                                  "0"};                         // not periodic
    for (Eigen::Index k = 0; k < c.knots.size(); ++k) t.push_back(format_real(c.knots(k)));
    for (int k = 0; k < n; ++k) t.push_back("1.");
    for (int k = 0; k < n; ++k) {
      for (int j = 0; j < 3; ++j) t.push_back(format_real(c.control(k, j)));
    }
    t.push_back(format_real(c.first_parameter()));
    t.push_back(format_real(c.last_parameter()));
    t.insert(t.end(), {"0.", "0.", "1."});  // unit normal of the plane
    params.push_back(t);
  }
  std::string directory;
  std::string parameter;
  int p_seq = 0;
  for (size_t e = 0; e < params.size(); ++e) {
    const int de = static_cast<int>(2 * e + 1);
    const std::vector<std::string> lines = pack(params[e], 64, ',', ';');
    const int first_p = p_seq + 1;
    for (const std::string& l : lines) {
      std::ostringstream s;
      s << std::left << std::setw(64) << l << std::right << std::setw(8) << de;
      parameter += iges_record(s.str(), 'P', ++p_seq);
    }
    const std::string label = e < d.curve_names.size() ? ascii(d.curve_names[e]) : "CURVE";
    std::string label8 = label.substr(0, 8);
    for (char& ch : label8) ch = static_cast<char>(std::toupper(static_cast<unsigned char>(ch)));
    directory += iges_record(field8(126) + field8(first_p) + field8(0) + field8(0) + field8(0) +
                                 field8(0) + field8(0) + field8(0) + "00000000",
                             'D', de);
    directory += iges_record(field8(126) + field8(0) + field8(0) +
                                 field8(static_cast<int>(lines.size())) + field8(0) + field8("") +
                                 field8("") + field8(label8) + field8(static_cast<int>(e + 1)),
                             'D', de + 1);
  }
  out += directory + parameter;
  std::ostringstream term;
  term << "S" << std::setw(7) << s_count << "G" << std::setw(7) << g_count << "D" << std::setw(7)
       << 2 * params.size() << "P" << std::setw(7) << p_seq;
  out += iges_record(term.str(), 'T', 1);
  return out;
}

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

// --------------------------------------------------------------------------------------------

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

namespace {

std::string num(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

}  // namespace

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
    << num(width * sheet_scale) << sheet_unit << "\" height=\"" << num(height * sheet_scale)
    << sheet_unit << "\" viewBox=\"" << num(x0) << " " << num(y_top) << " " << num(width) << " "
    << num(height) << "\">\n"
    << "<title>" << xml_escaped(d.name) << "</title>\n"
    << "<rect x=\"" << num(x0) << "\" y=\"" << num(y_top) << "\" width=\"" << num(width)
    << "\" height=\"" << num(height) << "\" fill=\"white\"/>\n";
  // Chord line, dashed.
  s << "<line x1=\"" << num(d.chord_line(0, 0)) << "\" y1=\"" << num(-d.chord_line(0, 1))
    << "\" x2=\"" << num(d.chord_line(1, 0)) << "\" y2=\"" << num(-d.chord_line(1, 1))
    << "\" stroke=\"#7a7a7a\" stroke-width=\"" << num(stroke * 0.6) << "\" stroke-dasharray=\""
    << num(chord * 0.02) << " " << num(chord * 0.01) << "\"/>\n";
  for (const BSplineCurve& c : d.curves) {
    const Eigen::MatrixXd p = curve_samples(c, 1500);
    s << "<path fill=\"none\" stroke=\"#10243e\" stroke-width=\"" << num(stroke)
      << "\" stroke-linejoin=\"round\" d=\"";
    for (Eigen::Index k = 0; k < p.rows(); ++k) {
      s << (k == 0 ? "M" : " L") << num(p(k, 0)) << " " << num(-p(k, 1));
    }
    s << "\"/>\n";
  }
  // Twist pivot marker.
  const Eigen::Vector3d pivot = placed_point(d.placement, Eigen::Vector2d(d.placement.pivot, 0.0));
  s << "<circle cx=\"" << num(pivot.x()) << "\" cy=\"" << num(-pivot.y()) << "\" r=\""
    << num(stroke * 2.5) << "\" fill=\"#b03a2e\"/>\n";
  // Labels above the section.
  std::ostringstream line1, line2;
  line1 << xml_escaped(d.name) << " - chord " << num(chord) << " " << u;
  line2 << "twist " << num(d.placement.twist_deg) << " deg (nose up +) about x/c "
        << num(d.placement.pivot) << " (dot); plane z = " << num(d.placement.offset.z()) << " "
        << u;
  s << "<g font-family=\"sans-serif\" fill=\"#10243e\" font-size=\"" << num(text_size) << "\">\n"
    << "<text x=\"" << num(x0 + margin) << "\" y=\"" << num(y_top + 1.5 * text_size) << "\">"
    << line1.str() << "</text>\n"
    << "<text x=\"" << num(x0 + margin) << "\" y=\"" << num(y_top + 2.8 * text_size)
    << "\" font-size=\"" << num(0.75 * text_size) << "\">" << line2.str() << "</text>\n";
  // Scale bar: a round length near a fifth of the chord, below the section.
  const double target = chord / 5.0;
  const double decade = std::pow(10.0, std::floor(std::log10(target)));
  double bar = decade;
  for (double f : {2.0, 5.0, 10.0}) {
    if (f * decade <= target) bar = f * decade;
  }
  const double bar_y = -box.lo.y() + margin + 1.0 * text_size;
  const double bar_x = x0 + margin;
  s << "<line x1=\"" << num(bar_x) << "\" y1=\"" << num(bar_y) << "\" x2=\"" << num(bar_x + bar)
    << "\" y2=\"" << num(bar_y) << "\" stroke=\"#10243e\" stroke-width=\"" << num(stroke * 1.5)
    << "\"/>\n"
    << "<text x=\"" << num(bar_x + bar + 0.5 * text_size) << "\" y=\""
    << num(bar_y + 0.35 * text_size) << "\" font-size=\"" << num(0.75 * text_size) << "\">"
    << num(bar) << " " << u << "</text>\n"
    << "</g>\n</svg>\n";
  return s.str();
}

}  // namespace fulmar::cad
