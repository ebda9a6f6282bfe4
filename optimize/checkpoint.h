#pragma once
// The search's checkpoint: every evaluation so far, written atomically as JSON after each
// iteration, so that a resumed search replays them in order and walks the same path.
//   {"format": "fulmar-checkpoint", "version": 3, "fingerprint": <case>, "elapsed_s": <s>,
//    "iterations": <n>, "evaluations": [<Evaluation as to_json writes it>, ...]}
// Version 2 added the constraints' ids to the records (and a full record for every evaluation),
// version 3 the shared outcome (common/status.h) of evaluations, design points and cl_max;
// versions 1 and 2 are still read and their records completed (see read_checkpoint).
#include <filesystem>
#include <string>
#include <vector>

#include "optimize/driver.h"

namespace fulmar::optimize {

struct Checkpoint {
  std::string fingerprint;              // identifies the case the evaluations belong to
  double elapsed_s = 0;                 // wall time of the search so far, s
  std::vector<Evaluation> evaluations;  // in the order they were analysed
};

// Writes `evaluations` (in this order) with the header fields atomically to `path`.
void write_checkpoint(const std::filesystem::path& path, const std::string& fingerprint,
                      double elapsed_s, int iterations,
                      const std::vector<const Evaluation*>& evaluations);

// Reads the checkpoint at `path` written for the case `fingerprint`. The outcome of a version-1
// or -2 record is derived from its "ok" and "status" text, a design point's "converged" and
// cl_max's "found". A version-1 checkpoint's records are also completed: a null record (an analysis
// that threw) becomes an empty one, a design point without results one that was "not analysed", and
// each constraint row takes its id from `constraint_ids` (same case, so the same constraints in the
// same order). Throws InputError naming the file when it is missing, not JSON (with line and
// column), of another format or version (1 to 3), of another case (fingerprint), or when a key is
// missing or mistyped (with its JSON path, e.g. "/evaluations/3/detail/panels").
Checkpoint read_checkpoint(const std::filesystem::path& path, const std::string& fingerprint,
                           const std::vector<std::string>& constraint_ids);

}  // namespace fulmar::optimize
