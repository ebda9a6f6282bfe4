// Geometry timings (run from a Release build): panelling, CST section and fit, metrics, for the
// sizes the optimizer uses. Prints the median time per call over repeated batches.
#include <algorithm>
#include <chrono>
#include <cstdio>
#include <functional>
#include <vector>

#include "geometry/cst.h"
#include "geometry/metrics.h"
#include "geometry/naca.h"
#include "geometry/panelling.h"

namespace {

double median_us(int calls, const std::function<void()>& f) {
  std::vector<double> batches;
  for (int b = 0; b < 7; ++b) {
    const auto t0 = std::chrono::steady_clock::now();
    for (int i = 0; i < calls; ++i) f();
    const auto t1 = std::chrono::steady_clock::now();
    batches.push_back(std::chrono::duration<double, std::micro>(t1 - t0).count() / calls);
  }
  std::sort(batches.begin(), batches.end());
  return batches[batches.size() / 2];
}

}  // namespace

int main() {
  using namespace fulmar;
  const Section naca = naca_section("2412");  // 239 points
  const CstFit fit = fit_cst(naca, 8, 8);
  const Section cst = cst_section(fit.shape);
  Points nodes;
  volatile double sink = 0;
  std::printf("geometry benchmark (median of 7 batches)\n");
  std::printf("  panel_nodes, 160 panels, NACA 2412 239 points: %8.1f us/call (target < 1000)\n",
              median_us(2000, [&] {
                panel_nodes(naca, {}, nodes);
                sink = sink + nodes(80, 0);
              }));
  std::printf("  panel_nodes, 160 panels, CST section 239 points: %6.1f us/call\n",
              median_us(2000, [&] {
                panel_nodes(cst, {}, nodes);
                sink = sink + nodes(80, 0);
              }));
  std::printf("  cst_section, order 8, 120 points per surface: %9.1f us/call\n",
              median_us(2000, [&] { sink = sink + cst_section(fit.shape).points(5, 1); }));
  std::printf("  fit_cst, order 8, NACA 2412: %26.1f us/call\n",
              median_us(20, [&] { sink = sink + fit_cst(naca, 8, 8).max_deviation; }));
  std::printf("  section_metrics, NACA 2412: %27.1f us/call\n",
              median_us(200, [&] { sink = sink + section_metrics(naca).thickness; }));
  std::printf("  curvature_reversals + minimum_thickness: %14.1f us/call\n", median_us(200, [&] {
                sink = sink + curvature_reversals(cst).lower + minimum_thickness(cst, 0.02, 0.98);
              }));
  return 0;
}
