#pragma once
// One source of rules: each allowed range is written once, in the Validate() of the options it
// belongs to (viscous::ViscousOptions, InviscidOptions, PanellingOptions, PolarOptions, the
// flight functions, the optimizer's options). The command line and the case files do not repeat
// the numbers: they fill those options, call Validate() and re-word its InputError with the place
// the value came from (an option such as "--ncrit" or a JSON path such as
// "/transition/ncrit"). The rule text is taken from the Validate message: its words from "must"
// on ("must be in [0.5, 20]"), or the whole message when it has no "must".
#include <string>
#include <utility>

#include "common/error.h"

namespace fulmar {

// For Validate(): throws InputError "<subject> = <value>: <rule>" (the value as general_text)
// unless `ok`. `subject` names the options and the field ("polar options: alpha_step").
void require_rule(bool ok, const std::string& subject, double value, const std::string& rule);

// The rule a Validate() message states: the text from the first "must" on, or the whole message.
std::string stated_rule(const std::string& message);

// "<place>: <rule> (got <value>)"; `value` empty: "<place>: <rule>"; a message without "must"
// (one that states the value itself): "<place>: <message>".
std::string placed_rule(const std::string& place, const std::string& value,
                        const std::string& message);

// Runs `validate` (a callable that throws InputError when a rule is broken) and re-throws its
// error as placed_rule(place, value, message).
template <class Validate>
void check_at(const std::string& place, const std::string& value, Validate&& validate) {
  try {
    std::forward<Validate>(validate)();
  } catch (const InputError& e) {
    throw InputError(placed_rule(place, value, e.what()));
  }
}

// The rule that `validate_bad` states when it is called with a value no rule accepts (NaN for a
// range of reals), for help texts that must not repeat the numbers; empty when it throws nothing.
template <class Validate>
std::string rule_of(Validate&& validate_bad) {
  try {
    std::forward<Validate>(validate_bad)();
  } catch (const InputError& e) {
    return stated_rule(e.what());
  }
  return {};
}

}  // namespace fulmar
