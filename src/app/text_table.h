#pragma once
// fulmar's text tables: columns in named groups separated by " | ", a group line over the column
// names, a rule under them, and cells already formatted (common/number_text.h: "n/a" for a value
// that is not finite). Used by `fulmar polar` and `fulmar analyze`.
#include <string>
#include <vector>

#include "common/number_text.h"

namespace fulmar::app {

struct TextColumn {
  std::string group;  // columns with the same group next to each other share one title
  std::string name;
  int width = 8;
  bool left = false;  // left-aligned (text) instead of right-aligned (numbers)
};

class TextTable {
 public:
  explicit TextTable(std::vector<TextColumn> columns) : columns_(std::move(columns)) {}

  // One row: one cell per column.
  void add_row(std::vector<std::string> cells) { rows_.push_back(std::move(cells)); }

  // The table, each line starting with `indent`.
  std::string str(const std::string& indent = "  ") const {
    const std::size_t n = columns_.size();
    auto boundary = [&](std::size_t i) {  // column i starts a new group
      return i > 0 && columns_[i].group != columns_[i - 1].group;
    };
    std::string groups, names, rule;
    for (std::size_t i = 0; i < n;) {
      std::size_t j = i;
      int span = 0;
      while (j < n && (j == i || !boundary(j))) span += columns_[j].width + (j > i ? 1 : 0), ++j;
      if (i > 0) groups += " | ";
      groups += padded(columns_[i].group, span, true);
      i = j;
    }
    for (std::size_t i = 0; i < n; ++i) {
      const std::string sep = i == 0 ? "" : (boundary(i) ? " | " : " ");
      names += sep + padded(columns_[i].name, columns_[i].width, columns_[i].left);
      rule += (i == 0 ? "" : (boundary(i) ? "-+-" : "-")) +
              std::string(static_cast<std::size_t>(columns_[i].width), '-');
    }
    std::string out =
        indent + trimmed(groups) + "\n" + indent + trimmed(names) + "\n" + indent + rule + "\n";
    for (const auto& row : rows_) {
      std::string line;
      for (std::size_t i = 0; i < n; ++i) {
        const std::string sep = i == 0 ? "" : (boundary(i) ? " | " : " ");
        line += sep + padded(i < row.size() ? row[i] : "", columns_[i].width, columns_[i].left);
      }
      out += indent + trimmed(line) + "\n";
    }
    return out;
  }

 private:
  static std::string trimmed(std::string s) {
    while (!s.empty() && s.back() == ' ') s.pop_back();
    return s;
  }

  std::vector<TextColumn> columns_;
  std::vector<std::vector<std::string>> rows_;
};

}  // namespace fulmar::app
