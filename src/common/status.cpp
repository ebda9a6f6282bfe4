#include "common/status.h"

#include "common/error.h"

namespace fulmar {

const EnumNames<Status>& status_names() {
  static const EnumNames<Status> names{{Status::kConverged, "converged"},
                                       {Status::kNotConverged, "not_converged"},
                                       {Status::kFailed, "failed"},
                                       {Status::kStopped, "stopped"}};
  return names;
}

std::string to_string(Status status) {
  return status_names().name(status);
}

Status status_from_string(const std::string& text, const std::string& where) {
  return status_names().parse(text, where, "status");
}

nlohmann::json to_json(const Outcome& outcome) {
  return nlohmann::json{{"status", to_string(outcome.status)}, {"reason", outcome.reason}};
}

Outcome outcome_from_json(const nlohmann::json& j, const std::string& where) {
  if (!j.is_object()) throw InputError(where + ": not an object");
  auto text = [&](const char* key) {
    if (!j.contains(key)) throw InputError(where + "/" + key + ": missing");
    if (!j.at(key).is_string()) throw InputError(where + "/" + key + ": not a text");
    return j.at(key).get<std::string>();
  };
  Outcome o;
  o.status = status_from_string(text("status"), where + "/status");
  o.reason = text("reason");
  return o;
}

}  // namespace fulmar
