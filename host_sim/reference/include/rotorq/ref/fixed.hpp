// Double-precision twins of rotorq/fixed.hpp and rotorq/accumulator.hpp: the exact real results.
// (The products of two q31 values need 62 bits, more than a double holds; the rounding of the double
// is below 2^-22 of a q31 LSB, which the accuracy figures may ignore.)
#pragma once

namespace rotorq::ref {

inline double add(double a, double b) { return a + b; }
inline double subtract(double a, double b) { return a - b; }
inline double negate(double a) { return -a; }
inline double multiply(double a, double b) { return a * b; }
inline double mul_add(double a, double b, double c) { return a * b + c; }

}  // namespace rotorq::ref
