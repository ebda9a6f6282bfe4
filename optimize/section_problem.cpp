#include "optimize/section_problem.h"

#include <algorithm>
#include <cmath>
#include <numbers>

#include "common/error.h"
#include "geometry/coordinates_io.h"
#include "geometry/metrics.h"
#include "geometry/naca.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

std::string text(double v) {
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

std::string scenario_label(const DesignPoint& p, const TransitionScenario& s, size_t scenarios) {
  return scenarios > 1 ? p.name + "/" + s.name : p.name;
}

}  // namespace

GeometryMeasures measure_geometry(const CstShape& shape, const std::vector<SparLimit>& spars,
                                  int allowed_upper, int allowed_lower) {
  std::vector<double> stations;
  for (const auto& sp : spars) stations.push_back(sp.x);
  return measure_cst(shape, stations, allowed_upper, allowed_lower);
}

BaselineShape resolve_baseline(const Case& c) {
  return resolve_shape(c, c.baseline);
}

BaselineShape resolve_shape(const Case& c, const Baseline& base) {
  const Parameterization& p = c.parameterization;
  const std::string where = c.path.string().empty() ? std::string("case") : c.path.string();
  BaselineShape b;
  Section source;
  bool fit = true;
  switch (base.kind) {
    case Baseline::Kind::naca:
      source = naca_section(base.naca, 201);
      b.name = "NACA " + base.naca;
      break;
    case Baseline::Kind::file: {
      try {
        source = read_coordinates(base.file).section;
      } catch (const InputError& e) {
        throw InputError(where + ": " + base.json_path + "/file: " + e.what());
      }
      b.name = source.name.empty() ? base.file.filename().string() : source.name;
      break;
    }
    case Baseline::Kind::cst: {
      b.shape = cst_from_json(base.cst, where + ": " + base.json_path + "/cst");
      b.name = base.cst.value("name", std::string("CST baseline"));
      if (b.shape.upper.size() == p.order_upper + 1 && b.shape.lower.size() == p.order_lower + 1) {
        fit = false;
      } else {
        source = cst_section(b.shape, 201, b.name);
      }
      break;
    }
  }
  if (fit) {
    const CstFit f = fit_cst(source, p.order_upper, p.order_lower);
    b.shape = f.shape;
    b.fit_deviation = f.max_deviation;
  }
  if (!std::isnan(p.te_gap)) {
    // Keep the mean trailing-edge height, set the gap.
    const double mid = 0.5 * (b.shape.te_upper + b.shape.te_lower);
    b.shape.te_upper = mid + 0.5 * p.te_gap;
    b.shape.te_lower = mid - 0.5 * p.te_gap;
  }
  return b;
}

CstShape DesignSpace::shape(const std::vector<double>& x) const {
  CstShape s = layout;
  const Eigen::Index nu = s.upper.size();
  for (Eigen::Index i = 0; i < nu; ++i) s.upper[i] = x[size_t(i)];
  for (Eigen::Index i = 0; i < s.lower.size(); ++i) s.lower[i] = x[size_t(nu + i)];
  return s;
}

DesignSpace design_space(const Case& c, const CstShape& baseline) {
  const Parameterization& p = c.parameterization;
  DesignSpace d;
  d.layout = baseline;
  auto add = [&](const Eigen::VectorXd& a, double lo, double hi, const char* surface) {
    for (Eigen::Index i = 0; i < a.size(); ++i) {
      const double v = a[i];
      if ((!std::isnan(lo) && v < lo) || (!std::isnan(hi) && v > hi))
        throw InputError(c.path.string() + ": /parameterization/bounds/" + surface +
                         ": the baseline's coefficient a_" + std::to_string(i) + " = " + text(v) +
                         " lies outside [" + text(lo) + ", " + text(hi) + "]");
      d.start.push_back(v);
      d.lower.push_back(std::isnan(lo) ? v - p.margin : std::max(lo, v - p.margin));
      d.upper.push_back(std::isnan(hi) ? v + p.margin : std::min(hi, v + p.margin));
      if (!(d.lower.back() < d.upper.back()))
        throw InputError(c.path.string() + ": /parameterization/bounds/" + surface +
                         ": leaves coefficient a_" + std::to_string(i) + " no room to move");
    }
  };
  add(baseline.upper, p.upper_min, p.upper_max, "upper");
  add(baseline.lower, p.lower_min, p.lower_max, "lower");
  return d;
}

SectionProblem::SectionProblem(const Case& c, const SectionEvaluator& evaluator, DesignSpace space)
    : case_(c), evaluator_(evaluator), space_(std::move(space)) {
  const Constraints& k = c.constraints;
  // Scales put one unit of scaled violation at a change a designer would call large.
  limits_.push_back({"thickness_positive", "thickness positive everywhere", true, 0.01, 0.1});
  limits_.push_back({"reversal_upper",
                     "curvature reversal beyond " + std::to_string(k.max_reversals_upper) +
                         " on the upper surface (strength, 1/c)",
                     false, kFlatCurvature, 0.5});
  limits_.push_back({"reversal_lower",
                     "curvature reversal beyond " + std::to_string(k.max_reversals_lower) +
                         " on the lower surface (strength, 1/c)",
                     false, kFlatCurvature, 0.5});
  if (!std::isnan(k.thickness_min))
    limits_.push_back({"thickness_min", "t/c", true, k.thickness_min, k.thickness_min});
  for (const auto& s : k.spars)
    limits_.push_back({"spar_" + text(s.x), "t/c at x = " + text(s.x), true, s.min, s.min});
  if (!std::isnan(k.te_gap_min))
    limits_.push_back({"te_gap_min", "trailing-edge gap", true, k.te_gap_min, 0.005});
  if (!std::isnan(k.te_gap_max))
    limits_.push_back({"te_gap_max", "trailing-edge gap", false, k.te_gap_max, 0.005});
  if (!std::isnan(k.te_angle_min_deg))
    limits_.push_back({"te_angle_min", "trailing-edge wedge angle (deg)", true, k.te_angle_min_deg,
                       std::max(1.0, k.te_angle_min_deg)});
  if (!std::isnan(k.le_radius_min))
    limits_.push_back(
        {"le_radius_min", "leading-edge radius", true, k.le_radius_min, k.le_radius_min});
  if (!std::isnan(k.area_min))
    limits_.push_back({"area_min", "area", true, k.area_min, k.area_min});
  if (!std::isnan(k.thickness_x_min))
    limits_.push_back({"thickness_x_min", "x of maximum t/c", true, k.thickness_x_min, 0.1});
  if (!std::isnan(k.thickness_x_max))
    limits_.push_back({"thickness_x_max", "x of maximum t/c", false, k.thickness_x_max, 0.1});
  if (!std::isnan(k.cl_max_min))
    limits_.push_back({kClMaxId, kClMaxConstraint, true, k.cl_max_min, k.cl_max_min});
  for (const auto& p : c.points)
    if (!std::isnan(p.cm_min))
      for (const auto& s : c.scenarios)
        limits_.push_back({"cm_" + scenario_label(p, s, c.scenarios.size()),
                           "cm at " + scenario_label(p, s, c.scenarios.size()), true, p.cm_min,
                           0.05});
  for (const auto& l : limits_) ids_.push_back(l.id);
  for (const auto& l : limits_)
    names_.push_back(l.name + (l.is_min ? " >= " : " <= ") + text(l.limit));
}

Evaluation SectionProblem::evaluate(const std::vector<double>& x, int panels) const {
  const Case& c = case_;
  Evaluation e;
  e.x = x;
  const CstShape shape = space_.shape(x);
  const GeometryMeasures g =
      measure_geometry(shape, c.constraints.spars, c.constraints.max_reversals_upper,
                       c.constraints.max_reversals_lower);
  const double nan = std::numeric_limits<double>::quiet_NaN();

  std::vector<double> values;
  values.push_back(g.min_shape_gap);
  values.push_back(g.excess_reversal_upper);
  values.push_back(g.excess_reversal_lower);
  const Constraints& k = c.constraints;
  if (!std::isnan(k.thickness_min)) values.push_back(g.thickness);
  for (double t : g.spar_thickness) values.push_back(t);
  if (!std::isnan(k.te_gap_min)) values.push_back(g.te_gap);
  if (!std::isnan(k.te_gap_max)) values.push_back(g.te_gap);
  if (!std::isnan(k.te_angle_min_deg)) values.push_back(g.te_angle_deg);
  if (!std::isnan(k.le_radius_min)) values.push_back(g.le_radius);
  if (!std::isnan(k.area_min)) values.push_back(g.area);
  if (!std::isnan(k.thickness_x_min)) values.push_back(g.thickness_x);
  if (!std::isnan(k.thickness_x_max)) values.push_back(g.thickness_x);

  e.detail.geometry = g;
  e.ok = true;
  e.status = "ok";
  double objective = kFailedObjective;
  ClMaxResult clmax;
  clmax.reason = "not analysed";
  std::vector<PointResult> results;

  if (g.min_shape_gap <= 0) {
    // Crossing surfaces: no flow analysis can mean anything.
    e.ok = false;
    e.status = "invalid geometry: the surfaces cross (thickness <= 0 somewhere)";
  } else {
    AnalysisRequest request;
    request.panels = panels;
    for (const auto& p : c.points)
      for (const auto& s : c.scenarios)
        request.points.push_back(
            {p.cl, FlowCondition{p.reynolds, p.mach, s.ncrit, s.trip_upper, s.trip_lower}});
    if (!std::isnan(k.cl_max_min)) {
      const TransitionScenario& s = c.scenarios.front();
      request.cl_max_at =
          FlowCondition{c.landing.reynolds, c.landing.mach, s.ncrit, s.trip_upper, s.trip_lower};
    }
    const SectionAnalysis a = evaluator_.analyse(cst_section(shape, 161, "design"), request);
    results = a.points;
    clmax = a.cl_max;
    if (results.size() != request.points.size()) {
      e.ok = false;
      e.status = "analysis failed: the evaluator returned " + std::to_string(results.size()) +
                 " of " + std::to_string(request.points.size()) + " points";
      results.resize(request.points.size());
    }
    double sum = 0, weights = 0;
    size_t i = 0;
    for (const auto& p : c.points)
      for (const auto& s : c.scenarios) {
        const PointResult& r = results[i++];
        if (e.ok && (!r.converged || !std::isfinite(r.cd) || r.cd <= 0)) {
          e.ok = false;
          e.status = "analysis failed at " + scenario_label(p, s, c.scenarios.size()) + ": " +
                     (r.reason.empty() ? std::string("not converged") : r.reason);
        }
        sum += p.weight * s.weight * r.cd;
        weights += p.weight * s.weight;
      }
    if (request.cl_max_at && e.ok && (!clmax.found || !std::isfinite(clmax.cl_max))) {
      e.ok = false;
      e.status =
          "cl_max not found: " + (clmax.reason.empty() ? std::string("no peak") : clmax.reason);
    }
    if (e.ok) objective = 100.0 * sum / weights;
  }
  if (!std::isnan(k.cl_max_min)) values.push_back(clmax.found ? clmax.cl_max : nan);
  {
    size_t i = 0;
    for (const auto& p : c.points)
      for (size_t s = 0; s < c.scenarios.size(); ++s, ++i)
        if (!std::isnan(p.cm_min))
          values.push_back(i < results.size() && results[i].converged ? results[i].cm : nan);
  }
  {
    size_t i = 0;
    for (const auto& p : c.points)
      for (const auto& s : c.scenarios) {
        DesignPointRecord pr;
        if (i < results.size()) {
          pr.result = results[i];
        } else {
          pr.result.reason = "not analysed";
        }
        pr.point = p.name;
        pr.scenario = s.name;
        pr.cl_target = p.cl;
        pr.reynolds = p.reynolds;
        pr.mach = p.mach;
        e.detail.points.push_back(std::move(pr));
        ++i;
      }
  }
  e.detail.cl_max = clmax;
  e.detail.panels = panels;
  e.objective = objective;

  for (size_t i = 0; i < limits_.size(); ++i) {
    const Limit& l = limits_[i];
    const double v = values[i];
    double scaled = 1.0;  // an unknown value (failed analysis) counts as violated
    if (std::isfinite(v)) scaled = (l.is_min ? l.limit - v : v - l.limit) / l.scale;
    e.constraints.push_back(scaled);
    ConstraintRecord row;
    row.id = l.id;
    row.name = l.name;
    row.value = std::isfinite(v) ? v : std::numeric_limits<double>::quiet_NaN();
    row.limit = l.limit;
    row.is_min = l.is_min;
    row.satisfied = std::isfinite(v) && scaled <= c.optimizer.constraint_tol;
    e.detail.constraints.push_back(std::move(row));
  }
  return e;
}

SearchProblem SectionProblem::search_problem() const {
  SearchProblem p;
  p.lower = space_.lower;
  p.upper = space_.upper;
  p.start = space_.start;
  p.constraint_names = names_;
  p.constraint_ids = ids_;
  const int panels = case_.analysis.panels;
  // The cl_max margin of the search (AnalysisOptions::search_cl_max_margin) on the scaled value;
  // the detail's table keeps the limit itself.
  int cl_max_index = -1;
  double shift = 0.0;
  for (size_t i = 0; i < limits_.size(); ++i)
    if (limits_[i].id == kClMaxId) {
      cl_max_index = static_cast<int>(i);
      shift = case_.analysis.search_cl_max_margin / limits_[i].scale;
    }
  p.evaluate = [this, panels, cl_max_index, shift](const std::vector<double>& x) {
    Evaluation e = evaluate(x, panels);
    if (cl_max_index >= 0 && static_cast<size_t>(cl_max_index) < e.constraints.size())
      e.constraints[static_cast<size_t>(cl_max_index)] += shift;
    return e;
  };
  return p;
}

const std::vector<ConstraintRecord>& SectionProblem::constraint_table(const Evaluation& e) {
  return e.detail.constraints;
}

}  // namespace fulmar::optimize
