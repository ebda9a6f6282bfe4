#pragma once
// The results of a trade study over its finished points: a table (study.csv), a trade plot
// (trade.svg: cd against the swept value with the active constraints marked, or a heat map of the
// weighted cd over two swept values), all optima overlaid (sections.svg) and a Markdown report.
// Everything here is a function of the study and the points' summaries alone (no times, no
// absolute paths), so a merged set of shards gives byte-identical files to a single run.
#include <filesystem>
#include <string>
#include <vector>

#include "optimize/run_summary.h"
#include "optimize/study/study_case.h"

namespace fulmar::study {

// One finished point.
struct PointRecord {
  StudyPoint point;
  std::string start;             // "baseline" or "point N" (1-based): where its search started
  optimize::RunSummary summary;  // the point's summary.json (run_optimization)
};

// One constraint of one point's verified optimum, from summary.json's "constraints".
struct ConstraintState {
  std::string id;   // stable id (optimize::ConstraintRecord::id): what identifies it across points
  std::string key;  // name and sense for headings, e.g. "t/c >=" (display text only)
  double value = 0, limit = 0;  // value NaN when the analysis failed
  bool met = false;
  bool active = false;  // within the study's active_tolerance of the limit (constraint_active)
};
std::vector<ConstraintState> constraint_states(const optimize::RunSummary& summary,
                                               double active_tolerance);

// The weighted cd of a point's verified optimum; NaN when its analysis failed.
double weighted_cd(const PointRecord& r);

// study.csv: one row per finished point in sweep order. Columns: point (1-based), each swept value,
// start, feasible, converged, evaluations, weighted_cd, "cd <design point>[/<scenario>]" for every
// design point (and transition scenario), cl_max, t_c, then per constraint "<key> value",
// "<key> limit", "<key> active", "<key> met", and the point's files relative to the study
// directory: coordinates (.dat), coordinates_csv, cst. Empty fields where a value is unknown.
std::string study_csv(const StudyDefinition& study, const std::vector<PointRecord>& records);

// trade.svg: for one parameter, cd against the swept value (weighted cd, and each design point's
// cd when there are several) above a strip that marks, per constraint, the points where it is
// active; for two parameters a heat map of the weighted cd with the active constraints numbered
// in each cell. A valid SVG document also for no points.
std::string trade_svg(const StudyDefinition& study, const std::vector<PointRecord>& records);

// sections.svg: every optimum overlaid, labelled with its swept values.
std::string sections_svg(const StudyDefinition& study, const std::vector<PointRecord>& records);

// report.md: the study, the table, the plots, the rules (active, warm start) and `caution`.
std::string study_report(const StudyDefinition& study, const std::vector<PointRecord>& records,
                         const std::string& caution);

// Writes the four files above into `dir` atomically.
void write_study_results(const StudyDefinition& study, const std::vector<PointRecord>& records,
                         const std::filesystem::path& dir, const std::string& caution);

}  // namespace fulmar::study
