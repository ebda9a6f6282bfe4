#include "optimize/study/study_results.h"

#include "common/xml_text.h"

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>
#include <set>
#include <sstream>

#include "common/atomic_file.h"
#include "common/error.h"
#include "common/number_text.h"
#include "geometry/cst.h"
#include "optimize/evaluation_record.h"
#include "optimize/svg_plot.h"

namespace fulmar::study {
namespace {

using nlohmann::json;

std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) q += (c == '"') ? std::string("\"\"") : std::string(1, c);
  return q + "\"";
}

std::string fixed(double v, int decimals) {
  return fixed_text(v, decimals);
}

// The label of one design-point result: the point's name, with the scenario when the case has
// several transition scenarios.
std::vector<std::string> design_point_labels(const std::vector<PointRecord>& records) {
  std::vector<std::string> labels;
  std::set<std::string> scenarios;
  for (const auto& r : records)
    for (const auto& p : r.summary.optimized.points) scenarios.insert(p.scenario);
  for (const auto& r : records)
    for (const auto& p : r.summary.optimized.points) {
      std::string l = p.point;
      if (scenarios.size() > 1) l.append("/").append(p.scenario);
      if (std::find(labels.begin(), labels.end(), l) == labels.end()) labels.push_back(l);
    }
  return labels;
}

std::map<std::string, double> design_point_cd(const PointRecord& r, bool with_scenario) {
  std::map<std::string, double> out;
  for (const auto& p : r.summary.optimized.points) {
    std::string l = p.point;
    if (with_scenario) l.append("/").append(p.scenario);
    out[l] = p.result.converged() ? p.result.cd : std::nan("");
  }
  return out;
}

bool has_scenarios(const std::vector<std::string>& labels,
                   const std::vector<PointRecord>& records) {
  if (records.empty()) return false;
  const auto& pts = records.front().summary.optimized.points;
  return !labels.empty() && !pts.empty() && labels.front() != pts.front().point;
}

// The constraints of the study, identified by id, in order of first appearance; each with its
// display key.
std::vector<std::pair<std::string, std::string>> constraint_keys(
    const std::vector<PointRecord>& records, double tol) {
  std::vector<std::pair<std::string, std::string>> keys;
  for (const auto& r : records)
    for (const auto& c : constraint_states(r.summary, tol))
      if (std::find_if(keys.begin(), keys.end(), [&](const auto& k) { return k.first == c.id; }) ==
          keys.end())
        keys.emplace_back(c.id, c.key);
  return keys;
}

std::string file_of(const PointRecord& r, const char* name) {
  return r.point.dir + "/" + name;
}

std::string active_list(const std::vector<ConstraintState>& states) {
  std::string s;
  for (const auto& c : states)
    if (c.active) s += (s.empty() ? "" : "; ") + c.key;
  return s.empty() ? "none" : s;
}

// ---- heat map (two parameters) ----

std::string heat_colour(double t) {
  // Light sand (low drag) to deep blue (high drag), linear in RGB.
  const double a[3] = {0xfb, 0xf1, 0xd4}, b[3] = {0x1f, 0x4e, 0x79};
  char buf[16];
  std::snprintf(buf, sizeof buf, "#%02x%02x%02x", int(std::lround(a[0] + t * (b[0] - a[0]))),
                int(std::lround(a[1] + t * (b[1] - a[1]))),
                int(std::lround(a[2] + t * (b[2] - a[2]))));
  return buf;
}

std::string heat_map(const StudyDefinition& study, const std::vector<PointRecord>& records) {
  std::vector<double> rows = study.parameters[0].values, cols = study.parameters[1].values;
  std::sort(rows.begin(), rows.end());
  std::sort(cols.begin(), cols.end());
  const double tol = study.active_tolerance;
  std::vector<std::pair<std::string, std::string>> active_keys;  // id, display key
  for (const auto& r : records)
    for (const auto& c : constraint_states(r.summary, tol))
      if (c.active && std::find_if(active_keys.begin(), active_keys.end(), [&](const auto& k) {
                        return k.first == c.id;
                      }) == active_keys.end())
        active_keys.emplace_back(c.id, c.key);
  double lo = 1e300, hi = -1e300;
  for (const auto& r : records) {
    const double cd = weighted_cd(r);
    if (std::isfinite(cd)) lo = std::min(lo, cd), hi = std::max(hi, cd);
  }
  const double cell_w = std::clamp(560.0 / double(cols.size()), 48.0, 110.0), cell_h = 40;
  const double left = 110, top = 56;
  const double width = left + cell_w * double(cols.size()) + 24;
  const double height = top + cell_h * double(rows.size()) + 70 + 16 * double(active_keys.size());
  std::ostringstream o;
  auto f = [](double v) { return fixed(v, 2); };
  o << "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<svg xmlns=\"http://www.w3.org/2000/svg\" "
       "width=\""
    << f(width) << "\" height=\"" << f(height) << "\" viewBox=\"0 0 " << f(width) << " "
    << f(height) << "\">\n"
    << "<rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n"
    << "<g font-family=\"Helvetica, Arial, sans-serif\" font-size=\"11\" fill=\"#333\">\n"
    << "<text x=\"" << f(left)
    << "\" y=\"20\" font-size=\"13\" font-weight=\"bold\">Weighted cd of the optima"
    << " (numbers: active constraints)</text>\n"
    << "<text x=\"" << f(left + cell_w * double(cols.size()) / 2)
    << "\" y=\"42\" text-anchor=\"middle\">" << xml_escaped(study.parameters[1].name) << "</text>\n"
    << "<text transform=\"translate(16," << f(top + cell_h * double(rows.size()) / 2)
    << ") rotate(-90)\" text-anchor=\"middle\">" << xml_escaped(study.parameters[0].name)
    << "</text>\n";
  for (size_t j = 0; j < cols.size(); ++j)
    o << "<text x=\"" << f(left + cell_w * (double(j) + 0.5)) << "\" y=\"" << f(top - 4)
      << "\" text-anchor=\"middle\">" << number_text(cols[j]) << "</text>\n";
  for (size_t i = 0; i < rows.size(); ++i) {
    const double y = top + cell_h * double(rows.size() - 1 - i);  // larger values upwards
    o << "<text x=\"" << f(left - 6) << "\" y=\"" << f(y + cell_h / 2 + 4)
      << "\" text-anchor=\"end\">" << number_text(rows[i]) << "</text>\n";
    for (size_t j = 0; j < cols.size(); ++j) {
      const PointRecord* rec = nullptr;
      for (const auto& r : records)
        if (r.point.values[0] == rows[i] && r.point.values[1] == cols[j]) rec = &r;
      const double x = left + cell_w * double(j);
      const double cd = rec ? weighted_cd(*rec) : std::nan("");
      const double t = std::isfinite(cd) && hi > lo ? (cd - lo) / (hi - lo) : 0.0;
      const std::string fill = std::isfinite(cd) ? heat_colour(t) : "#dddddd";
      o << "<rect x=\"" << f(x) << "\" y=\"" << f(y) << "\" width=\"" << f(cell_w) << "\" height=\""
        << f(cell_h) << "\" fill=\"" << fill << "\" stroke=\"white\" stroke-width=\"1.5\"/>\n";
      const std::string ink = t > 0.55 ? "white" : "#222";
      o << "<text x=\"" << f(x + cell_w / 2) << "\" y=\"" << f(y + 17)
        << "\" text-anchor=\"middle\" fill=\"" << ink << "\">"
        << (std::isfinite(cd) ? fixed(cd, 5) : std::string(rec ? "failed" : "not run"))
        << "</text>\n";
      if (rec) {
        std::string marks;
        for (const auto& c : constraint_states(rec->summary, tol))
          if (c.active) {
            const auto k = std::find_if(active_keys.begin(), active_keys.end(),
                                        [&](const auto& a) { return a.first == c.id; }) -
                           active_keys.begin();
            if (!marks.empty()) marks += ",";
            marks += std::to_string(k + 1);
          }
        if (!rec->summary.feasible) marks += marks.empty() ? "infeasible" : " infeasible";
        o << "<text x=\"" << f(x + cell_w / 2) << "\" y=\"" << f(y + 32)
          << "\" text-anchor=\"middle\" font-size=\"10\" fill=\"" << ink << "\">"
          << xml_escaped(marks) << "</text>\n";
      }
    }
  }
  double ly = top + cell_h * double(rows.size()) + 24;
  o << "<text x=\"" << f(left) << "\" y=\"" << f(ly) << "\">Colour: weighted cd from "
    << fixed(lo < hi ? lo : 0, 5) << " (light) to " << fixed(lo < hi ? hi : 0, 5)
    << " (dark). Active constraints:" << (active_keys.empty() ? " none" : "") << "</text>\n";
  for (size_t k = 0; k < active_keys.size(); ++k) {
    ly += 16;
    o << "<text x=\"" << f(left + 12) << "\" y=\"" << f(ly) << "\">" << k + 1 << ": "
      << xml_escaped(active_keys[k].second) << "</text>\n";
  }
  o << "</g>\n</svg>\n";
  return o.str();
}

}  // namespace

std::vector<ConstraintState> constraint_states(const optimize::RunSummary& summary,
                                               double active_tolerance) {
  std::vector<ConstraintState> out;
  for (const optimize::ConstraintRecord& c : summary.constraints) {
    ConstraintState s;
    s.id = c.id;
    s.key = c.name;
    s.key += c.is_min ? " >=" : " <=";
    s.value = c.value;
    s.limit = c.limit;
    s.met = c.satisfied;
    s.active = constraint_active(s.value, s.limit, active_tolerance);
    out.push_back(s);
  }
  return out;
}

double weighted_cd(const PointRecord& r) {
  return r.summary.optimized.weighted_cd;
}

std::string study_csv(const StudyDefinition& study, const std::vector<PointRecord>& records) {
  const double tol = study.active_tolerance;
  const auto labels = design_point_labels(records);
  const bool scen = has_scenarios(labels, records);
  const auto keys = constraint_keys(records, tol);
  std::ostringstream o;
  o << "point";
  for (const auto& p : study.parameters) o << "," << csv_field(p.name);
  o << ",start,feasible,converged,evaluations,weighted_cd";
  for (const auto& l : labels) o << "," << csv_field("cd " + l);
  o << ",cl_max,t_c";
  for (const auto& k : keys)
    for (const char* what : {" value", " limit", " active", " met"})
      o << "," << csv_field(k.second + what);
  o << ",coordinates,coordinates_csv,cst\n";
  for (const auto& r : records) {
    const optimize::SummarySection& opt = r.summary.optimized;
    o << r.point.index + 1;
    for (double v : r.point.values) o << "," << number_text(v, 12);
    o << "," << csv_field(r.start) << "," << (r.summary.feasible ? "true" : "false") << ","
      << (r.summary.search.outcome.status == Status::kConverged ? "true" : "false") << ","
      << r.summary.search.evaluations << "," << number_text(weighted_cd(r), 8);
    const auto cds = design_point_cd(r, scen);
    for (const auto& l : labels) {
      const auto it = cds.find(l);
      o << "," << (it == cds.end() ? std::string() : number_text(it->second, 8));
    }
    o << "," << number_text(opt.cl_max, 6) << "," << number_text(opt.geometry.thickness, 6);
    const auto states = constraint_states(r.summary, tol);
    for (const auto& k : keys) {
      const auto it = std::find_if(states.begin(), states.end(),
                                   [&](const ConstraintState& s) { return s.id == k.first; });
      if (it == states.end()) {
        o << ",,,,";
        continue;
      }
      o << "," << number_text(it->value, 8) << "," << number_text(it->limit, 8) << ","
        << (it->active ? "true" : "false") << "," << (it->met ? "true" : "false");
    }
    o << "," << csv_field(file_of(r, "optimized.dat")) << ","
      << csv_field(file_of(r, "optimized.csv")) << ","
      << csv_field(file_of(r, "optimized_cst.json")) << "\n";
  }
  return o.str();
}

std::string trade_svg(const StudyDefinition& study, const std::vector<PointRecord>& records) {
  if (study.parameters.size() == 2) return heat_map(study, records);
  using optimize::Chart;
  using optimize::Series;
  const double tol = study.active_tolerance;
  std::vector<const PointRecord*> sorted;
  for (const auto& r : records) sorted.push_back(&r);
  std::sort(sorted.begin(), sorted.end(), [](const PointRecord* a, const PointRecord* b) {
    return a->point.values[0] < b->point.values[0];
  });
  const auto& colours = optimize::series_colours();

  Chart cd;
  cd.title = "Drag of the optimum against " + study.parameters[0].name;
  cd.x_label = study.parameters[0].name;
  cd.y_label = "cd";
  Series w;
  w.label = "weighted cd";
  w.colour = colours[0];
  w.markers = true;
  for (const auto* r : sorted) w.x.push_back(r->point.values[0]), w.y.push_back(weighted_cd(*r));
  cd.series.push_back(w);
  const auto labels = design_point_labels(records);
  const bool scen = has_scenarios(labels, records);
  if (labels.size() > 1)
    for (size_t k = 0; k < labels.size(); ++k) {
      Series s;
      s.label = "cd " + labels[k];
      s.colour = colours[(k + 2) % colours.size()];
      s.dashed = true;
      for (const auto* r : sorted) {
        const auto cds = design_point_cd(*r, scen);
        const auto it = cds.find(labels[k]);
        s.x.push_back(r->point.values[0]);
        s.y.push_back(it == cds.end() ? std::nan("") : it->second);
      }
      cd.series.push_back(s);
    }
  // Infeasible optima are ringed in red on the cd curve.
  Series bad;
  bad.label = "constraints not met";
  bad.line = false;
  bad.markers = true;
  bad.colour = "#b03a2e";
  for (const auto* r : sorted)
    if (!r->summary.feasible) bad.x.push_back(r->point.values[0]), bad.y.push_back(weighted_cd(*r));
  if (!bad.x.empty()) cd.series.push_back(bad);

  // The strip: constraint k's active points at height k.
  std::vector<std::pair<std::string, std::string>> active_keys;  // id, display key
  for (const auto* r : sorted)
    for (const auto& c : constraint_states(r->summary, tol))
      if (c.active && std::find_if(active_keys.begin(), active_keys.end(), [&](const auto& k) {
                        return k.first == c.id;
                      }) == active_keys.end())
        active_keys.emplace_back(c.id, c.key);
  Chart strip;
  strip.title = active_keys.empty()
                    ? "Active constraints: none at any point"
                    : "Active constraints (within " + number_text(100 * tol) + " % of the limit)";
  strip.x_label = study.parameters[0].name;
  strip.y_label = "constraint number";
  strip.height = 120 + 22 * double(active_keys.size());
  for (size_t k = 0; k < active_keys.size(); ++k) {
    Series s;
    s.label = std::to_string(k + 1) + ": " + active_keys[k].second;
    s.colour = colours[(k + 1) % colours.size()];
    s.line = false;
    s.markers = true;
    for (const auto* r : sorted)
      for (const auto& c : constraint_states(r->summary, tol))
        if (c.active && c.id == active_keys[k].first)
          s.x.push_back(r->point.values[0]), s.y.push_back(double(k + 1));
    strip.series.push_back(s);
  }
  // An undrawn frame: the swept range on the x axis and half a row of room above and below.
  Series frame;
  frame.line = false;
  for (const auto* r : sorted) {
    frame.x.push_back(r->point.values[0]), frame.y.push_back(0.5);
    frame.x.push_back(r->point.values[0]), frame.y.push_back(double(active_keys.size()) + 0.5);
  }
  strip.series.push_back(frame);
  return optimize::svg_document({cd, strip});
}

std::string sections_svg(const StudyDefinition& study, const std::vector<PointRecord>& records) {
  optimize::Chart c;
  c.title = "Optimized sections";
  c.x_label = "x/c";
  c.y_label = "y/c";
  c.equal_aspect = true;
  c.height = 300;
  const auto& colours = optimize::series_colours();
  for (size_t k = 0; k < records.size(); ++k) {
    const Section s = cst_section(records[k].summary.optimized.cst, 81);
    optimize::Series se;
    // A legend of more than a dozen entries would cover the sections.
    se.label = k < 12 ? point_label(study, records[k].point) : std::string();
    se.colour = colours[k % colours.size()];
    se.dashed = (k / colours.size()) % 2 == 1;
    for (Eigen::Index i = 0; i < s.points.rows(); ++i)
      se.x.push_back(s.points(i, 0)), se.y.push_back(s.points(i, 1));
    c.series.push_back(se);
  }
  c.height += 15 * double(std::min<size_t>(records.size(), 12));
  return optimize::svg_document({c});
}

std::string study_report(const StudyDefinition& study, const std::vector<PointRecord>& records,
                         const std::string& caution) {
  const double tol = study.active_tolerance;
  const size_t total = sweep_points(study).size();
  std::ostringstream m;
  m << "# " << study.base_case.value("name", std::string("study")) << ": trade study\n\n";
  if (!caution.empty()) m << "> **" << caution << "**\n\n";
  if (study.base_case.contains("description") && study.base_case.at("description").is_string())
    m << study.base_case.at("description").get<std::string>() << "\n\n";
  m << "## What was swept\n\n| parameter | case value | values |\n|---|---|---|\n";
  for (const auto& p : study.parameters) {
    m << "| " << p.name << " | `" << p.pointer << "` | ";
    for (size_t i = 0; i < p.values.size(); ++i) m << (i ? ", " : "") << number_text(p.values[i]);
    m << " |\n";
  }
  m << "\nOne optimization per point (" << total << " points); points finished: " << records.size()
    << " of " << total << ".\n\n## Results\n\n| point |";
  for (const auto& p : study.parameters) m << " " << p.name << " |";
  m << " weighted cd | t/c | cl_max | feasible | active constraints | start |\n|---|";
  for (size_t k = 0; k < study.parameters.size(); ++k) m << "---|";
  m << "---|---|---|---|---|---|\n";
  for (const auto& r : records) {
    const optimize::SummarySection& opt = r.summary.optimized;
    m << "| " << r.point.index + 1 << " |";
    for (double v : r.point.values) m << " " << number_text(v) << " |";
    m << " " << fixed(weighted_cd(r), 5) << " | " << fixed(opt.geometry.thickness, 4) << " | "
      << fixed(opt.cl_max, 3) << " | " << (r.summary.feasible ? "yes" : "**no**") << " | "
      << active_list(constraint_states(r.summary, tol)) << " | " << r.start << " |\n";
  }
  if (records.size() < total) {
    m << "\nNot finished:";
    size_t shown = 0;
    std::set<int> done;
    for (const auto& r : records) done.insert(r.point.index);
    for (const auto& p : sweep_points(study))
      if (!done.count(p.index) && shown++ < 40) m << " " << p.index + 1;
    m << (shown > 40 ? " ..." : "") << "\n";
  }
  m << "\n## Plots\n\n![Trade](trade.svg)\n\n![Optimized sections](sections.svg)\n\n";
  m << "## How to read this\n\n"
    << "- Each point is the case with the swept values set, optimized and then re-verified with "
       "finer panels; the "
       "figures are those of the verification.\n"
    << "- A constraint is *active* when its verified value lies within " << number_text(100 * tol)
    << " % of its limit (at least " << number_text(tol * 0.01)
    << " absolute): the optimum presses against it, so relaxing that limit would lower the drag.\n"
    << "- Warm start: the points, in sweep order, are cut into chains of " << study.chain
    << " consecutive points. The first point of a chain starts from the case's baseline, every "
       "other one from the "
       "optimum of the point before it when that optimum met its constraints (column *start*). The "
       "rule does not "
       "depend on how the study was split into shards or jobs, so every split gives the same "
       "results. A warm start "
       "re-centres the coefficient bounds (the case's margin) on the starting section.";
  if (study.base_case.contains("second_start"))
    m << " Every point also searches from the case's `second_start` (half the analyses each), so "
         "that a point is not held in its neighbour's basin.";
  m << "\n"
    << "- The optimizer's tolerances apply to every point: differences in cd below them are "
       "noise.\n\n";
  m << "## Files\n\n`study.csv` (every point: swept values, cd at each design point, every "
       "constraint's value, limit, "
       "active and met, and the paths of the point's section files), `trade.svg`, `sections.svg`; "
       "each point's own "
       "results (coordinates, CST, polars, plots, report) are in `points/pNNN/`.\n\n";
  m << "## Cautions\n\nThese are two-dimensional section estimates from a numerical model. "
       "Three-dimensional effects, "
       "surface quality, contamination and manufacturing tolerances change the real drag and "
       "maximum lift.\n";
  if (!caution.empty()) m << "\n" << caution << "\n";
  return m.str();
}

void write_study_results(const StudyDefinition& study, const std::vector<PointRecord>& records,
                         const std::filesystem::path& dir, const std::string& caution) {
  write_file_atomically(dir / "study.csv", study_csv(study, records));
  write_file_atomically(dir / "trade.svg", trade_svg(study, records));
  write_file_atomically(dir / "sections.svg", sections_svg(study, records));
  write_file_atomically(dir / "report.md", study_report(study, records, caution));
}

}  // namespace fulmar::study
