#include "optimize/run_files.h"

#include <ostream>
#include <sstream>

#include "cad/export.h"
#include "common/atomic_file.h"
#include "geometry/coordinates_io.h"
#include "optimize/run_text.h"

namespace fulmar::optimize {

using run_text::csv_field;
using run_text::g6;

void OutputFiles::put(const std::string& key, const std::string& file, const std::string& content) {
  write_file_atomically(dir_ / file, content);
  record(key, file);
}

void OutputFiles::record(const std::string& key, const std::string& file) {
  files_[key] = (dir_ / file).string();
}

std::string history_csv(const SearchResult& r, const std::vector<std::string>& names, double tol) {
  std::ostringstream o;
  const size_t n = r.history.empty() ? 0 : r.history.front().x.size();
  o << "evaluation,status,objective_100cd,worst_constraint,feasible";
  for (size_t i = 0; i < n; ++i) o << ",x" << i;
  for (const auto& name : names) o << "," << csv_field(name);
  o << "\n";
  for (size_t k = 0; k < r.history.size(); ++k) {
    const Evaluation& e = r.history[k];
    const double w = worst_constraint(e);
    o << k + 1 << "," << csv_field(e.status) << "," << g6(e.objective, 10) << "," << g6(w, 6) << ","
      << (e.ok && w <= tol ? "true" : "false");
    for (double x : e.x) o << "," << g6(x, 17);
    for (double g : e.constraints) o << "," << g6(g, 8);
    o << "\n";
  }
  return o.str();
}

void write_section_files(const Case& c, const std::string& baseline_name,
                         const CstShape& baseline_shape, const std::string& optimum_name,
                         const CstShape& optimum_shape, OutputFiles& files,
                         std::ostream* progress) {
  const int per_surface = (c.outputs.points + 1) / 2;
  const Section opt_section = cst_section(optimum_shape, per_surface, optimum_name);
  files.put("coordinates", "optimized.dat", coordinates_text(opt_section));
  files.put("coordinates_csv", "optimized.csv", coordinates_csv(opt_section));
  files.put("cst", "optimized_cst.json", cst_to_json(optimum_shape, optimum_name).dump(2) + "\n");
  files.put("baseline_cst", "baseline_cst.json",
            cst_to_json(baseline_shape, baseline_name).dump(2) + "\n");
  for (const std::string& format_name : c.outputs.cad_formats) {
    cad::ExportOptions e;
    e.format = cad::cad_format_from_string(format_name);
    e.placement.units = cad::length_unit_from_string(c.outputs.cad_units);
    e.placement.chord = c.outputs.cad_chord > 0
                            ? c.outputs.cad_chord
                            : c.airplane->chord / cad::metres_per_unit(e.placement.units);
    const std::string file = "optimized_cad." + format_name;
    const cad::ExportReport report = cad::export_section(opt_section, e, files.dir() / file);
    files.record("cad_" + format_name, file);
    if (progress) *progress << "wrote " << file << ": " << report.message << "\n" << std::flush;
  }
}

}  // namespace fulmar::optimize
