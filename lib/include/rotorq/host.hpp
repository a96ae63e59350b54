// Host-only conversions between rotorq values and double. Not for the target path: it uses
// floating point and <cmath>.
//
//   to_q15(x), to_q31(x)    round to the nearest step (ties toward +infinity, the library's rule),
//                           saturate to [min, max]; NaN gives 0, +Inf max, -Inf min
//   to_double(q)            exact
//   turn16_from_degrees(deg), turn32_from_degrees(deg), turn16_from_radians(rad), turn32_from_radians(rad)
//                           reduce modulo one turn, round to the nearest step (ties toward +infinity,
//                           modulo one turn); NaN and +-Inf give 0
//   to_degrees(t) in [0, 360), to_radians(t) in [0, 2 pi), to_turns(t) in [0, 1)   exact or within
//                           one rounding of double
#pragma once

#include <cmath>
#include <cstdint>

#include "rotorq/fixed.hpp"
#include "rotorq/turn.hpp"

namespace rotorq {

namespace detail {

// round(y) with ties toward +infinity, exact for any double (no y + 0.5 rounding trap).
inline double round_half_up(double y) {
  const double whole = std::floor(y);
  return (y - whole >= 0.5) ? whole + 1.0 : whole;
}

template <typename Q>
Q from_double(double x) {
  if (std::isnan(x)) return Q::zero();
  const double scaled = std::ldexp(x, Q::fraction_bits);  // exact
  if (scaled >= static_cast<double>(Q::raw_max)) return Q::max();
  if (scaled <= static_cast<double>(Q::raw_min)) return Q::min();
  return Q::saturate(static_cast<int64_t>(round_half_up(scaled)));
}

// x reduced modulo `period` and rounded to the nearest step (ties toward +infinity), modulo one turn.
// The rounding happens on the signed remainder, before any addition of a period could round it.
template <typename Turn>
Turn turn_from_period(double x, double period) {
  using raw_type = typename Turn::raw_type;
  if (!std::isfinite(x)) return Turn{};
  const double remainder = std::fmod(x, period);                                   // exact, |r| < period
  const double steps = round_half_up(std::ldexp(remainder / period, Turn::bits));  // |steps| <= 2^bits
  const auto wrapped = static_cast<int64_t>(steps) + (int64_t{1} << Turn::bits);   // positive
  return Turn::from_raw(static_cast<raw_type>(static_cast<uint64_t>(wrapped)));
}

}  // namespace detail

inline q15 to_q15(double x) { return detail::from_double<q15>(x); }
inline q31 to_q31(double x) { return detail::from_double<q31>(x); }

template <int F>
constexpr double to_double(fixed<F> x) {
  return static_cast<double>(x.raw()) / static_cast<double>(detail::pow2(F));
}

inline turn16 turn16_from_degrees(double degrees) { return detail::turn_from_period<turn16>(degrees, 360.0); }
inline turn32 turn32_from_degrees(double degrees) { return detail::turn_from_period<turn32>(degrees, 360.0); }
inline turn16 turn16_from_radians(double radians) {
  return detail::turn_from_period<turn16>(radians, 6.283185307179586476925286766559);
}
inline turn32 turn32_from_radians(double radians) {
  return detail::turn_from_period<turn32>(radians, 6.283185307179586476925286766559);
}

template <int Bits>
constexpr double to_turns(turn<Bits> t) {
  return static_cast<double>(t.raw()) / static_cast<double>(uint64_t{1} << Bits);
}
template <int Bits>
constexpr double to_degrees(turn<Bits> t) {
  return to_turns(t) * 360.0;
}
template <int Bits>
constexpr double to_radians(turn<Bits> t) {
  return to_turns(t) * 6.283185307179586476925286766559;
}

}  // namespace rotorq
