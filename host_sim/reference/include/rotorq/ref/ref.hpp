// The double-precision reference model: one twin for every rotorq function, in namespace rotorq::ref,
// plus conversions of the frame structs between fixed point and double.
#pragma once

#include "rotorq/frames.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/clarke.hpp"
#include "rotorq/ref/fixed.hpp"
#include "rotorq/ref/park.hpp"
#include "rotorq/ref/pi_regulator.hpp"
#include "rotorq/ref/rotor_angle.hpp"
#include "rotorq/ref/sin_cos.hpp"
#include "rotorq/ref/svpwm.hpp"
#include "rotorq/ref/turn.hpp"

namespace rotorq::ref {

template <int F>
phases<double> to_double(phases<fixed<F>> x) {
  return {rotorq::to_double(x.a), rotorq::to_double(x.b), rotorq::to_double(x.c)};
}
template <int F>
stationary<double> to_double(stationary<fixed<F>> x) {
  return {rotorq::to_double(x.alpha), rotorq::to_double(x.beta)};
}
template <int F>
rotating<double> to_double(rotating<fixed<F>> x) {
  return {rotorq::to_double(x.d), rotorq::to_double(x.q)};
}
template <int F>
sin_cos_pair<double> to_double(sin_cos_pair<fixed<F>> x) {
  return {rotorq::to_double(x.sin), rotorq::to_double(x.cos)};
}

}  // namespace rotorq::ref
