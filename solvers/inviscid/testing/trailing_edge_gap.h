#pragma once
// Sections with a finite trailing-edge gap made from closed ones, for tests of the panel solver's
// open-trailing-edge treatment.
#include "geometry/section.h"

namespace fulmar::testing {

// `closed`: (N+1) x 2 nodes counter-clockwise from the trailing edge (upper surface first, the
// leading edge near row N/2). Returns the same nodes with the upper and lower surfaces sheared
// apart normal to x in proportion to the fraction of the way from the leading edge (smallest x)
// to the trailing edge (row 0): the gap at the trailing edge is `gap`, in the units of `closed`.
inline Points opened(const Points& closed, double gap) {
  Points p = closed;
  const int n = static_cast<int>(p.rows()) - 1;
  const double x_le = p.col(0).minCoeff(), x_te = p(0, 0);
  for (int k = 0; k <= n; ++k) {
    const double xi = (p(k, 0) - x_le) / (x_te - x_le);
    p(k, 1) += (k <= n / 2 ? 0.5 : -0.5) * gap * xi;
  }
  return p;
}

}  // namespace fulmar::testing
