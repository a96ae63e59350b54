// Port for Cortex-M cores without the DSP extension: Cortex-M0/M0+ (Armv6-M) and Cortex-M3
// (Armv7-M). Selected by ROTORQ_PORT_CORTEX_M_BASE (CMake: -DROTORQ_PORT=cortex_m_base).
//
// The gain is mostly in the 64-bit work: saturation of a 64-bit value by one comparison of its high
// word, 32-bit overflow tests for q31 sums, and on Armv6-M, whose MULS returns only the low 32 bits
// of a product, the exact 32 x 32 -> 64 product from four 16 x 16 multiplies instead of a call to
// the run-time library's 64 x 64 multiply (__aeabi_lmul). q15 products stay 16 x 16 -> 32. The M3
// has SSAT (Armv7-M's saturation instruction, __ARM_FEATURE_SAT), used for int16 saturation. Every
// function returns exactly what its generic namesake (rotorq/detail/ops_generic.hpp) returns; apart
// from SSAT it is all portable C++, so the host test suite runs the same code.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops_generic.hpp"
#include "rotorq/detail/ops_narrow.hpp"

#if defined(__ARM_FEATURE_SAT) && !defined(ROTORQ_PORT_ISA_MODEL)
#include <arm_acle.h>
#endif

namespace rotorq::ports::cortex_m_base {

namespace detail = ::rotorq::detail;

#if defined(__ARM_FEATURE_SAT) && !defined(ROTORQ_PORT_ISA_MODEL)
// GCC's __ssat macro assigns its built-in's unsigned-typed result to an int32_t, which
// -Wsign-conversion reports inside the expansion; the bits are the signed result.
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wsign-conversion"
inline int16_t sat16(int32_t v) noexcept { return static_cast<int16_t>(__ssat(v, 16)); }
#pragma GCC diagnostic pop
#else
using detail::generic::sat16;
#endif

inline int16_t sat16_wide(int64_t v) noexcept { return detail::narrow::sat16_wide<sat16>(v); }
inline int32_t sat32(int64_t v) noexcept { return detail::narrow::sat32(v); }

inline int16_t add16(int16_t a, int16_t b) noexcept { return sat16(int32_t{a} + int32_t{b}); }
inline int16_t sub16(int16_t a, int16_t b) noexcept { return sat16(int32_t{a} - int32_t{b}); }
inline int32_t add32(int32_t a, int32_t b) noexcept { return detail::narrow::add32(a, b); }
inline int32_t sub32(int32_t a, int32_t b) noexcept { return detail::narrow::sub32(a, b); }

#if defined(__ARM_ARCH_6M__)
inline int64_t mul_wide(int32_t a, int32_t b) noexcept { return detail::narrow::mul_wide_16x16(a, b); }
inline int64_t mul_wide_by_constant(int32_t a, int32_t k) noexcept { return mul_wide(a, k); }
inline uint64_t mul_wide_u32(uint32_t a, uint32_t b) noexcept {
  return detail::narrow::mul_wide_u32_16x16(a, b);
}
#else
using detail::generic::mul_wide;      // SMULL on Armv7-M
using detail::generic::mul_wide_u32;  // UMULL on Armv7-M
// A product by a constant as the instruction (GCC would expand it into shifts and additions).
inline int64_t mul_wide_by_constant(int32_t a, int32_t k) noexcept { return detail::narrow::smull(a, k); }
#endif

inline int16_t mul_q15(int16_t a, int16_t b) noexcept {
  return sat16((int32_t{a} * int32_t{b} + (1 << 14)) >> 15);  // |a b| <= 2^30
}
using detail::generic::difference_of_products_q15;
using detail::generic::sum_of_products_q15;

inline int32_t mul_q31(int32_t a, int32_t b) noexcept { return detail::narrow::mul_q31<mul_wide>(a, b); }
inline int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return detail::narrow::sum_of_products_q31<mul_wide>(a, b, c, d);
}
inline int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return detail::narrow::difference_of_products_q31<mul_wide>(a, b, c, d);
}

}  // namespace rotorq::ports::cortex_m_base
