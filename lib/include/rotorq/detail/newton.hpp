// Division-free reciprocal and reciprocal square root for the limiters and the DC-bus scaling.
//
// Cores without a hardware divider (Cortex-M0+, RV32IMC without a fast divide) pay dozens of cycles
// for a division and more for a square root. These use only shifts, 32x32->64 multiplies and a
// fixed number of Newton-Raphson steps, so they take the same time for every input and give the same
// bits on every target.
//
//   normalize(x)             x = m * 2^-k with m in [2^31, 2^32)
//   reciprocal_q30(m)        round-down of 2^30 / (m / 2^32), for m in [2^31, 2^32): 1/M in (1, 2]
//   reciprocal_sqrt_q30(m)   2^30 / sqrt(m / 2^32), for m in [2^30, 2^32): 1/sqrt(M) in (1, 2]
// Both are within 2 units of 2^-30 of the exact value (relative error below 2^-29), which
// tests/test_newton.cpp checks against exact integer bounds over sweeps of the whole input range.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"

namespace rotorq::detail {

// Number of leading zero bits of a nonzero value (a portable binary search: Cortex-M0+ has no CLZ).
constexpr int leading_zeros(uint32_t x) noexcept {
  int n = 0;
  if (x <= 0x0000ffffu) {
    n += 16;
    x <<= 16;
  }
  if (x <= 0x00ffffffu) {
    n += 8;
    x <<= 8;
  }
  if (x <= 0x0fffffffu) {
    n += 4;
    x <<= 4;
  }
  if (x <= 0x3fffffffu) {
    n += 2;
    x <<= 2;
  }
  if (x <= 0x7fffffffu) n += 1;
  return n;
}

// 1 / M in Q30 for M = m / 2^32 in [1/2, 1). Start from the line 48/17 - 32/17 M (the best linear
// start on this interval, relative error <= 1/17) and take three Newton steps R <- R (2 - M R).
constexpr uint32_t reciprocal_q30(uint32_t m) noexcept {
  // 48/17 and 32/17 in Q30
  // cppcheck-suppress shiftTooManyBits ; the product is a 64-bit value
  // Every product is of two values below 2^32 (R stays in [2^29.9, 2^31], M R below 2^31).
  using ops::mul_wide_u32;
  auto r = static_cast<uint32_t>(3031741620u - (mul_wide_u32(2021161081u, m) >> 32));
  for (int step = 0; step < 3; ++step) {
    const auto mr = static_cast<uint32_t>(mul_wide_u32(m, r) >> 32);  // M R in Q30, close to 2^30
    r = static_cast<uint32_t>(mul_wide_u32(r, (uint32_t{1} << 31) - mr) >> 30);
  }
  return r;
}

// 1 / sqrt(M) in Q30 for M = m / 2^32 in [1/4, 1). The start comes from a table of 1/sqrt(M) at
// the centres of the 24 steps of width 1/32 (indexed by the top five bits of m; relative error
// <= 3%), then three Newton steps R <- R (3 - M R^2) / 2.
constexpr uint64_t integer_sqrt(uint64_t x) noexcept {
  uint64_t root = 0;
  for (uint64_t bit = uint64_t{1} << 62; bit != 0; bit >>= 2) {
    if (x >= root + bit) {
      x -= root + bit;
      root = (root >> 1) + bit;
    } else {
      root >>= 1;
    }
  }
  return root;
}

struct reciprocal_sqrt_start_type {
  uint32_t value[24];
};
constexpr reciprocal_sqrt_start_type make_reciprocal_sqrt_start() noexcept {
  reciprocal_sqrt_start_type t{};
  for (uint32_t i = 0; i < 24; ++i) {
    // centre of step i: M = (8 + i + 1/2) / 32, in Q60; 1/sqrt(M) in Q30 = 2^60 / sqrt(M 2^60)
    const uint64_t centre60 = (2 * uint64_t{8 + i} + 1) << 54;
    t.value[i] = static_cast<uint32_t>((uint64_t{1} << 60) / integer_sqrt(centre60));
  }
  return t;
}
inline constexpr reciprocal_sqrt_start_type reciprocal_sqrt_start = make_reciprocal_sqrt_start();

constexpr uint32_t reciprocal_sqrt_q30(uint32_t m) noexcept {
  // R stays at or below 2^31 (1/sqrt(M) <= 2), so R, R^2 / 2^30 (up to 2^32, hence the split) and
  // 3 2^30 - M R^2 are products of values below 2^32.
  using ops::mul_wide_u32;
  uint32_t r = reciprocal_sqrt_start.value[(m >> 27) - 8];
  for (int step = 0; step < 3; ++step) {
    const uint64_t r_squared = mul_wide_u32(r, r) >> 30;  // Q30, <= 2^32
    const uint64_t m_r_squared =                          // M R^2 in Q30, close to 2^30
        (mul_wide_u32(m, static_cast<uint32_t>(r_squared)) +
         ((r_squared >> 32) != 0 ? uint64_t{m} << 32 : 0)) >>
        32;
    r = static_cast<uint32_t>(mul_wide_u32(r, static_cast<uint32_t>((uint64_t{3} << 30) - m_r_squared)) >>
                              31);
  }
  return r;
}

// Leading zero bits of a nonzero 64-bit value.
constexpr int leading_zeros(uint64_t x) noexcept {
  const auto high = static_cast<uint32_t>(x >> 32);
  return high != 0 ? leading_zeros(high) : 32 + leading_zeros(static_cast<uint32_t>(x));
}

// A positive value held as mantissa * 2^(exponent - 30), mantissa in Q30.
struct scaled_value {
  uint32_t mantissa;
  int exponent;
};

// 1 / sqrt(s / 2^62) for s > 0 (s / 2^62 < 4): the mantissa is within 2 units of 2^-30 of the exact
// value relative to 2^exponent.
constexpr scaled_value reciprocal_sqrt_of_q62(uint64_t s) noexcept {
  const int shift = leading_zeros(s) & ~1;  // even, so the exponent halves exactly
  const auto m = static_cast<uint32_t>((s << shift) >> 32);
  // s / 2^62 = (m / 2^32) 2^(2 - shift), so 1/sqrt = (1/sqrt(M)) 2^((shift - 2) / 2)
  return {reciprocal_sqrt_q30(m), (shift - 2) / 2};
}

// x * 2^shift for a signed shift, rounding to nearest (ties toward +infinity) when shifting right.
// The caller keeps the result within int64 (each call site says why).
constexpr int64_t scale_by_power_of_two(int64_t x, int shift) noexcept {
  if (shift >= 0) return x * pow2(shift);
  return round_shift(x, -shift);
}

// floor(v * r / 2^30) for r <= 2^30 and |v r / 2^30| < 2^62, splitting v so that no product
// overflows.
constexpr int64_t multiply_q30(int64_t v, uint32_t r) noexcept {
  // cppcheck-suppress unreadVariable ; read in the return statement
  const auto high = static_cast<int32_t>(v >> 32);                   // |high| < 2^31
  const auto low = static_cast<uint32_t>(static_cast<uint64_t>(v));  // [0, 2^32)
  // high r < 2^61 and low r < 2^62: exact 32 x 32 -> 64 products (r <= 2^30 fits an int32)
  return ops::mul_wide(high, static_cast<int32_t>(r)) * 4 +
         static_cast<int64_t>(ops::mul_wide_u32(low, r) >> 30);
}

}  // namespace rotorq::detail
