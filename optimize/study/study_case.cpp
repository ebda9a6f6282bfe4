#include "optimize/study/study_case.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>
#include <fstream>
#include <set>
#include <sstream>

#include "common/error.h"
#include "common/json_text.h"

namespace fulmar::study {
namespace {

using nlohmann::json;

[[noreturn]] void fail(const std::string& label, const std::string& path, const std::string& rule) {
  throw InputError(label + ": " + path + ": " + rule);
}

void reject_unknown_keys(const json& node, const std::set<std::string>& known,
                         const std::string& label, const std::string& path) {
  for (auto it = node.begin(); it != node.end(); ++it)
    if (!known.count(it.key())) fail(label, path + "/" + it.key(), "unknown key");
}

double finite_number(const json& node, const std::string& label, const std::string& path) {
  if (!node.is_number())
    fail(label, path, std::string("must be a number (got ") + node.type_name() + ")");
  const double v = node.get<double>();
  if (!std::isfinite(v)) fail(label, path, "must be a finite number");
  return v;
}

// Range values computed as from + i * step carry rounding noise (0.1 + 3 * 0.02 is
// 0.16000000000000003); 12 significant digits remove it and keep far more than any case needs.
double tidy(double v) {
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.12g", v);
  return std::strtod(buf, nullptr);
}

std::vector<double> read_range(const json& r, const std::string& label, const std::string& path) {
  if (!r.is_object())
    fail(label, path, std::string("must be an object (got ") + r.type_name() + ")");
  reject_unknown_keys(r, {"from", "to", "step", "count"}, label, path);
  for (const char* key : {"from", "to"})
    if (!r.contains(key)) fail(label, path + "/" + key, "missing required field");
  const double from = finite_number(r.at("from"), label, path + "/from");
  const double to = finite_number(r.at("to"), label, path + "/to");
  if (from == to) fail(label, path + "/to", "must differ from /from (" + number_text(from) + ")");
  const bool step = r.contains("step"), count = r.contains("count");
  if (step == count) fail(label, path, "give exactly one of step or count");
  std::vector<double> values;
  if (step) {
    const double s = finite_number(r.at("step"), label, path + "/step");
    if (!(s > 0))
      fail(label, path + "/step",
           "must be > 0 (got " + number_text(s) + "; the direction is from -> to)");
    const double span = std::abs(to - from);
    const double n = std::round(span / s);
    // The end must be a whole number of steps away, so that "to" is one of the points.
    if (std::abs(n * s - span) > 1e-9 * span)
      fail(label, path + "/step",
           "must divide to - from = " + number_text(to - from) + " into whole steps (got " +
               number_text(s) + ")");
    if (n + 1 > kMaxStudyPoints)
      fail(label, path + "/step",
           "gives " + number_text(n + 1) + " values, more than " + std::to_string(kMaxStudyPoints));
    const double dir = to > from ? 1 : -1;
    for (int i = 0; i <= int(n); ++i) values.push_back(i == int(n) ? to : tidy(from + dir * i * s));
  } else {
    const json& c = r.at("count");
    if (!c.is_number_integer())
      fail(label, path + "/count", std::string("must be an integer (got ") + c.type_name() + ")");
    const long long n = c.get<long long>();
    if (n < 2 || n > kMaxStudyPoints)
      fail(label, path + "/count",
           "must be in 2.." + std::to_string(kMaxStudyPoints) + " (got " + std::to_string(n) + ")");
    for (long long i = 0; i < n; ++i)
      values.push_back(i == n - 1 ? to : tidy(from + (to - from) * double(i) / double(n - 1)));
  }
  return values;
}

SweepParameter read_parameter(const json& p, const json& base_case, const std::string& label,
                              const std::string& path) {
  if (!p.is_object())
    fail(label, path, std::string("must be an object (got ") + p.type_name() + ")");
  reject_unknown_keys(p, {"pointer", "name", "values", "range"}, label, path);
  SweepParameter s;
  s.json_path = path;
  if (!p.contains("pointer")) fail(label, path + "/pointer", "missing required field");
  const json& ptr = p.at("pointer");
  if (!ptr.is_string())
    fail(label, path + "/pointer", std::string("must be a string (got ") + ptr.type_name() + ")");
  s.pointer = ptr.get<std::string>();
  json::json_pointer jp;
  try {
    jp = json::json_pointer(s.pointer);
  } catch (const json::exception&) {
    fail(label, path + "/pointer",
         "\"" + s.pointer + "\" is not a JSON pointer (RFC 6901: \"/key/0/key\")");
  }
  if (s.pointer.empty())
    fail(label, path + "/pointer", "must name a number of the case, not the whole case");
  if (s.pointer == "/schema_version" || s.pointer.rfind("/study", 0) == 0)
    fail(label, path + "/pointer",
         "\"" + s.pointer + "\" cannot be swept (only the case's own values)");
  bool exists = false;
  try {
    exists = base_case.contains(jp);
  } catch (const json::exception&) {
    exists = false;
  }
  if (!exists)
    fail(label, path + "/pointer",
         "\"" + s.pointer +
             "\" does not exist in the case (write the value into the case to sweep it)");
  const json& target = base_case.at(jp);
  if (!target.is_number() || target.is_boolean())
    fail(label, path + "/pointer",
         "\"" + s.pointer + "\" must point at a number (it holds " +
             std::string(target.type_name()) + ")");
  s.integer = target.is_number_integer();
  s.name = s.pointer;
  if (p.contains("name")) {
    const json& n = p.at("name");
    if (!n.is_string() || n.get<std::string>().empty())
      fail(label, path + "/name", "must be a non-empty string");
    s.name = n.get<std::string>();
  }
  const bool values = p.contains("values"), range = p.contains("range");
  if (values == range) fail(label, path, "give exactly one of values or range");
  if (values) {
    s.values_path = path + "/values";
    const json& v = p.at("values");
    if (!v.is_array())
      fail(label, s.values_path, std::string("must be an array (got ") + v.type_name() + ")");
    if (v.empty()) fail(label, s.values_path, "must hold at least one value");
    if (v.size() > size_t(kMaxStudyPoints))
      fail(label, s.values_path, "at most " + std::to_string(kMaxStudyPoints) + " values");
    for (size_t i = 0; i < v.size(); ++i)
      s.values.push_back(finite_number(v[i], label, s.values_path + "/" + std::to_string(i)));
  } else {
    s.values_path = path + "/range";
    s.values = read_range(p.at("range"), label, s.values_path);
  }
  for (size_t i = 0; i < s.values.size(); ++i) {
    const std::string where = s.values_path + (values ? "/" + std::to_string(i) : "");
    if (s.integer && s.values[i] != std::round(s.values[i]))
      fail(label, where,
           "must be a whole number: " + s.pointer + " holds an integer (got " +
               number_text(s.values[i], 12) + ")");
    for (size_t j = 0; j < i; ++j)
      if (s.values[j] == s.values[i])
        fail(label, where,
             "repeats the value " + number_text(s.values[i], 12) + " (each point once)");
  }
  return s;
}

void set_value(json& target, const SweepParameter& p, double v) {
  target[json::json_pointer(p.pointer)] =
      p.integer ? json(static_cast<long long>(std::llround(v))) : json(v);
}

std::string point_origin(const StudyDefinition& s, const StudyPoint& pt) {
  std::string o = " at study point " + std::to_string(pt.index + 1) + " (";
  for (size_t k = 0; k < s.parameters.size(); ++k)
    o += (k ? ", " : "") + s.parameters[k].pointer + " = " + number_text(pt.values[k], 12);
  return o + ")";
}

}  // namespace

std::string number_text(double v, int precision) {
  if (!std::isfinite(v)) return "";
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*g", precision, v);
  return buf;
}

StudyDefinition study_from_json(const json& root, const std::string& label,
                                const std::filesystem::path& base_dir) {
  StudyDefinition s;
  s.label = label;
  s.base_dir = base_dir;
  s.source = root;
  if (!root.is_object())
    fail(label, "/", std::string("must be an object (got ") + root.type_name() + ")");
  if (!root.contains("study"))
    fail(label, "/study",
         "missing required field (a study case is an optimization case plus a study block)");
  const json& st = root.at("study");
  if (!st.is_object())
    fail(label, "/study", std::string("must be an object (got ") + st.type_name() + ")");
  reject_unknown_keys(st, {"parameters", "chain", "active_tolerance"}, label, "/study");
  s.base_case = root;
  s.base_case.erase("study");

  if (!st.contains("parameters")) fail(label, "/study/parameters", "missing required field");
  const json& ps = st.at("parameters");
  if (!ps.is_array())
    fail(label, "/study/parameters", std::string("must be an array (got ") + ps.type_name() + ")");
  if (ps.empty() || ps.size() > 2)
    fail(label, "/study/parameters",
         "must hold one or two parameters (got " + std::to_string(ps.size()) + ")");
  for (size_t i = 0; i < ps.size(); ++i) {
    const std::string path = "/study/parameters/" + std::to_string(i);
    s.parameters.push_back(read_parameter(ps[i], s.base_case, label, path));
    if (i == 1 && s.parameters[1].pointer == s.parameters[0].pointer)
      fail(label, path + "/pointer", "sweeps the same value as /study/parameters/0");
  }
  size_t total = 1;
  for (const auto& p : s.parameters) total *= p.values.size();
  if (total > size_t(kMaxStudyPoints))
    fail(
        label, "/study/parameters",
        "gives " + std::to_string(total) + " points, more than " + std::to_string(kMaxStudyPoints));
  if (st.contains("chain")) {
    const json& c = st.at("chain");
    if (!c.is_number_integer())
      fail(label, "/study/chain", std::string("must be an integer (got ") + c.type_name() + ")");
    const long long n = c.get<long long>();
    if (n < 1 || n > kMaxStudyPoints)
      fail(label, "/study/chain",
           "must be in 1.." + std::to_string(kMaxStudyPoints) + " (got " + std::to_string(n) + ")");
    s.chain = int(n);
  }
  if (st.contains("active_tolerance")) {
    const double t = finite_number(st.at("active_tolerance"), label, "/study/active_tolerance");
    // Beyond half the limit "active" would say nothing about the limit any more.
    if (!(t > 0 && t <= 0.5))
      fail(label, "/study/active_tolerance", "must be in (0, 0.5] (got " + number_text(t) + ")");
    s.active_tolerance = t;
  }
  // The case itself, at every point: a swept value can break a rule of the case (a thickness
  // limit below a spar limit, a speed that gives Mach 0.7, ...).
  for (const StudyPoint& pt : sweep_points(s)) point_case(s, pt, std::nullopt);
  return s;
}

StudyDefinition parse_study(const std::string& text, const std::string& label,
                            const std::filesystem::path& base_dir) {
  return study_from_json(parse_json_text(text, label), label, base_dir);
}

StudyDefinition load_study(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path.string() + ": cannot read the study case file");
  std::stringstream ss;
  ss << in.rdbuf();
  StudyDefinition s = parse_study(ss.str(), path.string(), optimize::folder_of(path));
  s.case_path = path;
  return s;
}

std::vector<StudyPoint> sweep_points(const StudyDefinition& study) {
  std::vector<StudyPoint> points;
  const auto& outer = study.parameters.at(0).values;
  const size_t inner_n = study.parameters.size() > 1 ? study.parameters[1].values.size() : 1;
  const size_t width = std::max<size_t>(3, std::to_string(outer.size() * inner_n).size());
  for (size_t i = 0; i < outer.size(); ++i)
    for (size_t jj = 0; jj < inner_n; ++jj) {
      StudyPoint p;
      p.index = int(points.size());
      p.values.push_back(outer[i]);
      if (study.parameters.size() > 1) {
        const size_t j = i % 2 == 0 ? jj : inner_n - 1 - jj;  // serpentine
        p.values.push_back(study.parameters[1].values[j]);
      }
      p.chain = p.index / study.chain;
      p.predecessor = p.index % study.chain == 0 ? -1 : p.index - 1;
      std::string number = std::to_string(p.index + 1);
      p.dir = "points/p" + std::string(width - number.size(), '0') + number;
      points.push_back(p);
    }
  return points;
}

Shard shard_from_string(const std::string& text, const std::string& where) {
  const auto slash = text.find('/');
  auto whole = [](const std::string& t, int& out) {
    if (t.empty() || t.size() > 6 || t.find_first_not_of("0123456789") != std::string::npos)
      return false;
    out = std::stoi(t);
    return true;
  };
  Shard s;
  if (slash == std::string::npos || !whole(text.substr(0, slash), s.k) ||
      !whole(text.substr(slash + 1), s.n))
    throw InputError(where + " \"" + text + "\": must be K/N, e.g. 2/4");
  if (s.n < 1 || s.n > 10000 || s.k < 1 || s.k > s.n)
    throw InputError(where + " \"" + text + "\": must have 1 <= K <= N <= 10000");
  return s;
}

json point_case_json(const StudyDefinition& study, const StudyPoint& point,
                     const std::optional<json>& start_cst) {
  json c = study.base_case;
  for (size_t k = 0; k < study.parameters.size(); ++k)
    set_value(c, study.parameters[k], point.values.at(k));
  if (start_cst) c["baseline"] = json{{"cst", *start_cst}};
  return c;
}

optimize::Case point_case(const StudyDefinition& study, const StudyPoint& point,
                          const std::optional<json>& start_cst) {
  const json c = point_case_json(study, point, start_cst);
  optimize::Case parsed =
      optimize::parse_case(c.dump(), study.label + point_origin(study, point), study.base_dir);
  parsed.path = study.case_path;
  return parsed;
}

bool constraint_active(double value, double limit, double tolerance) {
  if (!std::isfinite(value) || !std::isfinite(limit)) return false;
  return std::abs(value - limit) <= tolerance * std::max(std::abs(limit), 0.01);
}

std::string point_label(const StudyDefinition& study, const StudyPoint& point) {
  std::string s;
  for (size_t k = 0; k < study.parameters.size(); ++k)
    s += (k ? ", " : "") + study.parameters[k].name + " = " + number_text(point.values.at(k));
  return s;
}

}  // namespace fulmar::study
