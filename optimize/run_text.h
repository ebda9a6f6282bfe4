#pragma once
// Number and field formatting shared by the files of one optimization run (run_*.cpp): the
// precision rules of the CSV files, tables and report live here once; the rule for values that
// are not finite is common/number_text.h's.
#include <cmath>
#include <string>

#include "common/number_text.h"

namespace fulmar::optimize::run_text {

// %g with `precision` significant digits; "" for a non-finite value (an empty CSV field).
inline std::string g6(double v, int precision = 6) {
  return std::isfinite(v) ? general_text(v, precision) : std::string();
}

// %f with `decimals` decimals; "n/a" for a non-finite value (a table cell).
inline std::string fixed(double v, int decimals) {
  return fixed_text(v, decimals);
}

// A CSV field, quoted (RFC 4180) when it holds a comma, quote or line break.
inline std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) q += (c == '"') ? std::string("\"\"") : std::string(1, c);
  return q + "\"";
}

}  // namespace fulmar::optimize::run_text
