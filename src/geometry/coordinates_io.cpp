#include "geometry/coordinates_io.h"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <numbers>
#include <optional>
#include <sstream>
#include <vector>

#include "common/atomic_file.h"
#include "common/error.h"
#include "common/number_text.h"
#include "geometry/metrics.h"
#include "geometry/spline.h"

namespace fulmar {

namespace {

constexpr int kMinimumPoints = 6;  // TE, two per surface, nose: the least a spline can follow

std::string trim(const std::string& s) {
  const auto b = s.find_first_not_of(" \t\r\n");
  if (b == std::string::npos) return {};
  const auto e = s.find_last_not_of(" \t\r\n");
  return s.substr(b, e - b + 1);
}

std::string lowercase(std::string s) {
  for (char& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

bool ends_with_csv(const std::filesystem::path& p) {
  return lowercase(p.extension().string()) == ".csv";
}

std::optional<double> number(std::string t) {
  t = trim(t);
  if (t.size() >= 2 && t.front() == '"' && t.back() == '"') t = trim(t.substr(1, t.size() - 2));
  if (!t.empty() && t[0] == '+') t.erase(0, 1);
  if (t.empty()) return std::nullopt;
  double v = 0;
  const auto r = std::from_chars(t.data(), t.data() + t.size(), v);
  if (r.ec != std::errc() || r.ptr != t.data() + t.size() || !std::isfinite(v)) {
    return std::nullopt;
  }
  return v;
}

// Fields separated by blanks, tabs or commas (plain text).
std::vector<std::string> blank_fields(const std::string& line) {
  std::vector<std::string> f;
  std::string cur;
  for (char c : line) {
    if (c == ' ' || c == '\t' || c == ',' || c == ';') {
      if (!cur.empty()) f.push_back(cur), cur.clear();
    } else {
      cur += c;
    }
  }
  if (!cur.empty()) f.push_back(cur);
  return f;
}

std::vector<std::string> comma_fields(const std::string& line) {
  std::vector<std::string> f;
  std::string cur;
  for (char c : line) {
    if (c == ',')
      f.push_back(trim(cur)), cur.clear();
    else
      cur += c;
  }
  f.push_back(trim(cur));
  return f;
}

std::string unquote(std::string s) {
  s = trim(s);
  if (s.size() >= 2 && s.front() == '"' && s.back() == '"') s = trim(s.substr(1, s.size() - 2));
  return s;
}

struct RawPoints {
  std::string name;
  std::vector<double> x, y;
  std::vector<int> line;  // 1-based source line of each point
  int last_line = 0;
  std::string first_comment;  // text of the first comment before any row (a CSV's name)
};

RawPoints parse_rows(const std::string& text, const std::string& source, bool csv) {
  RawPoints raw;
  // A UTF-8 byte-order mark (spreadsheet exports) would otherwise turn the first row into a name.
  const bool bom = text.rfind("\xEF\xBB\xBF", 0) == 0;
  std::istringstream in(bom ? text.substr(3) : text);
  std::string line_text;
  int line_no = 0;
  bool first = true;
  int col_x = -1, col_y = -1;
  std::size_t columns = 0;
  auto fail = [&](const std::string& what) {
    throw InputError(source + ":" + std::to_string(line_no) + ": " + what);
  };
  while (std::getline(in, line_text)) {
    ++line_no;
    raw.last_line = line_no;
    const auto hash = line_text.find('#');
    if (hash != std::string::npos && first && raw.first_comment.empty()) {
      raw.first_comment = trim(line_text.substr(hash + 1));
    }
    const std::string line =
        trim(hash == std::string::npos ? line_text : line_text.substr(0, hash));
    if (line.empty()) continue;
    if (first) {
      first = false;
      const std::vector<std::string> header = comma_fields(line);
      int hx = -1, hy = -1;
      for (std::size_t i = 0; i < header.size(); ++i) {
        const std::string h = lowercase(unquote(header[i]));
        if (h == "x") hx = static_cast<int>(i);
        if (h == "y") hy = static_cast<int>(i);
      }
      if (csv || (hx >= 0 && hy >= 0)) {
        if (hx < 0 || hy < 0) {
          fail("CSV header must name the columns x and y (found '" + line + "')");
        }
        csv = true;
        col_x = hx;
        col_y = hy;
        columns = header.size();
        continue;
      }
      const std::vector<std::string> f = blank_fields(line);
      if (!(f.size() == 2 && number(f[0]) && number(f[1]))) {
        raw.name = line;  // the optional name line
        continue;
      }
    }
    if (csv) {
      const std::vector<std::string> f = comma_fields(line);
      if (f.size() != columns) {
        fail("expected " + std::to_string(columns) + " comma-separated fields as in the header, " +
             "found " + std::to_string(f.size()));
      }
      const auto vx = number(f[col_x]);
      const auto vy = number(f[col_y]);
      if (!vx) fail("x is not a number: '" + f[col_x] + "'");
      if (!vy) fail("y is not a number: '" + f[col_y] + "'");
      raw.x.push_back(*vx);
      raw.y.push_back(*vy);
    } else {
      const std::vector<std::string> f = blank_fields(line);
      if (f.size() != 2) {
        fail("expected two numbers 'x y', found " + std::to_string(f.size()) + " fields: '" + line +
             "'");
      }
      const auto vx = number(f[0]);
      const auto vy = number(f[1]);
      if (!vx) fail("x is not a number: '" + f[0] + "'");
      if (!vy) fail("y is not a number: '" + f[1] + "'");
      raw.x.push_back(*vx);
      raw.y.push_back(*vy);
    }
    raw.line.push_back(line_no);
  }
  if (csv && raw.name.empty()) raw.name = raw.first_comment;
  if (csv && col_x < 0) {
    throw InputError(source + ":" + std::to_string(std::max(line_no, 1)) +
                     ": CSV file has no header row naming the columns x and y");
  }
  return raw;
}

}  // namespace

CoordinateFile parse_coordinates(const std::string& text, const std::string& source, bool csv) {
  RawPoints raw = parse_rows(text, source, csv);
  auto at_line = [&](int line, const std::string& what) {
    return InputError(source + ":" + std::to_string(line) + ": " + what);
  };
  CoordinateFile out;
  Normalisation& norm = out.normalisation;

  // Consecutive repeats (within 1e-12 of the extent) are dropped.
  double extent = 0;
  if (!raw.x.empty()) {
    const auto [xmin, xmax] = std::minmax_element(raw.x.begin(), raw.x.end());
    const auto [ymin, ymax] = std::minmax_element(raw.y.begin(), raw.y.end());
    extent = std::max(*xmax - *xmin, *ymax - *ymin);
  }
  std::vector<Eigen::Vector2d> p;
  std::vector<int> line;
  for (std::size_t i = 0; i < raw.x.size(); ++i) {
    const Eigen::Vector2d q(raw.x[i], raw.y[i]);
    if (!p.empty() && (q - p.back()).norm() <= 1e-12 * extent) {
      ++norm.repeats_dropped;
      continue;
    }
    p.push_back(q);
    line.push_back(raw.line[i]);
  }
  const int n = static_cast<int>(p.size());
  if (n < kMinimumPoints) {
    throw at_line(std::max(raw.last_line, 1), "too few points: " + std::to_string(n) +
                                                  " distinct, a section needs at least " +
                                                  std::to_string(kMinimumPoints));
  }

  // Trailing edge: the two ends together, at the end of the curve farthest from the nose.
  const Eigen::Vector2d te_mid = 0.5 * (p.front() + p.back());
  int nose = 0;
  for (int i = 1; i < n; ++i) {
    if ((p[i] - te_mid).norm() > (p[nose] - te_mid).norm()) nose = i;
  }
  const double chord_est = (p[nose] - te_mid).norm();
  const double gap = (p.front() - p.back()).norm();
  if (!(chord_est > 0) || gap > 0.1 * chord_est) {
    throw at_line(line.front(),
                  "no trailing edge: the first point (line " + std::to_string(line.front()) +
                      ") and the last (line " + std::to_string(line.back()) + ") are " +
                      general_text(gap) + " apart (file units), " +
                      general_text(100 * gap / std::max(chord_est, 1e-300)) +
                      " % of the distance from their midpoint to the farthest point; a section "
                      "file runs from the trailing edge over one surface to the leading edge and "
                      "back, so they must be within 10 %");
  }
  for (int i = 0; i < n; ++i) {
    if ((p[i] - p[nose]).norm() > 1.02 * chord_est) {
      throw at_line(line.front(),
                    "no trailing edge: the curve's ends (lines " + std::to_string(line.front()) +
                        " and " + std::to_string(line.back()) + ") are not at the end farthest " +
                        "from the nose: the point at line " + std::to_string(line[i]) +
                        " lies farther; a section file starts and ends at the trailing edge");
    }
  }

  // Doubling back: a turn of more than 150 degrees between consecutive segments.
  const double cos_limit = std::cos(150.0 * std::numbers::pi / 180.0);
  for (int i = 1; i + 1 < n; ++i) {
    const Eigen::Vector2d d1 = p[i] - p[i - 1], d2 = p[i + 1] - p[i];
    if (d1.dot(d2) < cos_limit * d1.norm() * d2.norm()) {
      throw at_line(line[i], "the curve doubles back here: between line " +
                                 std::to_string(line[i - 1]) + " and line " +
                                 std::to_string(line[i + 1]) +
                                 " it turns by more than 150 degrees");
    }
  }

  // Self-intersection, the trailing-edge closing segment included.
  {
    Points poly(n, 2);
    for (int i = 0; i < n; ++i) poly.row(i) = p[i].transpose();
    if (const auto hit = first_self_intersection(poly)) {
      const auto [i, j] = *hit;
      const int lj = line[j], lj1 = line[(j + 1) % n];
      throw at_line(lj, "the curve crosses or touches itself: the segment from line " +
                            std::to_string(lj) + " to line " + std::to_string(lj1) +
                            " meets the segment from line " + std::to_string(line[i]) +
                            " to line " + std::to_string(line[(i + 1) % n]));
    }
  }

  // Orientation: fulmar order runs counter-clockwise (upper surface first).
  double area2 = 0;
  for (int i = 0; i < n; ++i) {
    const Eigen::Vector2d& a = p[i];
    const Eigen::Vector2d& b = p[(i + 1) % n];
    area2 += a.x() * b.y() - b.x() * a.y();
  }
  if (area2 < 0) {
    std::reverse(p.begin(), p.end());
    std::reverse(line.begin(), line.end());
    norm.reversed = true;
  }

  Points pts(n, 2);
  for (int i = 0; i < n; ++i) pts.row(i) = p[i].transpose();
  double min_x = pts.col(0).minCoeff();
  if ((te_mid - Eigen::Vector2d(1, 0)).norm() > 1e-4 || std::abs(min_x) > 1e-3) {
    const SectionSpline spline(pts);
    const SplinePoint le = spline.at(spline.farthest_from(te_mid.x(), te_mid.y()));
    const Eigen::Vector2d le_pt(le.x, le.y);
    const Eigen::Vector2d chord = te_mid - le_pt;
    norm.applied = true;
    norm.chord = chord.norm();
    norm.leading_edge = le_pt;
    const double phi = std::atan2(chord.y(), chord.x());
    norm.rotation_deg = -phi * 180.0 / std::numbers::pi;
    const double c = std::cos(-phi) / norm.chord, s = std::sin(-phi) / norm.chord;
    for (int i = 0; i < n; ++i) {
      const double dx = p[i].x() - le_pt.x(), dy = p[i].y() - le_pt.y();
      pts(i, 0) = c * dx - s * dy;
      pts(i, 1) = s * dx + c * dy;
    }
    min_x = pts.col(0).minCoeff();
  }

  // Each surface runs one way in x: towards the nose on the first, away on the second.
  int k = 0;
  for (int i = 1; i < n; ++i) {
    if (pts(i, 0) < pts(k, 0)) k = i;
  }
  constexpr double kBackTolerance = 1e-5;  // chord; above the rounding of 5-decimal files
  double run = pts(0, 0);
  for (int i = 1; i <= k; ++i) {
    if (pts(i, 0) > run + kBackTolerance) {
      throw at_line(line[i],
                    "the curve doubles back here: x increases again on the way to the "
                    "leading edge");
    }
    run = std::min(run, pts(i, 0));
  }
  run = pts(k, 0);
  for (int i = k + 1; i < n; ++i) {
    if (pts(i, 0) < run - kBackTolerance) {
      throw at_line(line[i],
                    "the curve doubles back here: x decreases again on the way to the "
                    "trailing edge");
    }
    run = std::max(run, pts(i, 0));
  }

  out.section.name = raw.name.empty() ? std::filesystem::path(source).stem().string() : raw.name;
  out.section.points = std::move(pts);
  return out;
}

CoordinateFile read_coordinates(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError("cannot read coordinate file '" + path.string() + "'");
  std::stringstream ss;
  ss << in.rdbuf();
  return parse_coordinates(ss.str(), path.string(), ends_with_csv(path));
}

namespace {
std::string rows(const Section& s, const char* separator) {
  std::string out;
  char b[96];
  for (Eigen::Index i = 0; i < s.points.rows(); ++i) {
    // + 0.0 turns -0 into 0
    std::snprintf(b, sizeof b, "%.10f%s%.10f\n", s.points(i, 0) + 0.0, separator,
                  s.points(i, 1) + 0.0);
    out += b;
  }
  return out;
}
std::string one_line(std::string s) {
  for (char& c : s) {
    if (c == '\n' || c == '\r' || c == '#') c = ' ';
  }
  s = trim(s);
  return s.empty() ? "section" : s;
}
}  // namespace

std::string coordinates_text(const Section& s) {
  return one_line(s.name) + "\n" + rows(s, " ");
}

std::string coordinates_csv(const Section& s) {
  return "# " + one_line(s.name) + "\nx,y\n" + rows(s, ",");
}

void write_coordinates(const std::filesystem::path& path, const Section& section) {
  write_file_atomically(path,
                        ends_with_csv(path) ? coordinates_csv(section) : coordinates_text(section));
}

}  // namespace fulmar
