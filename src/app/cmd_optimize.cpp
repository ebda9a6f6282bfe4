// `fulmar optimize CASE.json [-o DIR] [--resume]`: the minimum-drag section for an airplane.
#include <atomic>
#include <cmath>
#include <csignal>
#include <cstdio>
#include <iostream>
#include <memory>

#include "app/commands.h"
#include "app/stop_signal.h"
#include "common/error.h"
#include "optimize/case_file.h"
#include "optimize/run.h"
#include "optimize/section_problem.h"
#include "optimize/viscous_evaluator.h"

namespace fulmar::app {
namespace {

struct OptimizeArgs {
  std::string case_file;
  std::string output_dir;
  bool resume = false;
  bool check = false;
  int threads = 0;
};

void print_conditions(const optimize::Case& c, const optimize::BaselineShape& b,
                      const optimize::DesignSpace& space) {
  std::printf("case %s: valid\n", c.name.c_str());
  for (const auto& p : c.points)
    std::printf("  design point %-12s cl %.4f  Re %.4g  M %.4f  weight %g\n", p.name.c_str(), p.cl,
                p.reynolds, p.mach, p.weight);
  if (c.landing.present)
    std::printf("  landing              Re %.4g  M %.4f  cl_max >= %.4f\n", c.landing.reynolds,
                c.landing.mach, c.constraints.cl_max_min);
  std::printf("  baseline %s, CST orders %d/%d (fit deviation %.2e), %zu design variables\n",
              b.name.c_str(), c.parameterization.order_upper, c.parameterization.order_lower,
              b.fit_deviation, space.start.size());
}

void run_optimize(const OptimizeArgs& a) {
  const optimize::Case c = optimize::load_case(a.case_file);
  const std::filesystem::path dir =
      a.output_dir.empty()
          ? std::filesystem::path(std::filesystem::path(a.case_file).stem().string() + "-result")
          : std::filesystem::path(a.output_dir);
  // All input is checked before any work: the baseline and its bounds, the output directory.
  const optimize::BaselineShape baseline = optimize::resolve_baseline(c);
  const optimize::DesignSpace space = optimize::design_space(c, baseline.shape);
  if (a.check) {
    print_conditions(c, baseline, space);
    return;
  }
  optimize::require_output_dir(dir);
  const std::unique_ptr<optimize::SectionEvaluator> evaluator = optimize::make_viscous_evaluator();
  if (!evaluator) throw InputError(a.case_file + ": " + optimize::viscous_unavailable_reason());

  optimize::RunOptions options;
  options.output_dir = dir;
  options.resume = a.resume;
  options.progress = &std::cout;
  options.threads = a.threads;
  options.caution = kCaution;
  optimize::RunOutcome out;
  {
    const StopOnSignal stop;
    options.stop = stop.flag();
    out = optimize::run_optimization(c, *evaluator, options);
  }
  const optimize::RunSummary& s = out.summary;
  std::cout << (out.interrupted
                    ? "stopped by a signal; the best feasible design so far is written"
                    : (out.converged ? "converged" : "stopped: " + s.search.outcome.reason))
            << "\n";
  if (std::isfinite(s.drag_reduction_percent))
    std::printf("weighted cd %.5f -> %.5f (%.1f %% less), constraints %s\n", s.baseline.weighted_cd,
                s.optimized.weighted_cd, s.drag_reduction_percent,
                out.feasible ? "all met" : "NOT all met");
  std::cout << "results in " << dir.string() << " (summary.json, report.md)\n";
}

}  // namespace

void add_optimize_command(CLI::App& app) {
  auto args = std::make_shared<OptimizeArgs>();
  CLI::App* cmd = app.add_subcommand(
      "optimize",
      "Find the section of least drag at the design points of CASE.json under its maximum-lift, "
      "moment and thickness constraints; write coordinates, polars, plots and a report to DIR. "
      "The case-file format is described in cases/README.md.\n\n" +
          std::string(kCaution));
  cmd->add_option("case", args->case_file, "Case file (JSON)")
      ->required()
      ->check(CLI::ExistingFile);
  cmd->add_option(
      "-o,--output", args->output_dir,
      "Output directory (created if missing; default: CASE-result in the working directory)");
  cmd->add_flag("--resume", args->resume,
                "Continue an interrupted run from DIR/checkpoint.json (same case file)");
  cmd->add_flag("--check", args->check,
                "Validate the case and print its design conditions; no analysis");
  cmd->add_option("--threads", args->threads,
                  "Threads for finite-difference gradients (0: all cores)")
      ->check(CLI::Range(0, 256));
  cmd->callback([args] { run_optimize(*args); });
}

}  // namespace fulmar::app
