#pragma once
// A small forward-mode dual number: a value and its partial derivatives with respect to up to
// kDualSize independent inputs. The boundary-layer closures and interval equations are written
// once as templates on the scalar type and evaluated with `double` (values only) or `Dual`
// (values and exact first derivatives), so the Newton Jacobians are exact by construction.
#include <array>
#include <cmath>

namespace fulmar::viscous {

// Inputs of one interval: (amplification-or-sqrt(Ctau), theta, delta*, ue) at its two ends.
inline constexpr int kDualSize = 8;

struct Dual {
  double v = 0.0;
  std::array<double, kDualSize> d{};

  Dual() = default;
  Dual(double value) : v(value) {}  // NOLINT: constants promote implicitly
  // An independent input number `index` (0 <= index < kDualSize) with the given value.
  static Dual input(double value, int index) {
    Dual x(value);
    x.d[static_cast<std::size_t>(index)] = 1.0;
    return x;
  }
};

inline double value_of(double x) {
  return x;
}
inline double value_of(const Dual& x) {
  return x.v;
}

// y = f(x) with f'(x) = slope: the chain rule for every unary function below.
inline Dual chain(const Dual& x, double fx, double slope) {
  Dual y(fx);
  for (int i = 0; i < kDualSize; ++i) y.d[i] = slope * x.d[i];
  return y;
}

inline Dual operator-(const Dual& a) {
  return chain(a, -a.v, -1.0);
}
inline Dual operator+(const Dual& a, const Dual& b) {
  Dual y(a.v + b.v);
  for (int i = 0; i < kDualSize; ++i) y.d[i] = a.d[i] + b.d[i];
  return y;
}
inline Dual operator-(const Dual& a, const Dual& b) {
  Dual y(a.v - b.v);
  for (int i = 0; i < kDualSize; ++i) y.d[i] = a.d[i] - b.d[i];
  return y;
}
inline Dual operator*(const Dual& a, const Dual& b) {
  Dual y(a.v * b.v);
  for (int i = 0; i < kDualSize; ++i) y.d[i] = a.d[i] * b.v + a.v * b.d[i];
  return y;
}
inline Dual operator/(const Dual& a, const Dual& b) {
  const double inv = 1.0 / b.v;
  Dual y(a.v * inv);
  for (int i = 0; i < kDualSize; ++i) y.d[i] = (a.d[i] - y.v * b.d[i]) * inv;
  return y;
}
inline Dual operator+(const Dual& a, double b) {
  return chain(a, a.v + b, 1.0);
}
inline Dual operator+(double a, const Dual& b) {
  return chain(b, a + b.v, 1.0);
}
inline Dual operator-(const Dual& a, double b) {
  return chain(a, a.v - b, 1.0);
}
inline Dual operator-(double a, const Dual& b) {
  return chain(b, a - b.v, -1.0);
}
inline Dual operator*(const Dual& a, double b) {
  return chain(a, a.v * b, b);
}
inline Dual operator*(double a, const Dual& b) {
  return chain(b, a * b.v, a);
}
inline Dual operator/(const Dual& a, double b) {
  return chain(a, a.v / b, 1.0 / b);
}
inline Dual operator/(double a, const Dual& b) {
  return chain(b, a / b.v, -a / (b.v * b.v));
}
inline Dual& operator+=(Dual& a, const Dual& b) {
  return a = a + b;
}
inline Dual& operator-=(Dual& a, const Dual& b) {
  return a = a - b;
}
inline Dual& operator*=(Dual& a, const Dual& b) {
  return a = a * b;
}

inline bool operator<(const Dual& a, const Dual& b) {
  return a.v < b.v;
}
inline bool operator>(const Dual& a, const Dual& b) {
  return a.v > b.v;
}
inline bool operator<(const Dual& a, double b) {
  return a.v < b;
}
inline bool operator>(const Dual& a, double b) {
  return a.v > b;
}
inline bool operator<(double a, const Dual& b) {
  return a < b.v;
}
inline bool operator>(double a, const Dual& b) {
  return a > b.v;
}

inline Dual sqrt(const Dual& x) {
  const double s = std::sqrt(x.v);
  return chain(x, s, 0.5 / s);
}
inline Dual exp(const Dual& x) {
  const double e = std::exp(x.v);
  return chain(x, e, e);
}
inline Dual log(const Dual& x) {
  return chain(x, std::log(x.v), 1.0 / x.v);
}
inline Dual log10(const Dual& x) {
  return chain(x, std::log10(x.v), 1.0 / (x.v * std::log(10.0)));
}
inline Dual tanh(const Dual& x) {
  const double t = std::tanh(x.v);
  return chain(x, t, 1.0 - t * t);
}
// x^p for x > 0 and a constant exponent p.
inline Dual pow(const Dual& x, double p) {
  const double y = std::pow(x.v, p);
  return chain(x, y, p * y / x.v);
}
// x^p for x > 0 with both base and exponent variable.
inline Dual pow(const Dual& x, const Dual& p) {
  return exp(p * log(x));
}

using std::exp;
using std::log;
using std::log10;
using std::pow;
using std::sqrt;
using std::tanh;

}  // namespace fulmar::viscous
