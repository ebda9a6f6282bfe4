#pragma once
// Clamped (open, non-periodic) polynomial B-spline curves in any dimension, evaluated with the
// de Boor recurrence (C. de Boor, "A Practical Guide to Splines", Springer 1978, ch. IX; the same
// algorithms as L. Piegl & W. Tiller, "The NURBS Book", 2nd ed. 1997, A2.1 and A2.2).
#include <Eigen/Core>

namespace fulmar::cad {

// A curve C(u) = sum_i N_{i,p}(u) P_i on u in [knots(p), knots(n)].
struct BSplineCurve {
  int degree = 3;           // p >= 1
  Eigen::VectorXd knots;    // n + p + 1 non-decreasing values; clamped: first and last p+1 equal
  Eigen::MatrixXd control;  // n by dim control points (dim 2 for a section, 3 once placed)

  int control_count() const { return static_cast<int>(control.rows()); }
  double first_parameter() const { return knots(degree); }
  double last_parameter() const { return knots(knots.size() - 1 - degree); }
  // Throws std::invalid_argument when the knot count, ordering or clamping is inconsistent.
  void check() const;
};

// Index s of the knot span with knots(s) <= u < knots(s+1), p <= s <= n-1; u at the end of the
// domain maps to the last non-empty span. u is clamped to the domain first.
int knot_span(const Eigen::VectorXd& knots, int degree, int control_count, double u);

// The p+1 non-zero basis functions N_{span-p..span, p}(u) written to `values` (size p+1).
void basis_functions(const Eigen::VectorXd& knots, int degree, int span, double u, double* values);

// C(u) by de Boor's triangular scheme; returns a dim-vector.
Eigen::VectorXd point_at(const BSplineCurve& curve, double u);

// The derivative curve C'(u): degree p-1, control points p (P_{i+1} - P_i) / (t_{i+p+1} - t_{i+1})
// on the knots without their first and last entry. Requires degree >= 1.
BSplineCurve derivative(const BSplineCurve& curve);

// `count` points at parameters equally spaced over the domain; count by dim.
Eigen::MatrixXd sample_uniform(const BSplineCurve& curve, int count);

}  // namespace fulmar::cad
