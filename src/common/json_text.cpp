#include "common/json_text.h"

#include <cstdio>
#include <fstream>
#include <sstream>

#include "common/error.h"

namespace fulmar {
namespace {

// Deeper nesting than this is refused rather than risking the stack of the checker.
constexpr int kMaxDepth = 512;

// A recursive-descent checker of the JSON grammar (RFC 8259, sections 2-7) that stops at the
// first error with a message of its own. Used only when the parser has refused the text.
class Checker {
 public:
  explicit Checker(const std::string& text) : t_(text) {}

  JsonSyntaxError run() {
    try {
      space();
      if (end()) fail("the text is empty: expected a JSON value");
      value(0);
      space();
      if (!end()) fail("unexpected " + found() + " after the end of the JSON value");
    } catch (const JsonSyntaxError& e) {
      return e;
    }
    return {};
  }

 private:
  [[noreturn]] void fail(const std::string& what) const { throw JsonSyntaxError{i_, what}; }
  bool end() const { return i_ >= t_.size(); }
  char peek() const { return end() ? '\0' : t_[i_]; }
  std::string found() const {
    if (end()) return "end of the text";
    const unsigned char c = static_cast<unsigned char>(t_[i_]);
    if (c == '"') return "'\"'";
    if (c >= 0x20 && c < 0x7F) return std::string("'") + t_[i_] + "'";
    char buf[16];
    std::snprintf(buf, sizeof buf, "byte 0x%02X", c);
    return buf;
  }
  void space() {
    while (!end() && (t_[i_] == ' ' || t_[i_] == '\t' || t_[i_] == '\n' || t_[i_] == '\r')) ++i_;
  }

  void value(int depth) {
    if (depth > kMaxDepth) fail("nested more than " + std::to_string(kMaxDepth) + " levels deep");
    switch (peek()) {
      case '{':
        object(depth);
        return;
      case '[':
        array(depth);
        return;
      case '"':
        string();
        return;
      case 't':
        literal("true");
        return;
      case 'f':
        literal("false");
        return;
      case 'n':
        literal("null");
        return;
      default:
        if (peek() == '-' || (peek() >= '0' && peek() <= '9')) {
          number();
          return;
        }
        fail("expected a value (found " + found() + ")");
    }
  }

  void object(int depth) {
    ++i_;  // {
    space();
    if (peek() == '}') {
      ++i_;
      return;
    }
    for (;;) {
      if (peek() != '"') fail("expected a key in double quotes (found " + found() + ")");
      string();
      space();
      if (peek() != ':') fail("expected ':' after the key (found " + found() + ")");
      ++i_;
      space();
      value(depth + 1);
      space();
      if (peek() == '}') {
        ++i_;
        return;
      }
      if (peek() != ',') fail("expected ',' or '}' (found " + found() + ")");
      ++i_;
      space();
      if (peek() == '}') fail("a ',' must be followed by another key (no trailing comma)");
    }
  }

  void array(int depth) {
    ++i_;  // [
    space();
    if (peek() == ']') {
      ++i_;
      return;
    }
    for (;;) {
      value(depth + 1);
      space();
      if (peek() == ']') {
        ++i_;
        return;
      }
      if (peek() != ',') fail("expected ',' or ']' (found " + found() + ")");
      ++i_;
      space();
      if (peek() == ']') fail("a ',' must be followed by another value (no trailing comma)");
    }
  }

  void string() {
    ++i_;  // opening quote
    for (;;) {
      if (end()) fail("the string is not closed (missing '\"')");
      const unsigned char c = static_cast<unsigned char>(t_[i_]);
      if (c == '"') {
        ++i_;
        return;
      }
      if (c < 0x20) fail("a control character inside a string (write \\n or \\t instead)");
      if (c == '\\') {
        ++i_;
        const char e = peek();
        if (e == 'u') {
          for (int k = 1; k <= 4; ++k) {
            const char h = i_ + k < t_.size() ? t_[i_ + k] : '\0';
            const bool hex =
                (h >= '0' && h <= '9') || (h >= 'a' && h <= 'f') || (h >= 'A' && h <= 'F');
            if (!hex) fail("\\u must be followed by four hexadecimal digits");
          }
          i_ += 5;
          continue;
        }
        if (std::string("\"\\/bfnrt").find(e) == std::string::npos || e == '\0')
          fail("unknown escape \\" + std::string(1, e) + " in a string");
      }
      ++i_;
    }
  }

  void digits(const char* what) {
    if (!(peek() >= '0' && peek() <= '9')) fail(std::string("a number needs ") + what);
    while (peek() >= '0' && peek() <= '9') ++i_;
  }

  void number() {
    if (peek() == '-') ++i_;
    if (peek() == '0') {
      ++i_;
      if (peek() >= '0' && peek() <= '9') fail("a number must not start with 0 (write 7, not 07)");
    } else {
      digits("a digit after '-'");
    }
    if (peek() == '.') {
      ++i_;
      digits("a digit after the decimal point");
    }
    if (peek() == 'e' || peek() == 'E') {
      ++i_;
      if (peek() == '+' || peek() == '-') ++i_;
      digits("a digit in its exponent");
    }
  }

  void literal(const std::string& word) {
    if (t_.compare(i_, word.size(), word) != 0)
      fail("expected a value (found " + found() + "; strings need double quotes)");
    i_ += word.size();
  }

  const std::string& t_;
  std::size_t i_ = 0;
};

}  // namespace

TextPosition position_of(const std::string& text, std::size_t offset) {
  TextPosition p;
  for (std::size_t i = 0; i < offset && i < text.size(); ++i) {
    if (text[i] == '\n') {
      ++p.line;
      p.column = 1;
    } else if ((static_cast<unsigned char>(text[i]) & 0xC0) != 0x80) {
      ++p.column;
    }
  }
  return p;
}

JsonSyntaxError json_syntax_error(const std::string& text) {
  return Checker(text).run();
}

nlohmann::json parse_json_text(const std::string& text, const std::string& label) {
  try {
    return nlohmann::json::parse(text);
  } catch (const nlohmann::json::parse_error& e) {
    JsonSyntaxError s = json_syntax_error(text);
    if (s.what.empty()) {  // valid grammar, refused by the parser: text that is not UTF-8
      s.offset = e.byte > 0 ? e.byte - 1 : 0;
      s.what = "not valid JSON (text that is not UTF-8?)";
    }
    const TextPosition p = position_of(text, s.offset);
    throw InputError(label + ":" + std::to_string(p.line) + ":" + std::to_string(p.column) + ": " +
                     s.what);
  }
}

nlohmann::json read_json_file(const std::filesystem::path& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw InputError(path.string() + ": cannot read the file");
  std::stringstream ss;
  ss << in.rdbuf();
  return parse_json_text(ss.str(), path.string());
}

}  // namespace fulmar
