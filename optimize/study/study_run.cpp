#include "optimize/study/study_run.h"

#include <algorithm>
#include <mutex>
#include <ostream>
#include <sstream>

#include "common/atomic_file.h"
#include "common/error.h"
#include "common/json_text.h"
#include "common/parallel_for.h"
#include "optimize/evaluation_record.h"
#include "optimize/run.h"
#include "optimize/section_problem.h"

namespace fulmar::study {
namespace {

namespace fs = std::filesystem;
using nlohmann::json;

// The JSON file at `p`, nullopt when there is none; a file that is not JSON is an InputError
// naming its line and column.
std::optional<json> read_json(const fs::path& p) {
  std::error_code ec;
  if (!fs::is_regular_file(p, ec)) return std::nullopt;
  return read_json_file(p);
}

json manifest(const StudyDefinition& study) {
  return json{{"kind", "fulmar-study"},
              {"schema_version", 1},
              {"case_file", study.case_path.string()},
              {"base_dir", fs::absolute(study.base_dir).lexically_normal().string()},
              {"case", study.source}};
}

// Throws unless `dir` is free for this study or already holds it.
void require_same_study(const StudyDefinition& study, const fs::path& dir) {
  const fs::path m = dir / kStudyManifest;
  if (!fs::exists(m)) return;
  const auto j = read_json(m);
  if (!j || !j->contains("case"))
    throw InputError(m.string() +
                     ": not a fulmar study manifest (choose another output directory)");
  if (j->at("case") != study.source)
    throw InputError(m.string() +
                     ": the directory holds a different study (another case or study block); "
                     "choose another output directory");
}

// Where a point starts: the case baseline, or its predecessor's optimum when that met its
// constraints. `pred` is the predecessor's record (null when none or not finished).
struct Start {
  std::string text = "baseline";
  std::optional<json> cst;
};
Start start_of(const StudyPoint& p, const PointRecord* pred) {
  Start s;
  if (p.predecessor < 0 || !pred) return s;
  if (!pred->summary.feasible) return s;
  s.cst = cst_to_json(pred->summary.optimized.cst, pred->summary.optimized.name);
  s.text = "point " + std::to_string(p.predecessor + 1);
  return s;
}

// The point's record when it is finished in `dir` from the start the rule gives.
std::optional<PointRecord> finished_point(const StudyDefinition& study, const StudyPoint& p,
                                          const PointRecord* pred, const fs::path& dir) {
  if (p.predecessor >= 0 && !pred) return std::nullopt;
  const Start s = start_of(p, pred);
  const auto point = read_json(dir / p.dir / kPointFile);
  if (!point || !point->contains("case") || point->at("case") != point_case_json(study, p, s.cst))
    return std::nullopt;
  const fs::path file = dir / p.dir / optimize::kSummaryFile;
  const auto summary = read_json(file);
  if (!summary) return std::nullopt;
  // A summary that cannot be read is an error naming the file and key, not an unfinished point.
  PointRecord r{p, s.text, optimize::run_summary_from_json(*summary, file.string())};
  if (r.summary.search.interrupted) return std::nullopt;
  return r;
}

}  // namespace

std::vector<PointRecord> finished_points(const StudyDefinition& study, const fs::path& dir) {
  std::vector<PointRecord> out;
  std::optional<PointRecord> prev;
  for (const StudyPoint& p : sweep_points(study)) {
    const std::optional<PointRecord> before = prev;
    const PointRecord* pred = before && before->point.index == p.predecessor ? &*before : nullptr;
    prev = finished_point(study, p, pred, dir);
    if (prev) out.push_back(*prev);
  }
  return out;
}

StudyDefinition study_of_directory(const fs::path& dir) {
  const fs::path m = dir / kStudyManifest;
  if (!fs::exists(m))
    throw InputError(m.string() + ": no study here (not a fulmar study directory)");
  const auto j = read_json(m);
  if (!j || !j->is_object() || j->value("kind", std::string()) != "fulmar-study" ||
      !j->contains("case"))
    throw InputError(m.string() + ": not a fulmar study manifest");
  const std::string case_file = j->value("case_file", std::string());
  StudyDefinition s = study_from_json(j->at("case"), m.string() + " (study of " + case_file + ")",
                                      j->value("base_dir", std::string()));
  s.case_path = case_file;
  return s;
}

StudyOutcome run_study(const StudyDefinition& study, const optimize::SectionEvaluator& evaluator,
                       const StudyRunOptions& options) {
  const fs::path dir = options.output_dir;
  optimize::require_output_dir(dir);
  require_same_study(study, dir);
  const std::vector<StudyPoint> points = sweep_points(study);
  StudyOutcome outcome;
  outcome.points_total = int(points.size());

  // This shard's chains, each in sweep order.
  std::vector<std::vector<StudyPoint>> chains;
  for (const auto& p : points) {
    if (!options.shard.takes(p)) continue;
    ++outcome.points_in_shard;
    if (chains.empty() || chains.back().front().chain != p.chain) chains.emplace_back();
    chains.back().push_back(p);
    if (!options.resume && fs::exists(dir / p.dir))
      throw InputError((dir / p.dir).string() +
                       ": exists already (continue with --resume, or choose another "
                       "output directory)");
  }

  // The baseline of every chain's first point is built now, so that a bad baseline file or bounds
  // that exclude it fail before anything is written.
  for (const auto& chain : chains) {
    const optimize::Case head = point_case(study, chain.front(), std::nullopt);
    optimize::design_space(head, optimize::resolve_baseline(head).shape);
  }

  const int cores = options.cores > 0 ? options.cores : int(core_count());
  int jobs = options.jobs > 0 ? options.jobs : cores;
  jobs = std::max(1, std::min(jobs, int(chains.size())));
  const int threads = std::max(1, cores / jobs);

  fs::create_directories(dir);
  write_file_atomically(dir / kStudyManifest, manifest(study).dump(2) + "\n");

  std::mutex mutex;     // guards the progress stream, the counters and `failed`
  bool failed = false;  // a chain threw: the chains not yet started are skipped
  auto say = [&](const std::string& line) {
    if (!options.progress) return;
    *options.progress << line << "\n" << std::flush;
  };
  {
    std::lock_guard<std::mutex> lock(mutex);
    say("fulmar study: " + study.base_case.value("name", std::string()) + ": " +
        std::to_string(points.size()) + " points, shard " + std::to_string(options.shard.k) + "/" +
        std::to_string(options.shard.n) + " runs " + std::to_string(outcome.points_in_shard) +
        " in " + std::to_string(chains.size()) + " chains; " + std::to_string(jobs) + " at once, " +
        std::to_string(threads) + " thread(s) each");
  }
  const std::string total = std::to_string(points.size());

  // One chain per job; the error of the lowest chain that threw is thrown again after all ended.
  fulmar::parallel_for(chains.size(), unsigned(jobs), [&](std::size_t k) {
    {
      std::lock_guard<std::mutex> lock(mutex);
      if (failed || (options.stop && options.stop->load())) return;
    }
    {
      const std::vector<StudyPoint>& chain = chains[k];
      std::optional<PointRecord> pred;
      for (const StudyPoint& p : chain) {
        if (options.stop && options.stop->load()) return;
        try {
          const PointRecord* pp = pred && pred->point.index == p.predecessor ? &*pred : nullptr;
          if (p.predecessor >= 0 && !pp) return;  // the predecessor was interrupted
          if (options.resume) {
            if (auto done = finished_point(study, p, pp, dir)) {
              std::lock_guard<std::mutex> lock(mutex);
              ++outcome.points_skipped;
              say("point " + std::to_string(p.index + 1) + "/" + total + " (" +
                  point_label(study, p) + "): finished earlier, kept");
              pred = done;
              continue;
            }
          }
          const Start s = start_of(p, pp);
          const json case_json = point_case_json(study, p, s.cst);
          const optimize::Case c = point_case(study, p, s.cst);
          const fs::path pdir = dir / p.dir;
          const auto old = read_json(pdir / kPointFile);
          const bool same = old && old->contains("case") && old->at("case") == case_json;
          if (fs::exists(pdir) && !same) {
            // A run from another start (its predecessor was redone): start this one afresh.
            fs::remove_all(pdir);
          }
          fs::create_directories(pdir);
          const bool resume = same && fs::exists(pdir / optimize::kCheckpointFile);
          json pj{{"index", p.index + 1}, {"start", s.text}, {"case", case_json}};
          json vals = json::object();
          for (size_t k = 0; k < study.parameters.size(); ++k)
            vals[study.parameters[k].pointer] = p.values[k];
          pj["values"] = vals;
          write_file_atomically(pdir / kPointFile, pj.dump(2) + "\n");
          write_file_atomically(pdir / "case.json", case_json.dump(2) + "\n");
          {
            std::lock_guard<std::mutex> lock(mutex);
            say("point " + std::to_string(p.index + 1) + "/" + total + " (" +
                point_label(study, p) + "): " + (resume ? "resuming" : "starting") + " from " +
                s.text);
          }
          std::ostringstream log;
          optimize::RunOptions ro;
          ro.output_dir = pdir;
          ro.resume = resume;
          ro.progress = &log;
          ro.stop = options.stop;
          ro.threads = threads;
          ro.caution = options.caution;
          const optimize::RunOutcome r = optimize::run_optimization(c, evaluator, ro);
          write_file_atomically(pdir / "progress.log", log.str());
          std::lock_guard<std::mutex> lock(mutex);
          if (r.interrupted) {
            outcome.interrupted = true;
            say("point " + std::to_string(p.index + 1) + "/" + total +
                ": interrupted (continue with --resume)");
            return;
          }
          ++outcome.points_run;
          const double cd = r.summary.optimized.weighted_cd;
          say("point " + std::to_string(p.index + 1) + "/" + total + " (" + point_label(study, p) +
              "): weighted cd " +
              (std::isfinite(cd) ? number_text(cd, 5) : std::string("(analysis failed)")) + ", " +
              (r.feasible ? "constraints met" : "constraints NOT met") + ", " +
              std::to_string(r.summary.search.evaluations) + " analyses");
          pred = PointRecord{p, s.text, r.summary};
        } catch (...) {  // thrown again by parallel_for once every chain has ended
          std::lock_guard<std::mutex> lock(mutex);
          failed = true;
          throw;
        }
      }
    }
  });
  if (options.stop && options.stop->load()) outcome.interrupted = true;

  const std::vector<PointRecord> done = finished_points(study, dir);
  outcome.points_finished = int(done.size());
  outcome.complete = done.size() == points.size();
  write_study_results(study, done, dir, options.caution);
  return outcome;
}

void merge_studies(const std::vector<fs::path>& shard_dirs, const fs::path& output_dir,
                   const std::string& caution) {
  if (shard_dirs.empty()) throw InputError("study merge: give at least one study directory");
  const StudyDefinition study = study_of_directory(shard_dirs.front());
  for (size_t i = 1; i < shard_dirs.size(); ++i) {
    const StudyDefinition other = study_of_directory(shard_dirs[i]);
    if (other.source != study.source)
      throw InputError(
          (shard_dirs[i] / kStudyManifest).string() + ": holds a different study than " +
          (shard_dirs.front() / kStudyManifest).string() + " (another case or study block)");
  }
  // Every point from the first directory that has it finished (from the start the rule gives).
  const std::vector<StudyPoint> points = sweep_points(study);
  std::vector<PointRecord> records;
  std::vector<size_t> source;
  std::string missing;
  std::optional<PointRecord> prev;
  for (const StudyPoint& p : points) {
    const std::optional<PointRecord> before = prev;
    const PointRecord* pred = before && before->point.index == p.predecessor ? &*before : nullptr;
    prev.reset();
    for (size_t d = 0; d < shard_dirs.size() && !prev; ++d) {
      prev = finished_point(study, p, pred, shard_dirs[d]);
      if (prev) source.push_back(d);
    }
    if (prev)
      records.push_back(*prev);
    else
      missing += (missing.empty() ? "" : ", ") + std::to_string(p.index + 1);
  }
  if (!missing.empty())
    throw InputError("study merge: point(s) " + missing + " of " + std::to_string(points.size()) +
                     " are finished in none of the directories given (run their shards, with "
                     "--resume to continue)");
  optimize::require_output_dir(output_dir);
  require_same_study(study, output_dir);

  fs::create_directories(output_dir / "points");
  write_file_atomically(output_dir / kStudyManifest, manifest(study).dump(2) + "\n");
  std::error_code ec;
  for (size_t i = 0; i < records.size(); ++i) {
    const fs::path from = shard_dirs[source[i]] / records[i].point.dir;
    const fs::path to = output_dir / records[i].point.dir;
    if (fs::equivalent(from, to, ec)) continue;
    // Copy beside the target, then swap it in, so an interrupted merge leaves no half point.
    const fs::path tmp = to.string() + ".merging";
    fs::remove_all(tmp);
    fs::copy(from, tmp, fs::copy_options::recursive);
    fs::remove_all(to);
    fs::rename(tmp, to);
  }
  write_study_results(study, records, output_dir, caution);
}

}  // namespace fulmar::study
