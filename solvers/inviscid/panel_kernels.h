#pragma once
// Closed-form stream function and velocity of one straight panel carrying a vortex sheet (linear
// or constant strength) or a constant source sheet, at a field point. Internal to the solver;
// exposed in a header so that the kernels can be tested against finite differences.
//
// Panel frame: origin at the start node a, x along the panel to b (length L), y to the left
// (into the section for a counter-clockwise contour). Field point at local (x, y); r1, r2 are
// its distances to a and b, theta1, theta2 the angles of (p - a), (p - b) from +x.
// Vortex sheets are clockwise positive: psi = (1/2pi) Int gamma ln r ds. Sources are outflow
// positive: psi = (1/2pi) Int sigma theta ds, with theta's branch cut chosen per use (see below).
#include <Eigen/Core>
#include <vector>

namespace fulmar::panel {

struct Frame {
  Eigen::Vector2d a, t, n;  // start node, unit tangent a->b, unit left normal
  double length = 0.0;
};

Frame frame(const Eigen::Vector2d& a, const Eigen::Vector2d& b);

// Row `i` of a #points by 2 array (x, y) as a point.
inline Eigen::Vector2d point_row(const Eigen::Matrix<double, Eigen::Dynamic, 2>& points, int i) {
  return points.row(i).transpose();
}

// Appends to `frames` the frames of the panels between consecutive rows of `points` (#points by
// 2; #points - 1 frames, from row 0 to the last row).
inline void append_frames(const Eigen::Matrix<double, Eigen::Dynamic, 2>& points,
                          std::vector<Frame>& frames) {
  for (int j = 0; j + 1 < static_cast<int>(points.rows()); ++j)
    frames.push_back(frame(point_row(points, j), point_row(points, j + 1)));
}

// Stream-function weights of a linear vortex sheet: psi = wa * gamma_a + wb * gamma_b.
void psi_vortex_linear(const Frame& f, const Eigen::Vector2d& p, double& wa, double& wb);
// Same with ln|p - a| and ln|p - b| given (shared by the two panels meeting at a node when many
// panels are assembled at one field point); use half_log_distance_squared for them.
void psi_vortex_linear(const Frame& f, const Eigen::Vector2d& p, double ln1, double ln2, double& wa,
                       double& wb);
// ln|p - q|, or 0 when p and q coincide (distance < 1e-12 scale).
double half_log_distance_squared(const Eigen::Vector2d& p, const Eigen::Vector2d& q, double scale);
// Stream function of a constant vortex sheet of unit strength.
double psi_vortex_constant(const Frame& f, const Eigen::Vector2d& p);

// Where the branch cut of each source element's angle lies.
enum class Cut {
  kRight,   // along the right normal (outward for a counter-clockwise section contour)
  kForward  // along +t beyond the element (downstream for a wake panel)
};
// Stream function of a constant source sheet of unit strength.
double psi_source_constant(const Frame& f, const Eigen::Vector2d& p, Cut cut);
// Same with ln|p - a| and ln|p - b| given (see the vortex fast path).
double psi_source_constant(const Frame& f, const Eigen::Vector2d& p, double ln1, double ln2,
                           Cut cut);

// Velocities (global x, y) induced at p. `log_scale`: when p coincides with a panel end
// (distance < 1e-12 L) the ln r of that end is replaced by ln(log_scale) (a finite part; the
// singular parts of adjacent collinear panels with continuous strength cancel exactly).
void velocity_vortex_linear(const Frame& f, const Eigen::Vector2d& p, double log_scale,
                            Eigen::Vector2d& va, Eigen::Vector2d& vb);
Eigen::Vector2d velocity_vortex_constant(const Frame& f, const Eigen::Vector2d& p,
                                         double log_scale);
Eigen::Vector2d velocity_source_constant(const Frame& f, const Eigen::Vector2d& p,
                                         double log_scale);
// Velocity weights of a source sheet whose strength varies linearly from sigma_a at a to sigma_b
// at b: v = va * sigma_a + vb * sigma_b (same finite part as above).
void velocity_source_linear(const Frame& f, const Eigen::Vector2d& p, double log_scale,
                            Eigen::Vector2d& va, Eigen::Vector2d& vb);

// The wake's source sheet as it acts on wake points. The wake polyline has panels k = 0..K-1
// (`wake_panels`, K frames joined end to end) carrying mean strengths sigma_k (the mass-defect
// difference over the panel length). The strength is taken piecewise linear and continuous:
// sigma_k at the midpoint of panel k, the mean of the two adjacent panels' sigma at an interior
// node, the panel's own sigma at the two ends of the wake. A constant strength per panel would
// make the velocity at a node logarithmically infinite wherever neighbouring strengths differ, so
// its finite part would leave the node-to-node mode of the mass defect almost without response;
// the continuous sheet gives every mode its proper (thin-body) response, growing with the wave
// number. Output: `weights` (K): the velocity along `t` (unit vector) at `p` per unit sigma_k;
// `log_scale` as above (any value at a node of the wake: the strength is continuous there).
void wake_source_velocity(const std::vector<Frame>& wake_panels, const Eigen::Vector2d& p,
                          const Eigen::Vector2d& t, double log_scale, Eigen::VectorXd& weights);

}  // namespace fulmar::panel
