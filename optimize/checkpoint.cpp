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
constexpr int kCheckpointVersion = 2;

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
    const bool v1 = j.at("version") == 1;
    if (j.at("format") != kCheckpointFormat || (j.at("version") != kCheckpointVersion && !v1))
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
      c.evaluations.push_back(
          evaluation_from_json(e, file + ": /evaluations/" + std::to_string(i)));
    }
  } catch (const json::exception& e) {
    throw InputError(file + ": damaged checkpoint (" + e.what() + ")");
  }
  return c;
}

}  // namespace fulmar::optimize
