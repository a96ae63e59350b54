// The primitive operations of the generic port: saturation, saturating add and subtract, rounding
// multiplies and the exact 32 x 32 -> 64 product, in portable C++.
//
// These definitions are the specification of every port: a port (ports/<name>) may replace any of
// them with faster code for its core, and must return exactly these values for every input. The
// rounding rule is the library's: to nearest, ties toward +infinity, then saturation. None of them
// overflows a signed integer, for any input.
#pragma once

#include "rotorq/detail/integer.hpp"

namespace rotorq::detail::generic {

inline constexpr int32_t int32_max = 2147483647;
inline constexpr int32_t int32_min = -int32_max - 1;

// Saturate into the int16 / int32 range (distinct names: int32_t is long on some targets, so
// overloads on int32_t and int64_t would be ambiguous for an int argument).
constexpr int16_t sat16(int32_t v) noexcept {
  return static_cast<int16_t>(v < -32768 ? -32768 : (v > 32767 ? 32767 : v));
}
constexpr int16_t sat16_wide(int64_t v) noexcept {
  return static_cast<int16_t>(v < -32768 ? -32768 : (v > 32767 ? 32767 : v));
}
constexpr int32_t sat32(int64_t v) noexcept {
  return static_cast<int32_t>(v < int32_min ? int32_min : (v > int32_max ? int32_max : v));
}

// a + b and a - b, saturated.
constexpr int16_t add16(int16_t a, int16_t b) noexcept { return sat16(int32_t{a} + int32_t{b}); }
constexpr int16_t sub16(int16_t a, int16_t b) noexcept { return sat16(int32_t{a} - int32_t{b}); }
constexpr int32_t add32(int32_t a, int32_t b) noexcept { return sat32(int64_t{a} + int64_t{b}); }
constexpr int32_t sub32(int32_t a, int32_t b) noexcept { return sat32(int64_t{a} - int64_t{b}); }

// The exact product of two int32 values; |result| <= 2^62.
constexpr int64_t mul_wide(int32_t a, int32_t b) noexcept { return int64_t{a} * int64_t{b}; }
// The exact product of two uint32 values; result < 2^64.
constexpr uint64_t mul_wide_u32(uint32_t a, uint32_t b) noexcept { return uint64_t{a} * uint64_t{b}; }
// The same as mul_wide, where k is a compile-time constant (a port may keep a compiler from expanding the
// product into shifts and additions).
constexpr int64_t mul_wide_by_constant(int32_t a, int32_t k) noexcept { return mul_wide(a, k); }

// a * b / 2^15 and a * b / 2^31, rounded and saturated (only -1 * -1 saturates).
constexpr int16_t mul_q15(int16_t a, int16_t b) noexcept {
  return sat16((int32_t{a} * int32_t{b} + (1 << 14)) >> 15);  // |a b| <= 2^30
}
constexpr int32_t mul_q31(int32_t a, int32_t b) noexcept {
  return sat32(round_shift(mul_wide(a, b), 31));  // |a b| <= 2^62
}

// (a b + c d) / 2^F and (a b - c d) / 2^F, each exact sum rounded once and saturated. The sum can
// reach 2^(2F+1) and overflow the product type: it is halved exactly first (floor), and floor((p + r)
// / 2) rounded from 2^(F-1) gives the same value as p + r rounded from 2^F.
constexpr int16_t sum_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) noexcept {
  return sat16(round_shift(half_sum(int32_t{a} * int32_t{b}, int32_t{c} * int32_t{d}), 14));
}
constexpr int16_t difference_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) noexcept {
  return sat16(round_shift(half_sum(int32_t{a} * int32_t{b}, -(int32_t{c} * int32_t{d})), 14));
}
constexpr int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return sat32(round_shift(half_sum(mul_wide(a, b), mul_wide(c, d)), 30));
}
constexpr int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return sat32(round_shift(half_sum(mul_wide(a, b), -mul_wide(c, d)), 30));
}

}  // namespace rotorq::detail::generic
