// The primitive operations every rotorq function is built from, and the choice of port.
//
// The generic definitions (ops_generic.hpp) are portable C++ and are what a build without a port
// uses. A port is chosen by defining one macro (CMake's ROTORQ_PORT option does it and adds the
// port's include directory, ports/<name>/include):
//   ROTORQ_PORT_CORTEX_M_DSP    Cortex-M4/M7/M33: SSAT, QADD/QSUB, SMULL-based rounding multiplies
//   ROTORQ_PORT_CORTEX_M_BASE   Cortex-M0+/M3: saturation on 32-bit halves; on Armv6-M the exact
//                               32 x 32 -> 64 product from four 16 x 16 multiplies (no helper call)
//   ROTORQ_PORT_RV32            RV32IM(C): saturation on 32-bit halves
// A port changes speed, never results: each of its functions returns exactly the generic value for
// every input (tests/test_ports.cpp checks this on the host, the target test vectors on each core).
// During constant evaluation the generic definitions are used, so every function stays constexpr.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops_generic.hpp"

#if defined(ROTORQ_PORT_CORTEX_M_DSP) + defined(ROTORQ_PORT_CORTEX_M_BASE) + defined(ROTORQ_PORT_RV32) > 1
#error "rotorq: define at most one ROTORQ_PORT_* macro"
#endif

#if defined(ROTORQ_PORT_CORTEX_M_DSP)
#include "rotorq/ports/cortex_m_dsp.hpp"
namespace rotorq::detail {
namespace port = ::rotorq::ports::cortex_m_dsp;
}
#elif defined(ROTORQ_PORT_CORTEX_M_BASE)
#include "rotorq/ports/cortex_m_base.hpp"
namespace rotorq::detail {
namespace port = ::rotorq::ports::cortex_m_base;
}
#elif defined(ROTORQ_PORT_RV32)
#include "rotorq/ports/rv32.hpp"
namespace rotorq::detail {
namespace port = ::rotorq::ports::rv32;
}
#else
namespace rotorq::detail {
namespace port = generic;
}
#endif

namespace rotorq::detail::ops {

// The port's definition at run time, the generic one in constant evaluation. Both are known at
// compile time, so the call inlines as if written directly.
template <auto Generic, auto Port, typename... Args>
constexpr auto dispatch(Args... args) noexcept {
  if (!__builtin_is_constant_evaluated()) return Port(args...);
  return Generic(args...);
}

constexpr int16_t sat16(int32_t v) noexcept { return dispatch<generic::sat16, port::sat16>(v); }
constexpr int16_t sat16_wide(int64_t v) noexcept {
  return dispatch<generic::sat16_wide, port::sat16_wide>(v);
}
constexpr int32_t sat32(int64_t v) noexcept { return dispatch<generic::sat32, port::sat32>(v); }
constexpr int16_t add16(int16_t a, int16_t b) noexcept { return dispatch<generic::add16, port::add16>(a, b); }
constexpr int16_t sub16(int16_t a, int16_t b) noexcept { return dispatch<generic::sub16, port::sub16>(a, b); }
constexpr int32_t add32(int32_t a, int32_t b) noexcept { return dispatch<generic::add32, port::add32>(a, b); }
constexpr int32_t sub32(int32_t a, int32_t b) noexcept { return dispatch<generic::sub32, port::sub32>(a, b); }
constexpr int64_t mul_wide(int32_t a, int32_t b) noexcept {
  return dispatch<generic::mul_wide, port::mul_wide>(a, b);
}
constexpr uint64_t mul_wide_u32(uint32_t a, uint32_t b) noexcept {
  return dispatch<generic::mul_wide_u32, port::mul_wide_u32>(a, b);
}
constexpr int64_t mul_wide_by_constant(int32_t a, int32_t k) noexcept {
  return dispatch<generic::mul_wide_by_constant, port::mul_wide_by_constant>(a, k);
}
constexpr int16_t mul_q15(int16_t a, int16_t b) noexcept {
  return dispatch<generic::mul_q15, port::mul_q15>(a, b);
}
constexpr int32_t mul_q31(int32_t a, int32_t b) noexcept {
  return dispatch<generic::mul_q31, port::mul_q31>(a, b);
}
constexpr int16_t sum_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) noexcept {
  return dispatch<generic::sum_of_products_q15, port::sum_of_products_q15>(a, b, c, d);
}
constexpr int16_t difference_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) noexcept {
  return dispatch<generic::difference_of_products_q15, port::difference_of_products_q15>(a, b, c, d);
}
constexpr int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return dispatch<generic::sum_of_products_q31, port::sum_of_products_q31>(a, b, c, d);
}
constexpr int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return dispatch<generic::difference_of_products_q31, port::difference_of_products_q31>(a, b, c, d);
}

}  // namespace rotorq::detail::ops
