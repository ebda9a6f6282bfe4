// `fulmar study CASE.json [-o DIR] [--jobs N] [--shard K/N] [--resume] [--check]` and
// `fulmar study merge DIR... -o OUT`: trade studies, one optimization per sweep point.
#include <atomic>
#include <csignal>
#include <iostream>
#include <memory>

#include "app/commands.h"
#include "app/stop_signal.h"
#include "common/error.h"
#include "optimize/run.h"
#include "optimize/study/study_case.h"
#include "optimize/study/study_run.h"
#include "optimize/viscous_evaluator.h"

namespace fulmar::app {
namespace {

namespace fs = std::filesystem;

struct StudyArgs {
  std::string case_file;
  std::string output_dir;
  int jobs = 0;
  std::string shard = "1/1";
  bool resume = false;
  bool check = false;
  std::vector<std::string> merge_dirs;
  std::string merge_output;
};

void print_plan(const study::StudyDefinition& s, const study::Shard& shard) {
  const auto points = study::sweep_points(s);
  std::cout << "study of " << s.base_case.value("name", std::string()) << ": valid, "
            << points.size() << " points in chains of " << s.chain << "\n";
  for (const auto& p : points)
    std::cout << "  point " << p.index + 1 << "  " << study::point_label(s, p) << "  chain "
              << p.chain + 1 << ", starts from "
              << (p.predecessor < 0 ? std::string("the baseline")
                                    : "point " + std::to_string(p.predecessor + 1))
              << ", shard " << p.chain % shard.n + 1 << "/" << shard.n << "\n";
}

void run_study_command(const StudyArgs& a) {
  if (a.case_file.empty())
    throw InputError("study: give a case file (fulmar study CASE.json) or use `study merge`");
  const study::Shard shard = study::shard_from_string(a.shard, "--shard");
  const study::StudyDefinition s = study::load_study(a.case_file);
  if (a.check) {
    print_plan(s, shard);
    return;
  }
  const fs::path dir = a.output_dir.empty()
                           ? fs::path(fs::path(a.case_file).stem().string() + "-study")
                           : fs::path(a.output_dir);
  optimize::require_output_dir(dir);
  const std::unique_ptr<optimize::SectionEvaluator> evaluator = optimize::make_viscous_evaluator();
  if (!evaluator) throw InputError(a.case_file + ": " + optimize::viscous_unavailable_reason());

  study::StudyRunOptions o;
  o.output_dir = dir;
  o.jobs = a.jobs;
  o.shard = shard;
  o.resume = a.resume;
  o.progress = &std::cout;
  o.caution = kCaution;
  study::StudyOutcome out;
  {
    const StopOnSignal stop;
    o.stop = stop.flag();
    out = study::run_study(s, *evaluator, o);
  }
  std::cout << (out.interrupted ? "stopped by a signal; continue with --resume. " : "")
            << out.points_run << " point(s) optimized, " << out.points_skipped
            << " kept from before; " << out.points_finished << " of " << out.points_total
            << " points of the study finished in " << dir.string()
            << (out.complete ? " (complete: study.csv, trade.svg, sections.svg, report.md)"
                             : " (merge the shards' directories with `fulmar study merge`)")
            << "\n";
}

void run_merge_command(const StudyArgs& a) {
  std::vector<fs::path> dirs(a.merge_dirs.begin(), a.merge_dirs.end());
  study::merge_studies(dirs, a.merge_output, kCaution);
  std::cout << "merged " << dirs.size() << " director" << (dirs.size() == 1 ? "y" : "ies")
            << " into " << a.merge_output << " (study.csv, trade.svg, sections.svg, report.md)\n";
}

}  // namespace

void add_study_command(CLI::App& app) {
  auto args = std::make_shared<StudyArgs>();
  CLI::App* cmd = app.add_subcommand("study",
                                     "Trade study: sweep one or two values of CASE.json (a "
                                     "constraint limit, the cruise speed or cl, Re, "
                                     "critical N, ...; named in its \"study\" block) and optimize "
                                     "the section at every point, to show what each "
                                     "constraint costs in drag. Writes study.csv, trade.svg, "
                                     "sections.svg and report.md to DIR, one "
                                     "sub-directory per point. Shards (--shard K/N) are "
                                     "independent processes for batch schedulers; "
                                     "`fulmar study merge` combines their directories.\n\n" +
                                         std::string(kCaution));
  cmd->add_option("case", args->case_file,
                  "Study case file (JSON: an optimization case plus a study block)")
      ->check(CLI::ExistingFile);
  cmd->add_option(
      "-o,--output", args->output_dir,
      "Study directory (created if missing; default: CASE-study in the working directory)");
  cmd->add_option("--jobs", args->jobs,
                  "Points optimized at once (0: one per core); each gets cores/jobs threads")
      ->check(CLI::Range(0, 1024));
  cmd->add_option(
      "--shard", args->shard,
      "Run only shard K of N (K/N, e.g. 2/4): every N-th warm-start chain; default 1/1");
  cmd->add_flag(
      "--resume", args->resume,
      "Continue in DIR: finished points are kept, unfinished ones resume from their checkpoint");
  cmd->add_flag("--check", args->check,
                "Validate the study and list its points, chains and shards; no analysis");
  cmd->require_subcommand(0, 1);

  CLI::App* merge =
      cmd->add_subcommand("merge",
                          "Combine the directories of a study's shards into one study directory "
                          "(which may be one of them) and "
                          "write the study results, exactly as one run over all points would.\n\n" +
                              std::string(kCaution));
  merge->add_option("dirs", args->merge_dirs, "Study directories of the shards")
      ->required()
      ->check(CLI::ExistingDirectory);
  merge->add_option("-o,--output", args->merge_output, "Merged study directory")->required();
  merge->callback([args] { run_merge_command(*args); });
  cmd->callback([args, merge] {
    if (merge->parsed()) return;
    run_study_command(*args);
  });
}

}  // namespace fulmar::app
