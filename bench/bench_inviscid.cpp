// Inviscid panel solver timing (run from a Release build, one core): for a new shape (assembly
// + one LU factorisation + two base solves), for each extra angle (superposition, loads), and
// for the coupling data (wake + source-influence matrix D), at 160 and 320 panels; against one
// dense LU factorisation and solve of a random matrix of the same size in the same run.
// Times are thread CPU time (so that other processes on a shared machine count less), the
// minimum over repeats (the least disturbed run).
#include <Eigen/Dense>
#include <algorithm>
#include <cstdio>
#include <ctime>
#include <functional>

#include "geometry/naca.h"
#include "geometry/panelling.h"
#include "solvers/inviscid/panel_solver.h"

namespace {

double cpu_seconds() {
  timespec ts{};
  clock_gettime(CLOCK_THREAD_CPUTIME_ID, &ts);
  return static_cast<double>(ts.tv_sec) + 1e-9 * static_cast<double>(ts.tv_nsec);
}

// Minimum over `repeats` runs of the CPU time per call (seconds) of `f` called `inner` times.
double min_time(int repeats, int inner, const std::function<void()>& f) {
  double best = 1e30;
  for (int r = 0; r < repeats; ++r) {
    const double start = cpu_seconds();
    for (int i = 0; i < inner; ++i) f();
    best = std::min(best, (cpu_seconds() - start) / inner);
  }
  return best;
}

}  // namespace

int main() {
  using namespace fulmar;
  std::printf("%8s %14s %14s %14s %10s %14s\n", "panels", "dense LU (ms)", "new shape (ms)",
              "per angle (us)", "shape/LU", "D build (ms)");
  for (int panels : {160, 320}) {
    PanellingOptions po;
    po.panels = panels;
    const Points nodes = panel_nodes(naca_section("2412", 120, false), po);
    const int n = panels + 2;
    const Eigen::MatrixXd a = Eigen::MatrixXd::Random(n, n) + n * Eigen::MatrixXd::Identity(n, n);
    const Eigen::VectorXd b = Eigen::VectorXd::Random(n);
    double sink = 0.0;
    const double t_lu = min_time(21, 5, [&] {
      Eigen::PartialPivLU<Eigen::MatrixXd> lu(a);
      sink += lu.solve(b)(0);
    });
    const double t_shape = min_time(21, 3, [&] {
      InviscidSolver s(nodes);
      sink += s.base_speed_0()(0);
    });
    const InviscidSolver solver(nodes);
    InviscidResult r;
    solver.solve(0.0, r);
    int k = 0;
    const double t_angle = min_time(21, 2000, [&] {
      solver.solve(-0.1 + 1e-4 * (k++ % 2000), r);
      sink += r.cl;
    });
    const double t_d = min_time(5, 1, [&] {
      const CouplingModel m = solver.coupling_model(0.05);
      sink += m.mass_influence(0, 0);
    });
    std::printf("%8d %14.3f %14.3f %14.2f %10.2f %14.2f\n", panels, 1e3 * t_lu, 1e3 * t_shape,
                1e6 * t_angle, t_shape / t_lu, 1e3 * t_d);
    if (sink == 12345.678) std::printf(" ");
  }
  return 0;
}
