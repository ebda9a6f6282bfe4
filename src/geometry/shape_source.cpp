#include "geometry/shape_source.h"

#include <cctype>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "common/enum_names.h"
#include "common/error.h"
#include "common/json_text.h"
#include "geometry/naca.h"

namespace fulmar {

namespace {

const EnumNames<ShapeSource::Kind> kKinds{{ShapeSource::Kind::kNaca, "naca"},
                                          {ShapeSource::Kind::kCst, "cst"},
                                          {ShapeSource::Kind::kCoordinates, "coordinates"}};

}  // namespace

std::string to_string(ShapeSource::Kind kind) {
  return kKinds.name(kind);
}

bool looks_like_naca(const std::string& spec) {
  if (spec.size() < 5) return false;
  std::string head;
  for (int i = 0; i < 4; ++i) {
    head += static_cast<char>(std::tolower(static_cast<unsigned char>(spec[i])));
  }
  if (head != "naca") return false;
  std::size_t i = 4;
  while (i < spec.size() && (spec[i] == ' ' || spec[i] == '-' || spec[i] == '_')) ++i;
  if (i == spec.size()) return false;
  for (; i < spec.size(); ++i) {
    if (!std::isdigit(static_cast<unsigned char>(spec[i]))) return false;
  }
  return true;
}

ShapeSource load_shape_source(const std::string& spec) {
  namespace fs = std::filesystem;
  ShapeSource src;
  if (looks_like_naca(spec)) {
    src.kind = ShapeSource::Kind::kNaca;
    src.section = naca_section(spec, kShapePointsPerSurface, false);
    return src;
  }
  std::error_code ec;
  if (!fs::is_regular_file(spec, ec)) {
    throw InputError("shape '" + spec + "': no such file, and not a NACA designation ('naca' " +
                     "and 4 or 5 digits, e.g. naca2412, naca23012)");
  }
  std::ifstream in(spec, std::ios::binary);
  if (!in) throw InputError("shape '" + spec + "': cannot read the file");
  std::stringstream ss;
  ss << in.rdbuf();
  const std::string text = ss.str();
  std::string ext = fs::path(spec).extension().string();
  for (char& c : ext) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  const auto first = text.find_first_not_of(" \t\r\n");
  if (ext == ".json" || (first != std::string::npos && text[first] == '{')) {
    const nlohmann::json j = parse_json_text(text, spec);
    src.kind = ShapeSource::Kind::kCst;
    src.cst = cst_from_json(j, spec);
    const std::string name =
        j.contains("name") && j["name"].is_string() ? j["name"].get<std::string>() : spec;
    src.section = cst_section(*src.cst, kShapePointsPerSurface, name);
    return src;
  }
  src.kind = ShapeSource::Kind::kCoordinates;
  CoordinateFile file = parse_coordinates(text, spec, ext == ".csv");
  src.section = std::move(file.section);
  src.normalisation = file.normalisation;
  return src;
}

Section load_shape(const std::string& spec) {
  return load_shape_source(spec).section;
}

std::optional<CstShape> load_cst_shape(const std::string& spec) {
  return load_shape_source(spec).cst;
}

}  // namespace fulmar
