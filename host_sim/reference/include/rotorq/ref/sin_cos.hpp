// Double-precision twin of rotorq/sin_cos.hpp: the sine and cosine of an angle given in turns.
//
// The angle is reduced exactly (turns - floor(turns) is exact for the dyadic angles of turn16 and
// turn32) and folded into the first octant before std::sin/std::cos see it, so the argument of the
// library call is below pi/4 and the result is within a few units in the last place of double
// (about 2^-52, or 2^-21 of a q31 LSB). tests/test_reference.cpp checks this against MPFR.
#pragma once

#include <cmath>

#include "rotorq/frames.hpp"
#include "rotorq/turn.hpp"

namespace rotorq::ref {

inline sin_cos_pair<double> sin_cos_turns(double turns) {
  constexpr double two_pi = 6.283185307179586476925286766559;
  const double t = turns - std::floor(turns);  // [0, 1)
  // eighths of a turn: fold into [0, 1/8] and remember which identities to apply
  const double eighths = t * 8.0;
  const int octant = static_cast<int>(eighths) & 7;
  const double within = eighths - static_cast<double>(static_cast<int>(eighths));  // [0, 1)
  // angle measured from the octant's start (even octants) or to its end (odd octants), in [0, 1/8]
  const double x = ((octant & 1) ? (1.0 - within) : within) * (two_pi / 8.0);
  const double s = std::sin(x);
  const double c = std::cos(x);
  // (sin, cos) of t for each octant, written with the small-angle pair (s, c)
  switch (octant) {
    case 0:
      return {s, c};
    case 1:
      return {c, s};
    case 2:
      return {c, -s};
    case 3:
      return {s, -c};
    case 4:
      return {-s, -c};
    case 5:
      return {-c, -s};
    case 6:
      return {-c, s};
    default:
      return {-s, c};
  }
}

template <int Bits>
sin_cos_pair<double> sin_cos(turn<Bits> angle) {
  return sin_cos_turns(std::ldexp(static_cast<double>(angle.raw()), -Bits));
}

}  // namespace rotorq::ref
