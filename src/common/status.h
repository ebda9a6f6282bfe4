#pragma once
// One vocabulary for how a computation ended, shared by the flow solver, the angle marches, the
// cl_max search, the analysis of one design and the optimizer's search, and written to files in
// one way (to_json / outcome_from_json, and the names below).
#include <string>

#include <nlohmann/json.hpp>

#include "common/enum_names.h"

namespace fulmar {

enum class Status {
  // "converged": met its own stopping rule (the solver's residual below its tolerance, NLopt's
  // xtol/ftol, a bracketed maximum refined to its width, every analysis of a design converged).
  kConverged,
  // "not_converged": ran out of iterations or budget with the measured value still above its
  // tolerance; the last values exist but are not trusted.
  kNotConverged,
  // "failed": broke down (a singular system, a non-finite value, no bracket, an analysis that
  // failed); there are no values to use.
  kFailed,
  // "stopped": ended early by a limit the user set (evaluation budget, time limit) or a signal.
  kStopped,
};

// The names of Status in files: "converged", "not_converged", "failed", "stopped".
const EnumNames<Status>& status_names();
std::string to_string(Status status);
// Throws InputError "<where>: unknown status "text" (one of converged, not_converged, ...)".
Status status_from_string(const std::string& text, const std::string& where);

// How a computation ended and why, in words ("residual 3e-7 above the tolerance 1e-9 after 30
// iterations"; may be empty when it converged).
struct Outcome {
  Status status = Status::kFailed;
  std::string reason;
  // Its values can be used as results: it converged.
  bool usable() const { return status == Status::kConverged; }
  bool operator==(const Outcome&) const = default;
};

// {"status": <name>, "reason": <text>}: the one JSON form of an Outcome (results that already
// had other keys for it keep writing those too, derived from the status).
nlohmann::json to_json(const Outcome& outcome);
// Reads the two keys of `j`; throws InputError "<where>/status: missing" (or "/reason"), or
// for an unknown status name.
Outcome outcome_from_json(const nlohmann::json& j, const std::string& where);

}  // namespace fulmar
