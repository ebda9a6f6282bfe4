#pragma once
// Reading one JSON node of a case file with errors that name the file, the JSON pointer path and
// the rule: "case.json: /design_points/0/speed: must be > 0 (got -3)". Object readers record the
// keys they consume so that a key no reader asked for is reported as unknown. Internal to the
// case-file reader (optimize/case_*.cpp).
#include <nlohmann/json.hpp>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "common/error.h"
#include "common/number_text.h"
#include "common/rule_check.h"

namespace fulmar::optimize::case_detail {

// A JSON node with its pointer path ("" for the root) and the label of its document (the file
// name; the pointer must outlive the reader and its children).
class Reader {
 public:
  Reader(const nlohmann::json& node, std::string path, const std::string* label)
      : node_(&node), path_(std::move(path)), label_(label) {}

  // Throw InputError "<label>: <path>: <rule>" (the root's path shown as "/").
  [[noreturn]] void fail(const std::string& rule) const { fail_at(path_, rule); }
  [[noreturn]] void fail_at(const std::string& path, const std::string& rule) const;
  const std::string& path() const { return path_; }
  std::string where() const { return *label_ + ": " + path_; }
  const nlohmann::json& node() const { return *node_; }

  // Object access; each fails unless this node is an object.
  void expect_object() const;
  bool has(const std::string& key);
  // The member `key`; fails with "missing required field" when absent.
  Reader child(const std::string& key);
  // The member `key`, or nothing when absent or null.
  std::optional<Reader> optional_child(const std::string& key);
  // Reports the first key of this object that no reader asked for.
  void finish() const;

  // Typed values; each fails naming the type found. number() also rejects non-finite values.
  double number() const;
  int integer() const;
  std::string string() const;
  bool boolean() const;
  std::vector<Reader> array() const;

  // Range checks that name the rule: > 0, and within lo..hi (each end open or closed).
  double positive() const;
  double in_range(double lo, double hi, bool lo_open, bool hi_open) const;

  // The number here, accepted by `rule` (a callable taking the value that throws InputError, as
  // a Validate() does); its error is re-worded with this path and the value.
  template <class Rule>
  double number_by(Rule&& rule) const {
    const double v = number();
    try {
      rule(v);
    } catch (const InputError& e) {
      throw InputError(*label_ + ": " +
                       placed_rule(path_.empty() ? "/" : path_, general_text(v), e.what()));
    }
    return v;
  }

  // Runs `validate` on options read from this object; its InputError "<prefix>.<field> = value:
  // rule" is reported at this object's path / <field> (dots become slashes).
  template <class Validate>
  void validate_fields(const std::string& prefix, Validate&& validate) const {
    try {
      validate();
    } catch (const InputError& e) {
      fail_field(prefix, e.what());
    }
  }

 private:
  [[noreturn]] void fail_field(const std::string& prefix, const std::string& message) const;

  const nlohmann::json* node_;
  std::string path_;
  const std::string* label_;
  std::set<std::string> used_;
};

}  // namespace fulmar::optimize::case_detail
