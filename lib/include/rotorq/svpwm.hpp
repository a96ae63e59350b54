// Space-vector modulation: a stationary-frame voltage to three duty cycles.
//
// The request v is normalised to the DC-bus voltage (v = v_alphabeta / V_dc, see dc_bus.hpp). The
// phase voltages of v (inverse Clarke) are centred by zero-sequence injection of -(max + min) / 2
// (min-max injection), which gives the centred space-vector duties
//
//   duty_x = 1/2 + v_x - (max(v_a, v_b, v_c) + min(v_a, v_b, v_c)) / 2,   x = a, b, c
//
// exactly as the dwell-time construction from the two adjacent active vectors with the zero time
// shared equally between the two zero vectors does (tests/test_svpwm.cpp compares the two). The
// duties stay in [0, 1] while max - min <= 1, that is inside the hexagon of the six active vectors;
// a sinusoidal output is possible up to the hexagon's inscribed circle, |v| <= 1/sqrt(3) (15.47%
// more fundamental than sine PWM's 1/2).
//
// Outside that range the caller picks what to give up (overmodulation):
//   overmodulation::circle    scale v to |v| = 1/sqrt(3), keeping its angle: the output stays
//                             sinusoidal; the usual choice inside a current loop
//   overmodulation::hexagon   use the full hexagon: inside it nothing changes; beyond its edge v is
//                             scaled radially onto the edge, keeping the angle; up to 2/3 at the
//                             vertices, more voltage but with low-order harmonics
// Any request, however large or malformed, yields duties in [0, 1] (the largest representable value
// stands for 1). `limited` says the request was changed; `sector` (1..6) is the 60-degree sector of
// the (limited) vector's angle, sector k covering [(k-1) 60, k 60) degrees from alpha; a zero vector
// reports sector 1.
//
// Accuracy in the linear range: the phase voltages and the injection are formed exactly in wide
// integers and each duty is rounded once, so duties are within 0.5 LSB (+ 2^-15 LSB for the
// constant) of the exact value. Beyond it the limited vector carries the limiter's error
// (voltage_limit.hpp; the circle's radius is 1/sqrt(3) rounded down, so the duties stay inside),
// which the phase voltages and the injection can double: duties within 3.5 LSB (q15) and 17 LSB
// (q31) of exact limiting; the README lists the measured figures.
//
// Beside it, for comparison and for simulation:
//   sine_pwm(v)   duty_x = 1/2 + v_x (no injection), linear for |v| <= 1/2, clamped to [0, 1];
//                 in the linear range each duty is rounded once (0.5 LSB + 2^-15 LSB)
//   six_step(v)   square wave: phase x fully on when v_x >= 0, off otherwise; the fundamental of
//                 each phase-to-midpoint voltage is (2/pi) V_dc whatever |v|; `sector` is the
//                 index k of the active vector V_k that the state is (V1 = a on, V2 = a and b on, ...)
#pragma once

#include "rotorq/clarke.hpp"
#include "rotorq/constants.hpp"
#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/newton.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"
#include "rotorq/voltage_limit.hpp"

namespace rotorq {

enum class overmodulation : uint8_t { circle, hexagon };

template <typename T>
struct modulation {
  phases<T> duty{};    // each in [0, max()]; max() stands for a duty of 1
  uint8_t sector = 1;  // 1..6
  bool limited = false;
};

namespace detail {

// The order of the three phase voltages, from their six strict pairwise comparisons (no difference
// formed, so nothing overflows): the largest, the smallest (either of two equal values: they are the
// same number) and the sector. Sector k covers [(k-1) 60, k 60) degrees of the voltage's angle.
struct phase_order {
  int64_t high;
  int64_t low;
  uint8_t sector;
};
constexpr phase_order order_of(const phases<int64_t>& w) noexcept {
  const bool ab = w.a > w.b, ba = w.b > w.a;
  const bool bc = w.b > w.c, cb = w.c > w.b;
  const bool ca = w.c > w.a, ac = w.a > w.c;
  phase_order o{ab ? (ac ? w.a : w.c) : (bc ? w.b : w.c), ab ? (bc ? w.c : w.b) : (ac ? w.c : w.a), 1};
  if (ab && !cb) {
    o.sector = 1;  // a > b >= c
  } else if (!ab && ac) {
    o.sector = 2;  // b >= a > c
  } else if (bc && !ac) {
    o.sector = 3;  // b > c >= a
  } else if (!bc && ba) {
    o.sector = 4;  // c >= b > a
  } else if (ca && !ba) {
    o.sector = 5;  // c > a >= b
  } else if (!ca && cb) {
    o.sector = 6;  // a >= c > b
  }                // else all equal: the zero vector, sector 1
  return o;
}

// A wide duty (1 = 2^(F+31)) to fixed<F>, rounded once and clamped to [0, max].
template <int F>
constexpr fixed<F> duty_from_wide(int64_t w) noexcept {
  const fixed<F> d = round_wide<F>(w);
  return d.raw() < 0 ? fixed<F>::zero() : d;
}

// The largest value not above 1/sqrt(3) (rounded down, so the limited vector stays inside).
template <int F>
constexpr fixed<F> inscribed_circle() noexcept {
  return fixed<F>::from_raw(static_cast<typename fixed<F>::raw_type>(constants::inv_sqrt3 >> (62 - F)));
}

}  // namespace detail

template <int F>
constexpr modulation<fixed<F>> svpwm(stationary<fixed<F>> v,
                                     overmodulation mode = overmodulation::circle) noexcept {
  bool was_limited = false;
  if (mode == overmodulation::circle) {
    const limited<stationary<fixed<F>>> l = limit_magnitude(v, detail::inscribed_circle<F>());
    v = l.value;
    was_limited = l.clipped;
  }
  const phases<int64_t> w = detail::inverse_clarke_wide(v);  // |w| <= 1.37 2^(F+31)
  const detail::phase_order order = detail::order_of(w);
  const int64_t high = order.high, low = order.low;
  const int64_t middle = detail::half_sum(high, low);        // floor((max + min) / 2)
  const int64_t half_spread = detail::half_sum(high, -low);  // floor((max - min) / 2)
  const int64_t half = detail::pow2(F + 30);                 // 1/2 in wide units
  const uint8_t sector = order.sector;

  if (mode == overmodulation::hexagon && half_spread > half) {
    // Beyond the hexagon: duty_x = 1/2 + (v_x - middle) / spread, spread = max - min in (1, 2.8).
    const auto spread30 = static_cast<uint32_t>(half_spread >> F);  // spread in Q30
    const int n = detail::leading_zeros(spread30);                  // 0 or 1
    const uint32_t inverse30 = detail::reciprocal_q30(spread30 << n) >> (2 - n);
    const auto duty = [&](int64_t x) {
      return detail::duty_from_wide<F>(half + detail::multiply_q30(x - middle, inverse30));
    };
    return {{duty(w.a), duty(w.b), duty(w.c)}, sector, true};
  }
  // |x - middle| <= max - min <= 2.8 2^(F+31) < 2^63 - 2^(F+30) for q31 too
  return {{detail::duty_from_wide<F>(half + w.a - middle), detail::duty_from_wide<F>(half + w.b - middle),
           detail::duty_from_wide<F>(half + w.c - middle)},
          sector,
          was_limited};
}

template <int F>
constexpr modulation<fixed<F>> sine_pwm(stationary<fixed<F>> v) noexcept {
  const phases<int64_t> w = detail::inverse_clarke_wide(v);
  const int64_t half = detail::pow2(F + 30);
  const int64_t one = 2 * half;
  const bool clamped = w.a < -half || w.a > half || w.b < -half || w.b > half || w.c < -half || w.c > half;
  const auto duty = [&](int64_t x) { return detail::duty_from_wide<F>(half + x < one ? half + x : one); };
  return {{duty(w.a), duty(w.b), duty(w.c)}, detail::order_of(w).sector, clamped};
}

template <int F>
constexpr modulation<fixed<F>> six_step(stationary<fixed<F>> v) noexcept {
  const phases<int64_t> w = detail::inverse_clarke_wide(v);
  const bool a = w.a >= 0, b = w.b >= 0, c = w.c >= 0;
  // active vector index: V1 100, V2 110, V3 010, V4 011, V5 001, V6 101 (the zero vectors 000 and 111
  // only for a zero request; they report 1)
  const uint8_t state = static_cast<uint8_t>((a ? 4 : 0) | (b ? 2 : 0) | (c ? 1 : 0));
  constexpr uint8_t index[8] = {1, 5, 3, 4, 1, 6, 2, 1};
  const auto duty = [](bool on) { return on ? fixed<F>::max() : fixed<F>::zero(); };
  return {{duty(a), duty(b), duty(c)}, index[state], false};
}

}  // namespace rotorq
