#include "geometry/cst.h"

#include <gtest/gtest.h>

#include <cmath>

#include "common/error.h"
#include "geometry/metrics.h"
#include "geometry/naca.h"

namespace fulmar {
namespace {

CstShape cambered_shape() {
  CstShape s;
  s.upper.resize(7);
  s.lower.resize(5);
  s.upper << 0.20, 0.18, 0.22, 0.15, 0.20, 0.12, 0.15;
  s.lower << -0.11, -0.05, -0.12, 0.02, -0.05;
  s.te_upper = 0.002;
  s.te_lower = -0.001;
  return s;
}

TEST(Cst, TrailingEdgeHeightsAndNose) {
  const CstShape s = cambered_shape();
  EXPECT_DOUBLE_EQ(cst_upper_y(s, 1.0), 0.002);  // the class function vanishes at x = 1
  EXPECT_DOUBLE_EQ(cst_lower_y(s, 1.0), -0.001);
  EXPECT_DOUBLE_EQ(cst_upper_y(s, 0.0), 0.0);
  EXPECT_GT(cst_upper_y(s, 0.3), 0.0);
  EXPECT_LT(cst_lower_y(s, 0.3), 0.0);
}

TEST(Cst, UnitShapeFunctionIsTheClassFunction) {
  // Bernstein polynomials sum to one, so all coefficients a gives y = a C(x) (Kulfan 2008, eq. 8).
  CstShape s;
  s.upper = Eigen::VectorXd::Constant(9, 0.3);
  s.lower = Eigen::VectorXd::Constant(4, -0.2);
  for (double x : {0.01, 0.2, 0.5, 0.9}) {
    EXPECT_NEAR(cst_upper_y(s, x), 0.3 * std::sqrt(x) * (1 - x), 1e-15);
    EXPECT_NEAR(cst_lower_y(s, x), -0.2 * std::sqrt(x) * (1 - x), 1e-15);
  }
}

TEST(Cst, LeadingEdgeRadiusIsHalfTheFirstCoefficientSquared) {
  // Kulfan 2008: with N1 = 0.5, y ~ a_0 sqrt(x) at the nose, so R_le = a_0^2 / 2.
  CstShape s;
  s.upper = Eigen::VectorXd::Constant(6, 0.17);
  s.lower = -s.upper;
  const double r = section_metrics(cst_section(s, 200)).le_radius;
  EXPECT_NEAR(r, 0.17 * 0.17 / 2, 2e-3 * r);  // local fit at the nose, 200 points: 0.2 %
}

TEST(Cst, CoefficientGradientMatchesFiniteDifferences) {
  // y is linear in every coefficient, so central differences are exact up to round-off:
  // step 1e-6, tolerance 1e-9.
  const CstShape s = cambered_shape();
  const Eigen::VectorXd p = cst_parameters(s);
  ASSERT_EQ(p.size(), cst_parameter_count(s));
  Eigen::VectorXd row(p.size());
  for (Surface surf : {Surface::kUpper, Surface::kLower}) {
    for (double x : {0.0, 1e-4, 0.05, 0.3, 0.77, 1.0}) {
      cst_y_gradient(s, surf, x, row);
      for (Eigen::Index k = 0; k < p.size(); ++k) {
        Eigen::VectorXd hi = p, lo = p;
        hi[k] += 1e-6;
        lo[k] -= 1e-6;
        const double fd = (cst_y(cst_with_parameters(s, hi), surf, x) -
                           cst_y(cst_with_parameters(s, lo), surf, x)) /
                          2e-6;
        EXPECT_NEAR(row[k], fd, 1e-9) << to_string(surf) << " x=" << x << " k=" << k;
      }
      const Eigen::VectorXd g =
          surf == Surface::kUpper ? cst_upper_y_gradient(s, x) : cst_lower_y_gradient(s, x);
      const Eigen::Index off = surf == Surface::kUpper ? 0 : s.upper.size();
      EXPECT_LT((g - row.segment(off, g.size())).norm(), 1e-15);
    }
  }
}

TEST(Cst, SlopeMatchesFiniteDifferences) {
  // Central differences of a smooth function, step 1e-6: truncation ~ y''' h^2 ~ 1e-11,
  // round-off ~ 1e-16 / 1e-6; tolerance 1e-8.
  const CstShape s = cambered_shape();
  for (Surface surf : {Surface::kUpper, Surface::kLower}) {
    for (double x : {0.01, 0.2, 0.5, 0.95, 0.999}) {
      const double fd = (cst_y(s, surf, x + 1e-6) - cst_y(s, surf, x - 1e-6)) / 2e-6;
      EXPECT_NEAR(cst_slope(s, surf, x), fd, 1e-8) << x;
    }
  }
}

TEST(Cst, FitRecoversTheCoefficientsOfItsOwnSection) {
  // Exact round trip: the points of a CST section are fitted back to the same coefficients (to
  // the conditioning of the least-squares problem times round-off).
  for (bool closed : {false, true}) {
    CstShape s = cambered_shape();
    if (closed) s.te_upper = s.te_lower = 0;
    const CstFit fit = fit_cst(cst_section(s, 120), 6, 4);
    EXPECT_LT((fit.shape.upper - s.upper).norm(), 1e-10);
    EXPECT_LT((fit.shape.lower - s.lower).norm(), 1e-10);
    EXPECT_NEAR(fit.shape.te_upper, s.te_upper, 1e-12);
    EXPECT_NEAR(fit.shape.te_lower, s.te_lower, 1e-12);
    EXPECT_LT(fit.max_deviation, 1e-13);
    EXPECT_EQ(fit.le_x, 0.0);
    EXPECT_EQ(fit.le_y, 0.0);
    EXPECT_EQ(fit.scale, 1.0);
  }
}

class CstFitNaca : public ::testing::TestWithParam<const char*> {};

TEST_P(CstFitNaca, Order8FitsWithin2e4Chord) {
  // Kulfan 2008 shows NACA sections represented by low-order CST to within wind-tunnel model
  // tolerances; the issue asks for a largest deviation of 2e-4 chord at order 8 (measured:
  // 0012 4.6e-5, 2412 1.3e-4).
  const CstFit fit = fit_cst(naca_section(GetParam()), 8, 8);
  EXPECT_LE(fit.max_deviation, 2e-4) << GetParam();
  EXPECT_EQ(fit.shape.upper.size(), 9);
  // The frame change is small: a nose offset below 1e-2 chord, a scale within 1e-3 of one.
  EXPECT_LT(std::hypot(fit.le_x, fit.le_y), 1e-2);
  EXPECT_NEAR(fit.scale, 1.0, 1e-3);
}
INSTANTIATE_TEST_SUITE_P(Naca, CstFitNaca, ::testing::Values("0012", "2412"));

TEST(Cst, JsonRoundTripIsExact) {
  const CstShape s = cambered_shape();
  const nlohmann::json j = nlohmann::json::parse(cst_to_json(s, "test").dump());
  EXPECT_EQ(j["kind"], kCstKind);
  const CstShape r = cst_from_json(j, "t.json");
  EXPECT_EQ(r.upper, s.upper);
  EXPECT_EQ(r.lower, s.lower);
  EXPECT_EQ(r.te_upper, s.te_upper);
  EXPECT_EQ(r.te_lower, s.te_lower);
}

TEST(Cst, BadJsonNamesThePath) {
  const nlohmann::json good = cst_to_json(cambered_shape(), "x");
  auto message = [](const nlohmann::json& j) -> std::string {
    try {
      cst_from_json(j, "w.json");
    } catch (const InputError& e) {
      return e.what();
    }
    return "";
  };
  nlohmann::json j = good;
  j["upper"][3] = "abc";
  EXPECT_NE(message(j).find("w.json: /upper/3:"), std::string::npos) << message(j);
  j = good;
  j.erase("lower");
  EXPECT_NE(message(j).find("/lower"), std::string::npos) << message(j);
  j = good;
  j["kind"] = "something-else";
  EXPECT_NE(message(j).find("/kind"), std::string::npos) << message(j);
  j = good;
  j["schema_version"] = 2;
  EXPECT_NE(message(j).find("/schema_version"), std::string::npos) << message(j);
  j = good;
  j["class_exponents"] = {1.0, 1.0};
  EXPECT_NE(message(j).find("/class_exponents"), std::string::npos) << message(j);
  j = good;
  j["te_upper"] = nullptr;
  EXPECT_NE(message(j).find("/te_upper"), std::string::npos) << message(j);
  j = good;
  j["upper"] = nlohmann::json::array();
  EXPECT_NE(message(j).find("/upper"), std::string::npos) << message(j);
  EXPECT_NE(message(nlohmann::json::array()).find("w.json"), std::string::npos);
}

TEST(Cst, BadArgumentsAreInputErrors) {
  EXPECT_THROW(cst_section(cambered_shape(), 5), InputError);
  EXPECT_THROW(fit_cst(naca_section("0012"), 0, 8), InputError);
  EXPECT_THROW(fit_cst(naca_section("0012", 10), 12, 12), InputError);  // too few points
  EXPECT_THROW(cst_with_parameters(cambered_shape(), Eigen::VectorXd(3)), InputError);
}

}  // namespace
}  // namespace fulmar
