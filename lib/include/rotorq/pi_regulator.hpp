// pi_regulator<Q>: a proportional-integral regulator in q15 or q31, with output limits, anti-windup,
// reset and an integrator preset. A small class the caller owns, one per regulated quantity (i_d,
// i_q, a six-step current, a speed).
//
//   rotorq::pi_regulator<rotorq::q15> current_q({q15::from_raw(26214), 1}, {q15::from_raw(19661), -4});
//   current_q.set_limit(v_max);                        // output in [-v_max, v_max]
//   const q15 v_q = current_q.update(i_q_ref, i_q);    // once per control period
//
// Law (parallel form, backward rectangular integration, common practice, no source):
//   e_k = reference - measured                 formed exactly: up to 2 - 2^-F in magnitude
//   I_k = I_(k-1) + ki e_k                     as far as the anti-windup allows (below)
//   u_k = clamp(kp e_k + I_k + feedforward, lo, hi)
// so a constant error e gives u_k = kp e + k ki e after k updates: a line (the integral of a
// constant), and ki is the integral gain times the sampling period.
//
// Gains. pi_gain<Q> is a mantissa of the format times a power of two: value = mantissa 2^exponent,
// so gains above 1 need no other format. The mantissa's precision is the format's (16 or 32 bits);
// pick the exponent that puts the mantissa in [1/2, 1). The value covers [0, (1 - 2^-F) 2^15]:
// exponents outside [-16, 15] count as the nearest end, and a negative mantissa counts as 0 (a
// regulator that acts the other way is the caller's sign change of the error).
//
// Resolution. The integrator is held with 16 more fraction bits than the output (Q(F+16), in an
// int64), so an increment of 1/65536 LSB still accumulates: a q15 regulator with ki = 2^-10 still
// integrates a 1 LSB error. The proportional term and the increment are exact products rounded once
// to that resolution (ties toward +infinity; for q15 with an exponent of -1 or more they are exact),
// then each is saturated at +-4 (an output of 4 times full scale already saturates any limit). The
// output is the exact sum of the proportional term, the integrator and the feedforward, rounded once
// to the format (ties toward +infinity) and clamped to [lo, hi]: from a given integrator, within
// 0.5 LSB + 2^-16 LSB of the exact law (2^-17 LSB for each of the two rounded products). Over k
// updates the integrator drifts from exact real arithmetic by at most k 2^-17 LSB (none for q15
// with exponents of -1 or more).
//
// Anti-windup: conditional integration (clamping). The integrator takes the increment, or the part
// of it that brings the output exactly to the limit in the increment's direction, or nothing when
// the output is at or beyond that limit already; an increment that leads back out of saturation is
// always taken, and the integrator itself stays within [lo, hi]. So the output meets a limit
// without the integrator winding past it, and leaves the limit as soon as the error turns. Chosen
// over back-calculation because it has no tracking gain to tune, costs a few compares and no
// multiply, and lets the caller express an outside limiter by narrowing the limits each period:
// with a d-priority voltage split, the q regulator's limit is sqrt(m^2 - v_d^2)
// (limit_d_priority({v_d, max}, m).value.q). The price: while the proportional term alone saturates
// the output, the integrator holds, so after a large step it starts from where it was.
//
// Bumpless transfer. preset(value) sets the integrator (clamped to the limits), so with zero error
// and no feedforward the next output is `value`: hand a regulator the voltage another mode was
// applying (six-step to FOC) and the output continues from it. reset() clears the integrator (to
// the limit nearest zero when zero lies outside the limits).
//
// Defined results for every input: limits with lo > hi collapse to the single value
// floor((lo + hi) / 2); set_limit(m) with m < 0 counts as 0 (consistent with limit_magnitude);
// full-scale errors and feedforward are formed exactly; no sum below overflows (each says why).
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/fixed.hpp"

namespace rotorq {

template <typename Q>
struct pi_gain {
  static constexpr int min_exponent = -16;
  static constexpr int max_exponent = 15;

  Q mantissa{};      // a negative mantissa counts as 0
  int exponent = 0;  // value = mantissa 2^exponent; clamped to [min_exponent, max_exponent]

  // The same gain with the mantissa and exponent brought into range.
  constexpr pi_gain normalized() const noexcept {
    const int e =
        exponent < min_exponent ? min_exponent : (exponent > max_exponent ? max_exponent : exponent);
    return {mantissa.raw() < 0 ? Q::zero() : mantissa, e};
  }
};

template <typename Q>
class pi_regulator {
 public:
  using value_type = Q;
  // Fraction bits of the integrator and of the proportional term: 16 more than the output.
  static constexpr int wide_fraction_bits = Q::fraction_bits + 16;

  constexpr pi_regulator(pi_gain<Q> kp, pi_gain<Q> ki) noexcept
      : kp_(kp.normalized()), ki_(ki.normalized()) {}
  constexpr pi_regulator(pi_gain<Q> kp, pi_gain<Q> ki, Q lo, Q hi) noexcept : pi_regulator(kp, ki) {
    set_limits(lo, hi);
  }

  constexpr void set_gains(pi_gain<Q> kp, pi_gain<Q> ki) noexcept {
    kp_ = kp.normalized();
    ki_ = ki.normalized();
  }

  // Output limits [lo, hi]; lo > hi collapses both to floor((lo + hi) / 2). The integrator is
  // clamped into the new limits at once.
  constexpr void set_limits(Q lo, Q hi) noexcept {
    int64_t low = lo.raw(), high = hi.raw();
    if (low > high) {
      // |low + high| < 2^32: no overflow; >> 1 is floor (arithmetic shift, detail/integer.hpp)
      low = high = (low + high) >> 1;
    }
    apply_limits(low, high);
  }
  // Symmetric limits [-m, m]; m < 0 counts as 0.
  constexpr void set_limit(Q m) noexcept {
    const int64_t limit = m.raw() > 0 ? m.raw() : 0;  // -limit >= -max: in range
    apply_limits(-limit, limit);
  }

  // One period: the error reference - measured (exact), the integrator, the limited output.
  constexpr Q update(Q reference, Q measured, Q feedforward = Q::zero()) noexcept {
    const int64_t proportional = term(kp_, reference, measured);                       // |.| <= 2^(W+2)
    const int64_t increment = term(ki_, reference, measured);                          // |.| <= 2^(W+2)
    const int64_t ff = int64_t{feedforward.raw()} * detail::pow2(16);                  // |.| <= 2^W
    const int64_t lo_wide = lo_ * detail::pow2(16), hi_wide = hi_ * detail::pow2(16);  // |.| <= 2^W

    const int64_t held = integrator_;  // within [lo, hi]
    // Conditional integration: the increment, or the part of it that brings the output to the limit
    // in its direction, or nothing when the output is there already. Every value here is below
    // 2^(W+2) + 2^(W+1) < 2^51 in magnitude, so no sum overflows.
    int64_t next = held;
    if (increment > 0) {
      const int64_t room = hi_wide - proportional - ff;  // the integrator that puts the output at hi
      const int64_t moved = held + increment < room ? held + increment : room;
      next = moved > held ? moved : held;
    } else if (increment < 0) {
      const int64_t room = lo_wide - proportional - ff;
      const int64_t moved = held + increment > room ? held + increment : room;
      next = moved < held ? moved : held;
    }
    integrator_ = detail::clamp(next, lo_wide, hi_wide);

    const int64_t unlimited = detail::round_shift(proportional + integrator_ + ff, 16);
    const int64_t limited = detail::clamp(unlimited, lo_, hi_);
    saturated_ = limited != unlimited;
    output_ = Q::saturate(limited);
    return output_;
  }

  // Set the integrator to `value` (clamped to the limits): with zero error and no feedforward the next
  // output is that value.
  constexpr void preset(Q value) noexcept {
    integrator_ = detail::clamp(value.raw(), lo_, hi_) * detail::pow2(16);
  }
  // Clears the integrator: zero, or the limit nearest zero when zero lies outside the limits.
  constexpr void reset() noexcept {
    integrator_ = detail::clamp(0, lo_ * detail::pow2(16), hi_ * detail::pow2(16));
    output_ = Q::zero();
    saturated_ = false;
  }

  constexpr Q output() const noexcept { return output_; }           // the last update's result
  constexpr bool saturated() const noexcept { return saturated_; }  // the last output was clamped
  constexpr Q lower_limit() const noexcept { return Q::saturate(lo_); }
  constexpr Q upper_limit() const noexcept { return Q::saturate(hi_); }
  // The integrator rounded to the format (ties toward +infinity), and its raw Q(F+16) value.
  constexpr Q integrator() const noexcept { return Q::saturate(detail::round_shift(integrator_, 16)); }
  constexpr int64_t integrator_wide() const noexcept { return integrator_; }
  constexpr pi_gain<Q> proportional_gain() const noexcept { return kp_; }
  constexpr pi_gain<Q> integral_gain() const noexcept { return ki_; }

 private:
  static constexpr int W = wide_fraction_bits;

  constexpr void apply_limits(int64_t low, int64_t high) noexcept {
    lo_ = low;
    hi_ = high;
    integrator_ = detail::clamp(integrator_, lo_ * detail::pow2(16), hi_ * detail::pow2(16));
  }
  static constexpr int64_t term_limit = detail::pow2(W + 2);  // 4 in Q(F+16)

  // gain * (reference - measured) in Q(F+16): the exact product p = error_raw mantissa_raw stands for
  // p 2^exponent / 2^(2F), which is p 2^s units of 2^-W with s = exponent + 16 - F
  // (q15: -15..16, q31: -31..0); rounded once when s < 0, saturated at +-term_limit.
  static constexpr int64_t term(pi_gain<Q> gain, Q reference, Q measured) noexcept {
    // The error needs F + 2 bits, so p is formed as the difference of two exact 32 x 32 -> 64
    // products (detail/ops.hpp, the port's multiply), each below 2^(2F) in magnitude:
    // |p| <= (2^(F+1) - 1)(2^F - 1) < 2^63 - 2^32 for F = 31.
    const int32_t m = gain.mantissa.raw();
    const int64_t p = detail::ops::mul_wide(reference.raw(), m) - detail::ops::mul_wide(measured.raw(), m);
    const int s = gain.exponent + 16 - Q::fraction_bits;
    if (s < 0) {
      // the rounding constant is at most 2^30, below the room left under 2^63
      return detail::clamp(detail::round_shift(p, -s), -term_limit, term_limit);
    }
    const int64_t room = term_limit >> s;  // |p| <= room keeps |p 2^s| <= term_limit
    if (p > room) return term_limit;
    if (p < -room) return -term_limit;
    return p * detail::pow2(s);
  }

  pi_gain<Q> kp_{};
  pi_gain<Q> ki_{};
  int64_t lo_ = Q::raw_min;
  int64_t hi_ = Q::raw_max;
  int64_t integrator_ = 0;  // Q(F+16), always within [lo, hi]
  Q output_{};
  bool saturated_ = false;
};

namespace detail {

// Spot check, evaluated by the compiler: a constant error e = 1/4 with kp = 1/2 and ki = 1/16 gives
// u_k = kp e + k ki e = 1/8 + k/64 (a line), and the anti-windup holds the integrator at the limit.
constexpr bool pi_regulator_ramp_is_a_line() noexcept {
  pi_regulator<q15> r({q15::from_raw(16384), 0}, {q15::from_raw(16384), -3});
  const q15 reference = q15::from_raw(8192), measured = q15::zero();
  for (int16_t k = 1; k <= 10; ++k) {
    if (r.update(reference, measured).raw() != 4096 + 512 * k) return false;
  }
  r.set_limit(q15::from_raw(8192));
  for (int k = 0; k < 100; ++k) r.update(reference, measured);
  return r.output().raw() == 8192 && r.saturated() && r.integrator().raw() <= 8192;
}
static_assert(pi_regulator_ramp_is_a_line());

}  // namespace detail

}  // namespace rotorq
