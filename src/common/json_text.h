#pragma once
// Reading JSON (case files, study files, CST shapes, checkpoints) with errors in fulmar's words:
// "case.json:12:5: expected ',' or '}' (found '\"')": file, line and column (1-based; the column
// counts characters, not bytes), then what is wrong. No parser library text reaches the user.
#include <cstddef>
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>

namespace fulmar {

// A place in a text: 1-based line and column (column in UTF-8 characters).
struct TextPosition {
  int line = 1;
  int column = 1;
};

// The line and column of byte `offset` of `text` (offsets past the end give the end's place).
TextPosition position_of(const std::string& text, std::size_t offset);

// The first syntax error of `text` as JSON (RFC 8259): its byte offset and what is wrong, or an
// empty `what` when the text is valid JSON.
struct JsonSyntaxError {
  std::size_t offset = 0;
  std::string what;
};
JsonSyntaxError json_syntax_error(const std::string& text);

// Parses `text`; throws InputError "<label>:<line>:<column>: <what is wrong>" when it is not
// valid JSON.
nlohmann::json parse_json_text(const std::string& text, const std::string& label);

// Reads and parses the file at `path` (label: the path as given); throws InputError
// "<path>: cannot read the file" when it cannot be read.
nlohmann::json read_json_file(const std::filesystem::path& path);

}  // namespace fulmar
