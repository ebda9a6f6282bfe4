// The SVG charts: a well-formed document, finite coordinates only, and gaps where data are missing.
#include "optimize/svg_plot.h"

#include <gtest/gtest.h>

#include <cmath>

namespace fulmar::optimize {
namespace {

int count(const std::string& s, const std::string& what) {
  int n = 0;
  for (size_t p = s.find(what); p != std::string::npos; p = s.find(what, p + 1)) ++n;
  return n;
}

TEST(SvgPlot, DocumentIsWellFormedAndFinite) {
  Chart c;
  c.title = "cd <vs> cl & more";
  Series s;
  s.label = "a";
  s.x = {0.006, 0.007, std::nan(""), 0.009};
  s.y = {0.2, 0.5, 0.7, 1.0};
  c.series.push_back(s);
  c.guides.push_back({"limit", 1.2, true});
  const std::string svg = svg_document({c, Chart{}});
  EXPECT_EQ(svg.rfind("<?xml", 0), 0u);
  EXPECT_NE(svg.find("</svg>"), std::string::npos);
  EXPECT_EQ(svg.find("nan"), std::string::npos);
  EXPECT_EQ(svg.find("inf"), std::string::npos);
  EXPECT_NE(svg.find("cd &lt;vs&gt; cl &amp; more"), std::string::npos);
  // The missing point breaks the line: two sub-paths.
  EXPECT_EQ(count(svg, " M"), 2);
  EXPECT_EQ(count(svg, "<svg"), 1);
}

TEST(SvgPlot, EqualAspectKeepsShapes) {
  Chart c;
  c.equal_aspect = true;
  Series s;
  s.x = {0, 1, 1, 0, 0};
  s.y = {0, 0, 0.1, 0.1, 0};
  c.series.push_back(s);
  const std::string svg = svg_document({c}, 720);
  EXPECT_EQ(svg.find("nan"), std::string::npos);
}

}  // namespace
}  // namespace fulmar::optimize
