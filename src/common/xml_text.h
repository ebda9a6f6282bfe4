#pragma once
// Text for XML-based outputs (the SVG plots and drawings).
#include <string>

namespace fulmar {

// `text` with the four XML special characters < > & " replaced by entities, safe inside element
// content and double-quoted attribute values.
std::string xml_escaped(const std::string& text);

}  // namespace fulmar
