// Double-precision twins of rotorq/park.hpp: rotation by -theta (park) and +theta (inverse_park).
#pragma once

#include "rotorq/frames.hpp"

namespace rotorq::ref {

inline rotating<double> park(stationary<double> v, sin_cos_pair<double> angle) {
  return {v.alpha * angle.cos + v.beta * angle.sin, -v.alpha * angle.sin + v.beta * angle.cos};
}

inline stationary<double> inverse_park(rotating<double> v, sin_cos_pair<double> angle) {
  return {v.d * angle.cos - v.q * angle.sin, v.d * angle.sin + v.q * angle.cos};
}

}  // namespace rotorq::ref
