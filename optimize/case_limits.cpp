#include <algorithm>
#include <cmath>

#include "geometry/naca.h"
#include "optimize/case_sections.h"

namespace fulmar::optimize::case_detail {
namespace {

double read_min_only(Reader r, double lo, double hi, bool lo_open) {
  const double v = r.child("min").in_range(lo, hi, lo_open, false);
  r.finish();
  return v;
}

}  // namespace

void read_min_max(Reader r, double& min, double& max, double lo, double hi) {
  if (auto c = r.optional_child("min")) min = c->in_range(lo, hi, false, false);
  if (auto c = r.optional_child("max")) max = c->in_range(lo, hi, false, false);
  if (std::isnan(min) && std::isnan(max)) r.fail("needs min or max");
  if (!std::isnan(min) && !std::isnan(max) && min > max)
    r.fail_at(r.path() + "/max",
              "must be >= min " + general_text(min) + " (got " + general_text(max) + ")");
  r.finish();
}

Constraints read_constraints(Reader r, const std::vector<DesignPoint>& points,
                             const LandingPoint& landing, std::vector<DesignPoint>& points_out) {
  Constraints c;
  points_out = points;
  double max_cl = -1e9;
  for (const auto& p : points) max_cl = std::max(max_cl, p.cl);

  if (auto cm = r.optional_child("cl_max")) {
    if (!landing.present) cm->fail("a cl_max limit needs the landing point (missing /landing)");
    if (auto m = cm->optional_child("min")) {
      c.cl_max_min = m->in_range(0, 3, true, false);
      if (c.cl_max_min < max_cl)
        m->fail("must be >= the cruise cl " + general_text(max_cl) +
                " (the section must reach the largest design cl with margin)");
      if (!std::isnan(landing.cl_max_required) && c.cl_max_min < landing.cl_max_required)
        m->fail("must be >= " + general_text(landing.cl_max_required) +
                ", the cl_max the stall speed requires (omit min to use that value)");
    }
    cm->finish();
  }
  if (std::isnan(c.cl_max_min) && landing.present) {
    if (std::isnan(landing.cl_max_required))
      r.fail_at(r.path() + "/cl_max/min",
                "missing required field (the landing point gives no stall speed)");
    c.cl_max_min = landing.cl_max_required;
    if (c.cl_max_min < max_cl)
      r.fail_at("/landing/stall_speed", "gives a required cl_max of " + general_text(c.cl_max_min) +
                                            ", below the cruise cl " + general_text(max_cl));
  }
  if (auto cm = r.optional_child("cm")) {
    const double v = read_min_only(*cm, -1, 1, false);
    for (auto& p : points_out)
      if (std::isnan(p.cm_min)) p.cm_min = v;
  }
  if (auto t = r.optional_child("thickness")) c.thickness_min = read_min_only(*t, 0, 0.5, true);
  if (auto s = r.optional_child("spar")) {
    for (Reader item : s->array()) {
      SparLimit l;
      l.x = item.child("x").in_range(0, 1, true, true);
      l.min = item.child("min").in_range(0, 0.5, true, false);
      if (!std::isnan(c.thickness_min) && l.min > c.thickness_min + 1e-12)
        item.fail_at(item.path() + "/min", "must be <= the maximum-thickness limit " +
                                               general_text(c.thickness_min) +
                                               " (no section can be deeper at the spar)");
      item.finish();
      c.spars.push_back(l);
    }
  }
  if (auto g = r.optional_child("te_gap")) read_min_max(*g, c.te_gap_min, c.te_gap_max, 0, 0.05);
  if (auto a = r.optional_child("te_angle_deg"))
    c.te_angle_min_deg = read_min_only(*a, 0, 60, false);
  if (auto le = r.optional_child("le_radius")) c.le_radius_min = read_min_only(*le, 0, 0.1, true);
  if (auto a = r.optional_child("area")) c.area_min = read_min_only(*a, 0, 0.4, true);
  if (auto x = r.optional_child("thickness_x"))
    read_min_max(*x, c.thickness_x_min, c.thickness_x_max, 0.05, 0.8);
  if (auto v = r.optional_child("curvature_reversals")) {
    if (auto u = v->optional_child("upper_max")) {
      c.max_reversals_upper = u->integer();
      if (c.max_reversals_upper < 0 || c.max_reversals_upper > 4) u->fail("must be in 0..4");
    }
    if (auto l = v->optional_child("lower_max")) {
      c.max_reversals_lower = l->integer();
      if (c.max_reversals_lower < 0 || c.max_reversals_lower > 4) l->fail("must be in 0..4");
    }
    v->finish();
  }
  r.finish();
  return c;
}

Parameterization read_parameterization(Reader r) {
  Parameterization p;
  for (const char* key : {"order_upper", "order_lower"}) {
    if (auto c = r.optional_child(key)) {
      const int n = c->integer();
      // Below 2 a surface cannot hold a realistic section; above 12 the Bernstein basis gets
      // ill-conditioned and invites waviness (Kulfan 2008 uses orders up to about 10).
      if (n < 2 || n > 12) c->fail("must be in 2..12 (got " + std::to_string(n) + ")");
      (std::string(key) == "order_upper" ? p.order_upper : p.order_lower) = n;
    }
  }
  if (auto b = r.optional_child("bounds")) {
    if (auto m = b->optional_child("margin")) p.margin = m->in_range(0, 1, true, false);
    if (auto u = b->optional_child("upper")) read_min_max(*u, p.upper_min, p.upper_max, -2, 2);
    if (auto l = b->optional_child("lower")) read_min_max(*l, p.lower_min, p.lower_max, -2, 2);
    b->finish();
  }
  if (auto t = r.optional_child("te_gap")) p.te_gap = t->in_range(0, 0.05, false, false);
  r.finish();
  return p;
}

Baseline read_baseline(Reader r, const std::filesystem::path& base_dir) {
  Baseline b;
  b.json_path = r.path();
  const int kinds = int(r.has("naca")) + int(r.has("file")) + int(r.has("cst"));
  if (kinds != 1) r.fail("give exactly one of naca, file or cst");
  if (auto n = r.optional_child("naca")) {
    b.kind = Baseline::Kind::naca;
    try {
      b.naca = parse_naca(n->string()).digits;
    } catch (const InputError& e) {
      n->fail(e.what());
    }
  }
  if (auto f = r.optional_child("file")) {
    b.kind = Baseline::Kind::file;
    std::filesystem::path p = f->string();
    if (p.is_relative()) p = base_dir / p;
    if (!std::filesystem::is_regular_file(p)) f->fail("no such file: " + p.string());
    b.file = p;
  }
  if (auto c = r.optional_child("cst")) {
    b.kind = Baseline::Kind::cst;
    c->expect_object();
    b.cst = c->node();
  }
  r.finish();
  return b;
}

}  // namespace fulmar::optimize::case_detail
