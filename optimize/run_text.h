#pragma once
// Number and field formatting shared by the files of one optimization run (run_*.cpp): the
// precision rules of the CSV files, tables and report live here once.
#include <cmath>
#include <cstdio>
#include <string>

#include <nlohmann/json.hpp>

namespace fulmar::optimize::run_text {

// %g with `precision` significant digits; "" for a non-finite value (an empty CSV field).
inline std::string g6(double v, int precision = 6) {
  if (!std::isfinite(v)) return "";
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*g", precision, v);
  return buf;
}

// %f with `decimals` decimals; "-" for a non-finite value (a table cell).
inline std::string fixed(double v, int decimals) {
  if (!std::isfinite(v)) return "-";
  char buf[48];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, v);
  return buf;
}

// A CSV field, quoted (RFC 4180) when it holds a comma, quote or line break.
inline std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) q += (c == '"') ? std::string("\"\"") : std::string(1, c);
  return q + "\"";
}

}  // namespace fulmar::optimize::run_text
