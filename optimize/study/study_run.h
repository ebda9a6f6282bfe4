#pragma once
// Running a trade study: one optimization per sweep point, each in its own sub-directory of the
// study directory, chains of points in parallel, resumable, shardable across processes; and
// merging the directories of separate shards into one study directory.
//
// A study directory holds:
//   study.json             the study (the whole case with its study block), to check that
//                          resumed runs and merged shards belong to the same study
//   points/pNNN/           one optimization (run_optimization's files) plus point.json (the
//                          point's values, its start and its exact case) and case.json (that case,
//                          runnable on its own with `fulmar optimize`)
//   study.csv, trade.svg, sections.svg, report.md   results over the finished points
// A point is finished when its summary.json exists, was not interrupted, and its point.json holds
// the case the warm-start rule (study_case.h) gives from its finished predecessor.
#include <atomic>
#include <filesystem>
#include <iosfwd>
#include <string>
#include <vector>

#include "optimize/section_evaluator.h"
#include "optimize/study/study_case.h"
#include "optimize/study/study_results.h"

namespace fulmar::study {

inline constexpr const char* kStudyManifest = "study.json";
inline constexpr const char* kPointFile = "point.json";

struct StudyRunOptions {
  std::filesystem::path output_dir;  // created if missing (its parent must exist)
  // Points optimized at once (whole chains in parallel); 0: one per core. Each optimization gets
  // max(1, cores / jobs) finite-difference threads, so the machine is used but not oversubscribed.
  int jobs = 0;
  int cores = 0;  // cores to plan for; 0: std::thread::hardware_concurrency()
  Shard shard;    // the chains this process runs (default 1/1: all)
  bool resume =
      false;  // continue: finished points are kept, unfinished ones resume from their checkpoint
  std::ostream* progress = nullptr;         // one line when a point starts and when it ends
  const std::atomic<bool>* stop = nullptr;  // set by a signal handler: running points stop cleanly
  std::string caution;                      // printed in the reports
};

struct StudyOutcome {
  int points_total = 0;     // points of the whole study
  int points_in_shard = 0;  // points this shard runs
  int points_run = 0;       // optimized by this call
  int points_skipped = 0;   // already finished (resume)
  int points_finished = 0;  // finished in the directory after this call, over all shards
  bool interrupted = false;
  bool complete = false;  // every point of the study is finished in the directory
};

// Runs this shard's points of `study` with `evaluator`, then writes the results of every finished
// point in the directory. Throws InputError before anything is written for an output directory
// that cannot be used, a directory holding another study, or (without resume) points of this
// shard that already exist there.
StudyOutcome run_study(const StudyDefinition& study, const optimize::SectionEvaluator& evaluator,
                       const StudyRunOptions& options);

// The finished points of `study` in `dir`, in sweep order (see the header comment).
std::vector<PointRecord> finished_points(const StudyDefinition& study,
                                         const std::filesystem::path& dir);

// Reads the study of a study directory (its study.json). Throws InputError naming the file.
StudyDefinition study_of_directory(const std::filesystem::path& dir);

// Combines the shard directories into `output_dir` (which may be one of them): every point of
// the study must be finished in one of them. The points are copied, then the results written
// exactly as a single run over all points would write them. Throws InputError, with nothing
// written, for directories of different studies or points finished nowhere (named).
void merge_studies(const std::vector<std::filesystem::path>& shard_dirs,
                   const std::filesystem::path& output_dir, const std::string& caution);

}  // namespace fulmar::study
