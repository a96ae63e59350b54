// The quarter-wave sine table behind rotorq::sin_cos, built by constexpr integer arithmetic.
//
//   sine_table.value[k] = round(sin((2k + 1) * pi / 1024) * 2^31),  k = 0 .. 255
//
// Entry k is the sine at the centre of the k-th of 256 equal segments of the first quadrant, so no
// entry is 1 and each fits an int32_t; the cosine at the same centre is entry 255 - k. 1024 bytes.
//
// The entries are computed with a Taylor series in Q62 fixed point (no floating point, so every
// compiler and target produces the same bits); the truncation and rounding errors of the series stay
// below 2^-56, far under the 2^-32 half-step of the stored Q31 value. tests/test_sin_cos.cpp checks
// every entry against MPFR's correctly rounded sine.
#pragma once

#include "rotorq/constants.hpp"
#include "rotorq/detail/integer.hpp"

namespace rotorq::detail {

inline constexpr int sine_segments = 256;  // per quadrant

struct uint128_parts {
  uint64_t high;
  uint64_t low;
};

// Full 128-bit product of two 64-bit values, from 32-bit pieces.
constexpr uint128_parts multiply_wide(uint64_t a, uint64_t b) noexcept {
  const uint64_t a_lo = a & 0xffffffffu, a_hi = a >> 32;
  const uint64_t b_lo = b & 0xffffffffu, b_hi = b >> 32;
  const uint64_t lo_lo = a_lo * b_lo;
  const uint64_t hi_lo = a_hi * b_lo;
  const uint64_t lo_hi = a_lo * b_hi;
  const uint64_t hi_hi = a_hi * b_hi;
  const uint64_t middle = (lo_lo >> 32) + (hi_lo & 0xffffffffu) + (lo_hi & 0xffffffffu);
  return {hi_hi + (hi_lo >> 32) + (lo_hi >> 32) + (middle >> 32), (middle << 32) | (lo_lo & 0xffffffffu)};
}

// floor(a * b / 2^62) for Q62 operands whose product stays below 2^64 * 2^62.
constexpr uint64_t multiply_q62(uint64_t a, uint64_t b) noexcept {
  const uint128_parts p = multiply_wide(a, b);
  return (p.high << 2) | (p.low >> 62);
}

// sin(x) * 2^62 for 0 <= x <= pi/2 given as x * 2^62: x - x^3/3! + x^5/5! - ...
constexpr int64_t sine_q62(uint64_t x) noexcept {
  const uint64_t x_squared = multiply_q62(x, x);
  int64_t sum = static_cast<int64_t>(x);
  uint64_t term = x;
  for (uint64_t n = 1; term != 0; ++n) {
    term = multiply_q62(term, x_squared) / ((2 * n) * (2 * n + 1));
    sum += (n % 2 == 1) ? -static_cast<int64_t>(term) : static_cast<int64_t>(term);
  }
  return sum;
}

struct sine_table_type {
  int32_t value[sine_segments];
};

constexpr sine_table_type make_sine_table() noexcept {
  sine_table_type table{};
  for (int k = 0; k < sine_segments; ++k) {
    // centre angle (2k + 1) * pi / 1024 in Q62: the 128-bit product shifted right by 10
    const uint128_parts centre_wide = multiply_wide(2 * static_cast<uint64_t>(k) + 1, constants::pi);
    const uint64_t centre = (centre_wide.high << 54) | (centre_wide.low >> 10);
    table.value[k] = static_cast<int32_t>(round_shift(sine_q62(centre), 31));
  }
  return table;
}

inline constexpr sine_table_type sine_table = make_sine_table();

// Spot checks (the correctly rounded values; tests/test_sin_cos.cpp compares all 256 with MPFR).
static_assert(sine_table.value[0] == 6588387);
static_assert(sine_table.value[1] == 19764913);
static_assert(sine_table.value[100] == 1241919421);
static_assert(sine_table.value[254] == 2147392690);
static_assert(sine_table.value[255] == 2147473542);
static_assert(sizeof(sine_table) == 1024);

}  // namespace rotorq::detail
