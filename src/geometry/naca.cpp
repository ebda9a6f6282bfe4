#include "geometry/naca.h"

#include <cctype>
#include <cmath>
#include <numbers>

#include "common/error.h"

namespace fulmar {

namespace {

// Report 537, table of the standard five-digit mean lines (design lift coefficient 0.3): position
// of maximum camber p, the end of the cubic part m and the factor k1.
struct FiveDigitMeanLine {
  double p, m, k1;
};
constexpr FiveDigitMeanLine kReport537[5] = {
    {0.05, 0.0580, 361.400},  // 210
    {0.10, 0.1260, 51.640},   // 220
    {0.15, 0.2025, 15.957},   // 230
    {0.20, 0.2900, 6.643},    // 240
    {0.25, 0.3910, 3.230},    // 250
};

[[noreturn]] void bad(const std::string& designation, const std::string& rule) {
  throw InputError("NACA designation '" + designation + "': " + rule);
}

}  // namespace

NacaDesignation parse_naca(const std::string& designation) {
  std::string s = designation;
  std::string lower;
  for (char c : s) lower += static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  std::size_t i = 0;
  if (lower.rfind("naca", 0) == 0) {
    i = 4;
    while (i < lower.size() && (lower[i] == ' ' || lower[i] == '-' || lower[i] == '_')) ++i;
  }
  std::string digits = s.substr(i);
  if (digits.empty()) bad(designation, "no digits after 'naca' (e.g. naca2412, naca23012)");
  for (char c : digits) {
    if (!std::isdigit(static_cast<unsigned char>(c))) {
      bad(designation, "expected 4 or 5 digits (e.g. naca2412, naca23012), found '" + digits + "'");
    }
  }
  NacaDesignation n;
  n.digits = digits;
  auto d = [&](std::size_t k) { return digits[k] - '0'; };
  if (digits.size() == 4) {
    n.family = NacaDesignation::Family::kFourDigit;
    n.max_camber = d(0) / 100.0;
    n.camber_x = d(1) / 10.0;
    n.thickness = (10 * d(2) + d(3)) / 100.0;
    if (n.max_camber > 0 && d(1) == 0) {
      bad(designation, "a cambered four-digit section needs a camber position digit 1..9");
    }
    if (n.max_camber == 0 && d(1) != 0) {
      bad(designation, "a symmetric four-digit section has camber position digit 0 (e.g. 0012)");
    }
  } else if (digits.size() == 5) {
    n.family = NacaDesignation::Family::kFiveDigit;
    if (d(0) == 0)
      bad(designation, "five-digit first digit (design lift coefficient) must be 1..9");
    if (d(1) < 1 || d(1) > 5) {
      bad(designation, "five-digit second digit must be 1..5 (standard mean lines 210..250)");
    }
    if (d(2) != 0) {
      bad(designation,
          "five-digit third digit must be 0: only the standard (non-reflexed) mean lines of "
          "NACA Report 537 are provided");
    }
    n.design_cl = 0.15 * d(0);
    const FiveDigitMeanLine& ml = kReport537[d(1) - 1];
    n.camber_x = ml.p;
    n.mean_line_m = ml.m;
    n.mean_line_k1 = ml.k1;
    n.thickness = (10 * d(3) + d(4)) / 100.0;
  } else {
    bad(designation, "expected 4 or 5 digits (e.g. naca2412, naca23012), found " +
                         std::to_string(digits.size()));
  }
  if (n.thickness <= 0) bad(designation, "thickness digits must be 01..99, found 00");
  return n;
}

double naca_half_thickness(double t, double x, bool closed_te) {
  if (closed_te && x >= 1.0) return 0.0;  // -0.1036 closes it exactly; avoid rounding residue
  const double a4 = closed_te ? -0.1036 : -0.1015;
  const double sx = std::sqrt(std::max(x, 0.0));
  return 5.0 * t * (0.2969 * sx + x * (-0.1260 + x * (-0.3516 + x * (0.2843 + x * a4))));
}

MeanLinePoint naca_mean_line(const NacaDesignation& n, double x) {
  MeanLinePoint r;
  if (n.family == NacaDesignation::Family::kFourDigit) {
    const double m = n.max_camber, p = n.camber_x;
    if (m == 0) return r;
    if (x < p) {
      r.y = m / (p * p) * (2 * p * x - x * x);
      r.slope = 2 * m / (p * p) * (p - x);
    } else {
      const double q = (1 - p) * (1 - p);
      r.y = m / q * ((1 - 2 * p) + 2 * p * x - x * x);
      r.slope = 2 * m / q * (p - x);
    }
    return r;
  }
  const double m = n.mean_line_m, k1 = n.mean_line_k1;
  const double scale = n.design_cl / 0.3;
  if (x < m) {
    r.y = k1 / 6 * (x * x * x - 3 * m * x * x + m * m * (3 - m) * x);
    r.slope = k1 / 6 * (3 * x * x - 6 * m * x + m * m * (3 - m));
  } else {
    r.y = k1 * m * m * m / 6 * (1 - x);
    r.slope = -k1 * m * m * m / 6;
  }
  r.y *= scale;
  r.slope *= scale;
  return r;
}

Section naca_section(const std::string& digits, int points_per_surface, bool closed_te) {
  const NacaDesignation n = parse_naca(digits);
  if (points_per_surface < 10 || points_per_surface > 5000) {
    throw InputError("NACA section points per surface: " + std::to_string(points_per_surface) +
                     " is outside [10, 5000]");
  }
  const int np = points_per_surface;
  Section s;
  s.name = "NACA " + n.digits + (closed_te ? " (closed trailing edge)" : "");
  s.points.resize(2 * np - 1, 2);
  for (int i = 0; i < np; ++i) {
    // i = 0 at the trailing edge, np - 1 at the leading edge.
    const double beta = std::numbers::pi * (np - 1 - i) / (np - 1);
    double x = 0.5 * (1 - std::cos(beta));
    if (i == 0) x = 1.0;
    if (i == np - 1) x = 0.0;
    const double yt = naca_half_thickness(n.thickness, x, closed_te);
    const MeanLinePoint c = naca_mean_line(n, x);
    const double theta = std::atan(c.slope);
    const double sn = std::sin(theta), cs = std::cos(theta);
    s.points(i, 0) = x - yt * sn;  // upper, running from the trailing edge forward
    s.points(i, 1) = c.y + yt * cs;
    const int j = 2 * np - 2 - i;  // lower, mirrored index
    s.points(j, 0) = x + yt * sn;
    s.points(j, 1) = c.y - yt * cs;
  }
  return s;
}

}  // namespace fulmar
