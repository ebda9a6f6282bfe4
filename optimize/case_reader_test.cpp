// The JSON node reader of case files: every failure names file, path and rule.
#include "optimize/case_reader.h"

#include <gtest/gtest.h>

#include <functional>

namespace fulmar::optimize::case_detail {
namespace {

using nlohmann::json;

std::string error_of(const std::function<void()>& f) {
  try {
    f();
  } catch (const InputError& e) {
    return e.what();
  }
  return "no error";
}

const std::string kLabel = "c.json";

TEST(CaseReader, TypesAndMissingFieldsAreNamedAtTheirPath) {
  const json doc = json::parse(R"({"a": {"n": "x", "k": [1, 2.5]}})");
  Reader root(doc, "", &kLabel);
  EXPECT_EQ(error_of([&] { root.child("a").child("n").number(); }),
            "c.json: /a/n: must be a number (got string)");
  EXPECT_EQ(error_of([&] { root.child("a").child("k").array()[1].integer(); }),
            "c.json: /a/k/1: must be an integer (got number)");
  EXPECT_EQ(error_of([&] { root.child("z"); }), "c.json: /z: missing required field");
  EXPECT_EQ(error_of([&] { Reader(doc, "", &kLabel).child("a").child("n").child("q"); }),
            "c.json: /a/n: must be an object (got string)");
}

TEST(CaseReader, UnreadKeysAreReportedAsUnknown) {
  const json doc = json::parse(R"({"a": 1, "b": null, "c": 2})");
  Reader r(doc, "", &kLabel);
  EXPECT_DOUBLE_EQ(r.child("a").number(), 1.0);
  EXPECT_FALSE(r.optional_child("b").has_value());
  EXPECT_EQ(error_of([&] { r.finish(); }), "c.json: /c: unknown key");
  r.child("c");
  EXPECT_NO_THROW(r.finish());
}

TEST(CaseReader, RangesStateTheirEnds) {
  const json doc = json::parse(R"({"v": 0.5})");
  Reader r(doc, "", &kLabel);
  EXPECT_DOUBLE_EQ(r.child("v").in_range(0, 0.5, true, false), 0.5);
  EXPECT_EQ(error_of([&] { Reader(doc, "", &kLabel).child("v").in_range(0, 0.5, false, true); }),
            "c.json: /v: must be in [0, 0.5) (got 0.5)");
  const json neg = json::parse(R"({"v": -2})");
  EXPECT_EQ(error_of([&] { Reader(neg, "", &kLabel).child("v").positive(); }),
            "c.json: /v: must be > 0 (got -2)");
}

TEST(CaseReader, ValidateMessagesMoveToTheFieldPath) {
  const json doc = json::parse(R"({"o": {}})");
  Reader r(doc, "", &kLabel);
  Reader o = r.child("o");
  EXPECT_EQ(error_of([&] {
              o.validate_fields("opt", [] { throw InputError("opt.sub.tol = 3: must be < 1"); });
            }),
            "c.json: /o/sub/tol: must be < 1 (got 3)");
}

}  // namespace
}  // namespace fulmar::optimize::case_detail
