#include "optimize/svg_plot.h"

#include "common/number_text.h"
#include "common/xml_text.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <sstream>

namespace fulmar::optimize {
namespace {

// SVG coordinates to a hundredth of a pixel.
std::string f(double v) {
  return fixed_text(v, 2);
}

std::string tick_text(double v, double step) {
  const int decimals = std::max(0, int(std::ceil(-std::log10(step) + 1e-9)));
  return fixed_text(std::abs(v) < 1e-12 * step ? 0.0 : v, std::min(decimals, 6));
}

// A round tick step (1, 2 or 5 times a power of ten) giving about `target` intervals.
double nice_step(double span, int target) {
  const double raw = span / target;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 5.0, 10.0})
    if (m * p >= raw) return m * p;
  return 10 * p;
}

struct Range {
  double lo = 1e300, hi = -1e300;
  void add(double v) {
    if (std::isfinite(v)) lo = std::min(lo, v), hi = std::max(hi, v);
  }
  void settle() {
    if (lo > hi) lo = 0, hi = 1;
    if (hi - lo < 1e-12 * std::max(1.0, std::abs(hi))) lo -= 0.5, hi += 0.5;
  }
};

void draw_chart(std::ostringstream& o, const Chart& c, double x0, double y0, double width) {
  const double left = 64, right = 16, top = 30, bottom = 46;
  double pw = width - left - right, ph = c.height - top - bottom;
  Range xr, yr;
  for (const auto& s : c.series) {
    for (size_t i = 0; i < s.x.size() && i < s.y.size(); ++i)
      if (std::isfinite(s.x[i]) && std::isfinite(s.y[i])) xr.add(s.x[i]), yr.add(s.y[i]);
  }
  for (const auto& g : c.guides) (g.horizontal ? yr : xr).add(g.value);
  xr.settle(), yr.settle();
  double xs = nice_step(xr.hi - xr.lo, 6), ys = nice_step(yr.hi - yr.lo, 5);
  double xlo = std::floor(xr.lo / xs) * xs, xhi = std::ceil(xr.hi / xs) * xs;
  double ylo = std::floor(yr.lo / ys) * ys, yhi = std::ceil(yr.hi / ys) * ys;
  if (c.equal_aspect) {
    // Grow the y range so that both axes have the same scale.
    const double scale = pw / (xhi - xlo);
    const double need = ph / scale;
    const double mid = 0.5 * (ylo + yhi);
    if (need > yhi - ylo)
      ylo = mid - need / 2, yhi = mid + need / 2;
    else
      ph = (yhi - ylo) * scale;
    ys = nice_step(yhi - ylo, 4);
  }
  auto X = [&](double v) { return x0 + left + (v - xlo) / (xhi - xlo) * pw; };
  auto Y = [&](double v) {
    const double t = (v - ylo) / (yhi - ylo);
    return y0 + top + (c.flip_y ? t : 1 - t) * ph;
  };
  o << "<g font-family=\"Helvetica, Arial, sans-serif\" font-size=\"11\" fill=\"#333\">\n";
  o << "<text x=\"" << f(x0 + left) << "\" y=\"" << f(y0 + 18)
    << "\" font-size=\"13\" font-weight=\"bold\">" << xml_escaped(c.title) << "</text>\n";
  o << "<rect x=\"" << f(x0 + left) << "\" y=\"" << f(y0 + top) << "\" width=\"" << f(pw)
    << "\" height=\"" << f(ph) << "\" fill=\"#fbfbfb\" stroke=\"#999\" stroke-width=\"0.8\"/>\n";
  for (double v = std::ceil(xlo / xs) * xs; v <= xhi + 1e-9 * xs; v += xs) {
    o << "<line x1=\"" << f(X(v)) << "\" y1=\"" << f(y0 + top) << "\" x2=\"" << f(X(v))
      << "\" y2=\"" << f(y0 + top + ph) << "\" stroke=\"#e4e4e4\" stroke-width=\"0.7\"/>\n";
    o << "<text x=\"" << f(X(v)) << "\" y=\"" << f(y0 + top + ph + 14)
      << "\" text-anchor=\"middle\">" << tick_text(v, xs) << "</text>\n";
  }
  const double ystart = std::ceil(ylo / ys) * ys;
  for (double v = ystart; v <= yhi + 1e-9 * ys; v += ys) {
    o << "<line x1=\"" << f(x0 + left) << "\" y1=\"" << f(Y(v)) << "\" x2=\"" << f(x0 + left + pw)
      << "\" y2=\"" << f(Y(v)) << "\" stroke=\"#e4e4e4\" stroke-width=\"0.7\"/>\n";
    o << "<text x=\"" << f(x0 + left - 6) << "\" y=\"" << f(Y(v) + 4) << "\" text-anchor=\"end\">"
      << tick_text(v, ys) << "</text>\n";
  }
  o << "<text x=\"" << f(x0 + left + pw / 2) << "\" y=\"" << f(y0 + top + ph + 32)
    << "\" text-anchor=\"middle\">" << xml_escaped(c.x_label) << "</text>\n";
  o << "<text transform=\"translate(" << f(x0 + 14) << "," << f(y0 + top + ph / 2)
    << ") rotate(-90)\" text-anchor=\"middle\">" << xml_escaped(c.y_label) << "</text>\n";
  for (const auto& g : c.guides) {
    if (g.horizontal)
      o << "<line x1=\"" << f(x0 + left) << "\" y1=\"" << f(Y(g.value)) << "\" x2=\""
        << f(x0 + left + pw) << "\" y2=\"" << f(Y(g.value)) << "\" stroke=\"" << g.colour
        << "\" stroke-width=\"1\" stroke-dasharray=\"6 3\"/>\n"
        << "<text x=\"" << f(x0 + left + pw - 4) << "\" y=\"" << f(Y(g.value) - 4)
        << "\" text-anchor=\"end\" fill=\"" << g.colour << "\">" << xml_escaped(g.label)
        << "</text>\n";
    else
      o << "<line x1=\"" << f(X(g.value)) << "\" y1=\"" << f(y0 + top) << "\" x2=\""
        << f(X(g.value)) << "\" y2=\"" << f(y0 + top + ph) << "\" stroke=\"" << g.colour
        << "\" stroke-width=\"1\" stroke-dasharray=\"6 3\"/>\n"
        << "<text x=\"" << f(X(g.value) + 4) << "\" y=\"" << f(y0 + top + 12) << "\" fill=\""
        << g.colour << "\">" << xml_escaped(g.label) << "</text>\n";
  }
  for (const auto& s : c.series) {
    if (s.line) {
      std::string path;
      bool pen = false;
      for (size_t i = 0; i < s.x.size() && i < s.y.size(); ++i) {
        if (!std::isfinite(s.x[i]) || !std::isfinite(s.y[i])) {
          pen = false;
          continue;
        }
        path += (pen ? " L" : " M") + f(X(s.x[i])) + " " + f(Y(s.y[i]));
        pen = true;
      }
      if (!path.empty())
        o << "<path d=\"" << path << "\" fill=\"none\" stroke=\"" << s.colour
          << "\" stroke-width=\"1.6\"" << (s.dashed ? " stroke-dasharray=\"5 3\"" : "") << "/>\n";
    }
    if (s.markers)
      for (size_t i = 0; i < s.x.size() && i < s.y.size(); ++i)
        if (std::isfinite(s.x[i]) && std::isfinite(s.y[i]))
          o << "<circle cx=\"" << f(X(s.x[i])) << "\" cy=\"" << f(Y(s.y[i]))
            << "\" r=\"3.2\" fill=\"white\" stroke=\"" << s.colour << "\" stroke-width=\"1.5\"/>\n";
  }
  // Legend, top right inside the frame.
  double ly = y0 + top + 14;
  for (const auto& s : c.series) {
    if (s.label.empty()) continue;
    const double lx = x0 + left + pw - 170;
    o << "<line x1=\"" << f(lx) << "\" y1=\"" << f(ly - 4) << "\" x2=\"" << f(lx + 18) << "\" y2=\""
      << f(ly - 4) << "\" stroke=\"" << s.colour << "\" stroke-width=\"2\""
      << (s.dashed ? " stroke-dasharray=\"5 3\"" : "") << "/>\n<text x=\"" << f(lx + 24)
      << "\" y=\"" << f(ly) << "\">" << xml_escaped(s.label) << "</text>\n";
    ly += 15;
  }
  o << "</g>\n";
}

}  // namespace

std::string svg_document(const std::vector<Chart>& charts, double width) {
  double height = 0;
  for (const auto& c : charts) height += c.height;
  if (height <= 0) height = 40;
  std::ostringstream o;
  o << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<svg xmlns=\"http://www.w3.org/2000/svg\" "
       "width=\""
    << f(width) << "\" height=\"" << f(height) << "\" viewBox=\"0 0 " << f(width) << " "
    << f(height) << "\">\n"
    << "<rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n";
  double y = 0;
  for (const auto& c : charts) {
    draw_chart(o, c, 0, y, width);
    y += c.height;
  }
  o << "</svg>\n";
  return o.str();
}

}  // namespace fulmar::optimize
