#include "optimize/run.h"

#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <ostream>
#include <sstream>

#include "common/atomic_file.h"
#include "common/error.h"
#include "geometry/cst.h"
#include "optimize/driver.h"
#include "optimize/run_files.h"
#include "optimize/run_plots.h"
#include "optimize/run_polars.h"
#include "optimize/run_report.h"
#include "optimize/run_summary.h"
#include "optimize/run_verify.h"
#include "optimize/section_problem.h"

namespace fulmar::optimize {
namespace {

// The design vector [upper a_0.., lower a_0..] of a shape at the search's orders, clamped into
// its bounds.
std::vector<double> clamped_design(const CstShape& st, const SearchProblem& search) {
  std::vector<double> x(search.start.size());
  for (Eigen::Index i = 0; i < st.upper.size(); ++i) x[size_t(i)] = st.upper[i];
  for (Eigen::Index i = 0; i < st.lower.size(); ++i) x[size_t(st.upper.size() + i)] = st.lower[i];
  for (size_t i = 0; i < x.size(); ++i) x[i] = std::clamp(x[i], search.lower[i], search.upper[i]);
  return x;
}

namespace fs = std::filesystem;
using nlohmann::json;

}  // namespace

void require_output_dir(const fs::path& dir) {
  std::error_code ec;
  if (fs::exists(dir, ec)) {
    if (!fs::is_directory(dir, ec))
      throw InputError(dir.string() + ": exists and is not a directory");
    if (::access(dir.c_str(), W_OK) != 0)
      throw InputError(dir.string() + ": directory is not writable");
    return;
  }
  const fs::path parent = dir.has_parent_path() ? dir.parent_path() : fs::path(".");
  if (!fs::is_directory(parent, ec))
    throw InputError(dir.string() + ": cannot create the output directory (" + parent.string() +
                     " does not exist)");
  if (::access(parent.c_str(), W_OK) != 0)
    throw InputError(dir.string() + ": cannot create the output directory (" + parent.string() +
                     " is not writable)");
}

RunOutcome run_optimization(const Case& c, const SectionEvaluator& evaluator,
                            const RunOptions& options) {
  // Everything that can fail on input is checked before the first file is written.
  require_output_dir(options.output_dir);
  const BaselineShape baseline = resolve_baseline(c);
  const DesignSpace space = design_space(c, baseline.shape);
  const SectionProblem problem(c, evaluator, space);
  const fs::path dir = options.output_dir;
  if (options.resume && !fs::exists(dir / kCheckpointFile))
    throw InputError((dir / kCheckpointFile).string() +
                     ": no checkpoint to resume from (run without --resume first)");

  json identity = c.source;
  if (identity.contains("optimizer")) {
    identity["optimizer"].erase("max_evaluations");
    identity["optimizer"].erase("time_limit_s");
  }
  identity.erase("outputs");
  identity["evaluator"] = evaluator.description();
  if (options.start_shape) identity["start"] = cst_to_json(*options.start_shape, "start");

  SearchSettings settings;
  settings.options = c.optimizer;
  settings.checkpoint = dir / kCheckpointFile;
  settings.fingerprint = identity.dump();
  settings.resume = options.resume;
  settings.threads = options.threads;
  settings.stop = options.stop;
  settings.progress = options.progress;
  if (options.progress)
    *options.progress << "fulmar optimize: " << c.name << ": " << space.start.size()
                      << " CST coefficients, " << problem.constraint_names().size()
                      << " constraints, algorithm " << to_string(c.optimizer.algorithm)
                      << ", budget " << c.optimizer.max_evaluations << " analyses"
                      << (options.resume ? ", resuming" : "") << "\n"
                      << std::flush;
  SearchProblem search = problem.search_problem();
  if (options.start_shape) {
    const CstShape& st = *options.start_shape;
    if (st.upper.size() != space.layout.upper.size() ||
        st.lower.size() != space.layout.lower.size())
      throw InputError("start design: its CST orders " + std::to_string(st.upper.size() - 1) + "/" +
                       std::to_string(st.lower.size() - 1) + " differ from the case's " +
                       std::to_string(c.parameterization.order_upper) + "/" +
                       std::to_string(c.parameterization.order_lower));
    search.start = clamped_design(st, search);
  }
  if (c.second_start) {
    const std::vector<double> x = clamped_design(resolve_shape(c, *c.second_start).shape, search);
    if (x != search.start) search.extra_starts.push_back(x);
  }
  fs::create_directories(dir);
  const SearchResult r = run_search(search, settings);
  const double tol = c.optimizer.constraint_tol;

  const VerifiedOptimum v = verify_optimum(c, problem, r, search.start, options.progress);
  const CstShape opt_shape = space.shape(v.x);
  const std::string opt_name = c.name + " optimized";

  OutputFiles out_files(dir);
  auto put = [&](const std::string& key, const std::string& file, const std::string& content) {
    out_files.put(key, file, content);
  };
  write_section_files(c, baseline.name, baseline.shape, opt_name, opt_shape, out_files,
                      options.progress);
  put("history", "history.csv", history_csv(r, problem.constraint_names(), tol));

  const auto conds = polar_conditions(c);
  SectionPolars base_p, opt_p;
  if (c.outputs.polars || c.outputs.plots) {
    const auto alphas = polar_angles(c.analysis);
    const Section bs = cst_section(baseline.shape, 161, baseline.name);
    const Section os = cst_section(opt_shape, 161, opt_name);
    for (const auto& k : conds) {
      base_p.per_condition.push_back(evaluator.polar(bs, k.flow, alphas, c.analysis.verify_panels));
      opt_p.per_condition.push_back(evaluator.polar(os, k.flow, alphas, c.analysis.verify_panels));
    }
  }
  if (c.outputs.polars) {
    put("polar_baseline", "polar_baseline.csv", polar_csv(conds, base_p, baseline.name));
    put("polar_optimized", "polar_optimized.csv", polar_csv(conds, opt_p, opt_name));
  }

  if (c.outputs.plots) {
    put("plot_sections", "sections.svg", sections_plot(baseline.shape, opt_shape));
    const PolarPlots pp = polar_plots(c, conds, base_p, opt_p, v.baseline, v.optimum);
    put("plot_polars", "polars.svg", pp.polars);
    put("plot_lift_moment", "lift_moment.svg", pp.lift_moment);
    put("plot_cp", "cp_cruise.svg", cp_plot(c, evaluator, baseline.shape, opt_shape));
    put("plot_convergence", "convergence.svg", convergence_plot(r, tol));
  }

  RunSummary summary = run_summary(c, r, v, baseline.name, baseline.shape, baseline.fit_deviation,
                                   opt_name, opt_shape, evaluator.description());
  out_files.record("checkpoint", kCheckpointFile);
  if (c.outputs.report) {
    const std::string report =
        report_markdown(c, summary, r, v, baseline.name, evaluator.description(), options.caution);
    out_files.record("report", "report.md");
    write_file_atomically(dir / "report.md", report);
  }
  for (const auto& item : out_files.paths().items())
    summary.files[item.key()] = item.value().get<std::string>();
  summary.files["summary"] = (dir / kSummaryFile).string();
  write_file_atomically(dir / kSummaryFile, to_json(summary).dump(2) + "\n");

  RunOutcome out;
  out.interrupted = r.interrupted;
  out.converged = r.converged();
  out.feasible = v.feasible;
  out.summary = summary;
  return out;
}

}  // namespace fulmar::optimize
