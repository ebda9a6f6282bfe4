#include "optimize/checkpoint.h"

#include <utility>

#include <nlohmann/json.hpp>

#include "common/atomic_file.h"
#include "common/error.h"
#include "common/json_text.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;

constexpr const char* kCheckpointFormat = "fulmar-checkpoint";
constexpr int kCheckpointVersion = 3;

// A version-1 record made whole (see read_checkpoint).
json upgrade_v1_detail(json d, const std::vector<std::string>& ids) {
  if (d.is_null()) return to_json(EvaluationRecord{});
  PointResult none;
  none.reason = "not analysed";
  const json not_analysed = to_json(none);
  if (d.contains("points"))
    for (auto& p : d["points"])
      if (p.is_object() && !p.contains("converged")) p.update(not_analysed);
  if (d.contains("constraints") && d["constraints"].is_array())
    for (size_t k = 0; k < d["constraints"].size(); ++k)
      if (!d["constraints"][k].contains("id") && k < ids.size()) d["constraints"][k]["id"] = ids[k];
  return d;
}

// A record of version 1 or 2 given the shared outcome of version 3, derived from the words those
// versions used: an evaluation's "ok" and "status" text (the reason when not ok), a design
// point's "converged" (not_converged when false: the values exist) and cl_max's "found" (failed
// when false: no maximum). Records without those keys are left for the reader to refuse.
json upgrade_v2_evaluation(json e) {
  if (!e.is_object()) return e;
  if (e.contains("ok") && e["ok"].is_boolean() && e.contains("status") && e["status"].is_string()) {
    const bool ok = e["ok"].get<bool>();
    e["outcome"] = to_json(Outcome{ok ? Status::kConverged : Status::kFailed,
                                   ok ? std::string() : e["status"].get<std::string>()});
  }
  if (!e.contains("detail") || !e["detail"].is_object()) return e;
  json& d = e["detail"];
  if (d.contains("points") && d["points"].is_array())
    for (json& p : d["points"])
      if (p.is_object() && !p.contains("status") && p.contains("converged") &&
          p["converged"].is_boolean())
        p["status"] =
            to_string(p["converged"].get<bool>() ? Status::kConverged : Status::kNotConverged);
  if (d.contains("cl_max") && d["cl_max"].is_object()) {
    json& c = d["cl_max"];
    if (!c.contains("status") && c.contains("found") && c["found"].is_boolean())
      c["status"] = to_string(c["found"].get<bool>() ? Status::kConverged : Status::kFailed);
  }
  return e;
}

}  // namespace

void write_checkpoint(const std::filesystem::path& path, const std::string& fingerprint,
                      double elapsed_s, int iterations,
                      const std::vector<const Evaluation*>& evaluations) {
  json evals = json::array();
  for (const Evaluation* e : evaluations) evals.push_back(to_json(*e));
  json j{{"format", kCheckpointFormat}, {"version", kCheckpointVersion},
         {"fingerprint", fingerprint},  {"elapsed_s", elapsed_s},
         {"iterations", iterations},    {"evaluations", std::move(evals)}};
  write_file_atomically(path, j.dump() + "\n");
}

Checkpoint read_checkpoint(const std::filesystem::path& path, const std::string& fingerprint,
                           const std::vector<std::string>& constraint_ids) {
  const std::string file = path.string();
  std::error_code ec;
  if (!std::filesystem::is_regular_file(path, ec))
    throw InputError(file + ": no checkpoint to resume from (run without --resume first)");
  const json j = read_json_file(path);
  Checkpoint c;
  try {
    const json& version = j.at("version");
    const bool v1 = version == 1, v2 = version == 2;
    if (j.at("format") != kCheckpointFormat || (version != kCheckpointVersion && !v1 && !v2))
      throw InputError(file + ": not a fulmar checkpoint of version " +
                       std::to_string(kCheckpointVersion));
    c.fingerprint = j.at("fingerprint").get<std::string>();
    if (c.fingerprint != fingerprint)
      throw InputError(file +
                       ": the checkpoint belongs to another case (or the case file changed); "
                       "run without --resume to start afresh");
    c.elapsed_s = j.at("elapsed_s").get<double>();
    const json& evals = j.at("evaluations");
    for (size_t i = 0; i < evals.size(); ++i) {
      json e = evals[i];
      if (v1 && e.is_object() && e.contains("detail"))
        e["detail"] = upgrade_v1_detail(e["detail"], constraint_ids);
      if (v1 || v2) e = upgrade_v2_evaluation(std::move(e));
      c.evaluations.push_back(
          evaluation_from_json(e, file + ": /evaluations/" + std::to_string(i)));
    }
  } catch (const json::exception& e) {
    throw InputError(file + ": damaged checkpoint (" + e.what() + ")");
  }
  return c;
}

}  // namespace fulmar::optimize
