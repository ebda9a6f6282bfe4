#pragma once
// A small forward-mode dual number: a value and its partial derivatives with respect to N
// independent inputs (kDualSize for an interval, 4 for one station). The boundary-layer closures
// and interval equations are written once as templates on the scalar type and evaluated with
// `double` (values only) or a dual number (values and exact first derivatives), so the Newton
// Jacobians are exact by construction.
#include <array>
#include <cmath>

namespace fulmar::viscous {

// Inputs of one interval: (amplification-or-sqrt(Ctau), theta, delta*, ue) at its two ends
// (0 .. 7), and kOriginShift, a shift of the arc-length origin (both ends moving together, as
// when the stagnation point moves).
inline constexpr int kDualSize = 9;
inline constexpr int kOriginShift = 8;

template <int N>
struct DualN {
  double v = 0.0;
  std::array<double, N> d{};

  DualN() = default;
  DualN(double value) : v(value) {}  // NOLINT: constants promote implicitly
  // An independent input number `index` (0 <= index < N) with the given value.
  static DualN input(double value, int index) {
    DualN x(value);
    x.d[static_cast<std::size_t>(index)] = 1.0;
    return x;
  }
};
// The numbers of the interval equations: derivatives with respect to both stations' inputs.
using Dual = DualN<kDualSize>;
// The numbers of one station's closures: derivatives with respect to its own four inputs (the
// closures see no others), at half the cost of a Dual.
using StationDual = DualN<4>;

// x with its M derivatives placed at positions offset .. offset + M - 1 of N.
template <int N, int M>
DualN<N> widen(const DualN<M>& x, int offset) {
  static_assert(M <= N);
  DualN<N> y(x.v);
  for (int i = 0; i < M; ++i)
    y.d[static_cast<std::size_t>(offset + i)] = x.d[static_cast<std::size_t>(i)];
  return y;
}

inline double value_of(double x) {
  return x;
}
template <int N>
double value_of(const DualN<N>& x) {
  return x.v;
}

// y = f(x) with f'(x) = slope: the chain rule for every unary function below.
template <int N>
DualN<N> chain(const DualN<N>& x, double fx, double slope) {
  DualN<N> y(fx);
  for (int i = 0; i < N; ++i) y.d[i] = slope * x.d[i];
  return y;
}

template <int N>
DualN<N> operator-(const DualN<N>& a) {
  return chain(a, -a.v, -1.0);
}
template <int N>
DualN<N> operator+(const DualN<N>& a, const DualN<N>& b) {
  DualN<N> y(a.v + b.v);
  for (int i = 0; i < N; ++i) y.d[i] = a.d[i] + b.d[i];
  return y;
}
template <int N>
DualN<N> operator-(const DualN<N>& a, const DualN<N>& b) {
  DualN<N> y(a.v - b.v);
  for (int i = 0; i < N; ++i) y.d[i] = a.d[i] - b.d[i];
  return y;
}
template <int N>
DualN<N> operator*(const DualN<N>& a, const DualN<N>& b) {
  DualN<N> y(a.v * b.v);
  for (int i = 0; i < N; ++i) y.d[i] = a.d[i] * b.v + a.v * b.d[i];
  return y;
}
template <int N>
DualN<N> operator/(const DualN<N>& a, const DualN<N>& b) {
  const double inv = 1.0 / b.v;
  DualN<N> y(a.v * inv);
  for (int i = 0; i < N; ++i) y.d[i] = (a.d[i] - y.v * b.d[i]) * inv;
  return y;
}
template <int N>
DualN<N> operator+(const DualN<N>& a, double b) {
  return chain(a, a.v + b, 1.0);
}
template <int N>
DualN<N> operator+(double a, const DualN<N>& b) {
  return chain(b, a + b.v, 1.0);
}
template <int N>
DualN<N> operator-(const DualN<N>& a, double b) {
  return chain(a, a.v - b, 1.0);
}
template <int N>
DualN<N> operator-(double a, const DualN<N>& b) {
  return chain(b, a - b.v, -1.0);
}
template <int N>
DualN<N> operator*(const DualN<N>& a, double b) {
  return chain(a, a.v * b, b);
}
template <int N>
DualN<N> operator*(double a, const DualN<N>& b) {
  return chain(b, a * b.v, a);
}
template <int N>
DualN<N> operator/(const DualN<N>& a, double b) {
  return chain(a, a.v / b, 1.0 / b);
}
template <int N>
DualN<N> operator/(double a, const DualN<N>& b) {
  return chain(b, a / b.v, -a / (b.v * b.v));
}
template <int N>
DualN<N>& operator+=(DualN<N>& a, const DualN<N>& b) {
  return a = a + b;
}
template <int N>
DualN<N>& operator-=(DualN<N>& a, const DualN<N>& b) {
  return a = a - b;
}
template <int N>
DualN<N>& operator*=(DualN<N>& a, const DualN<N>& b) {
  return a = a * b;
}

template <int N>
bool operator<(const DualN<N>& a, const DualN<N>& b) {
  return a.v < b.v;
}
template <int N>
bool operator>(const DualN<N>& a, const DualN<N>& b) {
  return a.v > b.v;
}
template <int N>
bool operator<(const DualN<N>& a, double b) {
  return a.v < b;
}
template <int N>
bool operator>(const DualN<N>& a, double b) {
  return a.v > b;
}
template <int N>
bool operator<(double a, const DualN<N>& b) {
  return a < b.v;
}
template <int N>
bool operator>(double a, const DualN<N>& b) {
  return a > b.v;
}

template <int N>
DualN<N> sqrt(const DualN<N>& x) {
  const double s = std::sqrt(x.v);
  return chain(x, s, 0.5 / s);
}
template <int N>
DualN<N> exp(const DualN<N>& x) {
  const double e = std::exp(x.v);
  return chain(x, e, e);
}
template <int N>
DualN<N> log(const DualN<N>& x) {
  return chain(x, std::log(x.v), 1.0 / x.v);
}
template <int N>
DualN<N> log10(const DualN<N>& x) {
  return chain(x, std::log10(x.v), 1.0 / (x.v * std::log(10.0)));
}
template <int N>
DualN<N> tanh(const DualN<N>& x) {
  const double t = std::tanh(x.v);
  return chain(x, t, 1.0 - t * t);
}
// x^p for x > 0 and a constant exponent p.
template <int N>
DualN<N> pow(const DualN<N>& x, double p) {
  const double y = std::pow(x.v, p);
  return chain(x, y, p * y / x.v);
}
// x^p for x > 0 with both base and exponent variable.
template <int N>
DualN<N> pow(const DualN<N>& x, const DualN<N>& p) {
  return exp(p * log(x));
}

using std::exp;
using std::log;
using std::log10;
using std::pow;
using std::sqrt;
using std::tanh;

}  // namespace fulmar::viscous
