// Primitive operations for cores with 32-bit registers, in portable C++: the ports compose these
// with their own instructions. Each returns exactly what its generic namesake (ops_generic.hpp)
// returns, for every input; tests/test_ports.cpp checks that on the host.
//
// The idea throughout: a 64-bit value is a high word `hi` and a low word `lo`. It fits 32 bits when
// hi is the sign extension of lo, and (hi:lo) >> 31 is 2 hi + (lo >> 31), so saturating it needs
// one comparison of hi instead of a 64-bit compare.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops_generic.hpp"

namespace rotorq::detail::narrow {

using generic::int32_max;
using generic::int32_min;

struct halves {
  int32_t hi;
  uint32_t lo;
};

constexpr halves split(int64_t v) noexcept {
  const auto bits = static_cast<uint64_t>(v);
  return {to_signed(static_cast<uint32_t>(bits >> 32)), static_cast<uint32_t>(bits)};
}
constexpr halves split(uint64_t bits) noexcept {
  return {to_signed(static_cast<uint32_t>(bits >> 32)), static_cast<uint32_t>(bits)};
}

constexpr int32_t sat32(int64_t v) noexcept {
  const halves h = split(v);
  const int32_t low = to_signed(h.lo);
  if (h.hi == (low < 0 ? -1 : 0)) return low;
  return h.hi < 0 ? int32_min : int32_max;
}

// SatFn saturates an int32 into int16 (SSAT on cores that have it).
template <int16_t (*SatFn)(int32_t) noexcept>
constexpr int16_t sat16_wide(int64_t v) noexcept {
  const halves h = split(v);
  const int32_t low = to_signed(h.lo);
  if (h.hi == (low < 0 ? -1 : 0)) return SatFn(low);
  return h.hi < 0 ? int16_t{-32768} : int16_t{32767};
}

// a + b and a - b saturated with 32-bit arithmetic: a sum overflows when both operands have one sign
// and the result the other; a difference when the operands' signs differ and the result's sign is
// the subtrahend's.
constexpr int32_t add32(int32_t a, int32_t b) noexcept {
  const int32_t sum = to_signed(static_cast<uint32_t>(a) + static_cast<uint32_t>(b));
  if (((a ^ sum) & (b ^ sum)) < 0) return a < 0 ? int32_min : int32_max;
  return sum;
}
constexpr int32_t sub32(int32_t a, int32_t b) noexcept {
  const int32_t difference = to_signed(static_cast<uint32_t>(a) - static_cast<uint32_t>(b));
  if (((a ^ b) & (a ^ difference)) < 0) return a < 0 ? int32_min : int32_max;
  return difference;
}

// (hi:lo) >> 31 saturated to int32, for -2^31 <= hi <= 2^31 - 1: 2 hi + (lo >> 31) when
// -2^30 <= hi < 2^30, else the sign's limit.
constexpr int32_t shift31_saturated(halves h) noexcept {
  if (h.hi >= (1 << 30)) return int32_max;
  if (h.hi < -(1 << 30)) return int32_min;
  return h.hi * 2 + static_cast<int32_t>(h.lo >> 31);
}

// The exact product from four 16 x 16 -> 32 multiplies, for cores whose multiplier returns only the
// low 32 bits (Armv6-M's MULS). a = ah 2^16 + al with ah signed and 0 <= al < 2^16, likewise b:
// |ah bh| <= 2^30, |ah bl|, |al bh| < 2^31, al bl < 2^32, so no partial product overflows.
constexpr int64_t mul_wide_16x16(int32_t a, int32_t b) noexcept {
  // an arithmetic right shift (implementation-defined, checked in detail/integer.hpp)
  // cppcheck-suppress shiftNegativeLHS
  const int32_t ah = a >> 16;
  const int32_t bh = b >> 16;
  const uint32_t al = static_cast<uint32_t>(a) & 0xffffu;
  const uint32_t bl = static_cast<uint32_t>(b) & 0xffffu;
  // cppcheck-suppress unreadVariable ; read in the return statement
  const int32_t high = ah * bh;
  const int64_t middle = static_cast<int64_t>(ah * static_cast<int32_t>(bl)) +
                         static_cast<int64_t>(static_cast<int32_t>(al) * bh);
  const uint32_t low = al * bl;
  return int64_t{high} * pow2(32) + middle * pow2(16) + int64_t{low};
}

// The unsigned exact product the same way: ah bh, al bl < 2^32, ah bl + al bh < 2^33.
constexpr uint64_t mul_wide_u32_16x16(uint32_t a, uint32_t b) noexcept {
  const uint32_t ah = a >> 16, al = a & 0xffffu;
  const uint32_t bh = b >> 16, bl = b & 0xffffu;
  const uint64_t middle = static_cast<uint64_t>(ah * bl) + static_cast<uint64_t>(al * bh);
  return (static_cast<uint64_t>(ah * bh) << 32) + (middle << 16) + static_cast<uint64_t>(al * bl);
}

// The exact product written as Armv7-M's SMULL, for products by a constant, which GCC would expand
// into shift-and-add chains (some 20 instructions for 0x55555555). With ROTORQ_PORT_ISA_MODEL (the
// host's check of the ports) it is the plain product.
inline int64_t smull(int32_t a, int32_t b) noexcept {
#if defined(ROTORQ_PORT_ISA_MODEL) || !defined(__ARM_ARCH_ISA_THUMB) || __ARM_ARCH_ISA_THUMB < 2
  return int64_t{a} * int64_t{b};
#else
  uint32_t low = 0;
  uint32_t high = 0;
  __asm__("smull %0, %1, %2, %3" : "=r"(low), "=r"(high) : "r"(a), "r"(b));
  return to_signed((uint64_t{high} << 32) | low);
#endif
}

// MulFn is the exact 32 x 32 -> 64 product of the core.
template <int64_t (*MulFn)(int32_t, int32_t) noexcept>
constexpr int32_t mul_q31(int32_t a, int32_t b) noexcept {
  // a b + 2^30 lies in [-2^62 + 2^31 + 2^30, 2^62 + 2^30]: no overflow.
  return shift31_saturated(split(MulFn(a, b) + pow2(30)));
}

// a b + c d + 2^30 wraps around in 64 bits only for a = b = c = d = -2^31 (both products 2^62);
// the wrapped value's high word is -2^31, which no other input gives (the true sum is at least
// -2^63 + 2^32 + 2^30), so that high word means +infinity.
template <int64_t (*MulFn)(int32_t, int32_t) noexcept>
constexpr int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  const uint64_t sum =
      static_cast<uint64_t>(MulFn(a, b)) + static_cast<uint64_t>(MulFn(c, d)) + (uint64_t{1} << 30);
  const halves h = split(sum);
  return h.hi == int32_min ? int32_max : shift31_saturated(h);
}

// a b - c d + 2^30 lies in [-2^63 + 2^31 + 2^30, 2^63 - 2^31 + 2^30]: no overflow.
template <int64_t (*MulFn)(int32_t, int32_t) noexcept>
constexpr int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  const uint64_t difference =
      static_cast<uint64_t>(MulFn(a, b)) - static_cast<uint64_t>(MulFn(c, d)) + (uint64_t{1} << 30);
  return shift31_saturated(split(difference));
}

}  // namespace rotorq::detail::narrow
