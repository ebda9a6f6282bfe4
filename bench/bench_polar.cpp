// Viscous timings and robustness (run from a Release build):
//   1. one point of NACA 0012, Re 6e6, 160 panels: cold start and warm start from the 0.5-deg
//      neighbour (ViscousSolver::solve_from), thread CPU time, minimum of repeats;
//   2. a 41-point polar (sweep_polar, -10..10 deg step 0.5) and the summary alone;
//   3. robustness: sweep_polar over -4..20 deg in 1-deg steps for six sections at three Reynolds
//      numbers; converged fraction from -4 deg up to 2 deg beyond the cl peak (or 20 deg), and
//      every failure in that range (alpha, reason);
//   4. the known weak spot: the sharp-nosed optimizer candidate of tests/data (leading-edge
//      bubble on two panels at 160 panels, DEVELOPERS.md), 4..20 deg at 160, 240 and 320 panels;
//   5. the 20 regression polars of DEVELOPERS.md (NACA 0012, 2412, 4412, 4415, 23012 at Re 2e5,
//      1e6, 3e6, 6e6; -4..14 deg step 0.5, as sweep_polar runs them): converged points, Newton
//      iterations counting failed attempts, solver calls. `bench_polar --points FILE` also writes
//      every point (section, Re, alpha, converged, cl, cd, cm; 10 digits), to compare two builds
//      point by point.
#include <time.h>

#include <algorithm>
#include <chrono>
#include <cstdio>
#include <fstream>
#include <functional>
#include <limits>
#include <numbers>
#include <string>
#include <vector>

#include "geometry/cst.h"
#include "geometry/naca.h"
#include "geometry/panelling.h"
#include "geometry/shape_source.h"
#include "solvers/viscous/polar.h"

namespace {

using namespace fulmar;
using namespace fulmar::viscous;

double thread_cpu_seconds() {
  timespec t{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &t);
  return static_cast<double>(t.tv_sec) + 1e-9 * static_cast<double>(t.tv_nsec);
}

// Minimum thread CPU time of `repeats` calls of f (seconds).
double min_cpu(int repeats, const std::function<void()>& f) {
  double best = std::numeric_limits<double>::infinity();
  for (int r = 0; r < repeats; ++r) {
    const double t0 = thread_cpu_seconds();
    f();
    best = std::min(best, thread_cpu_seconds() - t0);
  }
  return best;
}

// The CPU model from /proc/cpuinfo ("unknown" elsewhere).
std::string cpu_model() {
  std::ifstream in("/proc/cpuinfo");
  std::string line;
  while (std::getline(in, line))
    if (line.rfind("model name", 0) == 0) {
      const std::size_t colon = line.find(':');
      if (colon != std::string::npos) return line.substr(colon + 2);
    }
  return "unknown";
}

ViscousSolver make_solver(const std::string& naca, double re) {
  PanellingOptions po;
  po.panels = 160;
  ViscousOptions vo;
  vo.reynolds = re;
  return ViscousSolver(panel_nodes(naca_section(naca), po), vo);
}

void point_times() {
  const ViscousSolver solver = make_solver("0012", 6e6);
  const ViscousResult neighbour = solver.solve_from(3.5, nullptr);
  ViscousResult cold, warm;
  const double t_cold = min_cpu(5, [&] { cold = solver.solve_from(4.0, nullptr); });
  const double t_warm = min_cpu(5, [&] { warm = solver.solve_from(4.0, &neighbour.state); });
  std::printf("1. NACA 0012 Re 6e6 160 panels, alpha 4 (thread CPU, min of 5)\n");
  std::printf("   cold start: %7.1f ms, %2d Newton iterations, converged %d\n", 1e3 * t_cold,
              cold.iterations, cold.converged());
  std::printf(
      "   warm from 3.5 deg (neighbour converged %d): %7.1f ms, %2d iterations, "
      "converged %d\n",
      neighbour.converged(), 1e3 * t_warm, warm.iterations, warm.converged());
}

void polar_times() {
  const ViscousSolver solver = make_solver("0012", 6e6);
  PolarOptions o;
  o.alpha_from = -10;
  o.alpha_to = 10;
  o.alpha_step = 0.5;
  Polar p;
  const double t = min_cpu(3, [&] { p = sweep_polar(solver, o); });
  int converged = 0;
  for (const ViscousResult& r : p.points) converged += r.converged();
  std::printf(
      "2. 41-point polar NACA 0012 Re 6e6, -10..10 step 0.5 (thread CPU, min of 3): "
      "%.2f s, %d/%zu converged, %d solves (%.0f ms per solve)\n",
      t, converged, p.points.size(), p.solves, 1e3 * t / std::max(1, p.solves));
  const int calls = 20000;
  double sink = 0.0;
  const double ts = min_cpu(1, [&] {
    for (int c = 0; c < calls; ++c) sink += summarize_polar(p.points).cd_min;
  });
  std::printf("   summarize_polar on it: %.2f us/call (%g)\n", 1e6 * ts / calls, sink / calls);
}

void robustness() {
  std::printf(
      "3. robustness: sweep_polar -4..20 deg step 1 (no cl_max refinement), counted from "
      "-4 deg to 2 deg beyond the cl peak or 20 deg\n");
  std::printf("   %-6s %8s %9s %7s %7s %6s  failures (alpha: reason)\n", "NACA", "Re", "converged",
              "peak", "cl_max", "CPU s");
  int total = 0, total_ok = 0;
  for (const char* name : {"0009", "0012", "2412", "4412", "4415", "23012"}) {
    for (double re : {2e5, 1e6, 6e6}) {
      const ViscousSolver solver = make_solver(name, re);
      PolarOptions o;
      o.alpha_from = -4;
      o.alpha_to = 20;
      o.alpha_step = 1;
      o.refine_cl_max = false;
      const double t0 = thread_cpu_seconds();
      const Polar p = sweep_polar(solver, o);
      const double cpu = thread_cpu_seconds() - t0;
      // The grid peak of converged cl; the counted range ends 2 deg beyond it when cl falls
      // after it or the solutions stop converging after it, else at 20 deg.
      const PolarSummary& s = p.summary;
      const double end = s.has_cl_max ? s.alpha_cl_max + 2.0 + 1e-9 : 20.0;
      int n = 0, ok = 0;
      std::string failures;
      for (const ViscousResult& r : p.points) {
        if (r.alpha > end) continue;
        ++n;
        ok += r.converged();
        if (!r.converged()) {
          char buf[160];
          std::snprintf(buf, sizeof buf, " %g: %.60s;", r.alpha, r.reason.c_str());
          failures += buf;
        }
      }
      total += n;
      total_ok += ok;
      char peak[32] = "-", clmax[32] = "-";
      if (s.has_cl_max) {
        std::snprintf(peak, sizeof peak, "%.1f%s", s.alpha_cl_max, s.cl_max_bracketed ? "" : "?");
        std::snprintf(clmax, sizeof clmax, "%.3f", s.cl_max);
      }
      std::printf("   %-6s %8.0e %5d/%-3d %7s %7s %6.1f %s\n", name, re, ok, n, peak, clmax, cpu,
                  failures.c_str());
      std::fflush(stdout);
    }
  }
  std::printf(
      "   all: %d/%d converged (%.1f %%); peak '?' = last converged angle before "
      "failures (a lower bound), '-' = cl still rising at 20 deg\n",
      total_ok, total, 100.0 * total_ok / std::max(1, total));
}

void sharp_nose() {
  const std::string path =
      std::string(FULMAR_SOURCE_DIR) + "/tests/data/sharp_nose_candidate_cst.json";
  // 161 points per surface, as the optimizer builds its candidates.
  const Section section = cst_section(*load_cst_shape(path), 161, "sharp");
  std::printf("4. weak spot: sharp-nosed candidate (%s), Re 2.87e6, M 0.09, 4..20 deg step 1\n",
              "tests/data/sharp_nose_candidate_cst.json");
  for (int panels : {160, 240, 320}) {
    PanellingOptions po;
    po.panels = panels;
    ViscousOptions vo;
    vo.reynolds = 2.87e6;
    vo.mach = 0.09;
    const ViscousSolver solver(panel_nodes(section, po), vo);
    PolarOptions o;
    o.alpha_from = 4;
    o.alpha_to = 20;
    o.alpha_step = 1;
    o.refine_cl_max = false;
    const Polar p = sweep_polar(solver, o);
    int ok = 0;
    for (const ViscousResult& r : p.points) ok += r.converged();
    std::printf("   %3d panels: %2d/%zu converged, cl_max %s\n", panels, ok, p.points.size(),
                p.summary.has_cl_max ? std::to_string(p.summary.cl_max).c_str() : "-");
  }
}

void regression_polars(const char* points_path) {
  std::printf(
      "5. regression polars: NACA 0012 2412 4412 4415 23012 x Re 2e5 1e6 3e6 6e6, -4..14 step "
      "0.5\n");
  std::FILE* out = points_path ? std::fopen(points_path, "w") : nullptr;
  if (points_path && !out) std::printf("   cannot write %s\n", points_path);
  int ok = 0, points = 0, iterations = 0, solves = 0;
  const double t0 = thread_cpu_seconds();
  for (const char* name : {"0012", "2412", "4412", "4415", "23012"})
    for (double re : {2e5, 1e6, 3e6, 6e6}) {
      PanellingOptions po;
      po.panels = 160;
      ViscousOptions vo;
      vo.reynolds = re;
      const ViscousSolver solver(panel_nodes(naca_section(name), po), vo);
      PolarOptions o;
      o.alpha_from = -4;
      o.alpha_to = 14;
      o.alpha_step = 0.5;
      // As sweep_polar(solver, o) runs it, counting every Newton iteration.
      InviscidResult zero;
      solver.inviscid().solve_for_cl(0.0, zero);
      const double start = zero.converged ? zero.alpha * 180.0 / std::numbers::pi : 0.0;
      const PointSolver solve = [&](double alpha, const ViscousState* warm) {
        ViscousResult r = solver.solve_from(alpha, warm);
        iterations += r.iterations;
        return r;
      };
      const Polar p = sweep_polar(solve, start, o);
      solves += p.solves;
      for (const ViscousResult& r : p.points) {
        ++points;
        ok += r.converged();
        if (out)
          std::fprintf(out, "%s %g %g %d %.10g %.10g %.10g\n", name, re, r.alpha,
                       r.converged() ? 1 : 0, r.cl, r.cd, r.cm);
      }
    }
  if (out) std::fclose(out);
  std::printf(
      "   %d/%d converged, %d Newton iterations counting failed attempts, %d solver calls, "
      "%.1f s CPU\n",
      ok, points, iterations, solves, thread_cpu_seconds() - t0);
}

}  // namespace

int main(int argc, char** argv) {
  const char* points_path = nullptr;
  for (int i = 1; i < argc; ++i) {
    if (std::string(argv[i]) == "--points" && i + 1 < argc) {
      points_path = argv[++i];
    } else {
      std::fprintf(stderr, "usage: bench_polar [--points FILE]\n");
      return 2;
    }
  }
  std::printf("viscous polar benchmark (160 panels, N_crit 9, free transition)\n");
  std::printf("machine: %s; compiled for -march=%s\n", cpu_model().c_str(),
              std::string(FULMAR_BUILD_ARCH).empty() ? "(compiler default)" : FULMAR_BUILD_ARCH);
  point_times();
  polar_times();
  robustness();
  sharp_nose();
  regression_polars(points_path);
  return 0;
}
