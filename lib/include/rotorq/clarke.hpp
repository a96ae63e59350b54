// Clarke transforms: three phase quantities <-> the stationary frame (alpha along phase a).
//
// Amplitude-invariant (the default; a balanced set of amplitude A gives |alpha + j beta| = A):
//   clarke:            alpha = (2a - b - c) / 3            beta = (b - c) / sqrt(3)
//   clarke_balanced:   alpha = a                           beta = (a + 2b) / sqrt(3)   (c = -a - b)
//   inverse_clarke:    a = alpha   b = -alpha/2 + sqrt(3)/2 beta   c = -alpha/2 - sqrt(3)/2 beta
// Power-invariant (the matrix is orthonormal on the zero-sequence-free subspace):
//   clarke_power_invariant:          alpha = (2a - b - c) / sqrt(6)   beta = (b - c) / sqrt(2)
//   inverse_clarke_power_invariant:  a = sqrt(2/3) alpha
//                                    b = -alpha / sqrt(6) + beta / sqrt(2)
//                                    c = -alpha / sqrt(6) - beta / sqrt(2)
//
// Accuracy (against the exact value of the same inputs): each output is computed from exact
// products with one rounding at the end (ties toward +infinity), then saturated. q15 multiplies by
// the constant rounded to Q31, q31 by the Q62 constant split in two words, so the constant's own
// error stays below 2^-15 LSB: |error| <= 0.5 LSB + 2^-15 LSB, and clarke's alpha is exactly the
// correctly rounded value. Outputs that exceed the range (unbalanced inputs near full scale, for
// example clarke_balanced with a + 2b > sqrt(3)) saturate.
#pragma once

#include "rotorq/constants.hpp"
#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

namespace rotorq {

namespace detail {

// Wide values: a raw value times 2^31, held in int64 (Q46 for q15, Q62 for q31), so a product with a
// constant keeps all its bits until the one rounding at the end.
// floor(x * k / 2^31) for a Q62 constant 0 <= k < 2^62 (a value below 1), exact to the last bit of
// the Q62 result: with k = high 2^31 + low (high, low < 2^31) it is x high + floor(x low / 2^31),
// two exact 32 x 32 -> 64 products. |result| <= 2^62.
constexpr int64_t mul_q31_by_q62(int32_t x, uint64_t k) noexcept {
  const auto high = static_cast<int32_t>(k >> 31);
  const auto low = static_cast<int32_t>(k & 0x7fffffffu);
  return ops::mul_wide(x, high) + (ops::mul_wide(x, low) >> 31);
}

template <int F>
struct wide;
template <>
struct wide<15> {
  // n (an integer combination of raw inputs, |n| < 2^18) times the constant rounded to Q31: exact,
  // below 2^49.
  static constexpr int64_t times(int64_t n, uint64_t k62) noexcept {
    return ops::mul_wide(static_cast<int32_t>(n), constant<q31>(k62).raw());
  }
};
template <>
struct wide<31> {
  // x times the Q62 constant split in two words; |result| <= 2^62.
  static constexpr int64_t times(int32_t x, uint64_t k62) noexcept { return mul_q31_by_q62(x, k62); }
};

// Round a wide value to the format (ties toward +infinity) and saturate. Call sites keep |v| below
// 2^63 - 2^30.
template <int F>
constexpr fixed<F> round_wide(int64_t v) noexcept {
  return fixed<F>::saturate(round_shift(v, 31));
}

// The three phase values of inverse_clarke before rounding; |b|, |c| <= (1/2 + sqrt(3)/2) 2^(F+31).
template <int F>
constexpr phases<int64_t> inverse_clarke_wide(stationary<fixed<F>> v) noexcept {
  const int64_t half_alpha = int64_t{v.alpha.raw()} * pow2(30);
  const int64_t beta_part = wide<F>::times(v.beta.raw(), constants::sqrt3_over_2);
  return {int64_t{v.alpha.raw()} * pow2(31), beta_part - half_alpha, -beta_part - half_alpha};
}

}  // namespace detail

namespace detail {

// Both forward transforms have the shape alpha = k_alpha (2a - b - c), beta = k_beta (b - c).
// q15 forms the integer combinations first (|n| < 2^18) and multiplies once; q31 multiplies each
// input, as its combinations would not fit 32 bits: |alpha| <= 4 k_alpha 2^62 and
// |beta| <= 2 k_beta 2^62, both below 2^63 for the constants used (k_alpha <= 1/sqrt(6) ~ 0.41).
template <int F>
constexpr stationary<fixed<F>> forward_clarke(phases<fixed<F>> i, uint64_t k_alpha,
                                              uint64_t k_beta) noexcept {
  if constexpr (F == 15) {
    const int64_t a = i.a.raw(), b = i.b.raw(), c = i.c.raw();
    return {round_wide<15>(wide<15>::times(2 * a - b - c, k_alpha)),
            round_wide<15>(wide<15>::times(b - c, k_beta))};
  } else {
    const int64_t alpha = 2 * wide<31>::times(i.a.raw(), k_alpha) - wide<31>::times(i.b.raw(), k_alpha) -
                          wide<31>::times(i.c.raw(), k_alpha);
    const int64_t beta = wide<31>::times(i.b.raw(), k_beta) - wide<31>::times(i.c.raw(), k_beta);
    return {round_wide<31>(alpha), round_wide<31>(beta)};
  }
}

}  // namespace detail

// ---- amplitude-invariant ----

template <int F>
constexpr stationary<fixed<F>> clarke(phases<fixed<F>> i) noexcept {
  return detail::forward_clarke(i, constants::one_third, constants::inv_sqrt3);
}

constexpr stationary<q15> clarke_balanced(q15 a, q15 b) noexcept {
  const int64_t n = int64_t{a.raw()} + 2 * int64_t{b.raw()};
  return {a, detail::round_wide<15>(detail::wide<15>::times(n, constants::inv_sqrt3))};
}

constexpr stationary<q31> clarke_balanced(q31 a, q31 b) noexcept {
  // |beta62| <= 3/sqrt(3) 2^62
  const int64_t beta62 = detail::mul_q31_by_q62(a.raw(), constants::inv_sqrt3) +
                         2 * detail::mul_q31_by_q62(b.raw(), constants::inv_sqrt3);
  return {a, detail::round_wide<31>(beta62)};
}

template <int F>
constexpr phases<fixed<F>> inverse_clarke(stationary<fixed<F>> v) noexcept {
  const phases<int64_t> w = detail::inverse_clarke_wide(v);
  return {v.alpha, detail::round_wide<F>(w.b), detail::round_wide<F>(w.c)};
}

// ---- power-invariant ----

template <int F>
constexpr stationary<fixed<F>> clarke_power_invariant(phases<fixed<F>> i) noexcept {
  return detail::forward_clarke(i, constants::inv_sqrt6, constants::inv_sqrt2);
}

template <int F>
constexpr phases<fixed<F>> inverse_clarke_power_invariant(stationary<fixed<F>> v) noexcept {
  const int64_t alpha_part = detail::wide<F>::times(v.alpha.raw(), constants::inv_sqrt6);
  const int64_t beta_part = detail::wide<F>::times(v.beta.raw(), constants::inv_sqrt2);
  // |b|, |c| <= (1/sqrt(6) + 1/sqrt(2)) 2^(F+31)
  return {detail::round_wide<F>(detail::wide<F>::times(v.alpha.raw(), constants::sqrt2_over_3)),
          detail::round_wide<F>(beta_part - alpha_part), detail::round_wide<F>(-beta_part - alpha_part)};
}

}  // namespace rotorq
