#include "common/rule_check.h"

#include "common/number_text.h"

namespace fulmar {

std::string stated_rule(const std::string& message) {
  const auto at = message.find("must");
  return at == std::string::npos ? message : message.substr(at);
}

void require_rule(bool ok, const std::string& subject, double value, const std::string& rule) {
  if (!ok) throw InputError(subject + " = " + general_text(value) + ": " + rule);
}

std::string placed_rule(const std::string& place, const std::string& value,
                        const std::string& message) {
  // A message without "must" states the value itself ("altitude 25000 m is outside ...").
  if (message.find("must") == std::string::npos) return place + ": " + message;
  std::string text = place + ": " + stated_rule(message);
  if (!value.empty()) text += " (got " + value + ")";
  return text;
}

}  // namespace fulmar
