// Benchmark of the optimizer on a case (default cases/demo.json), run from a Release build:
//   ./build/bench/bench_demo [CASE.json] [--grid-only] [--out DIR] [--threads N]
// 1. The optimization itself, as `fulmar optimize` runs it: wall time, the baseline's and the
//    verified optimum's cruise cd, and every constraint of the verified optimum.
// 2. The NACA 4-digit grid: every section with camber 0..6 %, its position 0.2..0.6 and thickness
//    14..18 % (the t/c the demo allows, up to 4 % more), under the same constraints. Each section
//    is fitted with the case's CST orders and trailing-edge gap (as a NACA baseline is), analysed
//    at the case's verification panels exactly as the optimum is verified, and judged by the same
//    constraint table. The optimum should beat every feasible grid section in cruise cd.
#include <algorithm>
#include <chrono>
#include <cmath>
#include <cstdio>
#include <cstring>
#include <filesystem>
#include <iostream>
#include <mutex>
#include <string>
#include <vector>

#include "common/error.h"
#include "common/parallel_for.h"
#include "optimize/case_file.h"
#include "optimize/run.h"
#include "optimize/section_problem.h"
#include "optimize/viscous_evaluator.h"

using namespace fulmar;
using namespace fulmar::optimize;
using nlohmann::json;

namespace {

struct GridRow {
  std::string naca;
  double fit_deviation = 0;
  bool ok = false;
  std::string status;
  double objective = 0;
  std::vector<double> cd;  // per design point (nominal scenario)
  double cl_max = NAN, cm_worst = NAN;
  bool feasible = false;
  std::string violated;  // names of the constraints not met
};

double seconds_since(std::chrono::steady_clock::time_point t0) {
  return std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
}

GridRow evaluate_naca(const Case& base, const SectionEvaluator& ev, const std::string& digits) {
  GridRow row;
  row.naca = digits;
  Case c = base;
  c.baseline = Baseline{};
  c.baseline.kind = Baseline::Kind::naca;
  c.baseline.naca = digits;
  c.baseline.json_path = "/baseline/naca";
  const BaselineShape b = resolve_baseline(c);
  row.fit_deviation = b.fit_deviation;
  const DesignSpace space = design_space(c, b.shape);
  const SectionProblem problem(c, ev, space);
  const Evaluation e = problem.evaluate(space.start, c.analysis.verify_panels);
  row.ok = e.ok();
  row.status = e.status_text();
  row.objective = e.objective;
  const json detail = to_json(e.detail);
  const json& points = detail.at("points");
  for (const auto& p : points)
    if (p.value("scenario", std::string()) == c.scenarios.front().name)
      row.cd.push_back(p.value("converged", false) ? p.value("cd", std::nan("")) : NAN);
  row.cm_worst = INFINITY;
  for (const auto& p : points)
    if (p.value("converged", false))
      row.cm_worst = std::min(row.cm_worst, p.value("cm", std::nan("")));
  const json& clm = detail.at("cl_max");
  if (clm.value("found", false)) row.cl_max = clm.value("cl_max", std::nan(""));
  row.feasible = e.ok();
  for (const auto& t : detail.at("constraints"))
    if (!t.value("satisfied", false)) {
      row.feasible = false;
      row.violated += (row.violated.empty() ? "" : ",") + t.value("name", std::string("?"));
    }
  return row;
}

}  // namespace

int main(int argc, char** argv) {
  std::filesystem::path case_path = "cases/demo.json";
  std::filesystem::path out = std::filesystem::temp_directory_path() / "fulmar-bench-demo";
  bool grid_only = false;
  int threads = static_cast<int>(fulmar::core_count());
  for (int i = 1; i < argc; ++i) {
    if (!std::strcmp(argv[i], "--grid-only")) {
      grid_only = true;
    } else if (!std::strcmp(argv[i], "--out") && i + 1 < argc) {
      out = argv[++i];
    } else if (!std::strcmp(argv[i], "--threads") && i + 1 < argc) {
      threads = std::max(1, std::atoi(argv[++i]));
    } else {
      case_path = argv[i];
    }
  }
  try {
    const Case c = load_case(case_path);
    const auto ev = make_viscous_evaluator();
    std::printf("case %s: %s\n", case_path.string().c_str(), c.name.c_str());
    for (const auto& p : c.points)
      std::printf("  design point %-8s cl %.3f  Re %.3g  M %.3f  weight %.2f\n", p.name.c_str(),
                  p.cl, p.reynolds, p.mach, p.weight);
    std::printf("  cl_max required %.3f at Re %.3g\n", c.constraints.cl_max_min,
                c.landing.reynolds);

    double optimum_cd = NAN, optimum_objective = NAN;
    if (!grid_only) {
      std::filesystem::remove_all(out);
      RunOptions ro;
      ro.output_dir = out;
      ro.progress = &std::cout;
      const auto t0 = std::chrono::steady_clock::now();
      const RunOutcome r = run_optimization(c, *ev, ro);
      const double wall = seconds_since(t0);
      const RunSummary& s = r.summary;
      const auto& bp = s.baseline.points;
      const auto& op = s.optimized.points;
      const double cd0 = bp.empty() ? NAN : bp.front().result.cd;
      optimum_cd = op.empty() ? NAN : op.front().result.cd;
      optimum_objective = 100.0 * s.optimized.weighted_cd;  // NaN when the analysis failed
      std::printf("\noptimization: %.0f s wall, %d evaluations, feasible %s, converged %s\n", wall,
                  s.search.evaluations, r.feasible ? "yes" : "NO", r.converged ? "yes" : "no");
      std::printf("  cruise cd baseline %.6f -> verified optimum %.6f (%+.1f %%)\n", cd0,
                  optimum_cd, 100.0 * (optimum_cd / cd0 - 1.0));
      for (const ConstraintRecord& t : s.constraints)
        std::printf("  %-28s value %10.5f  limit %10.5f  %s\n", t.name.c_str(), t.value, t.limit,
                    t.satisfied ? "met" : "NOT MET");
    }

    std::vector<std::string> grid;
    for (int t = 14; t <= 18; ++t) {
      grid.push_back("00" + std::to_string(t));
      for (int m = 1; m <= 6; ++m)
        for (int p = 2; p <= 6; ++p)
          grid.push_back(std::to_string(m) + std::to_string(p) + std::to_string(t));
    }
    std::vector<GridRow> rows(grid.size());
    std::mutex print;
    const auto t1 = std::chrono::steady_clock::now();
    fulmar::parallel_for(grid.size(), unsigned(threads), [&](std::size_t i) {
      try {
        rows[i] = evaluate_naca(c, *ev, grid[i]);
      } catch (const std::exception& e) {
        rows[i].naca = grid[i];
        rows[i].status = e.what();
      }
      std::lock_guard<std::mutex> lock(print);
      std::fprintf(stderr, "\r  grid %zu/%zu", i + 1, grid.size());
    });
    std::printf("\nNACA 4-digit grid (%zu sections, %d panels, %.0f s wall on %d threads)\n",
                grid.size(), c.analysis.verify_panels, seconds_since(t1), threads);
    std::printf("%-6s %8s %9s %9s %7s %8s %9s  %s\n", "NACA", "fit dev", "cd cruise", "cd pt2",
                "cl_max", "cm min", "objective", "feasible / violated");
    const GridRow* best = nullptr;
    for (const GridRow& r : rows) {
      std::printf("%-6s %8.1e %9.6f %9.6f %7.3f %8.4f %9.5f  %s\n", r.naca.c_str(), r.fit_deviation,
                  r.cd.size() > 0 ? r.cd[0] : NAN, r.cd.size() > 1 ? r.cd[1] : NAN, r.cl_max,
                  r.cm_worst, r.ok ? r.objective : NAN,
                  r.feasible ? "yes" : (r.ok ? r.violated : "analysis: " + r.status).c_str());
      if (r.feasible && !r.cd.empty() && (!best || r.cd[0] < best->cd[0])) best = &r;
    }
    if (best) {
      std::printf("best feasible grid section by cruise cd: NACA %s, cd %.6f, objective %.5f\n",
                  best->naca.c_str(), best->cd[0], best->objective);
      if (std::isfinite(optimum_cd))
        std::printf("verified optimum: cruise cd %.6f (%+.1f %% against NACA %s), objective %.5f\n",
                    optimum_cd, 100.0 * (optimum_cd / best->cd[0] - 1.0), best->naca.c_str(),
                    optimum_objective);
    } else {
      std::printf("no grid section meets every constraint\n");
    }
  } catch (const InputError& e) {
    std::fprintf(stderr, "error: %s\n", e.what());
    return 2;
  }
  return 0;
}
