// Polar timings (run from a Release build): a full viscous polar with cl_max refinement, and the
// summary alone, for the sizes the optimizer and `fulmar polar` use. Prints the median of a few
// runs and what the sweep did (solves, converged points).
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <string>
#include <vector>

#include "geometry/naca.h"
#include "geometry/panelling.h"
#include "solvers/viscous/polar.h"

namespace {

using fulmar::viscous::Polar;

struct Run {
  double seconds = 0.0;
  Polar polar;
};

Run median_run(int runs, const fulmar::viscous::ViscousSolver& solver,
               const fulmar::viscous::PolarOptions& options) {
  std::vector<Run> all;
  for (int r = 0; r < runs; ++r) {
    const auto t0 = std::chrono::steady_clock::now();
    Polar p = fulmar::viscous::sweep_polar(solver, options);
    const auto t1 = std::chrono::steady_clock::now();
    all.push_back({std::chrono::duration<double>(t1 - t0).count(), std::move(p)});
  }
  std::sort(all.begin(), all.end(), [](auto& a, auto& b) { return a.seconds < b.seconds; });
  return std::move(all[all.size() / 2]);
}

void report(const char* name, double re, double from, double to, double step) {
  fulmar::PanellingOptions po;
  po.panels = 160;
  fulmar::viscous::ViscousOptions vo;
  vo.reynolds = re;
  const fulmar::viscous::ViscousSolver solver(panel_nodes(fulmar::naca_section(name), po), vo);
  fulmar::viscous::PolarOptions o;
  o.alpha_from = from;
  o.alpha_to = to;
  o.alpha_step = step;
  const Run r = median_run(3, solver, o);
  int converged = 0;
  for (const auto& p : r.polar.points) converged += p.converged;
  const auto& s = r.polar.summary;
  std::printf(
      "  NACA %s Re %.0e, %g..%g step %g: %6.2f s (%d/%zu converged, %d solves, %.0f ms "
      "per solve); cl_max %s\n",
      name, re, from, to, step, r.seconds, converged, r.polar.points.size(), r.polar.solves,
      1e3 * r.seconds / std::max(1, r.polar.solves),
      s.has_cl_max ? std::to_string(s.cl_max).c_str() : "none");
}

}  // namespace

int main() {
  std::printf("polar benchmark (160 panels, N_crit 9, median of 3 runs)\n");
  report("0012", 6e6, -2, 8, 1);
  report("0012", 6e6, -4, 20, 1);
  report("2412", 3e6, -4, 16, 1);
  report("0012", 1e6, 8, 18, 1);

  // The summary alone, on a 41-point polar (no solves).
  std::vector<fulmar::viscous::ViscousResult> pts(41);
  for (int i = 0; i < 41; ++i) {
    const double a = -4.0 + 0.5 * i;
    pts[i].alpha = a;
    pts[i].cl = 0.11 * a - 0.001 * a * a * a * 0.1;
    pts[i].cd = 0.006 + 0.01 * pts[i].cl * pts[i].cl;
    pts[i].converged = true;
  }
  const int calls = 20000;
  const auto t0 = std::chrono::steady_clock::now();
  double sink = 0.0;
  for (int c = 0; c < calls; ++c) sink += fulmar::viscous::summarize_polar(pts).cd_min;
  const auto t1 = std::chrono::steady_clock::now();
  std::printf("  summarize_polar, 41 points: %.2f us/call (%g)\n",
              std::chrono::duration<double, std::micro>(t1 - t0).count() / calls, sink / calls);
  return 0;
}
