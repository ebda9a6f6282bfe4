// Independent reader for the CAD export checks: reads an IGES or STEP file with OpenCASCADE
// (Debian's libocct packages), which converts it to millimetres, and prints what it found:
//   curves N
//   curve I type T degree P poles K closed C
//   sample I X Y Z          (SAMPLES points per curve, equally spaced in the curve parameter)
//   distance J D            (with a points file: distance of point J to the nearest curve, mm)
// Usage: cad_occt_probe iges|step FILE SAMPLES [POINTS_FILE with "x y z" rows in mm]
// Exit 1 with a message on stderr when the file does not read or holds no curve.
#include <BRepAdaptor_Curve.hxx>
#include <BRep_Tool.hxx>
#include <GeomAPI_ProjectPointOnCurve.hxx>
#include <Geom_BSplineCurve.hxx>
#include <Geom_Curve.hxx>
#include <Geom_TrimmedCurve.hxx>
#include <IFSelect_ReturnStatus.hxx>
#include <IGESControl_Reader.hxx>
#include <Interface_Static.hxx>
#include <STEPControl_Reader.hxx>
#include <TopExp_Explorer.hxx>
#include <TopoDS.hxx>
#include <TopoDS_Edge.hxx>
#include <TopoDS_Shape.hxx>
#include <cstdio>
#include <fstream>
#include <iostream>
#include <string>
#include <vector>

int main(int argc, char** argv) {
  if (argc < 4) {
    std::cerr << "usage: cad_occt_probe iges|step FILE SAMPLES [POINTS_FILE]\n";
    return 1;
  }
  const std::string kind = argv[1];
  const std::string file = argv[2];
  const int samples = std::stoi(argv[3]);
  TopoDS_Shape shape;
  if (kind == "iges") {
    IGESControl_Reader reader;
    Interface_Static::SetCVal("xstep.cascade.unit", "MM");
    if (reader.ReadFile(file.c_str()) != IFSelect_RetDone) {
      std::cerr << "OpenCASCADE could not read IGES file " << file << "\n";
      return 1;
    }
    reader.TransferRoots();
    shape = reader.OneShape();
  } else if (kind == "step") {
    STEPControl_Reader reader;
    Interface_Static::SetCVal("xstep.cascade.unit", "MM");
    if (reader.ReadFile(file.c_str()) != IFSelect_RetDone) {
      std::cerr << "OpenCASCADE could not read STEP file " << file << "\n";
      return 1;
    }
    reader.TransferRoots();
    shape = reader.OneShape();
  } else {
    std::cerr << "unknown kind " << kind << "\n";
    return 1;
  }
  std::vector<Handle(Geom_Curve)> curves;
  std::vector<std::pair<double, double>> ranges;
  for (TopExp_Explorer ex(shape, TopAbs_EDGE); ex.More(); ex.Next()) {
    const TopoDS_Edge edge = TopoDS::Edge(ex.Current());
    double first = 0.0, last = 0.0;
    Handle(Geom_Curve) c = BRep_Tool::Curve(edge, first, last);
    if (c.IsNull()) continue;
    // Edges carry their own location; apply it so the samples are in model coordinates.
    const TopLoc_Location loc = edge.Location();
    if (!loc.IsIdentity()) c = Handle(Geom_Curve)::DownCast(c->Transformed(loc.Transformation()));
    curves.push_back(c);
    ranges.emplace_back(first, last);
  }
  if (curves.empty()) {
    std::cerr << "no curve in " << file << "\n";
    return 1;
  }
  std::printf("curves %zu\n", curves.size());
  for (size_t i = 0; i < curves.size(); ++i) {
    Handle(Geom_Curve) base = curves[i];
    while (base->IsKind(STANDARD_TYPE(Geom_TrimmedCurve))) {
      base = Handle(Geom_TrimmedCurve)::DownCast(base)->BasisCurve();
    }
    const Handle(Geom_BSplineCurve) bs = Handle(Geom_BSplineCurve)::DownCast(base);
    std::printf(
        "curve %zu type %s degree %d poles %d closed %d\n", i,
        bs.IsNull() ? base->DynamicType()->Name() : "bspline", bs.IsNull() ? -1 : bs->Degree(),
        bs.IsNull() ? -1 : bs->NbPoles(),
        curves[i]->Value(ranges[i].first).Distance(curves[i]->Value(ranges[i].second)) < 1e-9 ? 1
                                                                                              : 0);
    for (int k = 0; k < samples; ++k) {
      const double u = ranges[i].first + (ranges[i].second - ranges[i].first) * k / (samples - 1);
      const gp_Pnt p = curves[i]->Value(u);
      std::printf("sample %zu %.15g %.15g %.15g\n", i, p.X(), p.Y(), p.Z());
    }
  }
  if (argc > 4) {
    std::ifstream in(argv[4]);
    double x, y, z;
    int j = 0;
    while (in >> x >> y >> z) {
      const gp_Pnt p(x, y, z);
      double best = 1e300;
      for (size_t i = 0; i < curves.size(); ++i) {
        GeomAPI_ProjectPointOnCurve proj(p, curves[i], ranges[i].first, ranges[i].second);
        double d = std::min(p.Distance(curves[i]->Value(ranges[i].first)),
                            p.Distance(curves[i]->Value(ranges[i].second)));
        if (proj.NbPoints() > 0) d = std::min(d, proj.LowerDistance());
        best = std::min(best, d);
      }
      std::printf("distance %d %.6e\n", j++, best);
    }
  }
  return 0;
}
