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
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

namespace rotorq {

namespace detail {

// q15: an integer combination of raw inputs (|n| < 2^18) times a constant rounded to Q31; the
// product is exact and below 2^49. The result is rounded from Q46 to Q15.
constexpr int64_t times_q31_constant(int64_t n, uint64_t k) noexcept {
  return n * int64_t{constant<q31>(k).raw()};
}
constexpr q15 round_q46(int64_t v) noexcept { return q15::saturate(round_shift(v, 31)); }

// q31: sums of Q62 terms below 2^63 in magnitude (each call site says why), rounded to Q31.
constexpr q31 round_q62(int64_t v) noexcept { return q31::saturate(round_shift(v, 31)); }

}  // namespace detail

// ---- amplitude-invariant ----

constexpr stationary<q15> clarke(phases<q15> i) noexcept {
  const int64_t a = i.a.raw(), b = i.b.raw(), c = i.c.raw();
  return {detail::round_q46(detail::times_q31_constant(2 * a - b - c, constants::one_third)),
          detail::round_q46(detail::times_q31_constant(b - c, constants::inv_sqrt3))};
}

constexpr stationary<q31> clarke(phases<q31> i) noexcept {
  using detail::mul_q31_by_q62;
  // |alpha62| <= (2/3 + 1/3 + 1/3) 2^62, |beta62| <= 2/sqrt(3) 2^62
  const int64_t alpha62 = mul_q31_by_q62(i.a.raw(), constants::two_thirds) -
                          mul_q31_by_q62(i.b.raw(), constants::one_third) -
                          mul_q31_by_q62(i.c.raw(), constants::one_third);
  const int64_t beta62 =
      mul_q31_by_q62(i.b.raw(), constants::inv_sqrt3) - mul_q31_by_q62(i.c.raw(), constants::inv_sqrt3);
  return {detail::round_q62(alpha62), detail::round_q62(beta62)};
}

constexpr stationary<q15> clarke_balanced(q15 a, q15 b) noexcept {
  const int64_t n = int64_t{a.raw()} + 2 * int64_t{b.raw()};
  return {a, detail::round_q46(detail::times_q31_constant(n, constants::inv_sqrt3))};
}

constexpr stationary<q31> clarke_balanced(q31 a, q31 b) noexcept {
  // |beta62| <= 3/sqrt(3) 2^62
  const int64_t beta62 = detail::mul_q31_by_q62(a.raw(), constants::inv_sqrt3) +
                         2 * detail::mul_q31_by_q62(b.raw(), constants::inv_sqrt3);
  return {a, detail::round_q62(beta62)};
}

constexpr phases<q15> inverse_clarke(stationary<q15> v) noexcept {
  const int64_t half_alpha46 = int64_t{v.alpha.raw()} * detail::pow2(30);  // alpha/2 in Q46
  const int64_t beta_part46 = detail::times_q31_constant(v.beta.raw(), constants::sqrt3_over_2);
  return {v.alpha, detail::round_q46(beta_part46 - half_alpha46),
          detail::round_q46(-beta_part46 - half_alpha46)};
}

constexpr phases<q31> inverse_clarke(stationary<q31> v) noexcept {
  const int64_t half_alpha62 = int64_t{v.alpha.raw()} * detail::pow2(30);  // alpha/2 in Q62
  const int64_t beta_part62 = detail::mul_q31_by_q62(v.beta.raw(), constants::sqrt3_over_2);
  // |b62|, |c62| <= (1/2 + sqrt(3)/2) 2^62
  return {v.alpha, detail::round_q62(beta_part62 - half_alpha62),
          detail::round_q62(-beta_part62 - half_alpha62)};
}

// ---- power-invariant ----

constexpr stationary<q15> clarke_power_invariant(phases<q15> i) noexcept {
  const int64_t a = i.a.raw(), b = i.b.raw(), c = i.c.raw();
  return {detail::round_q46(detail::times_q31_constant(2 * a - b - c, constants::inv_sqrt6)),
          detail::round_q46(detail::times_q31_constant(b - c, constants::inv_sqrt2))};
}

constexpr stationary<q31> clarke_power_invariant(phases<q31> i) noexcept {
  using detail::mul_q31_by_q62;
  // |alpha62| <= (2/sqrt(6) + 2/sqrt(6)) 2^62, |beta62| <= 2/sqrt(2) 2^62
  const int64_t alpha62 = mul_q31_by_q62(i.a.raw(), constants::sqrt2_over_3) -
                          mul_q31_by_q62(i.b.raw(), constants::inv_sqrt6) -
                          mul_q31_by_q62(i.c.raw(), constants::inv_sqrt6);
  const int64_t beta62 =
      mul_q31_by_q62(i.b.raw(), constants::inv_sqrt2) - mul_q31_by_q62(i.c.raw(), constants::inv_sqrt2);
  return {detail::round_q62(alpha62), detail::round_q62(beta62)};
}

constexpr phases<q15> inverse_clarke_power_invariant(stationary<q15> v) noexcept {
  const int64_t alpha_part46 = detail::times_q31_constant(v.alpha.raw(), constants::inv_sqrt6);
  const int64_t beta_part46 = detail::times_q31_constant(v.beta.raw(), constants::inv_sqrt2);
  return {detail::round_q46(detail::times_q31_constant(v.alpha.raw(), constants::sqrt2_over_3)),
          detail::round_q46(beta_part46 - alpha_part46), detail::round_q46(-beta_part46 - alpha_part46)};
}

constexpr phases<q31> inverse_clarke_power_invariant(stationary<q31> v) noexcept {
  const int64_t alpha_part62 = detail::mul_q31_by_q62(v.alpha.raw(), constants::inv_sqrt6);
  const int64_t beta_part62 = detail::mul_q31_by_q62(v.beta.raw(), constants::inv_sqrt2);
  // |b62|, |c62| <= (1/sqrt(6) + 1/sqrt(2)) 2^62
  return {detail::round_q62(detail::mul_q31_by_q62(v.alpha.raw(), constants::sqrt2_over_3)),
          detail::round_q62(beta_part62 - alpha_part62), detail::round_q62(-beta_part62 - alpha_part62)};
}

}  // namespace rotorq
