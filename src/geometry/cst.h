#pragma once
// Class/shape transformation (CST) sections: Kulfan, "Universal parametric geometry representation
// method", J. Aircraft 45(1), 2008. Each surface is
//   y(x) = C(x) * sum_{i=0..n} a_i * B_{i,n}(x) + x * y_te,   C(x) = x^0.5 * (1 - x)^1.0,
//   B_{i,n}(x) = binom(n, i) x^i (1 - x)^(n - i)   (Bernstein polynomials of degree n = "order"),
// with x the chord fraction in [0, 1], the leading edge at (0, 0) and y_te the surface's trailing-
// edge height. The order (number of coefficients - 1) may differ between the surfaces.
#include <Eigen/Core>
#include <nlohmann/json.hpp>
#include <string>

#include "geometry/section.h"

namespace fulmar {

struct CstShape {
  Eigen::VectorXd upper, lower;  // Bernstein coefficients a_0..a_n of each surface; lower ones are
                                 // signed so that a normal section has negative lower y
  double te_upper = 0, te_lower = 0;  // y_u(1) and y_l(1), chord fractions
};

enum class Surface { kUpper, kLower };
std::string to_string(Surface s);

// Surface height y(x) (chord fractions). x is clamped to >= 0; valid for x in [0, 1].
double cst_y(const CstShape& shape, Surface surface, double x);
double cst_upper_y(const CstShape& shape, double x);
double cst_lower_y(const CstShape& shape, double x);

// The shape function S(x) = sum_i a_i B_{i,n}(x) of a surface (y without the class function and
// the trailing-edge term). x is clamped to >= 0; valid for x in [0, 1].
double cst_shape_function(const CstShape& shape, Surface surface, double x);

// Surface slope dy/dx at x in (0, 1]; infinite at x = 0 (the round nose).
double cst_slope(const CstShape& shape, Surface surface, double x);

// Derivative of y_u(x) with respect to each upper coefficient (vector of upper.size()); it is
// C(x) B_{i,n}(x) and does not depend on the coefficients. The derivative with respect to
// te_upper is x. Likewise for the lower surface.
Eigen::VectorXd cst_upper_y_gradient(const CstShape& shape, double x);
Eigen::VectorXd cst_lower_y_gradient(const CstShape& shape, double x);

// All coefficients as one parameter vector, in this fixed order:
//   [upper_0 .. upper_n, lower_0 .. lower_m, te_upper, te_lower]  (n + m + 4 entries).
int cst_parameter_count(const CstShape& shape);
Eigen::VectorXd cst_parameters(const CstShape& shape);
// The shape with the layout (orders) of `layout` and the values of `parameters` (order above).
// Throws InputError when the size does not match.
CstShape cst_with_parameters(const CstShape& layout, const Eigen::VectorXd& parameters);
// Writes dy/dp for one surface at x into `row` (size cst_parameter_count, order above): the
// other surface's entries are zero. No allocation.
void cst_y_gradient(const CstShape& shape, Surface surface, double x,
                    Eigen::Ref<Eigen::VectorXd> row);

// The section: points_per_surface points on each surface (leading and trailing edges included),
// cosine-spaced in x, upper trailing edge first (2 * points_per_surface - 1 points).
// points_per_surface in [10, 5000]; throws InputError otherwise.
Section cst_section(const CstShape& shape, int points_per_surface = 120,
                    const std::string& name = "CST section");

// Linear least-squares fit of CST coefficients to a section's points.
struct CstFit {
  CstShape shape;
  double max_deviation = 0;           // largest distance from an input point to the fitted surface,
                                      // chord fractions (vertical residual projected on the normal)
  double max_vertical_deviation = 0;  // largest |y_fit(x_i) - y_i|, chord fractions
  // The frame change applied before fitting: x_fit = (x - le_x) * scale, same for y. The nose
  // (le_x, le_y) is searched (Nelder-Mead on the sum of squared residuals, le_x no greater than
  // the smallest x of the points, start at the point of smallest x) because a section's true nose
  // need not be one of its points (cambered NACA sections have none there); scale puts the
  // trailing-edge midpoint at x = 1. No rotation, so the chord line (angle-of-attack reference)
  // keeps its direction. For points that are a CST section the start is already exact: identity.
  double le_x = 0, le_y = 0, scale = 1;
};
// Fits Bernstein orders (degrees) order_upper, order_lower in [1, 25] to `section` (fulmar
// point order; chord-normalised up to small offsets such as those of cambered NACA sections),
// minimising the vertical residuals (linear least squares, Householder QR with column pivoting)
// for each trial nose. The upper surface is the points up to the one of smallest x, the lower
// the rest. The trailing-edge heights are fitted too, unless the trailing edge is closed (first and
// last points coincide), when they are zero. Throws InputError for bad orders or too few points on
// a surface (need order + 2).
CstFit fit_cst(const Section& section, int order_upper, int order_lower);

// CST JSON file format, written and read by fulmar:
//   { "kind": "fulmar-cst-section", "schema_version": 1, "name": "...",
//     "class_exponents": [0.5, 1.0], "upper": [a_0, ...], "lower": [a_0, ...],
//     "te_upper": 0.0, "te_lower": 0.0 }
// Extra keys are allowed and ignored (the fit command adds "fit": {...}).
inline constexpr const char* kCstKind = "fulmar-cst-section";
inline constexpr int kCstSchemaVersion = 1;
nlohmann::json cst_to_json(const CstShape& shape, const std::string& name);
// Reads the format above; `where` names the source (file name) in messages. Throws InputError
// "where: /json/path: rule broken" for a missing or wrong kind, an unknown schema version, class
// exponents other than [0.5, 1.0], empty or over-long (> 26) coefficient lists, non-numbers or
// non-finite numbers.
CstShape cst_from_json(const nlohmann::json& json, const std::string& where);

}  // namespace fulmar
