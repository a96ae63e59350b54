// Mathematical constants, each written once at high precision and rounded into a Q format at
// compile time.
//
// A constant is stored as value * 2^62, rounded to nearest (19 significant digits, enough for the
// correctly rounded q31 value). rotorq::constant<Q>(k) rounds it into Q (ties toward +infinity) and
// saturates, so a constant of 1 or more comes out as Q::max(). The raw values the transforms rely on
// are pinned by static_assert below; tests/test_constants.cpp checks every Q62 value against MPFR.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/fixed.hpp"

namespace rotorq::constants {

inline constexpr uint64_t pi = 14488038916154245685u;           // 3.141592653589793238462643
inline constexpr uint64_t inv_sqrt3 = 2662558164157085850u;     // 1/sqrt(3) = 0.5773502691896257645
inline constexpr uint64_t sqrt3_over_2 = 3993837246235628775u;  // sqrt(3)/2 = 0.8660254037844386468
inline constexpr uint64_t inv_sqrt2 = 3260954456333195553u;     // 1/sqrt(2) = 0.7071067811865475244
inline constexpr uint64_t sqrt2_over_3 = 3765425866358160376u;  // sqrt(2/3) = 0.8164965809277260327
inline constexpr uint64_t inv_sqrt6 = 1882712933179080188u;     // 1/sqrt(6) = 0.4082482904638630164
inline constexpr uint64_t one_third = 1537228672809129301u;     // 1/3
inline constexpr uint64_t two_thirds = 3074457345618258603u;    // 2/3

}  // namespace rotorq::constants

namespace rotorq {

// Round a Q62 constant into the format Q: to nearest, ties toward +infinity, saturated.
template <typename Q>
constexpr Q constant(uint64_t q62) noexcept {
  constexpr int shift = 62 - Q::fraction_bits;
  const uint64_t rounded = (q62 >> shift) + ((q62 >> (shift - 1)) & 1u);
  return Q::saturate(rounded > uint64_t{1} << 40 ? int64_t{1} << 40 : static_cast<int64_t>(rounded));
}

static_assert(constant<q15>(constants::inv_sqrt3).raw() == 18919);
static_assert(constant<q31>(constants::inv_sqrt3).raw() == 1239850262);
static_assert(constant<q15>(constants::sqrt3_over_2).raw() == 28378);
static_assert(constant<q31>(constants::sqrt3_over_2).raw() == 1859775393);
static_assert(constant<q15>(constants::inv_sqrt2).raw() == 23170);
static_assert(constant<q31>(constants::inv_sqrt2).raw() == 1518500250);
static_assert(constant<q15>(constants::sqrt2_over_3).raw() == 26755);
static_assert(constant<q31>(constants::sqrt2_over_3).raw() == 1753413056);
static_assert(constant<q15>(constants::inv_sqrt6).raw() == 13377);
static_assert(constant<q31>(constants::inv_sqrt6).raw() == 876706528);
static_assert(constant<q15>(constants::one_third).raw() == 10923);
static_assert(constant<q31>(constants::one_third).raw() == 715827883);
static_assert(constant<q15>(constants::two_thirds).raw() == 21845);
static_assert(constant<q31>(constants::two_thirds).raw() == 1431655765);
static_assert(constant<q15>(constants::pi) == q15::max());

}  // namespace rotorq
