// Double-precision twins of rotorq/clarke.hpp, written as the textbook matrices.
//
// Amplitude-invariant:  [alpha; beta] = 2/3 [1, -1/2, -1/2; 0, sqrt(3)/2, -sqrt(3)/2] [a; b; c]
// Power-invariant:      [alpha; beta] = sqrt(2/3) [1, -1/2, -1/2; 0, sqrt(3)/2, -sqrt(3)/2] [a; b; c]
// The inverses are the transposes scaled back (3/2 times the amplitude-invariant matrix's transpose,
// the plain transpose for the power-invariant one).
#pragma once

#include <cmath>

#include "rotorq/frames.hpp"

namespace rotorq::ref {

inline stationary<double> clarke(phases<double> i) {
  const double h = std::sqrt(3.0) / 2.0;
  return {2.0 / 3.0 * (i.a - 0.5 * i.b - 0.5 * i.c), 2.0 / 3.0 * (h * i.b - h * i.c)};
}

inline stationary<double> clarke_balanced(double a, double b) { return clarke({a, b, -a - b}); }

inline phases<double> inverse_clarke(stationary<double> v) {
  const double h = std::sqrt(3.0) / 2.0;
  return {v.alpha, -0.5 * v.alpha + h * v.beta, -0.5 * v.alpha - h * v.beta};
}

inline stationary<double> clarke_power_invariant(phases<double> i) {
  const double k = std::sqrt(2.0 / 3.0);
  const double h = std::sqrt(3.0) / 2.0;
  return {k * (i.a - 0.5 * i.b - 0.5 * i.c), k * (h * i.b - h * i.c)};
}

inline phases<double> inverse_clarke_power_invariant(stationary<double> v) {
  const double k = std::sqrt(2.0 / 3.0);
  const double h = std::sqrt(3.0) / 2.0;
  return {k * v.alpha, k * (-0.5 * v.alpha + h * v.beta), k * (-0.5 * v.alpha - h * v.beta)};
}

}  // namespace rotorq::ref
