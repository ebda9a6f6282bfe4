#pragma once
// One table per enumeration of the names it has in files and on the command line, so that
// to-string and from-string cannot disagree and the list in an error message is always complete.
#include <cstddef>
#include <initializer_list>
#include <optional>
#include <string>
#include <utility>
#include <vector>

#include "common/error.h"

namespace fulmar {

template <class Enum>
class EnumNames {
 public:
  EnumNames(std::initializer_list<std::pair<Enum, const char*>> table) : table_(table) {}

  // The name of `value` (the first entry that has it; "" when the table lacks it).
  std::string name(Enum value) const {
    for (const auto& [v, n] : table_)
      if (v == value) return n;
    return {};
  }

  // The value named `text` (exact, case-sensitive match), or nothing: for callers that word
  // their own message.
  std::optional<Enum> find(const std::string& text) const {
    for (const auto& [v, n] : table_)
      if (text == n) return v;
    return std::nullopt;
  }

  // The value named `text`; throws InputError "<where>: unknown <what> "text" (one of a, b, c)".
  Enum parse(const std::string& text, const std::string& where, const std::string& what) const {
    if (const std::optional<Enum> v = find(text)) return *v;
    throw InputError(where + ": unknown " + what + " \"" + text + "\" (one of " + list() + ")");
  }

  // "a, b, c": every name in table order.
  std::string list() const {
    std::string out;
    for (std::size_t i = 0; i < table_.size(); ++i)
      out += (i ? ", " : "") + std::string(table_[i].second);
    return out;
  }

  // Every name in table order (e.g. for CLI11's IsMember check).
  std::vector<std::string> names() const {
    std::vector<std::string> out;
    for (const auto& entry : table_) out.emplace_back(entry.second);
    return out;
  }

 private:
  std::vector<std::pair<Enum, const char*>> table_;
};

}  // namespace fulmar
