#include "common/json_text.h"

#include <gtest/gtest.h>

#include "common/error.h"

namespace fulmar {
namespace {

std::string error_of(const std::string& text) {
  try {
    parse_json_text(text, "case.json");
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}

TEST(JsonText, ValidTextParses) {
  const auto j = parse_json_text(R"({"a": [1, -2.5e3, true, null, "x\n\u00b0"]})", "x");
  EXPECT_EQ(j["a"][1].get<double>(), -2500.0);
  EXPECT_EQ(json_syntax_error(R"({"a": [1, {"b": false}]})").what, "");
}

TEST(JsonText, PositionCountsLinesAndCharacters) {
  const std::string t = "ab\n\xC2\xB0x";  // the degree sign is two bytes, one character
  EXPECT_EQ(position_of(t, 0).line, 1);
  EXPECT_EQ(position_of(t, 4).line, 2);
  EXPECT_EQ(position_of(t, 5).column, 2);
}

TEST(JsonText, MissingCommaNamesLineColumnAndWhatWasExpected) {
  EXPECT_EQ(error_of("{\n  \"name\": \"x\"\n  \"mass\": 1\n}\n"),
            "case.json:3:3: expected ',' or '}' (found '\"')");
  EXPECT_EQ(error_of("[1 2]"), "case.json:1:4: expected ',' or ']' (found '2')");
}

TEST(JsonText, EachKindOfErrorInFulmarsWords) {
  EXPECT_EQ(error_of(""), "case.json:1:1: the text is empty: expected a JSON value");
  EXPECT_EQ(error_of("{\"a\" 1}"), "case.json:1:6: expected ':' after the key (found '1')");
  EXPECT_EQ(error_of("{a: 1}"), "case.json:1:2: expected a key in double quotes (found 'a')");
  EXPECT_EQ(error_of("{\"a\": 1,}"),
            "case.json:1:9: a ',' must be followed by another key (no trailing comma)");
  EXPECT_EQ(error_of("[1,]"),
            "case.json:1:4: a ',' must be followed by another value (no trailing comma)");
  EXPECT_EQ(error_of("{\"a\": \"x"), "case.json:1:9: the string is not closed (missing '\"')");
  EXPECT_EQ(error_of("{\"a\": 07}"),
            "case.json:1:8: a number must not start with 0 (write 7, not 07)");
  EXPECT_EQ(error_of("{\"a\": 1.}"),
            "case.json:1:9: a number needs a digit after the decimal point");
  EXPECT_EQ(error_of("{\"a\": yes}"), "case.json:1:7: expected a value (found 'y')");
  EXPECT_EQ(error_of("{\"a\": nul}"),
            "case.json:1:7: expected a value (found 'n'; strings need double quotes)");
  EXPECT_EQ(error_of("{} x"), "case.json:1:4: unexpected 'x' after the end of the JSON value");
  EXPECT_EQ(error_of("{\"a\": \"\\q\"}"), "case.json:1:9: unknown escape \\q in a string");
  EXPECT_EQ(error_of("{\"a\": "), "case.json:1:7: expected a value (found end of the text)");
}

TEST(JsonText, NoParserLibraryTextReachesTheMessage) {
  for (const char* bad : {"{", "[1,,2]", "{\"a\":}", "\"\xFF\"", "tru", "{\"a\":1}}"}) {
    const std::string m = error_of(bad);
    EXPECT_FALSE(m.empty()) << bad;
    EXPECT_EQ(m.find("parse_error"), std::string::npos) << m;
    EXPECT_EQ(m.find("syntax error"), std::string::npos) << m;
    EXPECT_EQ(m.rfind("case.json:1:", 0), 0u) << m;
  }
}

TEST(JsonText, UnreadableFileIsAnInputError) {
  EXPECT_THROW(read_json_file("/nonexistent/dir/case.json"), InputError);
}

}  // namespace
}  // namespace fulmar
