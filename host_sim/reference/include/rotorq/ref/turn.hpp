// Double-precision twins of rotorq/turn.hpp: angles as fractions of a turn in [0, 1).
#pragma once

#include <cmath>

namespace rotorq::ref {

// (a + b) modulo one turn, in [0, 1).
inline double add_turns(double a, double b) {
  const double sum = a + b;
  return sum - std::floor(sum);
}

// The shortest signed rotation from `from` to `to`, in turns: [-1/2, 1/2).
inline double signed_difference_turns(double to, double from) {
  const double d = to - from;
  return d - std::floor(d + 0.5);
}

}  // namespace rotorq::ref
