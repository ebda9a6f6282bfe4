// Tests of the run's plots (run_plots.h): whole SVG documents with the expected charts.
#include "optimize/run_plots.h"

#include <gtest/gtest.h>

#include "geometry/naca.h"

namespace fulmar::optimize {
namespace {

int count(const std::string& s, const std::string& what) {
  int n = 0;
  for (size_t p = s.find(what); p != std::string::npos; p = s.find(what, p + 1)) ++n;
  return n;
}

TEST(RunPlots, SectionsPlotHasItsThreeCharts) {
  const CstShape a = fit_cst(naca_section("0012", 101), 4, 4).shape;
  const CstShape b = fit_cst(naca_section("2412", 101), 4, 4).shape;
  const std::string svg = sections_plot(a, b);
  EXPECT_EQ(svg.rfind("<?xml", 0), 0u);
  EXPECT_NE(svg.find("Sections"), std::string::npos);
  EXPECT_NE(svg.find("Thickness distribution"), std::string::npos);
  EXPECT_NE(svg.find("Camber distribution"), std::string::npos);
  EXPECT_EQ(count(svg, "</svg>"), 1);
}

// A failed analysis has no objective to draw (a gap, not a point at the penalty value), and the
// best-feasible line only takes feasible designs.
TEST(RunPlots, ConvergencePlotSkipsFailedAnalyses) {
  SearchResult r;
  Evaluation ok;
  ok.ok = true;
  ok.objective = 0.6;
  ok.constraints = {-1};
  Evaluation failed;
  failed.ok = false;
  failed.objective = 1e3;
  failed.constraints = {1};
  r.history = {ok, failed, ok};
  const std::string svg = convergence_plot(r, 1e-6);
  EXPECT_NE(svg.find("Convergence"), std::string::npos);
  EXPECT_NE(svg.find("Worst scaled constraint"), std::string::npos);
  EXPECT_EQ(svg.find("1000"), std::string::npos);  // the penalty value never reaches the plot
  EXPECT_EQ(svg.find("nan"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::optimize
