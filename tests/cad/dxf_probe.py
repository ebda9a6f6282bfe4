#!/usr/bin/python3
"""Independent reader for the CAD export checks: reads a DXF file with ezdxf (Debian's
python3-ezdxf), audits it, and prints what it found, in the same form as cad_occt_probe:
  units N                  ($INSUNITS of the header)
  audit errors E fixes F
  curves N
  curve I type T degree P poles K closed C
  sample I X Y Z           (SAMPLES points per SPLINE, from ezdxf's own B-spline evaluation;
                            the vertices of an LWPOLYLINE, at its elevation)
Usage: dxf_probe.py FILE SAMPLES
"""
import sys

import ezdxf


def main():
    path, samples = sys.argv[1], int(sys.argv[2])
    doc = ezdxf.readfile(path)
    auditor = doc.audit()
    print(f"units {doc.header.get('$INSUNITS', 0)}")
    print(f"version {doc.dxfversion}")
    print(f"audit errors {len(auditor.errors)} fixes {len(auditor.fixes)}")
    for e in auditor.errors:
        print(f"# audit error: {e}", file=sys.stderr)
    entities = [e for e in doc.modelspace() if e.dxftype() in ("SPLINE", "LWPOLYLINE")]
    print(f"curves {len(entities)}")
    for i, e in enumerate(entities):
        if e.dxftype() == "SPLINE":
            tool = e.construction_tool()
            pts = list(tool.points(tool.params(samples - 1)))
            print(f"curve {i} type spline degree {e.dxf.degree} poles {len(e.control_points)} "
                  f"closed {int(e.closed)}")
        else:
            z = e.dxf.elevation
            pts = [(x, y, z) for x, y in e.vertices()]
            print(f"curve {i} type lwpolyline degree 1 poles {len(pts)} closed {int(e.closed)}")
        for p in pts:
            print(f"sample {i} {p[0]:.15g} {p[1]:.15g} {p[2]:.15g}")


if __name__ == "__main__":
    main()
