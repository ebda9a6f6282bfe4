#pragma once
// Numbers as fulmar writes them, with one rule for values that are not finite (NaN, +-inf: a
// quantity that could not be computed, e.g. cl_max when cl still rises at the end of a polar):
//   text tables and messages: "n/a"
//   CSV: an empty field
//   JSON: null
// so that no output ever carries "nan" or "inf".
#include <nlohmann/json.hpp>
#include <string>

namespace fulmar {

// The text written for a value that is not finite.
inline constexpr const char* kNotAvailable = "n/a";

// `value` with `decimals` digits after the point ("%.*f"; a value that rounds to zero has no
// sign); "n/a" when not finite.
std::string fixed_text(double value, int decimals);

// `value` with `digits` significant digits, as "%.*g" writes it (2e+06); "n/a" when not finite.
std::string general_text(double value, int digits = 6);

// `value` for a CSV field: 10 significant digits, empty when not finite.
std::string csv_number(double value);

// `value` for a JSON document: the number, or null when not finite.
nlohmann::json json_number(double value);

// `text` right-aligned (left-aligned when `left`) in a field of `width` characters (counted in
// UTF-8 code points, so "—" or "°" count as one); longer text is kept whole.
std::string padded(const std::string& text, int width, bool left = false);

}  // namespace fulmar
