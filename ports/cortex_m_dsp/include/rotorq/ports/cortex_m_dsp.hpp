// Port for Cortex-M cores with the DSP extension (Armv7E-M: Cortex-M4, M7; Armv8-M Mainline with
// DSP: Cortex-M33). Selected by ROTORQ_PORT_CORTEX_M_DSP (CMake: -DROTORQ_PORT=cortex_m_dsp).
//
// GCC does not turn a clamp written in C into SSAT, nor a saturating add into QADD; this port uses
// them through the ACLE intrinsics of <arm_acle.h>, and forms the rounding multiplies from the
// high and low words of SMULL / SMLAL so that saturation needs one 32-bit comparison. Every
// function returns exactly what its generic namesake (rotorq/detail/ops_generic.hpp) returns.
//
// With ROTORQ_PORT_ISA_MODEL defined instead of an Arm target, the three instructions are modelled
// in portable C++ (their definitions in the Arm Architecture Reference Manual for Armv7-M: SSAT
// saturates a signed value to n bits, QADD / QSUB add and subtract with signed saturation), so the
// host test suite can check the port's arithmetic against the generic definitions.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops_generic.hpp"
#include "rotorq/detail/ops_narrow.hpp"

#if defined(__ARM_FEATURE_DSP) && !defined(ROTORQ_PORT_ISA_MODEL)
#include <arm_acle.h>
#elif !defined(ROTORQ_PORT_ISA_MODEL)
#error "rotorq's cortex_m_dsp port needs a core with the DSP extension (__ARM_FEATURE_DSP)"
#endif

namespace rotorq::ports::cortex_m_dsp {

namespace isa {
#if defined(ROTORQ_PORT_ISA_MODEL)
inline int32_t ssat16(int32_t v) noexcept { return v < -32768 ? -32768 : (v > 32767 ? 32767 : v); }
inline int32_t qadd(int32_t a, int32_t b) noexcept { return ::rotorq::detail::generic::add32(a, b); }
inline int32_t qsub(int32_t a, int32_t b) noexcept { return ::rotorq::detail::generic::sub32(a, b); }
#else
// GCC's __ssat macro assigns its built-in's unsigned-typed result to an int32_t, which
// -Wsign-conversion reports inside the expansion; the bits are the signed result.
#pragma GCC diagnostic push
#pragma GCC diagnostic ignored "-Wsign-conversion"
inline int32_t ssat16(int32_t v) noexcept { return __ssat(v, 16); }
#pragma GCC diagnostic pop
inline int32_t qadd(int32_t a, int32_t b) noexcept { return __qadd(a, b); }
inline int32_t qsub(int32_t a, int32_t b) noexcept { return __qsub(a, b); }
#endif
}  // namespace isa

namespace detail = ::rotorq::detail;

inline int16_t sat16(int32_t v) noexcept { return static_cast<int16_t>(isa::ssat16(v)); }
inline int16_t sat16_wide(int64_t v) noexcept { return detail::narrow::sat16_wide<sat16>(v); }
inline int32_t sat32(int64_t v) noexcept { return detail::narrow::sat32(v); }

inline int16_t add16(int16_t a, int16_t b) noexcept { return sat16(int32_t{a} + int32_t{b}); }
inline int16_t sub16(int16_t a, int16_t b) noexcept { return sat16(int32_t{a} - int32_t{b}); }
inline int32_t add32(int32_t a, int32_t b) noexcept { return isa::qadd(a, b); }
inline int32_t sub32(int32_t a, int32_t b) noexcept { return isa::qsub(a, b); }

using detail::generic::mul_wide;      // SMULL, which GCC fuses with a following addition into SMLAL
using detail::generic::mul_wide_u32;  // UMULL

// A product by a constant as the instruction (GCC would expand it into shifts and additions).
inline int64_t mul_wide_by_constant(int32_t a, int32_t k) noexcept { return detail::narrow::smull(a, k); }

inline int16_t mul_q15(int16_t a, int16_t b) noexcept {
  return sat16((int32_t{a} * int32_t{b} + (1 << 14)) >> 15);  // SMULBB, ADD, ASR, SSAT
}

// (a b + 2^30) >> 31 = 2 hi + (lo >> 31) with hi >= -2^30; QADD saturates 2 hi, and only hi = 2^30
// (a = b = -2^31) saturates, to 0x7fffffff, which the OR leaves unchanged.
inline int32_t mul_q31(int32_t a, int32_t b) noexcept {
  const detail::narrow::halves h = detail::narrow::split(mul_wide(a, b) + detail::pow2(30));
  return detail::to_signed(static_cast<uint32_t>(isa::qadd(h.hi, h.hi)) | (h.lo >> 31));
}

// 2 hi + bit saturated as hi + (hi + bit), each addition saturating: exact unless the true value is
// beyond the range, and then the sign's limit.
inline int32_t qadd_shift31(detail::narrow::halves h) noexcept {
  return isa::qadd(h.hi, isa::qadd(h.hi, static_cast<int32_t>(h.lo >> 31)));
}

inline int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  // wraps only for a = b = c = d = -2^31, recognised by its high word (see ops_narrow.hpp)
  const uint64_t sum =
      static_cast<uint64_t>(mul_wide(a, b)) + static_cast<uint64_t>(mul_wide(c, d)) + (uint64_t{1} << 30);
  const detail::narrow::halves h = detail::narrow::split(sum);
  return h.hi == detail::generic::int32_min ? detail::generic::int32_max : qadd_shift31(h);
}

inline int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  const uint64_t difference =
      static_cast<uint64_t>(mul_wide(a, b)) - static_cast<uint64_t>(mul_wide(c, d)) + (uint64_t{1} << 30);
  return qadd_shift31(detail::narrow::split(difference));
}

// a b + c d + 2^14 in 32 bits wraps only for a = b = c = d = -2^15 (both products 2^30): the wrapped
// value is below -2^31 + 2^15, which no other input reaches (the true sum is at least
// -2^31 + 2^16 + 2^14), so it means +infinity.
inline int16_t sum_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) noexcept {
  const uint32_t sum = static_cast<uint32_t>(int32_t{a} * int32_t{b}) +
                       static_cast<uint32_t>(int32_t{c} * int32_t{d}) + (1u << 14);
  const int32_t s = detail::to_signed(sum);
  return s < detail::generic::int32_min + (1 << 15) ? int16_t{32767} : sat16(s >> 15);
}

// a b - c d + 2^14 lies in [-2^31 + 2^15 + 2^14, 2^31 - 2^15 + 2^14]: no wrap.
inline int16_t difference_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) noexcept {
  const uint32_t difference = static_cast<uint32_t>(int32_t{a} * int32_t{b}) -
                              static_cast<uint32_t>(int32_t{c} * int32_t{d}) + (1u << 14);
  return sat16(detail::to_signed(difference) >> 15);
}

}  // namespace rotorq::ports::cortex_m_dsp
