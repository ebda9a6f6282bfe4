#pragma once
// The one representation of a wing section that every stage shares.
#include <Eigen/Core>
#include <string>

namespace fulmar {

// #points by 2 array of (x, y) coordinates, chord-normalised unless stated otherwise.
using Points = Eigen::Matrix<double, Eigen::Dynamic, 2>;

// A wing section as one ordered curve: from the trailing edge over the upper surface to the
// leading edge and back along the lower surface to the trailing edge (counter-clockwise when the
// section points to the right). Chord-normalised: leading edge (the point farthest from the
// trailing-edge midpoint) at (0, 0), trailing-edge midpoint at (1, 0). The trailing edge may be
// open (first and last points differ: a finite gap) or closed (they coincide).
struct Section {
  std::string name;  // free text, e.g. "NACA 2412" or the first line of a coordinate file
  Points points;     // #points by 2
};

// Frames in practice: coordinate files are normalised to the frame above on reading (unless they
// are already on a unit chord); CST sections have their nose exactly at (0, 0) and the trailing
// edges at x = 1 (a fitted CST's trailing-edge midpoint may sit slightly off y = 0); NACA sections
// keep the Reports' frame, whose chord is the mean line's, so for a cambered one the point
// farthest from the trailing edge lies up to ~1e-3 chord from (0, 0) (geometry/naca.h).

}  // namespace fulmar
