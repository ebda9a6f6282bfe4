#pragma once
// The linear solve of one Newton step of the coupled viscous system: its Jacobian is stored in
// two parts, J = L + G D P, and solved through L and an #stations-square capacitance matrix
// (Woodbury) instead of a dense LU of all 3 #stations unknowns; every step is checked against
// the full system, with a dense LU as the fallback.
//
//   L  (3 #stations square) each station's three equations in the (c, theta, m) unknowns of the
//      one to three stations they involve: 3 by 3 blocks, at most kBlocks per block row, block
//      lower triangular in a marching order of the stations;
//   G  (3 #stations by #stations) the equations' dependence on the edge velocities, sparse: at
//      most kSpeedTerms columns per row expected (any beyond are kept in a spill list);
//   D  (#stations square) the mass-defect influence matrix, ue = ue_inviscid + D m;
//   P  the selection of the m unknowns.
//
// Row index of equation e (0, 1, 2) of station s: 3 s + e (station-major). Unknown vectors
// (steps, products) are var-major: the c of all stations, then theta, then m.
#include <Eigen/Core>
#include <Eigen/LU>
#include <vector>

namespace fulmar::viscous::detail {

using RowMatrix = Eigen::Matrix<double, Eigen::Dynamic, Eigen::Dynamic, Eigen::RowMajor>;
using BlockRows = Eigen::Matrix<double, 3, Eigen::Dynamic, Eigen::RowMajor>;

// The work arrays of a Newton step, kept from one solve to the next in each thread: the
// largest (#stations square, about 0.3 MB at 160 panels, and a station's rows of #stations + 1)
// would otherwise be allocated and returned to the system for every solve, and their first
// touch costs page faults.
struct NewtonScratch {
  // 3 by n + 1 each: a station's rows of [-r, G D], then of L^-1 of it (BlockLinearSystem::solve)
  std::vector<BlockRows> w_rows;
  Eigen::MatrixXd cap_t;  // n by n: the capacitance matrix I + P W, transposed
  Eigen::MatrixXf cap_f;  // cap_t in single precision
  Eigen::PartialPivLU<Eigen::MatrixXf> cap_luf;
  Eigen::VectorXf cap_bf, cap_xf;               // n: single-precision right-hand side, solution
  Eigen::VectorXd cap_r;                        // n: residual of the refinement
  Eigen::PartialPivLU<Eigen::MatrixXd> cap_lu;  // when single precision is not enough
  Eigen::VectorXd dm, dm_solved, z;
  BlockRows block_rhs;  // 3 by n + 1
};
// This thread's scratch.
NewtonScratch& newton_scratch();

// The 3 by 3 inverse of `a` by Gaussian elimination with partial pivoting (non-finite entries
// when a pivot vanishes).
Eigen::Matrix3d block_inverse(Eigen::Matrix3d a);

// L and G of one Newton system of #stations stations, and its solve. Copies share the thread's
// NewtonScratch (a copy kept only for its other contents must not solve concurrently).
class BlockLinearSystem {
 public:
  static constexpr int kBlocks = 3;      // L blocks per block row (an interval's two stations;
                                         // the trailing-edge merge's three)
  static constexpr int kSpeedTerms = 4;  // G entries per row stored in place (the interval's two
                                         // stations and the two nodes around the stagnation point)

  // An empty system of `stations` stations (L and G zero).
  explicit BlockLinearSystem(int stations);

  int stations() const { return n_; }

  // Zeroes L and G for a new assembly.
  void clear();

  // The L block of the equations of station `row` in the unknowns (c, theta, m) of station `col`
  // (created zero on first use; more than kBlocks per row is not expected and reuses the last).
  Eigen::Matrix3d& block(int row, int col);

  // Adds `value` to G(r, col): the dependence of equation row r on the edge velocity of station
  // col.
  void add_speed(int r, int col, double value);

  // The Newton step `step` (3 #stations, var-major) solving (L + G D P) step = -res for the
  // residuals `res` (3 #stations, station-major), with `order` the stations in an order in which
  // L is block lower triangular and `d` the #stations-square D. Solved through the capacitance
  // matrix (in single precision, refined against the double matrix; in double precision when
  // refinement does not converge), checked against the full system and replaced by a dense LU
  // of it when max |J step + res| > 1e-6 max |res| + 1e-12. False when the step is not finite.
  bool solve(const RowMatrix& d, const std::vector<int>& order, const Eigen::VectorXd& res,
             Eigen::VectorXd& step);

  // (L + G D P) v for a var-major v (3 #stations), without forming the matrix. The reference is
  // to internal storage, valid until the next call.
  const Eigen::VectorXd& multiply(const RowMatrix& d, const Eigen::VectorXd& v) const;

  // The dense L + G D P (3 #stations square; rows station-major, columns var-major).
  Eigen::MatrixXd dense(const RowMatrix& d) const;

  // Calls f(row, column, value) for every entry of G.
  template <class F>
  void for_each_speed_term(F&& f) const {
    for (std::size_t r = 0; r < g_count_.size(); ++r)
      for (int k = 0; k < g_count_[r]; ++k)
        f(static_cast<int>(r), g_col_[kSpeedTerms * r + k], g_val_[kSpeedTerms * r + k]);
    for (const SpeedTerm& t : g_spill_) f(t.row, t.col, t.value);
  }

  // Counts since construction: steps solved by the dense fallback, and capacitance systems that
  // needed the double-precision LU (refinement of the single-precision one fell short).
  int dense_solves() const { return dense_solves_; }
  int double_capacitance_solves() const { return double_capacitance_solves_; }

 private:
  struct SpeedTerm {
    int row = 0, col = 0;
    double value = 0.0;
  };

  // ws_.dm_solved = C^-1 ws_.dm for the capacitance matrix C (ws_.cap_t = C^T).
  void solve_capacitance();

  int n_ = 0;
  // G: per row up to kSpeedTerms (column, value), the rest in g_spill_.
  std::vector<int> g_count_, g_col_;
  std::vector<double> g_val_;
  std::vector<SpeedTerm> g_spill_;
  std::vector<Eigen::Matrix3d> blocks_;           // up to kBlocks L blocks per station
  std::vector<int> block_station_, block_count_;  // column station of each block; blocks per row
  std::vector<Eigen::Matrix3d> a_inv_;            // inverse diagonal blocks of L (solve)
  std::vector<int> last_use_, slot_of_, free_slots_;  // solve's row buffers
  NewtonScratch& ws_ = newton_scratch();
  mutable Eigen::VectorXd due_scratch_, jv_;  // scratch of solve and multiply
  int dense_solves_ = 0;
  int double_capacitance_solves_ = 0;
};

}  // namespace fulmar::viscous::detail
