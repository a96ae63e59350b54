// Integer helpers shared by the rotorq headers: fixed-width types, rounding shifts and saturation.
//
// Only <stdint.h> is used, so the headers build with a toolchain that ships no C++ standard library
// (for example a bare-metal GCC with newlib/picolibc but no libstdc++).
#pragma once

#include <stdint.h>

namespace rotorq::detail {

// Right shifts of negative values are implementation-defined before C++20; every compiler rotorq
// supports (GCC, Clang) defines them as arithmetic shifts, and the rounding below relies on that.
// (cppcheck calls these shifts undefined; they are implementation-defined, which is what is checked.)
// cppcheck-suppress shiftNegativeLHS
static_assert((-1 >> 1) == -1, "rotorq needs arithmetic right shifts of negative integers");
// cppcheck-suppress shiftNegativeLHS
static_assert((int64_t{-3} >> 1) == -2, "rotorq needs arithmetic right shifts of negative integers");

// Type selection without <type_traits>.
template <bool Condition, typename IfTrue, typename IfFalse>
struct select {
  using type = IfTrue;
};
template <typename IfTrue, typename IfFalse>
struct select<false, IfTrue, IfFalse> {
  using type = IfFalse;
};

inline constexpr int64_t int64_max = 9223372036854775807;
inline constexpr int64_t int64_min = -int64_max - 1;

// Power of two as a signed 64-bit value, for 0 <= n <= 62.
constexpr int64_t pow2(int n) noexcept { return int64_t{1} << n; }

// Round value / 2^shift to nearest, ties toward +infinity: floor((value + 2^(shift-1)) / 2^shift).
// This is the rule of a rounding multiply-high instruction. Every call site keeps value + 2^(shift-1)
// inside the int64 range (each one says why).
constexpr int64_t round_shift(int64_t value, int shift) noexcept {
  return (value + pow2(shift - 1)) >> shift;
}
constexpr int32_t round_shift(int32_t value, int shift) noexcept {
  return (value + (int32_t{1} << (shift - 1))) >> shift;
}

// Clamp a wide value into [lo, hi].
constexpr int64_t clamp(int64_t value, int64_t lo, int64_t hi) noexcept {
  return value < lo ? lo : (value > hi ? hi : value);
}

// Two's-complement reinterpretation of a 64-bit pattern, without the implementation-defined
// conversion of an out-of-range unsigned value.
constexpr int64_t to_signed(uint64_t bits) noexcept {
  return bits <= static_cast<uint64_t>(int64_max) ? static_cast<int64_t>(bits)
                                                  : -static_cast<int64_t>(~bits) - 1;
}
constexpr int32_t to_signed(uint32_t bits) noexcept {
  return bits <= 0x7fffffffu ? static_cast<int32_t>(bits) : -static_cast<int32_t>(~bits) - 1;
}
constexpr int16_t to_signed(uint16_t bits) noexcept {
  return static_cast<int16_t>(bits <= 0x7fffu ? static_cast<int32_t>(bits)
                                              : static_cast<int32_t>(bits) - 65536);
}

// floor((p + q) / 2) for any two values, without overflow.
constexpr int64_t half_sum(int64_t p, int64_t q) noexcept { return (p >> 1) + (q >> 1) + (p & q & 1); }
constexpr int32_t half_sum(int32_t p, int32_t q) noexcept { return (p >> 1) + (q >> 1) + (p & q & 1); }

}  // namespace rotorq::detail
