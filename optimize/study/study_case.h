#pragma once
// A trade study: an optimization case plus a "study" block that names one or two numbers of the
// case to sweep. Each point of the sweep is the case with those numbers replaced, optimized on its
// own. This header reads and validates the study, expands the sweep into points in a fixed order,
// and decides, from the point index alone, which shard runs a point and where its search starts.
//
// The study block (documented in the README, "Trade studies"):
//   "study": {
//     "parameters": [                       // one or two
//       {"pointer": "/constraints/thickness/min",   // RFC 6901 pointer to a number of the case
//        "name": "minimum t/c",                     // optional label (default: the pointer)
//        "range": {"from": 0.10, "to": 0.18, "step": 0.02}   // or "count": 5 instead of "step"
//        // or "values": [0.10, 0.12, 0.15]
//       }],
//     "chain": 4,                 // optional: points per warm-start chain (default 4)
//     "active_tolerance": 0.01    // optional: see ConstraintState
//   }
//
// Point order: the first parameter's values are the outer loop, the second's the inner loop in
// serpentine order (forwards on even rows, backwards on odd rows), so consecutive points are
// always neighbours on the grid.
//
// Warm start (deterministic, independent of timing, jobs and shards): the points, in that order,
// are cut into chains of `chain` consecutive points (point i is in chain i / chain). The first
// point of a chain starts from the case's baseline; every other point starts from the optimized
// section of the point before it (its predecessor, one step away in the sweep), provided that
// optimum was verified feasible, else from the case's baseline. A chain runs in sequence; chains
// run in parallel. Shard K of N runs the chains c with c mod N == K - 1, whole, so a point and its
// predecessor are always in the same shard and every point starts from exactly the same design
// however the study is split.
#include <filesystem>
#include <optional>
#include <string>
#include <vector>

#include <nlohmann/json.hpp>

#include "optimize/case_file.h"

namespace fulmar::study {

// The number of points one study may hold (each is a full optimization).
inline constexpr int kMaxStudyPoints = 1000;

struct SweepParameter {
  std::string name;            // label for tables and plots
  std::string pointer;         // RFC 6901 pointer into the case (never into /study)
  bool integer = false;        // the case holds an integer there: every value is a whole number
  std::vector<double> values;  // in sweep order, as given or expanded from the range
  std::string json_path;       // where it was defined, e.g. /study/parameters/0
  std::string values_path;     // /study/parameters/0/values or .../range (for messages)
};

struct StudyDefinition {
  std::filesystem::path case_path;         // the case file (for messages and the report)
  std::filesystem::path base_dir;          // relative baseline paths resolve against this folder
  nlohmann::json source;                   // the whole case JSON as read, with the study block
  nlohmann::json base_case;                // the same without "study": a plain optimization case
  std::vector<SweepParameter> parameters;  // one or two
  int chain = 4;                           // points per warm-start chain, >= 1
  double active_tolerance = 0.01;          // see constraint_active
  std::string label;                       // file name used in messages
};

// One point of the sweep.
struct StudyPoint {
  int index = 0;               // 0-based position in sweep order
  std::vector<double> values;  // one per parameter, in parameter order
  int chain = 0;               // index / chain length
  int predecessor = -1;        // the point whose optimum seeds this one, -1: the case baseline
  std::string dir;             // sub-directory relative to the study directory, e.g. points/p003
};

// Reads and validates a study case. Throws InputError "FILE: /json/path: rule" at the first
// problem, before anything is written: the study block's own rules, and the complete optimization
// case validated at every point of the sweep (so a value that makes the case invalid is named
// with both paths).
StudyDefinition load_study(const std::filesystem::path& path);
StudyDefinition parse_study(const std::string& text, const std::string& label,
                            const std::filesystem::path& base_dir);
StudyDefinition study_from_json(const nlohmann::json& root, const std::string& label,
                                const std::filesystem::path& base_dir);

// The points in sweep order (see the header comment), #values(p0) x #values(p1) of them.
std::vector<StudyPoint> sweep_points(const StudyDefinition& study);

// One shard of N (K in 1..N).
struct Shard {
  int k = 1, n = 1;
  bool takes(const StudyPoint& p) const { return p.chain % n == k - 1; }
};
// Parses "K/N" (1 <= K <= N <= 10000). Throws InputError naming `where` and the rule.
Shard shard_from_string(const std::string& text, const std::string& where);

// The plain optimization case of one point: the base case with the swept values set, and, when
// `start_cst` is given (a CST JSON as fulmar writes it), that section as the baseline.
nlohmann::json point_case_json(const StudyDefinition& study, const StudyPoint& point,
                               const std::optional<nlohmann::json>& start_cst);
// Same, parsed and validated. Throws InputError naming the study value and the case's rule.
optimize::Case point_case(const StudyDefinition& study, const StudyPoint& point,
                          const std::optional<nlohmann::json>& start_cst);

// A constraint of the verified optimum is active when its value lies within
// tolerance x max(|limit|, 0.01) of its limit (on either side): relative to the limit, with a
// floor so that limits at or near zero (a cm limit of 0) are not held to an absolute zero band.
bool constraint_active(double value, double limit, double tolerance);

// "minimum t/c = 0.12" style text of a point's values.
std::string point_label(const StudyDefinition& study, const StudyPoint& point);

// Numbers as written into tables and labels: up to 6 significant digits, "" for non-finite.
std::string number_text(double v, int precision = 6);

}  // namespace fulmar::study
