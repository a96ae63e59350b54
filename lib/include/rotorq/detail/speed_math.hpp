// Integer helpers of electrical_speed.hpp: a quotient by Newton reciprocal (no divide instruction)
// and the wide products of a speed by a time.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/newton.hpp"
#include "rotorq/detail/ops.hpp"

namespace rotorq::detail {

// A nonzero value as mantissa * 2^exponent, mantissa in [2^31, 2^32). Values above 32 bits lose
// their low bits (truncated: relative error below 2^-31).
struct mantissa32 {
  uint32_t mantissa;
  int exponent;
};
constexpr mantissa32 normalize32(uint64_t x) noexcept {
  const int length = 64 - leading_zeros(x);  // bit length, 1..64
  if (length <= 32) return {static_cast<uint32_t>(x << (32 - length)), length - 32};
  return {static_cast<uint32_t>(x >> (length - 32)), length - 32};
}

// round(p / 2^shift) for shift >= 1 without forming p + 2^(shift-1) (p may be close to 2^64);
// 0 for shift >= 65.
constexpr uint64_t round_shift_unsigned(uint64_t p, int shift) noexcept {
  if (shift > 64) return 0;
  const uint64_t half_up = p >> (shift - 1);
  return (half_up >> 1) + (half_up & 1);
}

// round(numerator * 2^16 / denominator), both nonzero, saturated to `limit`. The reciprocal of the
// normalised denominator comes from three Newton steps (reciprocal_q30, within 2^-29 relative, rounded
// down), so the quotient is within 2^-28 relative + 0.5 of exact.
constexpr uint64_t quotient_q16(uint64_t numerator, uint64_t denominator, uint64_t limit) noexcept {
  const mantissa32 n = normalize32(numerator);
  const mantissa32 d = normalize32(denominator);
  // 1 / (m_d 2^e_d) = r 2^(-62 - e_d) with r = 2^62 / m_d in (2^30, 2^31]
  const uint32_t r = reciprocal_q30(d.mantissa);
  const uint64_t p = ops::mul_wide_u32(n.mantissa, r);  // < 2^63
  // quotient * 2^16 = p 2^(e_n - e_d - 62 + 16)
  const int shift = 46 - n.exponent + d.exponent;
  if (shift <= 0) return limit;  // p >= 2^61: far beyond any limit used here
  const uint64_t q = round_shift_unsigned(p, shift);
  return q < limit ? q : limit;
}

// floor(speed * ticks / 2^16) for speed < 2^47 and ticks < 2^32: the high and low parts of the speed
// are multiplied separately so no product exceeds 2^63.
// For a speed magnitude below 2^47 (an electrical_speed's), so that both parts are 32-bit values.
constexpr uint64_t steps_in(uint64_t speed, uint32_t ticks) noexcept {
  const uint64_t whole = ops::mul_wide_u32(static_cast<uint32_t>(speed >> 16), ticks);  // < 2^31 * 2^32
  const uint64_t fraction = ops::mul_wide_u32(static_cast<uint32_t>(speed & 0xffffu), ticks) >> 16;  // < 2^32
  return whole + fraction;
}

}  // namespace rotorq::detail
