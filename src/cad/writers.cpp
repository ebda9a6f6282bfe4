#include "cad/writers.h"

#include <cstdio>
#include <ctime>
#include <string>

namespace fulmar::cad {

std::string format_real(double value) {
  if (value == 0.0) value = 0.0;  // no "-0."
  char buf[40];
  std::snprintf(buf, sizeof buf, "%.15G", value);
  std::string s(buf);
  const size_t e = s.find('E');
  const std::string mantissa = s.substr(0, e);
  const std::string exponent = e == std::string::npos ? "" : s.substr(e);
  if (mantissa.find('.') == std::string::npos) return mantissa + "." + exponent;
  return s;
}

std::string utc_timestamp() {
  const std::time_t now = std::time(nullptr);
  std::tm tm{};
  gmtime_r(&now, &tm);
  char buf[32];
  std::strftime(buf, sizeof buf, "%Y-%m-%dT%H:%M:%S", &tm);
  return buf;
}

}  // namespace fulmar::cad
