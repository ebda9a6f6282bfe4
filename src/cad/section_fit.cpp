#include "cad/section_fit.h"

#include <Eigen/Sparse>
#include <Eigen/SparseCholesky>
#include <algorithm>
#include <cmath>
#include <sstream>

#include "common/error.h"

namespace fulmar::cad {

// ---------------------------------------------------------------------------------------------
// Interpolant

SectionSpline::SectionSpline(const Points& points) : p_(points) {
  const int n = static_cast<int>(points.rows());
  s_.resize(n);
  s_(0) = 0.0;
  for (int i = 1; i < n; ++i) s_(i) = s_(i - 1) + (points.row(i) - points.row(i - 1)).norm();
  // Natural cubic spline (zero second derivative at both ends): tridiagonal system for the
  // second derivatives, solved by the Thomas algorithm (both coordinates at once).
  m_ = Points::Zero(n, 2);
  if (n < 3) return;
  const int k = n - 2;
  std::vector<double> diag(k), upper(k), lower(k);
  Points rhs(k, 2);
  for (int j = 0; j < k; ++j) {
    const int i = j + 1;
    const double h0 = s_(i) - s_(i - 1);
    const double h1 = s_(i + 1) - s_(i);
    lower[j] = h0;
    diag[j] = 2.0 * (h0 + h1);
    upper[j] = h1;
    rhs.row(j) = 6.0 * ((p_.row(i + 1) - p_.row(i)) / h1 - (p_.row(i) - p_.row(i - 1)) / h0);
  }
  for (int j = 1; j < k; ++j) {
    const double w = lower[j] / diag[j - 1];
    diag[j] -= w * upper[j - 1];
    rhs.row(j) -= w * rhs.row(j - 1);
  }
  Points sol(k, 2);
  sol.row(k - 1) = rhs.row(k - 1) / diag[k - 1];
  for (int j = k - 2; j >= 0; --j) sol.row(j) = (rhs.row(j) - upper[j] * sol.row(j + 1)) / diag[j];
  m_.middleRows(1, k) = sol;
}

int SectionSpline::interval(double s) const {
  const int n = static_cast<int>(s_.size());
  const auto it = std::upper_bound(s_.data(), s_.data() + n, s);
  int i = static_cast<int>(it - s_.data()) - 1;
  return std::clamp(i, 0, n - 2);
}

Eigen::Vector2d SectionSpline::point(double s) const {
  const int i = interval(s);
  const double h = s_(i + 1) - s_(i);
  const double a = (s_(i + 1) - s) / h;
  const double b = (s - s_(i)) / h;
  const Eigen::RowVector2d v =
      a * p_.row(i) + b * p_.row(i + 1) +
      ((a * a * a - a) * m_.row(i) + (b * b * b - b) * m_.row(i + 1)) * (h * h) / 6.0;
  return v.transpose();
}

Eigen::Vector2d SectionSpline::first_derivative(double s) const {
  const int i = interval(s);
  const double h = s_(i + 1) - s_(i);
  const double a = (s_(i + 1) - s) / h;
  const double b = (s - s_(i)) / h;
  const Eigen::RowVector2d v = (p_.row(i + 1) - p_.row(i)) / h -
                               (3.0 * a * a - 1.0) * h / 6.0 * m_.row(i) +
                               (3.0 * b * b - 1.0) * h / 6.0 * m_.row(i + 1);
  return v.transpose();
}

Eigen::Vector2d SectionSpline::second_derivative(double s) const {
  const int i = interval(s);
  const double h = s_(i + 1) - s_(i);
  const double a = (s_(i + 1) - s) / h;
  const double b = (s - s_(i)) / h;
  return (a * m_.row(i) + b * m_.row(i + 1)).transpose();
}

double SectionSpline::curvature(double s) const {
  const Eigen::Vector2d d1 = first_derivative(s);
  const Eigen::Vector2d d2 = second_derivative(s);
  const double speed = d1.norm();
  return std::abs(d1.x() * d2.y() - d1.y() * d2.x()) / (speed * speed * speed);
}

// ---------------------------------------------------------------------------------------------
// Section preparation

int leading_edge_index(const Points& points) {
  const Eigen::RowVector2d te = 0.5 * (points.row(0) + points.row(points.rows() - 1));
  int best = 0;
  double best_d = -1.0;
  for (int i = 0; i < points.rows(); ++i) {
    const double d = (points.row(i) - te).squaredNorm();
    if (d > best_d) {
      best_d = d;
      best = i;
    }
  }
  return best;
}

Section cleaned_section(const Section& section) {
  const std::string what = "section '" + section.name + "'";
  if (section.points.rows() < 5) {
    throw InputError(what + ": has " + std::to_string(section.points.rows()) +
                     " points; export needs at least 5");
  }
  if (!section.points.allFinite()) throw InputError(what + ": has a coordinate that is not finite");
  Section out{section.name, Points(section.points.rows(), 2)};
  int n = 0;
  for (int i = 0; i < section.points.rows(); ++i) {
    if (n > 0 && (section.points.row(i) - out.points.row(n - 1)).norm() <= 1e-12) continue;
    out.points.row(n++) = section.points.row(i);
  }
  out.points.conservativeResize(n, 2);
  if (n < 5) throw InputError(what + ": fewer than 5 distinct points");
  const int le = leading_edge_index(out.points);
  if (le == 0 || le == n - 1) {
    throw InputError(what +
                     ": the leading edge (the point farthest from the trailing-edge "
                     "midpoint) is an end point; points must run TE -> LE -> TE");
  }
  return out;
}

Section close_trailing_edge(const Section& section) {
  Section out = section;
  Points& p = out.points;
  const int n = static_cast<int>(p.rows());
  const int le = leading_edge_index(p);
  const Eigen::RowVector2d gap = p.row(0) - p.row(n - 1);
  const double x_le = p(le, 0);
  const double span_upper = p(0, 0) - x_le;
  const double span_lower = p(n - 1, 0) - x_le;
  for (int i = 0; i < n; ++i) {
    const bool upper = i <= le;
    const double span = upper ? span_upper : span_lower;
    const double w = span > 0.0 ? std::clamp((p(i, 0) - x_le) / span, 0.0, 1.0) : 0.0;
    p.row(i) += (upper ? -0.5 : 0.5) * w * gap;
  }
  // Exactly one point at the trailing edge on both ends.
  const Eigen::RowVector2d mid = 0.5 * (section.points.row(0) + section.points.row(n - 1));
  p.row(0) = mid;
  p.row(n - 1) = mid;
  return out;
}

// ---------------------------------------------------------------------------------------------
// Fitting

void FitOptions::Validate() const {
  auto fail = [](const std::string& field, const std::string& value, const std::string& rule) {
    throw InputError("fit option " + field + " = " + value + ": " + rule);
  };
  if (!(tolerance > 0.0) || !std::isfinite(tolerance) || tolerance > 0.1) {
    std::ostringstream v;
    v << tolerance;
    fail("tolerance", v.str(), "must be > 0 and <= 0.1 chord");
  }
  if (degree < 3 || degree > 7) fail("degree", std::to_string(degree), "must be 3..7");
  if (samples_per_interval < 1 || samples_per_interval > 64) {
    fail("samples_per_interval", std::to_string(samples_per_interval), "must be 1..64");
  }
  if (max_control_points < 2 * degree + 2) {
    fail("max_control_points", std::to_string(max_control_points), "must be >= 2 * degree + 2");
  }
}

nlohmann::json FittedSection::to_json() const {
  nlohmann::json j;
  j["converged"] = converged;
  j["max_deviation"] = max_deviation;
  j["max_deviation_input_points"] = max_deviation_input_points;
  j["tolerance"] = tolerance;
  j["curves"] = curves.size();
  j["control_points"] = control_points;
  j["history"] = history;
  j["message"] = message;
  return j;
}

namespace {

// How one control point enters the least-squares problem.
struct ControlRule {
  enum Kind { kFree, kFixed, kOnTangent } kind = kFree;
  Eigen::Vector2d value = Eigen::Vector2d::Zero();      // fixed value, or base point of the tangent
  Eigen::Vector2d direction = Eigen::Vector2d::Zero();  // unit tangent; P = value + a * direction
};

// Data of one curve to fit: dense samples of the interpolant with their interpolant arc length.
struct CurveData {
  Points samples;              // m by 2
  Eigen::VectorXd arc;         // m, interpolant s of each sample
  std::vector<char> is_input;  // 1 where the sample is an input point
  Eigen::VectorXd density;     // m, knot density weight (curvature based)
  bool tangent_at_start = false;
  bool tangent_at_end = false;
  Eigen::Vector2d tangent = Eigen::Vector2d::Zero();  // at the constrained end, along travel
};

struct CurveFit {
  BSplineCurve curve;
  Eigen::VectorXd params;     // foot-point parameter of each sample
  Eigen::VectorXd distances;  // distance of each sample to the curve
};

std::vector<ControlRule> control_rules(const CurveData& data, int n) {
  std::vector<ControlRule> rules(n);
  const int m = static_cast<int>(data.samples.rows());
  rules[0].kind = ControlRule::kFixed;
  rules[0].value = data.samples.row(0).transpose();
  rules[n - 1].kind = ControlRule::kFixed;
  rules[n - 1].value = data.samples.row(m - 1).transpose();
  if (data.tangent_at_end) {
    rules[n - 2].kind = ControlRule::kOnTangent;
    rules[n - 2].value = rules[n - 1].value;
    rules[n - 2].direction = -data.tangent;
  }
  if (data.tangent_at_start) {
    rules[1].kind = ControlRule::kOnTangent;
    rules[1].value = rules[0].value;
    rules[1].direction = data.tangent;
  }
  return rules;
}

// Least-squares control points for the given knots and sample parameters, honouring the rules.
Eigen::MatrixXd least_squares_controls(const CurveData& data, const Eigen::VectorXd& knots,
                                       int degree, const Eigen::VectorXd& params) {
  const int n = static_cast<int>(knots.size()) - degree - 1;
  const int m = static_cast<int>(data.samples.rows());
  const std::vector<ControlRule> rules = control_rules(data, n);
  std::vector<int> first_unknown(n, -1);
  int unknowns = 0;
  for (int i = 0; i < n; ++i) {
    if (rules[i].kind == ControlRule::kFree) {
      first_unknown[i] = unknowns;
      unknowns += 2;
    } else if (rules[i].kind == ControlRule::kOnTangent) {
      first_unknown[i] = unknowns;
      unknowns += 1;
    }
  }
  std::vector<Eigen::Triplet<double>> triplets;
  triplets.reserve(static_cast<size_t>(m) * 2 * (degree + 1));
  Eigen::VectorXd rhs(2 * m);
  std::vector<double> basis(degree + 1);
  for (int k = 0; k < m; ++k) {
    const int span = knot_span(knots, degree, n, params(k));
    basis_functions(knots, degree, span, params(k), basis.data());
    for (int c = 0; c < 2; ++c) {
      const int row = 2 * k + c;
      double r = data.samples(k, c);
      for (int j = 0; j <= degree; ++j) {
        const int i = span - degree + j;
        const double b = basis[j];
        switch (rules[i].kind) {
          case ControlRule::kFixed:
            r -= b * rules[i].value(c);
            break;
          case ControlRule::kFree:
            triplets.emplace_back(row, first_unknown[i] + c, b);
            break;
          case ControlRule::kOnTangent:
            r -= b * rules[i].value(c);
            triplets.emplace_back(row, first_unknown[i], b * rules[i].direction(c));
            break;
        }
      }
      rhs(row) = r;
    }
  }
  Eigen::SparseMatrix<double> a(2 * m, unknowns);
  a.setFromTriplets(triplets.begin(), triplets.end());
  const Eigen::SparseMatrix<double> at = a.transpose();
  Eigen::SparseMatrix<double> normal = at * a;
  const Eigen::VectorXd atb = at * rhs;
  Eigen::SimplicialLDLT<Eigen::SparseMatrix<double>> solver(normal);
  Eigen::VectorXd z;
  if (solver.info() == Eigen::Success) z = solver.solve(atb);
  if (solver.info() != Eigen::Success || !z.allFinite()) {
    // A knot span without data makes the normal matrix singular; a tiny ridge keeps it solvable
    // without changing a well-posed solution measurably.
    Eigen::SparseMatrix<double> ridge(unknowns, unknowns);
    ridge.setIdentity();
    normal += 1e-12 * ridge;
    solver.compute(normal);
    z = solver.solve(atb);
  }
  Eigen::MatrixXd control(n, 2);
  for (int i = 0; i < n; ++i) {
    switch (rules[i].kind) {
      case ControlRule::kFixed:
        control.row(i) = rules[i].value.transpose();
        break;
      case ControlRule::kFree:
        control(i, 0) = z(first_unknown[i]);
        control(i, 1) = z(first_unknown[i] + 1);
        break;
      case ControlRule::kOnTangent:
        control.row(i) = (rules[i].value + z(first_unknown[i]) * rules[i].direction).transpose();
        break;
    }
  }
  return control;
}

// Moves each parameter to the foot point of its sample on the curve (Newton on
// (C(u) - Q) . C'(u) = 0, clamped to the domain) and returns the distances.
void project_samples(const BSplineCurve& curve, const Points& samples, Eigen::VectorXd& params,
                     Eigen::VectorXd& distances) {
  const BSplineCurve d1 = derivative(curve);
  const BSplineCurve d2 = derivative(d1);
  const double lo = curve.first_parameter();
  const double hi = curve.last_parameter();
  distances.resize(samples.rows());
  for (Eigen::Index k = 0; k < samples.rows(); ++k) {
    const Eigen::Vector2d q = samples.row(k).transpose();
    double u = params(k);
    for (int it = 0; it < 12; ++it) {
      const Eigen::Vector2d r = point_at(curve, u) - q;
      const Eigen::Vector2d c1 = point_at(d1, u);
      const Eigen::Vector2d c2 = point_at(d2, u);
      const double f = r.dot(c1);
      const double df = c1.dot(c1) + r.dot(c2);
      if (!(df > 0.0)) break;
      const double next = std::clamp(u - f / df, lo, hi);
      const double step = std::abs(next - u);
      u = next;
      if (step < 1e-15) break;
    }
    params(k) = u;
    distances(k) = (point_at(curve, u) - q).norm();
  }
}

// Interior knots placed so that each span holds an equal share of the curvature-based density.
std::vector<double> initial_interior_knots(const CurveData& data, const Eigen::VectorXd& params,
                                           int count) {
  const int m = static_cast<int>(params.size());
  std::vector<double> cumulative(m, 0.0);
  for (int k = 1; k < m; ++k) {
    cumulative[k] = cumulative[k - 1] +
                    0.5 * (data.density(k) + data.density(k - 1)) * (params(k) - params(k - 1));
  }
  std::vector<double> knots;
  for (int j = 1; j <= count; ++j) {
    const double target = cumulative[m - 1] * j / (count + 1);
    const auto it = std::lower_bound(cumulative.begin(), cumulative.end(), target);
    const int k = std::clamp(static_cast<int>(it - cumulative.begin()), 1, m - 1);
    const double w = (target - cumulative[k - 1]) / (cumulative[k] - cumulative[k - 1] + 1e-300);
    knots.push_back(params(k - 1) + w * (params(k) - params(k - 1)));
  }
  return knots;
}

Eigen::VectorXd clamped_knots(const std::vector<double>& interior, int degree) {
  Eigen::VectorXd t(static_cast<Eigen::Index>(interior.size()) + 2 * (degree + 1));
  int i = 0;
  for (int j = 0; j <= degree; ++j) t(i++) = 0.0;
  for (double v : interior) t(i++) = v;
  for (int j = 0; j <= degree; ++j) t(i++) = 1.0;
  return t;
}

struct CurveResult {
  CurveFit fit;
  bool converged = false;
  std::string reason;
  std::vector<double> history;
};

CurveResult fit_curve(const CurveData& data, const FitOptions& options) {
  const int p = options.degree;
  const int m = static_cast<int>(data.samples.rows());
  CurveResult result;
  Eigen::VectorXd params(m);
  const double s0 = data.arc(0);
  const double s1 = data.arc(m - 1);
  for (int k = 0; k < m; ++k) params(k) = (data.arc(k) - s0) / (s1 - s0);
  std::vector<double> interior = initial_interior_knots(data, params, 2 * p);
  for (int round = 0;; ++round) {
    CurveFit fit;
    fit.curve.degree = p;
    fit.curve.knots = clamped_knots(interior, p);
    fit.params = params;
    // Alternate the linear solve with foot-point parameter correction (Hoschek's intrinsic
    // parameterisation, common practice): the distances measured are then true normal distances.
    for (int pass = 0; pass < 3; ++pass) {
      fit.curve.control = least_squares_controls(data, fit.curve.knots, p, fit.params);
      project_samples(fit.curve, data.samples, fit.params, fit.distances);
    }
    const double worst = fit.distances.maxCoeff();
    result.history.push_back(worst);
    result.fit = fit;
    params = fit.params;
    if (worst <= options.tolerance) {
      result.converged = true;
      return result;
    }
    // Split every span whose worst sample is out of tolerance, if it holds enough samples that
    // both halves stay determined.
    std::vector<double> bounds = {0.0};
    bounds.insert(bounds.end(), interior.begin(), interior.end());
    bounds.push_back(1.0);
    const int spans = static_cast<int>(bounds.size()) - 1;
    std::vector<double> span_worst(spans, 0.0);
    std::vector<int> span_count(spans, 0);
    for (int k = 0; k < m; ++k) {
      const auto it = std::upper_bound(bounds.begin(), bounds.end(), params(k));
      const int s = std::clamp(static_cast<int>(it - bounds.begin()) - 1, 0, spans - 1);
      span_worst[s] = std::max(span_worst[s], fit.distances(k));
      ++span_count[s];
    }
    std::vector<double> added;
    for (int s = 0; s < spans; ++s) {
      if (span_worst[s] > options.tolerance && span_count[s] >= 2 * (p + 1)) {
        added.push_back(0.5 * (bounds[s] + bounds[s + 1]));
      }
    }
    const int control_after = static_cast<int>(interior.size() + added.size()) + p + 1;
    if (added.empty()) {
      result.reason = "no knot span with enough samples left to split";
      return result;
    }
    if (control_after > options.max_control_points) {
      result.reason = "the next refinement would exceed max_control_points = " +
                      std::to_string(options.max_control_points);
      return result;
    }
    interior.insert(interior.end(), added.begin(), added.end());
    std::sort(interior.begin(), interior.end());
  }
}

CurveData curve_data(const SectionSpline& spline, int first, int last, int per_interval) {
  CurveData d;
  const int intervals = last - first;
  const int m = intervals * per_interval + 1;
  d.samples.resize(m, 2);
  d.arc.resize(m);
  d.is_input.assign(m, 0);
  d.density.resize(m);
  const Eigen::VectorXd& s = spline.knots();
  const double length = s(last) - s(first);
  int k = 0;
  for (int i = first; i < last; ++i) {
    for (int j = 0; j < per_interval; ++j) {
      d.arc(k) = s(i) + (s(i + 1) - s(i)) * j / per_interval;
      d.is_input[k] = j == 0;
      ++k;
    }
  }
  d.arc(k) = s(last);
  d.is_input[k] = 1;
  for (k = 0; k < m; ++k) {
    d.samples.row(k) = spline.point(d.arc(k)).transpose();
    // Knot density grows with the square root of curvature times length (common practice for
    // curvature-adaptive knots); the constant keeps flat regions covered.
    d.density(k) = 1.0 + std::sqrt(spline.curvature(d.arc(k)) * length);
  }
  return d;
}

}  // namespace

FittedSection fit_section(const Section& input, const FitOptions& options) {
  options.Validate();
  const Section section = cleaned_section(input);
  const SectionSpline spline(section.points);
  const int n = static_cast<int>(section.points.rows());
  std::vector<CurveData> parts;
  if (options.split) {
    const int le = leading_edge_index(section.points);
    Eigen::Vector2d tangent = spline.first_derivative(spline.knots()(le));
    tangent.normalize();
    parts.push_back(curve_data(spline, 0, le, options.samples_per_interval));
    parts.back().tangent_at_end = true;
    parts.back().tangent = tangent;
    parts.push_back(curve_data(spline, le, n - 1, options.samples_per_interval));
    parts.back().tangent_at_start = true;
    parts.back().tangent = tangent;
  } else {
    parts.push_back(curve_data(spline, 0, n - 1, options.samples_per_interval));
  }
  FittedSection out;
  out.tolerance = options.tolerance;
  out.converged = true;
  std::string reasons;
  for (const CurveData& part : parts) {
    const CurveResult r = fit_curve(part, options);
    out.curves.push_back(r.fit.curve);
    out.control_points += r.fit.curve.control_count();
    out.max_deviation = std::max(out.max_deviation, r.fit.distances.maxCoeff());
    for (Eigen::Index k = 0; k < r.fit.distances.size(); ++k) {
      if (part.is_input[k]) {
        out.max_deviation_input_points =
            std::max(out.max_deviation_input_points, r.fit.distances(k));
      }
    }
    if (out.history.size() < r.history.size()) out.history.resize(r.history.size(), 0.0);
    for (size_t i = 0; i < r.history.size(); ++i)
      out.history[i] = std::max(out.history[i], r.history[i]);
    if (!r.converged) {
      out.converged = false;
      reasons += (reasons.empty() ? "" : "; ") + r.reason;
    }
  }
  std::ostringstream msg;
  msg.precision(3);
  msg << "largest deviation " << out.max_deviation << " chord " << (out.converged ? "<=" : "> ")
      << " tolerance " << options.tolerance << " chord (" << out.curves.size()
      << (out.curves.size() == 1 ? " curve, " : " curves, ") << out.control_points
      << " control points, degree " << options.degree << ")";
  if (!out.converged) msg << ": tolerance not met: " << reasons;
  out.message = msg.str();
  return out;
}

double polyline_deviation(const Section& input, int samples_per_interval) {
  const Section section = cleaned_section(input);
  const SectionSpline spline(section.points);
  const Eigen::VectorXd& s = spline.knots();
  double worst = 0.0;
  for (Eigen::Index i = 0; i + 1 < s.size(); ++i) {
    const Eigen::Vector2d a = section.points.row(i).transpose();
    const Eigen::Vector2d b = section.points.row(i + 1).transpose();
    const Eigen::Vector2d ab = b - a;
    for (int j = 1; j < samples_per_interval; ++j) {
      const Eigen::Vector2d q = spline.point(s(i) + (s(i + 1) - s(i)) * j / samples_per_interval);
      const double t = std::clamp((q - a).dot(ab) / ab.squaredNorm(), 0.0, 1.0);
      worst = std::max(worst, (a + t * ab - q).norm());
    }
  }
  return worst;
}

}  // namespace fulmar::cad
