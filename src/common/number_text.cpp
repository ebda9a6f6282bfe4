#include "common/number_text.h"

#include <cmath>
#include <cstdio>
#include <sstream>

namespace fulmar {

std::string fixed_text(double value, int decimals) {
  if (!std::isfinite(value)) return kNotAvailable;
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*f", decimals, value);
  // A value that rounds to zero is written without a sign ("0.0000", not "-0.0000").
  if (buf[0] == '-' && std::string(buf + 1).find_first_not_of("0.") == std::string::npos)
    return buf + 1;
  return buf;
}

std::string general_text(double value, int digits) {
  if (!std::isfinite(value)) return kNotAvailable;
  char buf[64];
  std::snprintf(buf, sizeof buf, "%.*g", digits, value);
  return buf;
}

std::string csv_number(double value) {
  if (!std::isfinite(value)) return {};
  std::ostringstream s;
  s.precision(10);
  s << value;
  return s.str();
}

nlohmann::json json_number(double value) {
  if (!std::isfinite(value)) return nullptr;
  return value;
}

std::string padded(const std::string& text, int width, bool left) {
  int length = 0;
  for (unsigned char c : text) length += (c & 0xC0) != 0x80;  // UTF-8 lead bytes
  if (length >= width) return text;
  const std::string fill(static_cast<std::size_t>(width - length), ' ');
  return left ? text + fill : fill + text;
}

}  // namespace fulmar
