#include "optimize/case_reader.h"

#include <cmath>

namespace fulmar::optimize::case_detail {

void Reader::fail_at(const std::string& path, const std::string& rule) const {
  throw InputError(*label_ + ": " + (path.empty() ? "/" : path) + ": " + rule);
}

void Reader::expect_object() const {
  if (!node_->is_object()) fail("must be an object (got " + std::string(node_->type_name()) + ")");
}

bool Reader::has(const std::string& key) {
  expect_object();
  return node_->contains(key);
}

Reader Reader::child(const std::string& key) {
  expect_object();
  if (!node_->contains(key)) fail_at(path_ + "/" + key, "missing required field");
  used_.insert(key);
  return Reader(node_->at(key), path_ + "/" + key, label_);
}

std::optional<Reader> Reader::optional_child(const std::string& key) {
  expect_object();
  if (!node_->contains(key) || node_->at(key).is_null()) {
    used_.insert(key);
    return std::nullopt;
  }
  return child(key);
}

void Reader::finish() const {
  for (auto it = node_->begin(); it != node_->end(); ++it) {
    if (!used_.count(it.key())) fail_at(path_ + "/" + it.key(), "unknown key");
  }
}

double Reader::number() const {
  if (!node_->is_number()) fail("must be a number (got " + std::string(node_->type_name()) + ")");
  const double v = node_->get<double>();
  if (!std::isfinite(v)) fail("must be a finite number");
  return v;
}

int Reader::integer() const {
  if (!node_->is_number_integer())
    fail("must be an integer (got " + std::string(node_->type_name()) + ")");
  return node_->get<int>();
}

std::string Reader::string() const {
  if (!node_->is_string()) fail("must be a string (got " + std::string(node_->type_name()) + ")");
  return node_->get<std::string>();
}

bool Reader::boolean() const {
  if (!node_->is_boolean())
    fail("must be true or false (got " + std::string(node_->type_name()) + ")");
  return node_->get<bool>();
}

std::vector<Reader> Reader::array() const {
  if (!node_->is_array()) fail("must be an array (got " + std::string(node_->type_name()) + ")");
  std::vector<Reader> items;
  for (size_t i = 0; i < node_->size(); ++i)
    items.emplace_back((*node_)[i], path_ + "/" + std::to_string(i), label_);
  return items;
}

double Reader::positive() const {
  const double v = number();
  if (!(v > 0)) fail("must be > 0 (got " + general_text(v) + ")");
  return v;
}

double Reader::in_range(double lo, double hi, bool lo_open, bool hi_open) const {
  const double v = number();
  const bool ok = (lo_open ? v > lo : v >= lo) && (hi_open ? v < hi : v <= hi);
  if (!ok)
    fail("must be in " + std::string(lo_open ? "(" : "[") + general_text(lo) + ", " +
         general_text(hi) + (hi_open ? ")" : "]") + " (got " + general_text(v) + ")");
  return v;
}

void Reader::fail_field(const std::string& prefix, const std::string& m) const {
  const auto eq = m.find(" = ");
  if (m.rfind(prefix + ".", 0) != 0 || eq == std::string::npos) fail(m);
  std::string field = m.substr(prefix.size() + 1, eq - prefix.size() - 1);
  for (char& c : field)
    if (c == '.') c = '/';
  const auto colon = m.find(": ", eq);
  const std::string got = m.substr(eq + 3, colon == std::string::npos ? 0 : colon - eq - 3);
  fail_at(path_ + "/" + field, stated_rule(m) + " (got " + got + ")");
}

}  // namespace fulmar::optimize::case_detail
