#include "geometry/cst.h"

#include <Eigen/QR>
#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <numbers>
#include <tuple>

#include "common/error.h"

namespace fulmar {

namespace {

constexpr int kMaxCoefficients = 64;  // evaluation buffers; JSON and fits allow at most 26

// All Bernstein polynomials B_{i,n}(x), i = 0..n, into b[0..n] (de Casteljau recursion: stable
// and free of binomial coefficients).
void bernstein(int n, double x, double* b) {
  b[0] = 1.0;
  const double u = 1.0 - x;
  for (int k = 1; k <= n; ++k) {
    b[k] = x * b[k - 1];
    for (int i = k - 1; i >= 1; --i) b[i] = u * b[i] + x * b[i - 1];
    b[0] *= u;
  }
}

const Eigen::VectorXd& coefficients(const CstShape& s, Surface f) {
  return f == Surface::kUpper ? s.upper : s.lower;
}

void check_size(const Eigen::VectorXd& a) {
  if (a.size() < 1 || a.size() > kMaxCoefficients) {
    throw InputError("CST surface has " + std::to_string(a.size()) + " coefficients; it needs 1.." +
                     std::to_string(kMaxCoefficients));
  }
}

double class_function(double x) {
  return std::sqrt(x) * (1.0 - x);
}

}  // namespace

std::string to_string(Surface s) {
  return s == Surface::kUpper ? "upper" : "lower";
}

double cst_shape_function(const CstShape& shape, Surface surface, double x) {
  const Eigen::VectorXd& a = coefficients(shape, surface);
  check_size(a);
  x = std::max(x, 0.0);
  double b[kMaxCoefficients];
  const int n = static_cast<int>(a.size()) - 1;
  bernstein(n, x, b);
  double sum = 0;
  for (int i = 0; i <= n; ++i) sum += a[i] * b[i];
  return sum;
}

double cst_y(const CstShape& shape, Surface surface, double x) {
  const double te = surface == Surface::kUpper ? shape.te_upper : shape.te_lower;
  x = std::max(x, 0.0);
  return class_function(x) * cst_shape_function(shape, surface, x) + x * te;
}

double cst_upper_y(const CstShape& shape, double x) {
  return cst_y(shape, Surface::kUpper, x);
}
double cst_lower_y(const CstShape& shape, double x) {
  return cst_y(shape, Surface::kLower, x);
}

double cst_slope(const CstShape& shape, Surface surface, double x) {
  const Eigen::VectorXd& a = coefficients(shape, surface);
  check_size(a);
  const double te = surface == Surface::kUpper ? shape.te_upper : shape.te_lower;
  const int n = static_cast<int>(a.size()) - 1;
  double b[kMaxCoefficients];
  bernstein(n, x, b);
  double s = 0;
  for (int i = 0; i <= n; ++i) s += a[i] * b[i];
  // dS/dx = n sum (a_{i+1} - a_i) B_{i,n-1}(x)
  double ds = 0;
  if (n >= 1) {
    bernstein(n - 1, x, b);
    for (int i = 0; i < n; ++i) ds += n * (a[i + 1] - a[i]) * b[i];
  }
  if (x <= 0) return std::copysign(std::numeric_limits<double>::infinity(), a[0]);
  const double sx = std::sqrt(x);
  const double dc = 0.5 / sx * (1.0 - x) - sx;
  return dc * s + class_function(x) * ds + te;
}

namespace {
Eigen::VectorXd surface_gradient(const Eigen::VectorXd& a, double x) {
  check_size(a);
  x = std::max(x, 0.0);
  const int n = static_cast<int>(a.size()) - 1;
  Eigen::VectorXd g(n + 1);
  bernstein(n, x, g.data());
  g *= class_function(x);
  return g;
}
}  // namespace

Eigen::VectorXd cst_upper_y_gradient(const CstShape& shape, double x) {
  return surface_gradient(shape.upper, x);
}
Eigen::VectorXd cst_lower_y_gradient(const CstShape& shape, double x) {
  return surface_gradient(shape.lower, x);
}

int cst_parameter_count(const CstShape& shape) {
  return static_cast<int>(shape.upper.size() + shape.lower.size()) + 2;
}

Eigen::VectorXd cst_parameters(const CstShape& shape) {
  const Eigen::Index nu = shape.upper.size(), nl = shape.lower.size();
  Eigen::VectorXd p(nu + nl + 2);
  p.head(nu) = shape.upper;
  p.segment(nu, nl) = shape.lower;
  p[nu + nl] = shape.te_upper;
  p[nu + nl + 1] = shape.te_lower;
  return p;
}

CstShape cst_with_parameters(const CstShape& layout, const Eigen::VectorXd& p) {
  const Eigen::Index nu = layout.upper.size(), nl = layout.lower.size();
  if (p.size() != nu + nl + 2) {
    throw InputError("CST parameter vector has " + std::to_string(p.size()) + " entries; the " +
                     "layout needs " + std::to_string(nu + nl + 2));
  }
  CstShape s;
  s.upper = p.head(nu);
  s.lower = p.segment(nu, nl);
  s.te_upper = p[nu + nl];
  s.te_lower = p[nu + nl + 1];
  return s;
}

void cst_y_gradient(const CstShape& shape, Surface surface, double x,
                    Eigen::Ref<Eigen::VectorXd> row) {
  const Eigen::Index nu = shape.upper.size(), nl = shape.lower.size();
  if (row.size() != nu + nl + 2) {
    throw InputError("CST gradient row has " + std::to_string(row.size()) + " entries; needs " +
                     std::to_string(nu + nl + 2));
  }
  const Eigen::VectorXd& a = coefficients(shape, surface);
  check_size(a);
  x = std::max(x, 0.0);
  row.setZero();
  const Eigen::Index offset = surface == Surface::kUpper ? 0 : nu;
  const int n = static_cast<int>(a.size()) - 1;
  bernstein(n, x, row.data() + offset);
  row.segment(offset, n + 1) *= class_function(x);
  row[surface == Surface::kUpper ? nu + nl : nu + nl + 1] = x;
}

Section cst_section(const CstShape& shape, int points_per_surface, const std::string& name) {
  if (points_per_surface < 10 || points_per_surface > 5000) {
    throw InputError("CST section points per surface: " + std::to_string(points_per_surface) +
                     " is outside [10, 5000]");
  }
  check_size(shape.upper);
  check_size(shape.lower);
  const int np = points_per_surface;
  Section s;
  s.name = name;
  s.points.resize(2 * np - 1, 2);
  for (int i = 0; i < np; ++i) {
    const double beta = std::numbers::pi * (np - 1 - i) / (np - 1);
    double x = 0.5 * (1 - std::cos(beta));
    if (i == 0) x = 1.0;
    if (i == np - 1) x = 0.0;
    s.points(i, 0) = x;
    s.points(i, 1) = cst_upper_y(shape, x);
    const int j = 2 * np - 2 - i;
    s.points(j, 0) = x;
    s.points(j, 1) = cst_lower_y(shape, x);
  }
  return s;
}

CstFit fit_cst(const Section& section, int order_upper, int order_lower) {
  for (int order : {order_upper, order_lower}) {
    if (order < 1 || order > 25) {
      throw InputError("CST order " + std::to_string(order) + " is outside [1, 25]");
    }
  }
  const Points& p = section.points;
  const Eigen::Index n = p.rows();
  if (n < 5) throw InputError("CST fit: section '" + section.name + "' has too few points");
  Eigen::Index ile = 0;
  for (Eigen::Index i = 1; i < n; ++i) {
    if (p(i, 0) < p(ile, 0)) ile = i;
  }
  const double te_x = 0.5 * (p(0, 0) + p(n - 1, 0));
  const double min_x = p(ile, 0);
  if (!(te_x - min_x > 0)) {
    throw InputError("CST fit: section '" + section.name +
                     "' has no chord (trailing edge is not behind the leading edge)");
  }
  const double chord = te_x - min_x;
  const bool closed = (p.row(0) - p.row(n - 1)).norm() <= 1e-12 * chord;
  for (auto [m, order, surf] : {std::tuple{ile + 1, order_upper, Surface::kUpper},
                                std::tuple{n - ile, order_lower, Surface::kLower}}) {
    const Eigen::Index need = order + 2 + (closed ? 0 : 1);
    if (m < need) {
      throw InputError("CST fit: the " + to_string(surf) + " surface of '" + section.name +
                       "' has " + std::to_string(m) + " points; order " + std::to_string(order) +
                       " needs at least " + std::to_string(need));
    }
  }
  // Fits both surfaces with the nose at (x0, y0); returns the sum of squared vertical residuals.
  auto fit_frame = [&](double x0, double y0, CstShape& shape) {
    const double scale = 1.0 / (te_x - x0);
    double ss = 0;
    auto one = [&](Eigen::Index from, Eigen::Index to, int order, Eigen::VectorXd& coef,
                   double& te) {
      const Eigen::Index m = to - from + 1;
      const int cols = order + 1 + (closed ? 0 : 1);
      Eigen::MatrixXd a(m, cols);
      Eigen::VectorXd rhs(m);
      double b[kMaxCoefficients];
      for (Eigen::Index k = 0; k < m; ++k) {
        const double x = std::max((p(from + k, 0) - x0) * scale, 0.0);
        const double y = (p(from + k, 1) - y0) * scale;
        bernstein(order, x, b);
        const double c = class_function(x);
        for (int i = 0; i <= order; ++i) a(k, i) = c * b[i];
        if (!closed) a(k, order + 1) = x;
        rhs[k] = y;
      }
      const Eigen::VectorXd sol = a.colPivHouseholderQr().solve(rhs);
      coef = sol.head(order + 1);
      te = closed ? 0.0 : sol[order + 1];
      ss += (a * sol - rhs).squaredNorm();
    };
    one(0, ile, order_upper, shape.upper, shape.te_upper);
    one(ile, n - 1, order_lower, shape.lower, shape.te_lower);
    return ss;
  };

  // The nose of the fitted curve need not be a data point (cambered NACA sections put none
  // there): search the origin (x0 <= smallest x, so that no point falls ahead of the nose) with
  // Nelder-Mead on the sum of squares, starting at the data point of minimum x. For data that is
  // a CST section the start is the optimum and stays put.
  CstShape shape;
  auto objective = [&](const Eigen::Vector2d& v) {
    if (v.x() > min_x) return std::numeric_limits<double>::infinity();
    return fit_frame(v.x(), v.y(), shape);
  };
  std::array<Eigen::Vector2d, 3> simplex = {Eigen::Vector2d(min_x, p(ile, 1)),
                                            Eigen::Vector2d(min_x - 2e-4 * chord, p(ile, 1)),
                                            Eigen::Vector2d(min_x, p(ile, 1) + 1e-3 * chord)};
  std::array<double, 3> f = {objective(simplex[0]), objective(simplex[1]), objective(simplex[2])};
  if (f[0] > 1e-28) {
    for (int it = 0; it < 200; ++it) {
      std::array<int, 3> idx = {0, 1, 2};
      std::sort(idx.begin(), idx.end(), [&](int a, int b) { return f[a] < f[b]; });
      const int best = idx[0], mid = idx[1], worst = idx[2];
      if (f[worst] - f[best] <= 1e-14 * f[best] ||
          (simplex[worst] - simplex[best]).norm() <= 1e-10 * chord) {
        break;
      }
      const Eigen::Vector2d centre = 0.5 * (simplex[best] + simplex[mid]);
      const Eigen::Vector2d xr = centre + (centre - simplex[worst]);
      const double fr = objective(xr);
      if (fr < f[best]) {
        const Eigen::Vector2d xe = centre + 2.0 * (centre - simplex[worst]);
        const double fe = objective(xe);
        if (fe < fr)
          simplex[worst] = xe, f[worst] = fe;
        else
          simplex[worst] = xr, f[worst] = fr;
      } else if (fr < f[mid]) {
        simplex[worst] = xr, f[worst] = fr;
      } else {
        const Eigen::Vector2d xc = centre + 0.5 * (simplex[worst] - centre);
        const double fc = objective(xc);
        if (fc < f[worst]) {
          simplex[worst] = xc, f[worst] = fc;
        } else {
          for (int k : {mid, worst}) {
            simplex[k] = simplex[best] + 0.5 * (simplex[k] - simplex[best]);
            f[k] = objective(simplex[k]);
          }
        }
      }
    }
  }
  const int best = static_cast<int>(std::min_element(f.begin(), f.end()) - f.begin());
  CstFit fit;
  fit.le_x = simplex[best].x();
  fit.le_y = simplex[best].y();
  fit.scale = 1.0 / (te_x - fit.le_x);
  fit_frame(fit.le_x, fit.le_y, fit.shape);

  for (Eigen::Index i = 0; i < n; ++i) {
    const Surface surf = i < ile ? Surface::kUpper : Surface::kLower;
    const double x = std::max((p(i, 0) - fit.le_x) * fit.scale, 0.0);
    const double y = (p(i, 1) - fit.le_y) * fit.scale;
    const double r = std::abs(cst_y(fit.shape, surf, x) - y);
    const double slope = x > 0 ? cst_slope(fit.shape, surf, x) : 0.0;
    const double normal = x > 0 ? r / std::sqrt(1.0 + slope * slope) : r;
    fit.max_vertical_deviation = std::max(fit.max_vertical_deviation, r);
    fit.max_deviation = std::max(fit.max_deviation, normal);
  }
  return fit;
}

nlohmann::json cst_to_json(const CstShape& shape, const std::string& name) {
  nlohmann::json j;
  j["kind"] = kCstKind;
  j["schema_version"] = kCstSchemaVersion;
  j["name"] = name;
  j["class_exponents"] = {0.5, 1.0};
  j["upper"] = std::vector<double>(shape.upper.data(), shape.upper.data() + shape.upper.size());
  j["lower"] = std::vector<double>(shape.lower.data(), shape.lower.data() + shape.lower.size());
  j["te_upper"] = shape.te_upper;
  j["te_lower"] = shape.te_lower;
  return j;
}

namespace {

[[noreturn]] void json_error(const std::string& where, const std::string& path,
                             const std::string& rule) {
  throw InputError(where + ": " + path + ": " + rule);
}

double finite_number(const nlohmann::json& v, const std::string& where, const std::string& path) {
  if (!v.is_number()) json_error(where, path, "must be a number, found " + v.dump());
  const double d = v.get<double>();
  if (!std::isfinite(d)) json_error(where, path, "must be finite");
  return d;
}

Eigen::VectorXd coefficient_list(const nlohmann::json& j, const std::string& key,
                                 const std::string& where) {
  const std::string path = "/" + key;
  if (!j.contains(key)) json_error(where, path, "missing (list of Bernstein coefficients)");
  const nlohmann::json& a = j[key];
  if (!a.is_array()) json_error(where, path, "must be a list of numbers, found " + a.dump());
  if (a.empty() || a.size() > 26) {
    json_error(where, path,
               "must hold 1..26 coefficients (order 0..25), found " + std::to_string(a.size()));
  }
  Eigen::VectorXd v(static_cast<Eigen::Index>(a.size()));
  for (std::size_t i = 0; i < a.size(); ++i) {
    v[static_cast<Eigen::Index>(i)] = finite_number(a[i], where, path + "/" + std::to_string(i));
  }
  return v;
}

}  // namespace

CstShape cst_from_json(const nlohmann::json& j, const std::string& where) {
  if (!j.is_object()) json_error(where, "/", "must be a JSON object");
  if (!j.contains("kind")) {
    json_error(where, "/kind",
               std::string("missing; a fulmar CST file has \"kind\": \"") + kCstKind + "\"");
  }
  if (j["kind"] != kCstKind) {
    json_error(where, "/kind",
               std::string("must be \"") + kCstKind + "\", found " + j["kind"].dump());
  }
  if (!j.contains("schema_version")) json_error(where, "/schema_version", "missing");
  const nlohmann::json& ver = j["schema_version"];
  if (!ver.is_number_integer() || ver.get<long long>() != kCstSchemaVersion) {
    json_error(
        where, "/schema_version",
        "this fulmar reads version " + std::to_string(kCstSchemaVersion) + ", found " + ver.dump());
  }
  if (j.contains("class_exponents")) {
    const nlohmann::json& c = j["class_exponents"];
    if (!c.is_array() || c.size() != 2 || !c[0].is_number() || !c[1].is_number() ||
        c[0].get<double>() != 0.5 || c[1].get<double>() != 1.0) {
      json_error(where, "/class_exponents",
                 "must be [0.5, 1.0] (round nose, sharp trailing edge "
                 "class function), found " +
                     c.dump());
    }
  }
  CstShape s;
  s.upper = coefficient_list(j, "upper", where);
  s.lower = coefficient_list(j, "lower", where);
  for (const char* key : {"te_upper", "te_lower"}) {
    const std::string path = std::string("/") + key;
    if (!j.contains(key)) json_error(where, path, "missing (trailing-edge height)");
    const double v = finite_number(j[key], where, path);
    if (std::abs(v) > 0.25) json_error(where, path, "must be within [-0.25, 0.25] chord");
    (std::string(key) == "te_upper" ? s.te_upper : s.te_lower) = v;
  }
  if (j.contains("name") && !j["name"].is_string()) {
    json_error(where, "/name", "must be a string, found " + j["name"].dump());
  }
  return s;
}

}  // namespace fulmar
