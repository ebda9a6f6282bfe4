#pragma once
// Small line charts as SVG for the optimization report: axes with round tick values, light grid,
// lines and markers, a legend. Several charts can be stacked into one picture.
#include <string>
#include <vector>

namespace fulmar::optimize {

struct Series {
  std::string label;
  std::vector<double> x, y;  // same length; non-finite pairs are skipped (the line breaks there)
  std::string colour = "#1f4e79";
  bool line = true;
  bool markers = false;
  bool dashed = false;
};

// A horizontal or vertical reference line (e.g. the cl_max requirement).
struct Guide {
  std::string label;
  double value = 0;
  bool horizontal = true;
  std::string colour = "#b03a2e";
};

struct Chart {
  std::string title, x_label, y_label;
  std::vector<Series> series;
  std::vector<Guide> guides;
  bool equal_aspect = false;  // one unit of x as long as one of y (section shapes)
  bool flip_y = false;        // larger values downwards (Cp plots)
  double height = 320;        // pixels of this chart within the picture
};

// The charts stacked top to bottom, `width` pixels wide. Always a valid SVG document, also for
// empty charts.
std::string svg_document(const std::vector<Chart>& charts, double width = 720);

// Palette shared by the plots: baseline and optimized section, then further series.
inline constexpr const char* kBaselineColour = "#7f7f7f";
inline constexpr const char* kOptimizedColour = "#c0392b";
inline const std::vector<std::string>& series_colours() {
  static const std::vector<std::string> c{"#1f4e79", "#c0392b", "#2e8b57",
                                          "#8e44ad", "#d68910", "#17a589"};
  return c;
}

}  // namespace fulmar::optimize
