// Port for 32-bit RISC-V cores with the multiply extension (RV32IM, RV32IMC). Selected by
// ROTORQ_PORT_RV32 (CMake: -DROTORQ_PORT=rv32).
//
// The base ISA has no saturating instructions; MUL and MULH give the exact 32 x 32 -> 64 product.
// The gain is in the 64-bit work: saturation by one comparison of the high word, 32-bit overflow
// tests for the q31 sums, and rounding multiplies formed from MUL/MULH's two words. Every function
// returns exactly what its generic namesake (rotorq/detail/ops_generic.hpp) returns; all of it is
// portable C++, so the host test suite runs the same code.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops_generic.hpp"
#include "rotorq/detail/ops_narrow.hpp"

namespace rotorq::ports::rv32 {

namespace detail = ::rotorq::detail;

using detail::generic::add16;
using detail::generic::difference_of_products_q15;
using detail::generic::mul_q15;
using detail::generic::mul_wide;  // MUL + MULH
using detail::generic::mul_wide_by_constant;
using detail::generic::mul_wide_u32;  // MUL + MULHU
using detail::generic::sat16;
using detail::generic::sub16;
using detail::generic::sum_of_products_q15;

constexpr int32_t sat32(int64_t v) noexcept { return detail::narrow::sat32(v); }
constexpr int16_t sat16_wide(int64_t v) noexcept { return detail::narrow::sat16_wide<sat16>(v); }

constexpr int32_t add32(int32_t a, int32_t b) noexcept { return detail::narrow::add32(a, b); }
constexpr int32_t sub32(int32_t a, int32_t b) noexcept { return detail::narrow::sub32(a, b); }

constexpr int32_t mul_q31(int32_t a, int32_t b) noexcept { return detail::narrow::mul_q31<mul_wide>(a, b); }
constexpr int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return detail::narrow::sum_of_products_q31<mul_wide>(a, b, c, d);
}
constexpr int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) noexcept {
  return detail::narrow::difference_of_products_q31<mul_wide>(a, b, c, d);
}

}  // namespace rotorq::ports::rv32
