#pragma once
// Section coordinate files.
//
// Plain text: rows "x y" (numbers separated by blanks, tabs or one comma), an optional name line
// first, blank lines and '#' comments anywhere. CSV: '#' comments and blank lines allowed, then a
// header row naming the columns, of which "x" and "y" (any case) are used; a comment before the
// header is the section's name. A file is read as CSV
// when its name ends in ".csv" or its first row is a header holding both "x" and "y".
//
// The points run from the trailing edge over one surface to the leading edge and back over the
// other, in either direction: clockwise input is reversed into fulmar order (upper surface first).
// Consecutive repeated points are dropped. A section that is not chord-normalised (trailing-edge
// midpoint not within 1e-4 of (1, 0), or the smallest x not within 1e-3 of 0) is moved, rotated
// and scaled so that the point of the curve farthest from the trailing-edge midpoint (on a spline
// through the points) is at (0, 0) and the trailing-edge midpoint at (1, 0); what was applied is
// reported. Sections already in a unit-chord frame are left untouched, so NACA ordinates laid out
// on their mean-line chord stay as tabulated.
//
// Bad files throw InputError "file:line: what is wrong": not a number, a row without two numbers,
// a header without x and y columns, too few points, no trailing edge (the ends are not together at
// the far end from the nose), a curve that doubles back (turns back on itself by more than 150
// degrees, or runs backwards in x along a surface), or one that touches or crosses itself.
#include <Eigen/Core>
#include <filesystem>
#include <string>

#include "geometry/section.h"

namespace fulmar {

// What the reader did to the file's points to bring them into fulmar's frame:
//   p_section = R(rotation_deg) * (p_file - leading_edge) / chord.
struct Normalisation {
  bool applied = false;     // false: the file was already chord-normalised and kept as is
  double chord = 1;         // file units (distance from the leading edge to the TE midpoint)
  double rotation_deg = 0;  // counter-clockwise rotation applied, degrees
  Eigen::Vector2d leading_edge = Eigen::Vector2d::Zero();  // file coordinates
  bool reversed = false;    // the file ran clockwise (lower surface first) and was reversed
  int repeats_dropped = 0;  // consecutive repeated points removed
};

struct CoordinateFile {
  Section section;
  Normalisation normalisation;
};

// Reads and checks a coordinate file. Throws InputError (file:line: ...) as described above.
CoordinateFile read_coordinates(const std::filesystem::path& path);
// Same for text already in memory; `source` names it in messages, `csv` selects the CSV form
// (otherwise it is sniffed from the first row).
CoordinateFile parse_coordinates(const std::string& text, const std::string& source, bool csv);

// The section as plain text (name line, then "x y" rows) or CSV ("# name" comment, "x,y" header,
// rows), 10 decimals.
std::string coordinates_text(const Section& section);
std::string coordinates_csv(const Section& section);
// Writes atomically; CSV when the file name ends in ".csv" (any case), else plain text.
void write_coordinates(const std::filesystem::path& path, const Section& section);

}  // namespace fulmar
