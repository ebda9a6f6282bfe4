#include "solvers/viscous/transition.h"

#include <gtest/gtest.h>

#include <cmath>

#include "common/error.h"

namespace fulmar::viscous {
namespace {

TEST(Mack, NineAtSevenHundredthsPercent) {
  // Mack (JPL 77-15, 1977): N = -8.43 - 2.4 ln(Tu); Tu = 0.07 % gives 9.0 (arithmetic).
  EXPECT_NEAR(n_crit_from_turbulence(0.0007), 9.0, 0.02);
  EXPECT_GT(n_crit_from_turbulence(0.0005), n_crit_from_turbulence(0.002));
  EXPECT_THROW(n_crit_from_turbulence(0.0), InputError);
  EXPECT_THROW(n_crit_from_turbulence(-1e-3), InputError);
}

TEST(CriticalReTheta, BlasiusNearTwoHundred) {
  // The Orr-Sommerfeld neutral point of the Blasius profile is Re_delta* = 520, Re_theta = 201
  // (Schlichting, Boundary-Layer Theory, ch. 15; from memory). The envelope fit of Drela & Giles
  // 1987 gives the Re_theta where its straight-line envelope N(Re_theta) starts, which lies above
  // the neutral point because the true envelope rises slowly at first: we find 244 (21 % above).
  // The test asks for a value between the neutral point and 30 % above it.
  const double rc = std::pow(10.0, log10_critical_re_theta(2.59));
  EXPECT_GT(rc, 201.0);
  EXPECT_LT(rc, 1.3 * 201.0);
  // Adverse gradients (larger H) destabilise: lower critical Re_theta.
  EXPECT_LT(log10_critical_re_theta(3.5), log10_critical_re_theta(2.59));
}

TEST(AmplificationRate, ZeroBelowCriticalAndGrowsWithH) {
  const double theta = 1e-3;
  EXPECT_EQ(amplification_rate(2.59, theta, 100.0), 0.0);
  const double r1 = amplification_rate(2.59, theta, 1000.0);
  const double r2 = amplification_rate(3.2, theta, 1000.0);
  EXPECT_GT(r1, 0.0);
  EXPECT_GT(r2, r1);
}

TEST(AmplificationRate, RampIsContinuousAndDerivativesExact) {
  // Scan Re_theta through the onset ramp: no jump larger than the smooth change between samples.
  const double theta = 1e-3, hk = 2.8;
  const double rc = std::pow(10.0, log10_critical_re_theta(hk));
  double prev = amplification_rate(hk, theta, 0.7 * rc);
  for (double f = 0.7; f < 1.5; f += 0.001) {
    const double r = amplification_rate(hk, theta, f * rc);
    EXPECT_LT(std::abs(r - prev), 2.0) << f;  // the rate itself is ~100 per unit length
    prev = r;
  }
  for (double f : {0.9, 1.0, 1.1, 2.0}) {
    for (double h : {2.3, 2.8, 4.5, 6.0}) {
      const Dual x = Dual::input(h, 0), t = Dual::input(theta, 1), re = Dual::input(f * rc, 2);
      const Dual r = amplification_rate(x, t, re);
      const double steps[3] = {1e-6, 1e-10, 1e-4 * rc};
      for (int i = 0; i < 3; ++i) {
        double p[3] = {h, theta, f * rc}, m[3] = {h, theta, f * rc};
        p[i] += steps[i];
        m[i] -= steps[i];
        const double fd =
            (amplification_rate(p[0], p[1], p[2]) - amplification_rate(m[0], m[1], m[2])) /
            (2.0 * steps[i]);
        EXPECT_NEAR(r.d[i], fd, 1e-5 * std::max(1.0, std::abs(fd))) << i << " " << f << " " << h;
      }
    }
  }
}

}  // namespace
}  // namespace fulmar::viscous
