#include "optimize/case_file.h"

#include <cmath>
#include <fstream>
#include <sstream>

#include "common/error.h"
#include "common/json_text.h"
#include "common/number_text.h"
#include "optimize/case_sections.h"

// The reading of a case document in order; each section has its reader in case_flight.cpp,
// case_limits.cpp or case_options.cpp, and the checks that span sections are here.

namespace fulmar::optimize {

using case_detail::Reader;
using nlohmann::json;

Case parse_case(const std::string& text, const std::string& label,
                const std::filesystem::path& base_dir) {
  using namespace case_detail;
  const json root = parse_json_text(text, label);
  Case c;
  c.source = root;
  Reader r(root, "", &label);
  r.expect_object();
  {
    Reader v = r.child("schema_version");
    const int version = v.integer();
    if (version != kCaseSchemaVersion)
      v.fail("unsupported schema version " + std::to_string(version) + " (this fulmar reads " +
             std::to_string(kCaseSchemaVersion) + ")");
  }
  c.name = r.child("name").string();
  if (auto d = r.optional_child("description")) c.description = d->string();
  if (auto n = r.optional_child("notes")) {
    if (!c.description.empty()) c.description += "\n";
    c.description += n->string();
  }
  double factor = kWingToSectionFactor;
  if (auto a = r.optional_child("airplane")) c.airplane = read_airplane(*a, factor);

  TransitionScenario nominal;
  if (auto t = r.optional_child("transition")) {
    read_transition_values(*t, nominal);
    nominal.name = "nominal";
    if (auto s = t->optional_child("scenarios")) {
      const auto items = s->array();
      if (items.empty()) s->fail("must hold at least one scenario");
      for (const Reader& item : items) c.scenarios.push_back(read_scenario(item, nominal));
    }
    t->finish();
  }
  if (c.scenarios.empty()) c.scenarios.push_back(nominal);

  {
    Reader pts = r.child("design_points");
    const auto items = pts.array();
    if (items.empty()) pts.fail("must hold at least one design point");
    if (items.size() > 8) pts.fail("at most 8 design points");
    for (size_t i = 0; i < items.size(); ++i)
      c.points.push_back(read_point(items[i], c.airplane, i));
  }
  if (auto l = r.optional_child("landing")) c.landing = read_landing(*l, c.airplane, factor);
  check_analysis_options(r, c);

  {
    std::vector<DesignPoint> points;
    const json empty = json::object();
    auto k = r.optional_child("constraints");
    c.constraints = read_constraints(k ? *k : Reader(empty, "/constraints", &label), c.points,
                                     c.landing, points);
    c.points = points;
  }
  if (auto p = r.optional_child("parameterization")) c.parameterization = read_parameterization(*p);
  {
    const Parameterization& p = c.parameterization;
    if (!std::isnan(p.te_gap)) {
      if (!std::isnan(c.constraints.te_gap_min) && p.te_gap < c.constraints.te_gap_min)
        r.fail_at("/parameterization/te_gap",
                  "must be >= the te_gap limit " + general_text(c.constraints.te_gap_min));
      if (!std::isnan(c.constraints.te_gap_max) && p.te_gap > c.constraints.te_gap_max)
        r.fail_at("/parameterization/te_gap",
                  "must be <= the te_gap limit " + general_text(c.constraints.te_gap_max));
    }
  }
  c.baseline = read_baseline(r.child("baseline"), base_dir);
  if (auto s = r.optional_child("second_start")) c.second_start = read_baseline(*s, base_dir);
  if (auto o = r.optional_child("optimizer")) c.optimizer = read_optimizer(*o);
  if (auto a = r.optional_child("analysis")) c.analysis = read_analysis(*a);
  if (auto o = r.optional_child("outputs")) {
    c.outputs = read_outputs(*o);
    if (!c.outputs.cad_formats.empty() && c.outputs.cad_chord == 0 && !c.airplane)
      o->fail_at(o->path() + "/cad/chord",
                 "missing required field (no airplane gives the chord for the CAD files)");
  }
  r.finish();
  return c;
}

std::filesystem::path folder_of(const std::filesystem::path& file) {
  return file.has_parent_path() ? file.parent_path() : std::filesystem::path(".");
}

Case load_case(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path.string() + ": cannot read the case file");
  std::stringstream ss;
  ss << in.rdbuf();
  Case c = parse_case(ss.str(), path.string(), folder_of(path));
  c.path = path;
  return c;
}

}  // namespace fulmar::optimize
