// Double-precision twin of rotorq/pi_regulator.hpp: the same law in real arithmetic (no rounding),
// with the same limits and the same anti-windup (conditional integration), plus the conversion of a
// double gain to the library's pi_gain.
//
//   e = reference - measured;  I += ki e, or the part of it that brings the output to the limit in its
//   direction, or nothing there;  I clamped to [lo, hi];  u = clamp(kp e + I + feedforward, lo, hi)
#pragma once

#include <algorithm>
#include <cmath>

#include "rotorq/host.hpp"
#include "rotorq/pi_regulator.hpp"

namespace rotorq::ref {

class pi_regulator {
 public:
  pi_regulator(double kp, double ki, double lo = -1.0, double hi = 1.0)
      : kp_(std::max(kp, 0.0)), ki_(std::max(ki, 0.0)) {
    set_limits(lo, hi);
  }

  void set_gains(double kp, double ki) {
    kp_ = std::max(kp, 0.0);
    ki_ = std::max(ki, 0.0);
  }
  // lo > hi collapses to the midpoint (the library takes the floor of the midpoint in raw steps).
  void set_limits(double lo, double hi) {
    if (lo > hi) lo = hi = (lo + hi) / 2;
    lo_ = lo;
    hi_ = hi;
  }
  void set_limit(double m) { set_limits(-std::max(m, 0.0), std::max(m, 0.0)); }

  double update(double reference, double measured, double feedforward = 0.0) {
    const double error = reference - measured;
    const double proportional = std::clamp(kp_ * error, -4.0, 4.0);
    const double increment = std::clamp(ki_ * error, -4.0, 4.0);
    const double held = std::clamp(integrator_, lo_, hi_);
    double next = held;
    if (increment > 0) next = std::max(held, std::min(held + increment, hi_ - proportional - feedforward));
    if (increment < 0) next = std::min(held, std::max(held + increment, lo_ - proportional - feedforward));
    integrator_ = std::clamp(next, lo_, hi_);
    const double unlimited = proportional + integrator_ + feedforward;
    output_ = std::clamp(unlimited, lo_, hi_);
    saturated_ = output_ != unlimited;
    return output_;
  }

  void preset(double value) { integrator_ = std::clamp(value, lo_, hi_); }
  void reset() {
    integrator_ = std::clamp(0.0, lo_, hi_);
    output_ = 0;
    saturated_ = false;
  }
  // For comparisons that start both from the same state.
  void set_integrator(double value) { integrator_ = value; }

  double output() const { return output_; }
  bool saturated() const { return saturated_; }
  double integrator() const { return integrator_; }

 private:
  double kp_, ki_;
  double lo_ = -1.0, hi_ = 1.0;
  double integrator_ = 0.0;
  double output_ = 0.0;
  bool saturated_ = false;
};

// The value of a library gain.
template <typename Q>
double gain_value(pi_gain<Q> g) {
  const pi_gain<Q> n = g.normalized();
  return std::ldexp(to_double(n.mantissa), n.exponent);
}

// The library gain nearest `value` (>= 0): the exponent that puts the mantissa in [1/2, 1), the
// mantissa rounded to the format; values beyond the largest gain give the largest, NaN and values
// <= 0 give 0, values below the smallest step give 0.
template <typename Q>
pi_gain<Q> to_pi_gain(double value) {
  if (!(value > 0)) return {};
  int exponent = 0;
  (void)std::frexp(value, &exponent);  // value = m 2^exponent, m in [1/2, 1)
  exponent = std::clamp(exponent, pi_gain<Q>::min_exponent, pi_gain<Q>::max_exponent);
  const double mantissa = std::ldexp(value, -exponent);
  if (mantissa >= 1.0) return {Q::max(), pi_gain<Q>::max_exponent};
  // rounding can carry the mantissa to 1: then take the next exponent
  const Q rounded = rotorq::detail::from_double<Q>(mantissa);
  if (rounded == Q::max() && mantissa > to_double(Q::max()) && exponent < pi_gain<Q>::max_exponent) {
    return {rotorq::detail::from_double<Q>(mantissa / 2), exponent + 1};
  }
  return {rounded, exponent};
}

}  // namespace rotorq::ref
