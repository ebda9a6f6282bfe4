#include "cad/writers.h"

#include <algorithm>
#include <iomanip>
#include <sstream>

#include "cad/writer_parts.h"

namespace fulmar::cad {

using detail::ascii;
using detail::Box;
using detail::drawing_box;

namespace {

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

}  // namespace fulmar::cad
