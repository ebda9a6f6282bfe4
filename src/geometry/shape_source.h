#pragma once
// SHAPE arguments: a NACA designation ("naca2412", "NACA23012", "naca 0012"; the prefix is
// required), a CST JSON file written by fulmar (geometry/cst.h), or a coordinate file (plain text
// or CSV, geometry/coordinates_io.h). A CST JSON is recognised by the extension ".json" or a
// first non-blank character '{'.
#include <optional>
#include <string>

#include "geometry/coordinates_io.h"
#include "geometry/cst.h"
#include "geometry/section.h"

namespace fulmar {

struct ShapeSource {
  enum class Kind { kNaca, kCst, kCoordinates };
  Kind kind = Kind::kNaca;
  Section section;
  std::optional<CstShape> cst;                 // exactly as stored, for a CST JSON
  std::optional<Normalisation> normalisation;  // for a coordinate file
};
std::string to_string(ShapeSource::Kind kind);  // "naca", "cst", "coordinates"

// Points per surface used for NACA and CST shapes given by name or coefficients.
inline constexpr int kShapePointsPerSurface = 120;

// Loads any SHAPE. Throws InputError naming the spec (and file:line or JSON path) on bad input,
// or when the spec is neither an existing file nor a NACA designation.
ShapeSource load_shape_source(const std::string& spec);
Section load_shape(const std::string& spec);
// The CST shape when `spec` is a CST JSON file, so that an optimizer can start from its
// coefficients exactly; std::nullopt for NACA designations and coordinate files.
std::optional<CstShape> load_cst_shape(const std::string& spec);
// True when `spec` has the form of a NACA designation: "naca" (any case), optional ' ', '-' or
// '_', then digits only. Anything else is taken as a file name.
bool looks_like_naca(const std::string& spec);

}  // namespace fulmar
