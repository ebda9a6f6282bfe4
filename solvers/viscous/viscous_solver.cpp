#include "solvers/viscous/viscous_solver.h"

#include <Eigen/LU>
#include <algorithm>
#include <cmath>
#include <numbers>
#include <optional>
#include <sstream>
#include <tuple>

#include "common/error.h"
#include "solvers/viscous/block_linear_solver.h"

namespace fulmar::viscous {

namespace {

constexpr double kDeg = std::numbers::pi / 180.0;

InviscidOptions inviscid_options(const ViscousOptions& o) {
  InviscidOptions io;
  io.mach = o.mach;
  io.wake_length = o.wake_length;
  return io;
}

// Trailing-edge base thickness carried in the wake's delta*, fading out behind the trailing edge
// over 2.5 gap heights (the dead-air region behind a blunt base closes within a few heights;
// a modelling choice), smoothly (zero slope at both ends).
double wake_gap(double h, double distance) {
  if (h <= 0.0) return 0.0;
  const double t = distance / (2.5 * h);
  if (t >= 1.0) return 0.0;
  return h * (1.0 - t) * (1.0 - t) * (1.0 + 2.0 * t);
}

using detail::BlockLinearSystem;
using detail::RowMatrix;

// Everything about one solve that depends on the angle and the stagnation node.
struct Layout {
  int n_surface = 0, n_wake = 0, n = 0;  // stations
  int stag = 0;                          // upper-side first node; lower-side first is stag + 1
  Eigen::VectorXd sign;                  // +1 upper and wake, -1 lower
  Eigen::VectorXd ue_inviscid;           // boundary-layer sense (> 0 downstream)
  // D in boundary-layer sense: sign_i sign_j D_ij (row-major: the Newton solve combines its rows)
  RowMatrix d;
  Eigen::VectorXd s;    // arc length: surface from node 0, wake from TE
  Eigen::VectorXd gap;  // wake base thickness per station (0 on the surface)
  Eigen::VectorXd x;    // x/c of the surface nodes
};

// The node k with q_k > 0 >= q_{k+1} (speed changes sign) nearest to the leading-edge node.
int stagnation_node(const Eigen::VectorXd& q, int n_surface, int le) {
  int best = -1;
  for (int k = 0; k + 1 < n_surface; ++k) {
    if (q(k) > 0.0 && q(k + 1) <= 0.0) {
      if (best < 0 || std::abs(k - le) < std::abs(best - le)) best = k;
    }
  }
  return best < 0 ? le : best;
}

}  // namespace

nlohmann::json ViscousResult::to_json() const {
  nlohmann::json j;
  j["alpha"] = alpha;
  j["cl"] = cl;
  j["cd"] = cd;
  j["cm"] = cm;
  j["cd_friction"] = cd_friction;
  j["cd_pressure"] = cd_pressure;
  j["transition_upper"] = transition_upper;
  j["transition_lower"] = transition_lower;
  j["converged"] = converged;
  j["status"] = to_string(status);
  j["reason"] = reason;
  j["residual"] = residual;
  j["iterations"] = iterations;
  j["residual_history"] = residual_history;
  nlohmann::json h = nlohmann::json::array();
  for (const NewtonIteration& it : history)
    h.push_back({{"residual", it.residual},
                 {"worst_station", it.worst_station},
                 {"worst_equation", it.worst_equation},
                 {"stagnation_node", it.stagnation_node},
                 {"transition_interval_upper", it.transition_upper},
                 {"transition_interval_lower", it.transition_lower},
                 {"relaxation", it.relaxation},
                 {"limited_by", it.limited_by}});
  j["history"] = h;
  return j;
}

ViscousSolver::ViscousSolver(const Points& nodes, const ViscousOptions& options)
    : inviscid_((options.Validate(), nodes), inviscid_options(options)), options_(options) {
  flow_.reynolds = options.reynolds;
  flow_.mach = options.mach;
  flow_.n_crit = options.n_crit;
  surface_response_ = inviscid_.surface_source_response();
}

CouplingModel ViscousSolver::model_at(double alpha_deg) const {
  return inviscid_.coupling_model(alpha_deg * kDeg, &surface_response_);
}

namespace {

// The Newton system and state of one solve.
class CoupledSystem {
 public:
  CoupledSystem(const InviscidSolver& inviscid, const CouplingModel& model,
                const ViscousOptions& options, const FlowConditions& flow)
      : inv_(inviscid),
        model_(model),
        opt_(options),
        flow_(flow),
        jac_(model.surface_nodes + model.wake_nodes) {
    lay_.n_surface = model.surface_nodes;
    lay_.n_wake = model.wake_nodes;
    lay_.n = lay_.n_surface + lay_.n_wake;
    lay_.s = model.arc_length;
    const Points& nodes = inviscid.nodes();
    lay_.x = nodes.col(0);
    const double xmin = lay_.x.minCoeff();
    lay_.x = (lay_.x.array() - xmin) / inviscid.chord();
    le_ = 0;
    lay_.x.minCoeff(&le_);
    lay_.gap = Eigen::VectorXd::Zero(lay_.n);
    te_gap_ = inviscid.te_gap() * inviscid.chord();
    for (int j = 0; j < lay_.n_wake; ++j)
      lay_.gap(lay_.n_surface + j) = wake_gap(te_gap_, lay_.s(lay_.n_surface + j));
    const int n3 = 3 * lay_.n;
    res_.resize(n3);
    c_.resize(lay_.n);
    th_.resize(lay_.n);
    mu_.resize(lay_.n);
    ue_.resize(lay_.n);
    cold_ue_ = Eigen::VectorXd::Ones(lay_.n);
    h_floor_.assign(static_cast<std::size_t>(lay_.n), 0.0);
    h_before_.assign(static_cast<std::size_t>(lay_.n), 0.0);
    kinds_.assign(static_cast<std::size_t>(lay_.n), LayerKind::kLaminar);
  }

  const Layout& layout() const { return lay_; }

  // Sets the stagnation node and the signs that go with it.
  void set_stagnation(int stag) {
    lay_.stag = stag;
    lay_.sign = Eigen::VectorXd::Ones(lay_.n);
    for (int i = stag + 1; i < lay_.n_surface; ++i) lay_.sign(i) = -1.0;
    lay_.ue_inviscid = lay_.sign.cwiseProduct(model_.edge_velocity);
    lay_.d = lay_.sign.asDiagonal() * model_.mass_influence * lay_.sign.asDiagonal();
  }

  // Cold start: march both surfaces and the wake on the inviscid edge velocity. (A second march
  // on the speeds of the marched layer's viscous flow, or on the inviscid flow at the angle of
  // its circulation, starts Newton further from the solution near the stagnation point.)
  void cold_start() { cold_march(model_.edge_velocity); }

  // One cold-start march on the node-sense speeds q (#stations).
  void cold_march(const Eigen::VectorXd& q) {
    set_stagnation(stagnation_node(q, lay_.n_surface, le_));
    cold_ue_ = lay_.sign.cwiseProduct(q);
    march_on_cold_speed();
  }

  // The marches of cold_start on the boundary-layer-sense speeds cold_ue_.
  void march_on_cold_speed() {
    for (int side = 0; side < 2; ++side) {
      const std::vector<int> idx = side_nodes(side);
      const int m = static_cast<int>(idx.size());
      Eigen::VectorXd x(m), ue(m);
      const double xi0 = first_xi(side);
      for (int p = 0; p < m; ++p) {
        x(p) = xi0 + std::abs(lay_.s(idx[p]) - lay_.s(idx[0]));
        ue(p) = p == 0 ? first_speed(side) : std::max(cold_ue_(idx[p]), 1e-3);
      }
      // The inviscid speed falls steeply over the last panels towards the trailing-edge
      // stagnation of a finite-angle edge, which the displacement effect removes; a march on it
      // would start Newton from a layer far too thick there. Continue the trend of the two
      // panels before instead (initial guess only).
      if (m >= 6)
        for (int p = m - 2; p < m; ++p) ue(p) = std::max(ue(p), 2.0 * ue(p - 1) - ue(p - 2));
      for (int p = 0; p < m; ++p) cold_ue_(idx[p]) = ue(p);
      const double trip = trip_arc(side, idx, x);
      const MarchResult mr = march_surface(x, ue, 1.0, trip, flow_, true);
      for (int p = 0; p < m; ++p) {
        const int i = idx[p];
        const StationState& st = mr.stations[p];
        c_(i) = st.c;
        th_(i) = st.theta;
        mu_(i) = st.ue * st.dstar;
        kinds_[i] = mr.kinds[p];
      }
    }
    // Wake from the merged trailing-edge state.
    const StationState merged = merged_state();
    Eigen::VectorXd x(lay_.n_wake), ue(lay_.n_wake), gap(lay_.n_wake);
    for (int j = 0; j < lay_.n_wake; ++j) {
      const int i = lay_.n_surface + j;
      x(j) = lay_.s(i);
      // The same in the near wake: no dip below the trailing-edge speed.
      ue(j) = std::max(cold_ue_(i), 0.5 * (cold_ue_(0) + cold_ue_(lay_.n_surface - 1)));
      cold_ue_(i) = ue(j);
      gap(j) = lay_.gap(i);
    }
    StationState first = merged;
    first.ue = ue(0);
    const MarchResult mw = march_wake(first, x, ue, gap, flow_);
    for (int j = 0; j < lay_.n_wake; ++j) {
      const int i = lay_.n_surface + j;
      c_(i) = mw.stations[j].c;
      th_(i) = mw.stations[j].theta;
      mu_(i) = mw.stations[j].ue * mw.stations[j].dstar;
      kinds_[i] = LayerKind::kWake;
    }
  }

  bool warm_start(const ViscousState& st) {
    if (static_cast<int>(st.stations.size()) != lay_.n || st.stagnation_node < 0 ||
        st.stagnation_node + 1 >= lay_.n_surface)
      return false;
    set_stagnation(st.stagnation_node);
    for (int i = 0; i < lay_.n; ++i) {
      const StationState& s = st.stations[i];
      c_(i) = s.c;
      th_(i) = s.theta;
      mu_(i) = s.ue * s.dstar;
      kinds_[i] = st.kinds[i];
    }
    // Keep each station's delta* (the layer's own state) at this angle's speeds.
    ue_valid_ = true;
    for (int pass = 0; pass < 2; ++pass) {
      update_edge_velocity();
      for (int i = 0; i < lay_.n; ++i) mu_(i) = dstar_speed(i) * st.stations[i].dstar;
    }
    return true;
  }

  // Edge velocities from the current mass defects.
  void update_edge_velocity() {
    ue_.noalias() = lay_.d * mu_;
    ue_ += lay_.ue_inviscid;
  }

  // A laminar layer within two nodes of the stagnation point is close to the stagnation
  // similarity state, H = 2.22 for Hiemenz flow (Falkner-Skan m = 1; Schlichting, Boundary-Layer
  // Theory, table of the Falkner-Skan solutions, from memory); H outside (1.8, 4) there is not a
  // state of it (1.8 is beyond the most accelerated similar flows, 4 is laminar separation).
  static constexpr double kStagnationH = 2.2;
  static constexpr double kNearStagnationHMin = 1.8, kNearStagnationHMax = 4.0;

  // Moves the stagnation node when a first station's speed has turned; returns true if moved.
  bool relocate_stagnation() {
    const int k = lay_.stag;
    int nk = k;
    if (ue_(k) <= 1e-9 * std::abs(ue_(k + 1)) && k > 0)
      nk = k - 1;
    else if (ue_(k + 1) <= 1e-9 * std::abs(ue_(k)) && k + 2 < lay_.n_surface)
      nk = k + 1;
    if (nk == k) return false;
    const int moved = nk < k ? k : k + 1;  // the node that changes side
    // The nodes around the stagnation point keep their delta* (the speed that converts m into
    // delta* changes with their role); the node that changes sides sat next to the stagnation
    // point: a laminar layer near the stagnation similarity state (H about 2.2). So does a laminar
    // node whose delta* has lost its meaning: m was set for a speed that has since changed by a
    // large fraction (right after a cold start, when the displacement effect moves the
    // stagnation point by a panel, H = m / ue / theta came out at 0.97 and 9.2 on a sharp nose).
    const int lo = std::max(0, std::min(k, nk) - 1),
              hi = std::min(lay_.n_surface - 1, std::max(k, nk) + 2);
    std::array<double, 5> dstar{};  // hi - lo + 1 <= 5: the stagnation node moves by one
    for (int i = lo; i <= hi; ++i) {
      const double d = station(i).dstar, h = d / th_(i);
      const bool lost =
          kinds_[i] == LayerKind::kLaminar && !(h > kNearStagnationHMin && h < kNearStagnationHMax);
      dstar[static_cast<std::size_t>(i - lo)] = i == moved || lost ? kStagnationH * th_(i) : d;
    }
    set_stagnation(nk);
    for (int pass = 0; pass < 2; ++pass) {
      update_edge_velocity();
      for (int i = lo; i <= hi; ++i)
        mu_(i) = dstar_speed(i) * dstar[static_cast<std::size_t>(i - lo)];
    }
    c_(moved) = 0.0;
    kinds_[moved] = LayerKind::kLaminar;
    update_edge_velocity();
    return true;
  }

  // Stations of one side in boundary-layer order (side 0 upper, 1 lower).
  std::vector<int> side_nodes(int side) const {
    std::vector<int> idx;
    if (side == 0) {
      for (int i = lay_.stag; i >= 0; --i) idx.push_back(i);
    } else {
      for (int i = lay_.stag + 1; i < lay_.n_surface; ++i) idx.push_back(i);
    }
    return idx;
  }

  // Where the stagnation point lies between the nodes k = stag and k + 1, as the fraction t of
  // that interval from the first node of `side` (t = u_k / (u_k + u_k+1) on the upper side), from
  // the current or inviscid speeds. The first station of a side is modelled at no less than
  // kMinStagnationFraction of the interval (smoothly): a node that sits on the stagnation point
  // would otherwise carry ue ~ 0, where delta* = m / ue and ln ue are ill-conditioned and the
  // Newton system near-singular. The model moves the stagnation point by at most that fraction of
  // one leading-edge panel (~1e-4 chord).
  static constexpr double kMinStagnationFraction = 0.05;
  struct StagnationFraction {
    double t = 0.5, sum = 1.0;       // modelled fraction and u_k + u_k+1
    double d_uk = 0.0, d_uk1 = 0.0;  // dt / du_k, dt / du_k+1
  };
  StagnationFraction stagnation_fraction(int side) const {
    const int k = lay_.stag;
    const Eigen::VectorXd& u = ue_valid_ ? ue_ : cold_ue_;
    return stagnation_fraction(side, u(k), u(k + 1));
  }
  // The same for the speeds a, b at the nodes stag and stag + 1.
  static StagnationFraction stagnation_fraction(int side, double a, double b) {
    StagnationFraction f;
    f.sum = std::max(a + b, 1e-10);
    const double raw = (side == 0 ? a : b) / f.sum;
    double draw_da = (side == 0 ? b : -b) / (f.sum * f.sum);
    double draw_db = (side == 0 ? -a : a) / (f.sum * f.sum);
    if (a + b <= 1e-10) draw_da = draw_db = 0.0;
    constexpr double lo = kMinStagnationFraction, w = 0.8 * kMinStagnationFraction;
    double slope = 1.0;
    f.t = raw;
    if (raw <= lo - w) {
      f.t = lo;
      slope = 0.0;
    } else if (raw < lo + w) {
      const double g = lo + w - raw;
      f.t = raw + g * g / (4.0 * w);
      slope = 1.0 - g / (2.0 * w);
    }
    f.d_uk = slope * draw_da;
    f.d_uk1 = slope * draw_db;
    return f;
  }

  // Arc length from the stagnation point to the first station of a side, and its derivatives
  // with respect to ue at the two nodes around the stagnation point.
  double first_xi(int side, double* d_uk = nullptr, double* d_uk1 = nullptr) const {
    const int k = lay_.stag;
    const double ds = std::abs(lay_.s(k + 1) - lay_.s(k));
    const StagnationFraction f = stagnation_fraction(side);
    if (d_uk) *d_uk = f.d_uk * ds;
    if (d_uk1) *d_uk1 = f.d_uk1 * ds;
    return f.t * ds;
  }

  // The edge speed the boundary layer sees at the first station of a side: t (u_k + u_k+1), the
  // stagnation-point velocity gradient times first_xi (equal to the node's own speed unless the
  // node is within the modelled minimum distance of the stagnation point); derivatives as above.
  double first_speed(int side, double* d_uk = nullptr, double* d_uk1 = nullptr) const {
    const StagnationFraction f = stagnation_fraction(side);
    const bool has_sum = f.sum > 1e-10;
    if (d_uk) *d_uk = f.d_uk * f.sum + (has_sum ? f.t : 0.0);
    if (d_uk1) *d_uk1 = f.d_uk1 * f.sum + (has_sum ? f.t : 0.0);
    return f.t * f.sum;
  }

  // Side whose first station is node i, or -1.
  int first_station_side(int i) const {
    if (i == lay_.stag) return 0;
    if (i == lay_.stag + 1) return 1;
    return -1;
  }

  // Arc length along the side (same origin as the stations' x) of the forced transition point.
  double trip_arc(int side, const std::vector<int>& idx, const Eigen::VectorXd& x) const {
    const double xt = side == 0 ? opt_.trip_upper : opt_.trip_lower;
    if (xt >= 1.0) return 1e9;
    for (std::size_t p = 1; p < idx.size(); ++p) {
      const double xa = lay_.x(idx[p - 1]), xb = lay_.x(idx[p]);
      if (xb > xt && xb > xa) {
        const double w = std::clamp((xt - xa) / (xb - xa), 0.0, 1.0);
        return x(static_cast<Eigen::Index>(p - 1)) + w * (x(p) - x(p - 1));
      }
    }
    return 1e9;
  }

  // Trip fraction of the interval between BL positions p-1 and p of a side.
  double trip_fraction(int side, int i1, int i2) const {
    const double xt = side == 0 ? opt_.trip_upper : opt_.trip_lower;
    if (xt >= 1.0) return 2.0;
    const double xa = lay_.x(i1), xb = lay_.x(i2);
    if (xb <= xt) return 2.0;
    if (xa >= xt) return 0.0;
    return (xt - xa) / (xb - xa);
  }

  // The speed that converts m into delta* = m / ue: bounded below, because at a node on the
  // stagnation point ue ~ 0 is set by tiny mass-defect effects and m / ue would be meaningless
  // there (m -> 0 with ue; the similarity equations then fix delta* through m / kMinDstarSpeed).
  static constexpr double kMinDstarSpeed = 1e-4;
  double dstar_speed(int i) const {
    const int side = first_station_side(i);
    if (side >= 0) return first_speed(side);
    return std::max(ue_(i), kMinDstarSpeed);
  }

  StationState station(int i) const {
    StationState s;
    s.c = c_(i);
    s.theta = th_(i);
    const int side = first_station_side(i);
    s.ue = side >= 0 ? first_speed(side) : ue_(i);
    s.dstar = mu_(i) / dstar_speed(i);
    return s;
  }

  StationState merged_state() const {
    const int u = 0, l = lay_.n_surface - 1;
    StationState a = station_guess(u), b = station_guess(l);
    StationState w;
    w.theta = a.theta + b.theta;
    w.dstar = a.dstar + b.dstar + te_gap_;
    w.c = (turbulent_c(u, a) * a.theta + turbulent_c(l, b) * b.theta) / w.theta;
    w.ue = 0.5 * (a.ue + b.ue);
    return w;
  }

  // Station with ue from the current solution if set, else inviscid.
  StationState station_guess(int i) const {
    StationState s;
    s.c = c_(i);
    s.theta = th_(i);
    s.ue = ue_valid_ ? ue_(i) : cold_ue_(i);
    s.dstar = mu_(i) / s.ue;
    return s;
  }

  // sqrt(Ctau) a trailing-edge station hands to the wake (a laminar one as if it had just
  // become turbulent).
  double turbulent_c(int i, const StationState& s) const {
    if (kinds_[i] != LayerKind::kLaminar) return s.c;
    const Closure<double> k =
        close_station(LayerKind::kTurbulent, 0.0, s.theta, s.dstar, s.ue, flow_);
    return transition_ctau_root(k);
  }

  // Before each Newton step: move the stagnation node to where the speed changes sign (the BL
  // positions of both sides shift with it), then decide the layer kinds.
  void prepare_iteration() {
    bool moved = false;
    for (int move = 0; move < 40 && relocate_stagnation(); ++move) moved = true;
    if (moved) take_transition_from_kinds();
    assign_transition();
  }

  // turbulent_c and its derivatives with respect to the station's (c, theta, delta*, ue).
  std::array<double, 5> turbulent_c_linearized(int i, const StationState& s) const {
    if (kinds_[i] != LayerKind::kLaminar) return {s.c, 1.0, 0.0, 0.0, 0.0};
    const Closure<Dual> k = close_station(LayerKind::kTurbulent, Dual(0.0), Dual::input(s.theta, 0),
                                          Dual::input(s.dstar, 1), Dual::input(s.ue, 2), flow_);
    const Dual c = transition_ctau_root(k);
    return {c.v, 0.0, c.d[0], c.d[1], c.d[2]};
  }

  // Decides laminar/turbulent per station from the current state (amplification, trips). The
  // transition interval moves by at most kMaxTransitionMove intervals per Newton iteration: a
  // transient state in early iterations can put the e^N point far from where it settles, and a
  // large jump of the laminar/turbulent split throws Newton far off. A solve is converged only
  // when that limit is not active (transition_limited() false).
  static constexpr int kMaxTransitionMove = 2;
  // A band of 0.15 interval lengths: wide enough to stop the flipping, narrow enough that nearby
  // shapes reach the same solution (at 0.25 a 1e-3 change of one CST coefficient could land a
  // climb-point solution in another interval and change its cd by 10 %).
  static constexpr double kTransitionHysteresis = 0.15;
  // Shape factors that tell a station that changes kind whether its state fits the new kind:
  // a turbulent station with H above kKeepStateH is reattaching from a bubble (laminar-like); a
  // laminar one above kSeparatedLaminarH is separated (laminar separation at H_k about 4.0 in the
  // closures of closures.h).
  static constexpr double kKeepStateH = 2.4;
  static constexpr double kSeparatedLaminarH = 3.5;
  void assign_transition() {
    transition_limited_ = false;
    bool moved_mass = false;
    for (int side = 0; side < 2; ++side) {
      const std::vector<int> idx = side_nodes(side);
      const int m = static_cast<int>(idx.size());
      // Amplification along the side: the unknowns on laminar stations, continued by the
      // explicit rule over stations that are turbulent now.
      // Over turbulent stations the layer's own state (H ~ 1.4) says nothing about laminar
      // amplification: the rate of the last laminar station is carried on instead.
      std::vector<double> n_est(static_cast<std::size_t>(m), 0.0);
      int natural = m;  // first turbulent BL position (m: laminar to the trailing edge)
      double last_rate = 0.0;
      for (int p = 1; p < m; ++p) {
        const int i1 = idx[p - 1], i2 = idx[p];
        const bool laminar1 = kinds_[i1] == LayerKind::kLaminar || p == 1;
        const StationState s1 = station(i1);
        const double n1 = laminar1 ? s1.c : n_est[p - 1];
        n_est[p - 1] = n1;
        const double x1 = xi_of(side, idx, p - 1), x2 = xi_of(side, idx, p);
        double w = 2.0;
        if (laminar1) {
          const std::array<double, 4> a{n1, s1.theta, s1.dstar, s1.ue};
          w = transition_fraction(x1, x2, a.data(), flow_);
          const Closure<double> k =
              close_station(LayerKind::kLaminar, n1, s1.theta, s1.dstar, s1.ue, flow_);
          last_rate = amplification_rate(k.hk, s1.theta, k.re_theta);
        } else if (last_rate * (x2 - x1) > 1e-12) {
          w = (flow_.n_crit - n1) / (last_rate * (x2 - x1));
        }
        if (w <= 1.0 || trip_fraction(side, i1, i2) <= 1.0) {
          natural = p;
          break;
        }
        n_est[p] = kinds_[i2] == LayerKind::kLaminar ? c_(i2) : n1 + (x2 - x1) * last_rate;
      }
      int first = natural;
      // Hysteresis: the transition stays in its interval while the e^N point lies within
      // kTransitionHysteresis of it (the interval residuals continue smoothly beyond it), so
      // that it cannot flip between two intervals from one iteration to the next.
      const int q = previous_transition_[side];
      bool keep = false;
      if (!release_[side] && q >= 1 && q < m && natural != q &&
          kinds_[idx[q - 1]] == LayerKind::kLaminar &&
          trip_fraction(side, idx[q - 1], idx[q]) > 1.0) {
        bool tripped_before = false;
        for (int p = 1; p < q; ++p)
          tripped_before |= trip_fraction(side, idx[p - 1], idx[p]) <= 1.0;
        const StationState s1 = station(idx[q - 1]);
        const std::array<double, 4> a{s1.c, s1.theta, s1.dstar, s1.ue};
        const double wq =
            transition_fraction(xi_of(side, idx, q - 1), xi_of(side, idx, q), a.data(), flow_);
        keep = !tripped_before && wq >= -kTransitionHysteresis && wq <= 1.0 + kTransitionHysteresis;
      }
      // At a separation bubble the e^N point of a state moves against its transition: a
      // transition that is too early leaves a short bubble with slow amplification and an e^N
      // point too late, and vice versa (at NACA 0012, Re 2e5 about as far on the other side of
      // the settled point). A natural transition there moves half way to the e^N point, which
      // stops the alternation from running away.
      const bool natural_free =
          natural >= m || trip_fraction(side, idx[natural - 1], idx[natural]) > 1.0;
      const bool bubble =
          q >= 1 && q < m &&
          (station(idx[q - 1]).dstar - lay_.gap(idx[q - 1])) / th_(idx[q - 1]) > kSeparatedLaminarH;
      if (keep) {
        first = q;
      } else if (bubble && natural_free && trip_fraction(side, idx[q - 1], idx[q]) > 1.0) {
        const int d = natural - q;
        first = std::clamp(q + (d > 0 ? (d + 1) / 2 : -((1 - d) / 2)), q - kMaxTransitionMove,
                           q + kMaxTransitionMove);
      } else if (previous_transition_[side] >= 1)
        first = std::clamp(natural, previous_transition_[side] - kMaxTransitionMove,
                           previous_transition_[side] + kMaxTransitionMove);
      first = std::clamp(first, 1, m);
      if (first != natural && !keep) transition_limited_ = true;
      previous_transition_[side] = first;
      release_[side] = false;
      transition_interval_[side] = first < m ? first : -1;
      kinds_[idx[0]] = LayerKind::kLaminar;
      double h_laminar = 2.6;  // H of the last laminar station (a Blasius-like value before)
      for (int p = 1; p < m; ++p) {
        const int i = idx[p];
        if (p < first) {
          if (kinds_[i] != LayerKind::kLaminar) {
            // A turbulent station that turns laminar: N from the estimate, and the laminar
            // shape factor of its upstream neighbour (a turbulent H ~ 1.4 would stop the
            // amplification and push transition ever further downstream). A station at the
            // reattachment of a separation bubble already has a laminar-like H and keeps its
            // state: replacing its mass defect would kick the edge velocity there (the coupling
            // answers a local change of m with a sawtooth in ue).
            c_(i) = std::max(n_est[p], 0.0);
            if ((station(i).dstar - lay_.gap(i)) / th_(i) < kKeepStateH) {
              mu_(i) = dstar_speed(i) * (h_laminar * th_(i) + lay_.gap(i));
              moved_mass = true;
            }
          } else {
            // Not capped at attached values: in a separation bubble the laminar layer ahead of
            // transition has H well above 4, and the station that turns laminar continues it.
            h_laminar = std::clamp(station(i).dstar / th_(i), 2.0, 10.0);
          }
          kinds_[i] = LayerKind::kLaminar;
        } else {
          if (kinds_[i] == LayerKind::kLaminar) {
            // A laminar station that turns turbulent: the shape factor and shear stress of the
            // nearest turbulent station downstream (a laminar H ~ 2.6 behind transition would
            // send the turbulent equations after a spurious low-H root).
            int d = -1;
            for (int pp = p + 1; pp < m && d < 0; ++pp)
              if (kinds_[idx[pp]] != LayerKind::kLaminar) d = idx[pp];
            const bool separated = (station(i).dstar - lay_.gap(i)) / th_(i) > kSeparatedLaminarH;
            // The transition moved one interval upstream, onto this station (the e^N point
            // crossed it): the turbulent layer just behind the transition point continues the
            // laminar state (theta and H are continuous through transition), so the state stays.
            // Taking H from downstream instead moves the mass defect and kicks the edge
            // velocity; kept, a warm-started point converges in fewer iterations and more
            // low-Re points converge (NACA 4415 Re 2e5, -4..14 deg: 36 of 37 against 14). Its c
            // is that of the old first turbulent station, which lay as far behind the
            // transition point as this one does now (the initial shear stress of its own state
            // instead leaves a lag residual of order 1: 738 rather than 740 of the 20 test
            // polars' points converged, 390 of 404 rather than 402 of 411 in bench_polar's
            // robustness table). A move the other way (turbulent to laminar) keeps the laminar
            // reset below: a laminar station with a turbulent H ~ 1.5 led NACA 4412 Re 1e6 near
            // zero lift onto a second, lower-lift solution.
            const bool one_upstream = p == q - 1 && first == q - 1;
            if (one_upstream && d >= 0) {
              c_(i) = c_(d);
            } else if (d < 0) {
              // No turbulent station downstream: the state stays, c is the initial shear
              // stress of the station's own state.
              const StationState s2 = station(i);
              const Closure<double> k =
                  close_station(LayerKind::kTurbulent, 0.0, s2.theta, s2.dstar, s2.ue, flow_);
              c_(i) = transition_ctau_root(k);
            } else if (separated) {
              // Transition in a separated laminar layer: the state is continuous through it
              // (only c changes meaning); the turbulent equations reattach the layer from there.
              c_(i) = c_(d);
            } else {
              const double h = std::clamp((station(d).dstar - lay_.gap(d)) / th_(d), 1.3, 2.2);
              mu_(i) = dstar_speed(i) * (h * th_(i) + lay_.gap(i));
              c_(i) = c_(d);
              moved_mass = true;
            }
          }
          kinds_[i] = LayerKind::kTurbulent;
        }
      }
    }
    if (moved_mass) update_edge_velocity();
  }

  // The transition intervals implied by the layer kinds (after a start).
  void take_transition_from_kinds() {
    for (int side = 0; side < 2; ++side) {
      const std::vector<int> idx = side_nodes(side);
      const int m = static_cast<int>(idx.size());
      int first = m;
      for (int p = 1; p < m; ++p)
        if (kinds_[idx[p]] != LayerKind::kLaminar) {
          first = p;
          break;
        }
      previous_transition_[side] = first;
    }
  }
  bool transition_limited() const { return transition_limited_; }

  // A converged state whose transition point lies outside its interval (w < 0 or w > 1, which
  // the hysteresis band of assign_transition allows) is a second representation of a solution
  // whose transition point lies in the neighbouring interval, and not an equivalent one (the
  // station in between carries the wrong layer kind). Releases the hysteresis of such a side
  // for the next assignment, at most NewtonOptions::max_settles times per solve, so that the solve
  // goes on to the representation with w in [0, 1]: one solution whatever the path (warm start,
  // angle step, nearby shape).
  static constexpr double kSettleSlack = 1e-6;
  bool outside_interval(int side) const {
    if (transition_interval_[side] < 1 || settles_ >= opt_.newton.max_settles) return false;
    const double w = transition_weight_[side];
    return w < -kSettleSlack || w > 1.0 + kSettleSlack;
  }
  bool needs_settling() const { return outside_interval(0) || outside_interval(1); }
  void settle_transition() {
    for (int side = 0; side < 2; ++side) release_[side] = outside_interval(side);
    ++settles_;
  }

  double xi_of(int side, const std::vector<int>& idx, int p) const {
    return first_xi(side) + std::abs(lay_.s(idx[p]) - lay_.s(idx[0]));
  }

  // The Jacobian is kept in two parts, J = L + G D P (D the mass-defect influence matrix, P the
  // selection of the m unknowns): L holds each equation's direct dependence on the (c, theta, m)
  // of the one or two stations of its interval (3 by 3 blocks; block lower triangular in the
  // marching order of the stations), G (#equations by #stations) its dependence on the edge
  // velocities. Newton steps are solved through L and an #stations-square capacitance matrix
  // (Woodbury), O(n^2) + O(n_stations^3), instead of a dense LU of all 3 n unknowns.

  // Adds dR/d(c, theta, delta*, ue) of station i to row r of the Jacobian (chain rule through
  // delta* = m / ue and ue = ue_inv + D m; at a first station through first_speed).
  void add_row(int r, int i, double dc, double dth, double dds, double due) {
    const double u = dstar_speed(i);
    Eigen::Matrix3d& b = jac_.block(r / 3, i);
    b(r % 3, 0) += dc;
    b(r % 3, 1) += dth;
    b(r % 3, 2) += dds / u;
    const int side = first_station_side(i);
    if (side >= 0) {
      const double coef = due - dds * mu_(i) / (u * u);
      double d_uk = 0.0, d_uk1 = 0.0;
      first_speed(side, &d_uk, &d_uk1);
      jac_.add_speed(r, lay_.stag, coef * d_uk);
      jac_.add_speed(r, lay_.stag + 1, coef * d_uk1);
      return;
    }
    const double coef = due - (ue_(i) > kMinDstarSpeed ? dds * mu_(i) / (u * u) : 0.0);
    jac_.add_speed(r, i, coef);
  }

  // Stations in marching order: upper side from the stagnation point, lower side, wake.
  void march_order(std::vector<int>& order) const {
    order.clear();
    for (int side = 0; side < 2; ++side)
      for (int i : side_nodes(side)) order.push_back(i);
    for (int j = 0; j < lay_.n_wake; ++j) order.push_back(lay_.n_surface + j);
  }

  // The Newton step for the current Jacobian and residuals into step_ (var-major: c, theta, m
  // blocks of #stations each); false when the system is singular.
  //
  // With W = L^-1 G D (3 #stations by #stations) and z0 = -L^-1 r, the mass-defect part dm of
  // the step solves (I + P W) dm = P z0, and then L dx = -r - G D dm gives the whole step. G is
  // sparse, so G D costs O(n^2) (a few rows of D per equation) and the block solve through L is
  // O(n^2); only the LU of the #stations-square capacitance matrix is O(n^3). W is formed station
  // by station in marching order and only its m rows are kept (in the capacitance matrix): the
  // rows of a station are needed only until the stations downstream that see it are done, so
  // the work stays in a few small buffers instead of a 3 #stations by #stations + 1 matrix
  // streamed through memory three times.
  bool solve_newton() {
    march_order(order_);
    return jac_.solve(lay_.d, order_, res_, step_);
  }

  // The dense Jacobian L + G D P (var-major columns), for the consistency test.
  Eigen::MatrixXd dense_jacobian() const { return jac_.dense(lay_.d); }

  // Residuals and Jacobian at the current state; returns max |residual|.
  double assemble() {
    jac_.clear();
    closure_kind_.assign(static_cast<std::size_t>(lay_.n), -1);
    closure_.resize(static_cast<std::size_t>(lay_.n));
    res_.setZero();
    const int n = lay_.n;
    for (int side = 0; side < 2; ++side) {
      const std::vector<int> idx = side_nodes(side);
      // First station: similarity.
      {
        const int i = idx[0];
        double d_uk = 0.0, d_uk1 = 0.0;
        IntervalSpec spec;
        spec.type = IntervalType::kSimilarity;
        spec.x2 = first_xi(side, &d_uk, &d_uk1);
        const IntervalLinearization lin = linearize_interval(spec, station(i), station(i), flow_);
        for (int e = 0; e < 3; ++e) {
          const int r = 3 * i + e;
          res_(r) = lin.r(e);
          add_row(r, i, lin.j(e, 4), lin.j(e, 5), lin.j(e, 6), lin.j(e, 7));
          // Through the stagnation point's position.
          const double dx = lin.j(e, 0);
          jac_.add_speed(r, lay_.stag, dx * d_uk);
          jac_.add_speed(r, lay_.stag + 1, dx * d_uk1);
        }
      }
      for (std::size_t p = 1; p < idx.size(); ++p) {
        const int i1 = idx[p - 1], i2 = idx[p];
        IntervalSpec spec;
        spec.x1 = xi_of(side, idx, static_cast<int>(p - 1));
        spec.x2 = xi_of(side, idx, static_cast<int>(p));
        if (static_cast<int>(p) == transition_interval_[side]) {
          spec.type = IntervalType::kTransition;
          spec.trip_fraction = trip_fraction(side, i1, i2);
        } else {
          spec.type =
              kinds_[i2] == LayerKind::kLaminar ? IntervalType::kLaminar : IntervalType::kTurbulent;
        }
        double w = -1.0;
        // Every wall station's xi is measured from the stagnation point, which moves with the
        // speeds at the two nodes around it.
        Eigen::Vector3d d_origin = Eigen::Vector3d::Zero();
        const bool first = true;
        IntervalClosures given;
        if (spec.type != IntervalType::kTransition) {
          const LayerKind kind = kinds_[i2];
          given = {closure_of(i1, kind, 0.0), closure_of(i2, kind, 0.0)};
        }
        const IntervalLinearization lin = linearize_interval(
            spec, station(i1), station(i2), flow_, &w, first ? &d_origin : nullptr, given);
        if (spec.type == IntervalType::kTransition) transition_weight_[side] = w;
        double d_uk = 0.0, d_uk1 = 0.0;
        if (first) first_xi(side, &d_uk, &d_uk1);
        for (int e = 0; e < 3; ++e) {
          const int r = 3 * i2 + e;
          res_(r) = lin.r(e);
          add_row(r, i1, lin.j(e, 0), lin.j(e, 1), lin.j(e, 2), lin.j(e, 3));
          add_row(r, i2, lin.j(e, 4), lin.j(e, 5), lin.j(e, 6), lin.j(e, 7));
          if (first) {
            jac_.add_speed(r, lay_.stag, d_origin(e) * d_uk);
            jac_.add_speed(r, lay_.stag + 1, d_origin(e) * d_uk1);
          }
        }
      }
    }
    // Wake: merge at the trailing edge, then wake intervals.
    {
      const int w0 = lay_.n_surface, u = 0, l = lay_.n_surface - 1;
      const StationState a = station(u), b = station(l), w = station(w0);
      const double tsum = a.theta + b.theta;
      // c_w - (cu tu + cl tl) / (tu + tl); a laminar side hands on the initial turbulent
      // sqrt(Ctau) of its state (derivatives through the closures).
      const std::array<double, 5> lu = turbulent_c_linearized(u, a),
                                  ll = turbulent_c_linearized(l, b);
      const double cu = lu[0], cl = ll[0];
      const double cm = (cu * a.theta + cl * b.theta) / tsum;
      int r = 3 * w0;
      res_(r) = w.c - cm;
      add_row(r, w0, 1.0, 0.0, 0.0, 0.0);
      const double fu = -a.theta / tsum, fl = -b.theta / tsum;
      add_row(r, u, fu * lu[1], -(cu - cm) / tsum + fu * lu[2], fu * lu[3], fu * lu[4]);
      add_row(r, l, fl * ll[1], -(cl - cm) / tsum + fl * ll[2], fl * ll[3], fl * ll[4]);
      r = 3 * w0 + 1;
      // (w - S) / S = w / S - 1: d/dS = -w / S^2.
      res_(r) = (w.theta - tsum) / tsum;
      const double dts = -w.theta / (tsum * tsum);
      add_row(r, w0, 0.0, 1.0 / tsum, 0.0, 0.0);
      add_row(r, u, 0.0, dts, 0.0, 0.0);
      add_row(r, l, 0.0, dts, 0.0, 0.0);
      r = 3 * w0 + 2;
      const double dscale = a.dstar + b.dstar + te_gap_;
      res_(r) = (w.dstar - dscale) / dscale;
      const double dds = -w.dstar / (dscale * dscale);
      add_row(r, w0, 0.0, 0.0, 1.0 / dscale, 0.0);
      add_row(r, u, 0.0, 0.0, dds, 0.0);
      add_row(r, l, 0.0, 0.0, dds, 0.0);
    }
    for (int j = 1; j < lay_.n_wake; ++j) {
      const int i1 = lay_.n_surface + j - 1, i2 = i1 + 1;
      IntervalSpec spec;
      spec.type = IntervalType::kWake;
      spec.x1 = lay_.s(i1);
      spec.x2 = lay_.s(i2);
      spec.gap1 = lay_.gap(i1);
      spec.gap2 = lay_.gap(i2);
      const IntervalLinearization lin =
          linearize_interval(spec, station(i1), station(i2), flow_, nullptr, nullptr,
                             {closure_of(i1, LayerKind::kWake, spec.gap1),
                              closure_of(i2, LayerKind::kWake, spec.gap2)});
      for (int e = 0; e < 3; ++e) {
        const int r = 3 * i2 + e;
        res_(r) = lin.r(e);
        add_row(r, i1, lin.j(e, 0), lin.j(e, 1), lin.j(e, 2), lin.j(e, 3));
        add_row(r, i2, lin.j(e, 4), lin.j(e, 5), lin.j(e, 6), lin.j(e, 7));
      }
    }
    (void)n;
    return res_.allFinite() ? res_.cwiseAbs().maxCoeff() : INFINITY;
  }

  // The closures of station i as a layer of kind `kind` (gap: its wake base thickness) in this
  // assembly: each station is the end of one interval and the start of the next, and closes
  // once for both.
  const Closure<StationDual>* closure_of(int i, LayerKind kind, double gap) {
    const std::size_t k = static_cast<std::size_t>(i);
    if (closure_kind_[k] != static_cast<int>(kind)) {
      closure_[k] = station_closure(kind, station(i), flow_, gap);
      closure_kind_[k] = static_cast<int>(kind);
    }
    return &closure_[k];
  }

  // One limited Newton step; returns the relaxation factor used (0 if the solve failed).
  double newton_step() {
    if (!solve_newton()) return 0.0;
    const int n = lay_.n;
    double rlx = 1.0;
    limited_by_.clear();
    auto limit = [&](double change, double allowed, const char* what, int i) {
      if (std::abs(change) * rlx > allowed) {
        rlx = allowed / std::abs(change);
        limited_by_ = std::string(what) + " at station " + std::to_string(i);
      }
    };
    const NewtonOptions& nw = opt_.newton;
    for (int i = 0; i < n; ++i) {
      limit(step_(n + i), nw.theta_change * th_(i), "theta", i);
      // m relative to itself, but not below a part of theta (m ~ 0 at the stagnation point).
      limit(step_(2 * n + i), nw.mass_change * std::abs(mu_(i)) + nw.mass_change_theta * th_(i),
            "mass defect", i);
      if (kinds_[i] == LayerKind::kLaminar)
        limit(step_(i), nw.amplification_change, "amplification", i);
      else
        limit(step_(i), nw.shear_change * c_(i), "shear stress", i);
    }
    // Keep every H above the closures' floor (see boundary_layer.cpp) and every ue positive.
    const Eigen::VectorXd dmu = step_.segment(2 * n, n);
    const Eigen::VectorXd due = lay_.d * dmu;
    // The shape-factor floor halves the step at most nw.floor_halvings times; stations still below
    // it after the step are then put on it (their delta* raised), so that one station near the
    // floor cannot freeze the whole solution.
    // Shape factors before the step: the floor (of delta* / theta) and H (of the layer's own
    // delta*, without the wake gap) for the limit on its fall after the step.
    for (int i = 0; i < n; ++i) {
      const double dstar = station(i).dstar;
      h_floor_[i] = 0.5 * (std::min(dstar / th_(i), 1.05) + 1.0);
      h_before_[i] = (dstar - lay_.gap(i)) / th_(i);
    }
    bool floor_fix = false;
    for (int k = 0; k < nw.max_halvings; ++k) {
      bool sign_ok = true, floor_ok = true;
      for (int i = 0; i < n && sign_ok; ++i) {
        double u = ue_(i) + rlx * due(i);
        const int first_side = first_station_side(i);
        if (first_side >= 0) {
          // A first station's delta* is m over the modelled speed near the stagnation point
          // (first_speed), which stays positive; its H is held above the floor like any other.
          const int k = lay_.stag;
          const StagnationFraction f =
              stagnation_fraction(first_side, ue_(k) + rlx * due(k), ue_(k + 1) + rlx * due(k + 1));
          u = f.t * f.sum;
        } else if (u <= 0.0) {
          sign_ok = false;
          limited_by_ = "edge velocity sign at station " + std::to_string(i);
          break;
        }
        const double h =
            ((mu_(i) + rlx * dmu(i)) / u - lay_.gap(i)) / (th_(i) + rlx * step_(n + i));
        if (h < h_floor_[i]) {
          floor_ok = false;
          limited_by_ = "shape factor floor at station " + std::to_string(i);
        }
      }
      if (sign_ok && floor_ok) break;
      if (sign_ok && k >= nw.floor_halvings) {
        floor_fix = true;
        break;
      }
      rlx *= 0.5;
    }
    saved_c_ = c_;
    saved_th_ = th_;
    saved_mu_ = mu_;
    apply_step(rlx);
    // After the step: a turbulent or wake station whose H - 1 fell below nw.shape_drop_fraction of
    // its value before the step is put back on that level (delta* raised), and with floor_fix every
    // station below its floor onto the floor.
    bool moved_mass = false;
    for (int i = 0; i < n; ++i) {
      if (first_station_side(i) >= 0) continue;
      double lo = floor_fix ? h_floor_[i] : 0.0;
      if (kinds_[i] != LayerKind::kLaminar)
        lo = std::max(lo, 1.0 + nw.shape_drop_fraction * (h_before_[i] - 1.0));
      const double u = dstar_speed(i);
      if ((mu_(i) / u - lay_.gap(i)) / th_(i) < lo) {
        mu_(i) = u * (lo * th_(i) + lay_.gap(i));
        moved_mass = true;
      }
    }
    if (moved_mass) update_edge_velocity();
    return rlx;
  }

  // Why NewtonOptions::shape_drop_fraction (how far the H - 1 of a turbulent or wake station may
  // fall in one Newton step, as a fraction of itself) is 0.3.
  // Behind a transition point that has moved upstream, the linearised transition interval can
  // ask a reattaching layer for a shape factor far below any turbulent state (NACA 0012, Re 6e6,
  // 6.5 -> 7 deg: H 2.25 -> 0.82 at the first turbulent station; the step the other limits let
  // through took it to 1.07), from which the lag equation does not recover and every later step
  // is cut to 1-2 % by the shape-factor floor. Held at this fraction, such warm starts converge
  // (that one in 8 iterations). Measured on bench_polar's 20 regression polars (NACA 0012, 2412,
  // 4412, 4415, 23012 x Re 2e5-6e6, -4..14 deg step 0.5): the same 740 solutions (cd within 1e-9),
  // Newton iterations including failed attempts 8741 -> 8037, cold starts alone 554 -> 572 of 740.
  // The response to the fraction is irregular: 0.5 gave 617 cold starts but lost NACA 23012 at
  // 10.5 deg cold and one polar point, 0.7 gave 575 and lost 13 cold starts of the cold-start test.

  // State = saved state + rlx * step, with the positivity floors.
  void apply_step(double rlx) {
    const int n = lay_.n;
    c_ = saved_c_ + rlx * step_.segment(0, n);
    th_ = saved_th_ + rlx * step_.segment(n, n);
    mu_ = saved_mu_ + rlx * step_.segment(2 * n, n);
    for (int i = 0; i < n; ++i) {
      th_(i) = std::max(th_(i), 1e-9);
      if (kinds_[i] != LayerKind::kLaminar) c_(i) = std::max(c_(i), 1e-5);
    }
    update_edge_velocity();
  }

  // The Jacobian of assemble() by central differences (kinds and transition intervals held),
  // column by column, with relative steps; restores the state. For the consistency test.
  Eigen::MatrixXd difference_jacobian(double rel_step) {
    const int n3 = 3 * lay_.n;
    Eigen::MatrixXd fd(n3, n3);
    Eigen::VectorXd* parts[3] = {&c_, &th_, &mu_};
    for (int col = 0; col < n3; ++col) {
      Eigen::VectorXd& v = *parts[col / lay_.n];
      const int i = col % lay_.n;
      const double v0 = v(i);
      const double h = rel_step * std::max(std::abs(v0), col / lay_.n == 0 ? 1e-2 : 1e-6);
      v(i) = v0 + h;
      update_edge_velocity();
      assemble();
      const Eigen::VectorXd rp = res_;
      v(i) = v0 - h;
      update_edge_velocity();
      assemble();
      fd.col(col) = (rp - res_) / (2.0 * h);
      v(i) = v0;
    }
    update_edge_velocity();
    assemble();
    return fd;
  }
  Eigen::MatrixXd jacobian() const { return dense_jacobian(); }

  // Where the largest residual is: (station, equation).
  std::pair<int, int> worst_residual() const {
    Eigen::Index k = 0;
    res_.cwiseAbs().maxCoeff(&k);
    return {static_cast<int>(k / 3), static_cast<int>(k % 3)};
  }
  const std::string& limited_by() const { return limited_by_; }
  void mark_ue_valid() { ue_valid_ = true; }
  const Eigen::VectorXd& ue() const { return ue_; }
  const Eigen::VectorXd& c() const { return c_; }
  const Eigen::VectorXd& theta() const { return th_; }
  const Eigen::VectorXd& mu() const { return mu_; }
  const std::vector<LayerKind>& kinds() const { return kinds_; }
  int transition_interval(int side) const { return transition_interval_[side]; }
  double transition_weight(int side) const { return transition_weight_[side]; }
  const FlowConditions& flow() const { return flow_; }

 private:
  const InviscidSolver& inv_;
  const CouplingModel& model_;
  const ViscousOptions& opt_;
  FlowConditions flow_;
  Layout lay_;
  int le_ = 0;
  double te_gap_ = 0.0;
  BlockLinearSystem jac_;                      // the Newton Jacobian of the last assembly
  std::vector<int> order_;                     // marching order of the stations
  std::vector<Closure<StationDual>> closure_;  // per station, this assembly's (closure_of)
  std::vector<int> closure_kind_;              // the LayerKind of closure_, -1: none yet
  Eigen::VectorXd res_, step_;
  Eigen::VectorXd c_, th_, mu_, ue_;
  std::vector<LayerKind> kinds_;
  bool ue_valid_ = false;
  std::string limited_by_;
  Eigen::VectorXd saved_c_, saved_th_, saved_mu_;
  std::vector<double> h_floor_, h_before_;  // per station, before the step (newton_step)
  Eigen::VectorXd cold_ue_;                 // the speeds of the cold-start marches
  int transition_interval_[2] = {-1, -1};
  int previous_transition_[2] = {-1, -1};  // BL position of the last assignment (-1: none yet)
  bool transition_limited_ = false;
  double transition_weight_[2] = {1.0, 1.0};
  bool release_[2] = {false, false};  // hysteresis released for the next assignment
  int settles_ = 0;
};

}  // namespace

JacobianCheck ViscousSolver::jacobian_check(double alpha_deg, int newton_steps,
                                            const ViscousState* warm_start) const {
  const CouplingModel model = model_at(alpha_deg);
  CoupledSystem sys(inviscid_, model, options_, flow_);
  if (!(warm_start && sys.warm_start(*warm_start))) sys.cold_start();
  sys.take_transition_from_kinds();
  sys.update_edge_velocity();
  sys.mark_ue_valid();
  for (int it = 0; it <= newton_steps; ++it) {
    sys.prepare_iteration();
    sys.assemble();
    if (it < newton_steps) sys.newton_step();
  }
  JacobianCheck out;
  out.analytic = sys.jacobian();
  out.difference = sys.difference_jacobian(1e-6);
  return out;
}

ViscousResult ViscousSolver::solve_alpha(double alpha_deg, const ViscousState* warm_start) const {
  const bool warm = warm_start && warm_start->valid();
  if (!std::isfinite(alpha_deg) || std::abs(alpha_deg) > 60.0)
    return solve_from(alpha_deg, nullptr);
  // The warm and the cold attempt share the coupling model at this angle.
  const CouplingModel model = model_at(alpha_deg);
  int total = 0;
  auto finish = [&total](ViscousResult r, const std::string& how) {
    total += r.iterations;
    r.iterations = total;
    if (!how.empty()) r.reason += " (" + how + ")";
    return r;
  };
  if (warm) {
    ViscousResult r = solve_on(model, alpha_deg, warm_start);
    if (r.converged) return finish(std::move(r), "warm start");
    total += r.iterations;
  }
  ViscousResult cold = solve_on(model, alpha_deg, nullptr);
  if (cold.converged || !warm)
    return finish(std::move(cold), warm ? "cold start after the warm start failed" : "");
  total += cold.iterations;
  // Continuation from the warm state's angle: halve the remaining step until a sub-step
  // converges, then go on from there.
  ViscousState from = *warm_start;
  double step = alpha_deg - from.alpha;
  for (int level = 0, tries = 0; level < 6 && tries < 16; ++tries) {
    step *= 0.5;
    const double target = from.alpha + step;
    ViscousResult r = solve_from(target, &from);
    total += r.iterations;
    if (!r.converged) {
      ++level;
      continue;
    }
    from = r.state;
    step = alpha_deg - from.alpha;
    ViscousResult last = solve_on(model, alpha_deg, &from);
    if (last.converged) return finish(std::move(last), "continuation from the warm start's angle");
    total += last.iterations;
  }
  return finish(std::move(cold), "warm, cold and continuation starts all failed");
}

ViscousResult ViscousSolver::solve_from(double alpha_deg, const ViscousState* warm_start) const {
  ViscousResult res;
  res.alpha = alpha_deg;
  if (!std::isfinite(alpha_deg) || std::abs(alpha_deg) > 60.0) {
    res.status = SolveStatus::kFailed;
    res.reason = "angle of attack must be finite and within +-60 deg";
    return res;
  }
  return solve_on(model_at(alpha_deg), alpha_deg, warm_start);
}

ViscousResult ViscousSolver::solve_on(const CouplingModel& model, double alpha_deg,
                                      const ViscousState* warm_start) const {
  ViscousResult res;
  res.alpha = alpha_deg;
  const double alpha = alpha_deg * kDeg;
  CoupledSystem sys(inviscid_, model, options_, flow_);
  bool warm = warm_start && warm_start->valid() && sys.warm_start(*warm_start);
  if (!warm) sys.cold_start();
  sys.take_transition_from_kinds();
  sys.update_edge_velocity();
  sys.mark_ue_valid();
  double r = INFINITY;
  bool done = false;
  int it = 0;
  std::size_t last_move = 0;
  int moved_upper = -2, moved_lower = -2;
  std::optional<CoupledSystem> settled_from;
  double settled_residual = INFINITY;
  int settled_at = 0;
  for (; it < options_.max_iterations; ++it) {
    sys.prepare_iteration();
    r = sys.assemble();
    res.residual_history.push_back(r);
    if (!std::isfinite(r)) break;
    if (r < options_.tolerance && it > 0 && !sys.transition_limited()) {
      if (!sys.needs_settling()) {
        done = true;
        break;
      }
      // This converged state stands if the settled representation does not converge within
      // kSettleIterations (when the move starts the transition running, it does not).
      settled_from.emplace(sys);
      settled_residual = r;
      settled_at = it;
      sys.settle_transition();
      continue;
    }
    if (settled_from &&
        (it - settled_at > options_.newton.settle_iterations || sys.transition_limited()))
      break;
    // Give up early when the residual has stopped falling (a fallback start is cheaper); a
    // move of the transition interval raises it legitimately and restarts the count.
    const std::size_t h = res.residual_history.size();
    if (sys.transition_interval(0) != moved_upper || sys.transition_interval(1) != moved_lower) {
      moved_upper = sys.transition_interval(0);
      moved_lower = sys.transition_interval(1);
      last_move = h - 1;
    }
    const NewtonOptions& nw = options_.newton;
    if (h > last_move + static_cast<std::size_t>(nw.stall_iterations) && r > nw.stall_residual &&
        r > nw.stall_ratio *
                res.residual_history[h - 1 - static_cast<std::size_t>(nw.stall_window)])
      break;
    NewtonIteration rec;
    rec.residual = r;
    std::tie(rec.worst_station, rec.worst_equation) = sys.worst_residual();
    rec.stagnation_node = sys.layout().stag;
    rec.transition_upper = sys.transition_interval(0);
    rec.transition_lower = sys.transition_interval(1);
    const double rlx = sys.newton_step();
    rec.relaxation = rlx;
    rec.limited_by = rlx <= 0.0 ? std::string("singular Newton system") : sys.limited_by();
    res.history.push_back(std::move(rec));
    if (rlx <= 0.0) {
      r = INFINITY;
      break;
    }
  }
  // The settled representation did not converge: the converged state before it stands.
  const bool use_settled = !done && settled_from.has_value();
  if (use_settled) {
    done = true;
    r = settled_residual;
  }
  const CoupledSystem& fin = use_settled ? *settled_from : sys;
  res.iterations = it;
  res.residual = r;
  std::ostringstream msg;
  if (done) {
    res.converged = true;
    res.status = SolveStatus::kConverged;
    msg << "converged: max residual " << r << " < tolerance " << options_.tolerance << " after "
        << it << " Newton iterations";
  } else if (std::isfinite(r)) {
    res.status = SolveStatus::kNotConverged;
    msg << "not converged: max residual " << r << " >= tolerance " << options_.tolerance
        << " after " << it << " Newton iterations";
  } else {
    res.status = SolveStatus::kFailed;
    msg << "failed: the Newton system became singular or non-finite after " << it << " iterations";
  }
  res.reason = msg.str();

  // Outputs from the final state.
  const Layout& lay = fin.layout();
  const int ns = lay.n_surface, nw = lay.n_wake;
  const Eigen::VectorXd& ue = fin.ue();
  Eigen::VectorXd q = lay.sign.head(ns).cwiseProduct(ue.head(ns));
  res.ue = q;
  res.theta = fin.theta().head(ns);
  res.dstar.resize(ns);
  res.shape.resize(ns);
  res.cf.resize(ns);
  res.amplification = fin.c().head(ns);
  for (int i = 0; i < ns; ++i) {
    const StationState s = fin.station(i);
    res.dstar(i) = s.dstar;
    res.shape(i) = s.dstar / s.theta;
    res.cf(i) = skin_friction(fin.kinds()[i], s, flow_);
  }
  res.wake_theta = fin.theta().tail(nw);
  res.wake_ue = ue.tail(nw);
  res.wake_dstar = fin.mu().tail(nw).cwiseQuotient(ue.tail(nw));
  InviscidResult loads;
  inviscid_.loads_from_speed(alpha, q, loads);
  // Lift from the surface pressures at every Mach number, like cm. The circulation of the edge
  // speed (Kutta-Joukowski, which the inviscid solver uses at M = 0) is the lift of a potential
  // flow; with the displacement sources on the surface and in the wake it is not: NACA 4412,
  // Re 6e6, 14 deg, gave 1.7636 by circulation against 1.7375 from the pressures (which M = 0.001
  // then gave too: a step of 1.5 % between M = 0 and any M > 0), 0.2 % apart at 4 deg.
  res.cl = loads.converged ? loads.cl_pressure : loads.cl;
  res.cm = loads.cm;
  res.cp = loads.cp;
  // Squire-Young at the wake end.
  const int last = lay.n - 1;
  const StationState se = fin.station(last);
  const double h_end = (se.dstar - lay.gap(last)) / se.theta;
  res.cd = 2.0 * se.theta * std::pow(std::max(se.ue, 1e-6), 0.5 * (h_end + 5.0));
  // Friction drag: wall shear along the local flow direction, projected on the free stream.
  const Points& nodes = inviscid_.nodes();
  const Eigen::Vector2d e(std::cos(alpha), std::sin(alpha));
  double cdf = 0.0;
  for (int side = 0; side < 2; ++side) {
    const std::vector<int> idx = fin.side_nodes(side);
    for (std::size_t p = 1; p < idx.size(); ++p) {
      const int i1 = idx[p - 1], i2 = idx[p];
      const Eigen::Vector2d t = (nodes.row(i2) - nodes.row(i1)).transpose();
      cdf += 0.5 * (res.cf(i1) + res.cf(i2)) * t.dot(e);
    }
  }
  res.cd_friction = cdf / inviscid_.chord();
  res.cd_pressure = res.cd - res.cd_friction;
  // Transition points as x/c.
  for (int side = 0; side < 2; ++side) {
    const int p = fin.transition_interval(side);
    double xt = 1.0;
    if (p > 0) {
      const std::vector<int> idx = fin.side_nodes(side);
      const double w = fin.transition_weight(side);
      xt = lay.x(idx[p - 1]) + w * (lay.x(idx[p]) - lay.x(idx[p - 1]));
    }
    (side == 0 ? res.transition_upper : res.transition_lower) = xt;
  }
  // State for warm starts.
  res.state.alpha = alpha_deg;
  res.state.stagnation_node = lay.stag;
  res.state.stations.resize(static_cast<std::size_t>(lay.n));
  res.state.kinds = fin.kinds();
  for (int i = 0; i < lay.n; ++i) res.state.stations[i] = fin.station(i);
  // Never a NaN in the outputs.
  const double scalars[] = {res.cl, res.cd, res.cm, res.cd_friction, res.cd_pressure};
  bool finite = true;
  for (double v : scalars) finite = finite && std::isfinite(v);
  if (!finite) {
    res.converged = false;
    res.status = SolveStatus::kFailed;
    res.reason += "; non-finite loads, outputs zeroed";
    res.cl = res.cd = res.cm = res.cd_friction = res.cd_pressure = 0.0;
    res.state = ViscousState{};
  }
  if (!res.converged) res.state = ViscousState{};
  return res;
}

ViscousResult ViscousSolver::solve_cl(double cl_target, const ViscousState* warm_start) const {
  // Secant iteration on alpha from the inviscid angle (viscous lift is somewhat lower).
  InviscidResult inv;
  inviscid_.solve_for_cl(cl_target, inv);
  double a0 = inv.converged ? inv.alpha / kDeg : 0.0;
  ViscousResult r0 = solve_alpha(a0, warm_start);
  // A first angle that does not converge: try a few neighbours before giving up.
  for (double offset : {-0.7, 0.6, -1.5, 1.3, -2.5}) {
    if (r0.converged) break;
    r0 = solve_alpha(a0 + offset, warm_start);
    if (r0.converged) a0 += offset;
  }
  if (!r0.converged) {
    r0.reason = "target cl not reached: no converged solution near the inviscid angle " +
                std::to_string(inv.alpha / kDeg) + " deg; last: " + r0.reason;
    return r0;
  }
  double a1 = a0 + 0.5;
  ViscousResult r1 = solve_alpha(a1, &r0.state);
  for (int k = 0; k < 20; ++k) {
    if (!r1.converged) return r1;
    if (std::abs(r1.cl - cl_target) < 1e-5) return r1;
    const double slope = (r1.cl - r0.cl) / (a1 - a0);
    if (!(std::abs(slope) > 1e-4)) break;
    const double a2 = a1 + std::clamp((cl_target - r1.cl) / slope, -2.0, 2.0);
    r0 = std::move(r1);
    a0 = a1;
    a1 = a2;
    r1 = solve_alpha(a1, &r0.state);
  }
  r1.converged = false;
  r1.status = SolveStatus::kNotConverged;
  std::ostringstream msg;
  msg << "target cl " << cl_target << " not reached: cl " << r1.cl << " at alpha " << r1.alpha;
  r1.reason = msg.str();
  return r1;
}

}  // namespace fulmar::viscous
