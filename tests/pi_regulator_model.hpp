// The rule of rotorq/pi_regulator.hpp written out independently, in 128-bit integers with explicit
// floor divisions (no shifts of negative values, no shared helpers), for tests/test_pi_regulator.cpp
// and tests/fuzz/fuzz_pi_regulator.cpp. It follows the header comment, not the code: gains
// normalised (negative mantissa 0, exponent clamped to [-16, 15]); error exact; each product
// gain x error rounded once to 2^-(F+16) (ties toward +infinity) and saturated at +-4; conditional
// integration (the increment, or the part of it that brings the output to the limit) against limits collapsed
// to floor((lo + hi) / 2) when inverted; output rounded once (ties toward +infinity) and clamped.
#pragma once

#include <algorithm>
#include <cstdint>

namespace rotorq::test {

using int128 = __int128;

// floor(n / d) for d > 0.
inline int128 floor_div(int128 n, int128 d) {
  const int128 q = n / d;
  return (n % d != 0 && n < 0) ? q - 1 : q;
}
inline int128 pow2_128(int n) {
  int128 p = 1;
  for (int k = 0; k < n; ++k) p *= 2;
  return p;
}
// round(n / 2^shift), ties toward +infinity.
inline int128 round_half_up(int128 n, int shift) {
  return floor_div(2 * n + pow2_128(shift), 2 * pow2_128(shift));
}
inline int128 clamp128(int128 v, int128 lo, int128 hi) { return v < lo ? lo : (v > hi ? hi : v); }

template <int F>
struct pi_model {
  int64_t kp_mantissa = 0, ki_mantissa = 0;
  int kp_exponent = 0, ki_exponent = 0;
  int128 lo = -pow2_128(F), hi = pow2_128(F) - 1;
  int128 integrator = 0;  // units of 2^-(F+16)
  int128 output = 0;
  bool saturated = false;

  static int clamp_exponent(int e) { return e < -16 ? -16 : (e > 15 ? 15 : e); }
  void set_gains(int64_t kp_m, int kp_e, int64_t ki_m, int ki_e) {
    kp_mantissa = kp_m < 0 ? 0 : kp_m;
    ki_mantissa = ki_m < 0 ? 0 : ki_m;
    kp_exponent = clamp_exponent(kp_e);
    ki_exponent = clamp_exponent(ki_e);
  }
  void set_limits(int64_t l, int64_t h) {
    if (l > h) {
      l = h = static_cast<int64_t>(floor_div(int128{l} + h, 2));
    }
    lo = l;
    hi = h;
    integrator = clamp128(integrator, lo * pow2_128(16), hi * pow2_128(16));
  }
  void set_limit(int64_t m) { set_limits(m < 0 ? 0 : -m, m < 0 ? 0 : m); }

  // gain x error in units of 2^-(F+16): the exact value error m 2^e / 2^(2F), rounded once, saturated
  static int128 term(int64_t mantissa, int exponent, int128 error) {
    const int128 exact_numerator = error * mantissa;  // value = numerator 2^exponent / 2^(2F)
    const int shift = 2 * F - (F + 16) - exponent;    // units: numerator / 2^shift
    const int128 t = shift > 0 ? round_half_up(exact_numerator, shift) : exact_numerator * pow2_128(-shift);
    const int128 limit = 4 * pow2_128(F + 16);
    return clamp128(t, -limit, limit);
  }

  int64_t update(int64_t reference, int64_t measured, int64_t feedforward = 0) {
    const int128 error = int128{reference} - measured;
    const int128 p = term(kp_mantissa, kp_exponent, error);
    const int128 inc = term(ki_mantissa, ki_exponent, error);
    const int128 unit = pow2_128(16);
    const int128 held = clamp128(integrator, lo * unit, hi * unit);
    // the increment, or the part that brings the output to the limit, or nothing
    int128 next = held;
    if (inc > 0) next = std::max(held, std::min(held + inc, hi * unit - p - feedforward * unit));
    if (inc < 0) next = std::min(held, std::max(held + inc, lo * unit - p - feedforward * unit));
    integrator = clamp128(next, lo * unit, hi * unit);
    const int128 unlimited = round_half_up(p + integrator + feedforward * unit, 16);
    output = clamp128(unlimited, lo, hi);
    saturated = output != unlimited;
    return static_cast<int64_t>(output);
  }
  void preset(int64_t value) { integrator = clamp128(value, lo, hi) * pow2_128(16); }
  void reset() {
    integrator = clamp128(0, lo * pow2_128(16), hi * pow2_128(16));
    output = 0;
    saturated = false;
  }
};

}  // namespace rotorq::test
