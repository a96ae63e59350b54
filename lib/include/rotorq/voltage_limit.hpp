// Voltage-vector limiters: keep a requested voltage inside what the inverter can produce.
//
//   limit_magnitude(v, m)    any frame (stationary or rotating): if |v| > m, scale v by m / |v|,
//                            which keeps its angle (the usual choice for the regulator output)
//   limit_d_priority(v, m)   rotating frame: d first, clamped to [-m, m]; then q clamped to
//                            +-sqrt(m^2 - d^2), so the flux-producing axis keeps what it asked for
//
// Both return the limited vector and whether it had to be limited. A negative m counts as 0.
//
// No division and no square root: |v|^2 is formed exactly, 1/sqrt(|v|^2) comes from a table start and
// three Newton steps (detail/newton.hpp; shifts and multiplies only, the same time for every input),
// and sqrt(x) = x / sqrt(x). The scale factor is within 2^-28 of m / |v| (relative), so a limited
// output is within 0.5 LSB + |v| 2^-28 of the exact one: below 0.51 LSB for q15, a few LSB for q31.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/newton.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

namespace rotorq {

template <typename T>
struct limited {
  T value{};
  bool clipped = false;  // the input exceeded the limit and was changed
};

namespace detail {

// x^2 + y^2 for raw values in Q62 (exact; below 2^64).
template <int F>
constexpr uint64_t square_sum_q62(int32_t x, int32_t y) noexcept {
  const uint64_t sum =
      static_cast<uint64_t>(ops::mul_wide(x, x)) + static_cast<uint64_t>(ops::mul_wide(y, y));
  return sum << (62 - 2 * F);
}

// Scale (x, y) by m / |(x, y)| when |(x, y)| > m; returns whether it did.
template <int F>
constexpr bool scale_to_magnitude(int32_t& x, int32_t& y, int32_t m) noexcept {
  const int32_t limit = m > 0 ? m : 0;
  const uint64_t length_squared = square_sum_q62<F>(x, y);
  if (length_squared <= square_sum_q62<F>(limit, 0)) return false;
  const scaled_value inverse_length = reciprocal_sqrt_of_q62(length_squared);
  // k = m / |v| in Q30: m_raw R 2^exponent / 2^F; k < 1 (up to the error of R), so it fits.
  const int64_t k30 = scale_by_power_of_two(
      static_cast<int64_t>(ops::mul_wide_u32(static_cast<uint32_t>(limit), inverse_length.mantissa)),
      inverse_length.exponent - F);
  // k30 <= 2^30 (plus the error of R), so it fits an int32 and x k30 is an exact 32 x 32 product
  x = static_cast<int32_t>(round_shift(ops::mul_wide(x, static_cast<int32_t>(k30)), 30));
  y = static_cast<int32_t>(round_shift(ops::mul_wide(y, static_cast<int32_t>(k30)), 30));
  return true;
}

// sqrt(s / 2^62) as a raw value of fixed<F>, for 0 <= s <= 2^62 (a value of at most 1).
template <int F>
constexpr int32_t sqrt_q62_to_raw(uint64_t s) noexcept {
  if (s == 0) return 0;
  const scaled_value inverse_root = reciprocal_sqrt_of_q62(s);
  // sqrt(S) = S / sqrt(S): the mantissa of S, (s << shift) >> 32 = M in Q32, times 1/sqrt(M) in Q30,
  // gives sqrt(M) in Q30; then sqrt(S) = sqrt(M) 2^(1 - shift/2) = sqrt(M) 2^(-exponent).
  const int shift = leading_zeros(s) & ~1;
  // cppcheck-suppress shiftTooManyBits ; s is a 64-bit value
  const auto m = static_cast<uint32_t>((s << shift) >> 32);
  // cppcheck-suppress shiftTooManyBits ; the product is a 64-bit value
  const auto root30 = static_cast<int64_t>(ops::mul_wide_u32(m, inverse_root.mantissa) >> 32);
  const int64_t raw = scale_by_power_of_two(root30, F - 30 - inverse_root.exponent);
  return static_cast<int32_t>(raw < pow2(F) - 1 ? raw : pow2(F) - 1);
}

}  // namespace detail

template <int F>
constexpr limited<stationary<fixed<F>>> limit_magnitude(stationary<fixed<F>> v, fixed<F> m) noexcept {
  int32_t x = v.alpha.raw(), y = v.beta.raw();
  const bool clipped = detail::scale_to_magnitude<F>(x, y, m.raw());
  return {{fixed<F>::saturate(x), fixed<F>::saturate(y)}, clipped};
}

template <int F>
constexpr limited<rotating<fixed<F>>> limit_magnitude(rotating<fixed<F>> v, fixed<F> m) noexcept {
  int32_t x = v.d.raw(), y = v.q.raw();
  const bool clipped = detail::scale_to_magnitude<F>(x, y, m.raw());
  return {{fixed<F>::saturate(x), fixed<F>::saturate(y)}, clipped};
}

template <int F>
constexpr limited<rotating<fixed<F>>> limit_d_priority(rotating<fixed<F>> v, fixed<F> m) noexcept {
  const int64_t limit = m.raw() > 0 ? m.raw() : 0;
  const int64_t d = detail::clamp(v.d.raw(), -limit, limit);
  const uint64_t room = detail::square_sum_q62<F>(static_cast<int32_t>(limit), 0) -
                        detail::square_sum_q62<F>(static_cast<int32_t>(d), 0);
  const int64_t q_limit = detail::sqrt_q62_to_raw<F>(room);
  const int64_t q = detail::clamp(v.q.raw(), -q_limit, q_limit);
  return {{fixed<F>::saturate(d), fixed<F>::saturate(q)}, d != v.d.raw() || q != v.q.raw()};
}

}  // namespace rotorq
