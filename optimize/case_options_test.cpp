// The optimizer, analysis and output settings of a case file.
#include <gtest/gtest.h>

#include "optimize/testing/case_json.h"

namespace fulmar::optimize {
namespace {

using nlohmann::json;
using testing::error_of;
using testing::good_case;
using testing::parse;

TEST(CaseOptions, OptimizerAndAnalysisRangesAreTheirValidates) {
  json j = good_case();
  j["optimizer"] = {{"xtol_rel", 1.5}};
  EXPECT_EQ(error_of(j), "case.json: /optimizer/xtol_rel: must be in [0, 1) (got 1.5)");
  j = good_case();
  j["analysis"] = {{"polar_alpha", {{"min", -40}, {"max", 10}}}};
  EXPECT_EQ(error_of(j),
            "case.json: /analysis/polar_alpha/min: must be in [-30, 30] deg (got -40)");
  AnalysisOptions a;
  a.search_cl_max_margin = 0.3;
  EXPECT_THROW(a.Validate(), InputError);
}

TEST(CaseOptions, OptionsValidateNameTheField) {
  OptimizerOptions o;
  o.max_evaluations = 0;
  EXPECT_THROW(o.Validate(), InputError);
  AnalysisOptions a;
  a.verify_panels = 100;
  try {
    a.Validate();
    FAIL();
  } catch (const InputError& e) {
    EXPECT_NE(std::string(e.what()).find("analysis.verify_panels"), std::string::npos);
  }
}

TEST(CaseOptions, AlgorithmNamesRoundTrip) {
  for (Algorithm a : {Algorithm::slsqp, Algorithm::mma, Algorithm::cobyla, Algorithm::isres,
                      Algorithm::multistart})
    EXPECT_EQ(algorithm_from_string(to_string(a), "x"), a);
  json j = good_case();
  j["optimizer"] = {{"algorithm", "simplex"}};
  EXPECT_EQ(error_of(j),
            "case.json: /optimizer/algorithm: unknown algorithm \"simplex\" (one of "
            "slsqp, mma, cobyla, isres, multistart)");
}

TEST(CaseOptions, CadOutputsNeedKnownFormatsAndAChord) {
  json j = good_case();
  j["outputs"] = {{"cad", {{"formats", {"iges", "obj"}}}}};
  EXPECT_EQ(error_of(j).rfind("case.json: /outputs/cad/formats/1: ", 0), 0u) << error_of(j);
  j["outputs"] = {{"cad", {{"formats", {"step"}}}}};
  j.erase("airplane");
  j["design_points"] = {{{"cl", 0.5}, {"reynolds", 1e6}}};
  j.erase("landing");
  j["constraints"].erase("cl_max");
  EXPECT_EQ(error_of(j),
            "case.json: /outputs/cad/chord: missing required field (no airplane "
            "gives the chord for the CAD files)");
}

}  // namespace
}  // namespace fulmar::optimize
