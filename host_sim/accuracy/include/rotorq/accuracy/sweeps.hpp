// Accuracy sweeps: every rotorq function against its double twin, with the error in LSB of the
// output format. The tests assert these figures against the documented bounds and the
// rotorq-accuracy tool prints the same figures (and writes them into the README), so the published
// numbers are the tested ones.
//
// Error convention: computed - clamp(exact, min, max), where exact is the double twin evaluated on
// the exact values of the same inputs; a result that saturates because the exact value is outside
// the range therefore counts as exact. For functions with several outputs, each output is one sample.
#pragma once

#include <cstdint>
#include <string>
#include <vector>

namespace rotorq::accuracy {

struct error_stats {
  std::string function;  // e.g. "sin_cos"
  std::string format;    // "q15" or "q31"
  std::string inputs;    // what was swept
  double bound = 0.0;    // the documented bound on |error|, in LSB
  // the function is documented as correctly rounded (0.5 LSB, plus 2^-15 LSB for a constant)
  bool correctly_rounded = false;
  uint64_t samples = 0;
  double max_abs = 0.0;  // largest |error| in LSB
  double sum = 0.0;
  double sum_squares = 0.0;
  std::string worst_input;  // the input that gave max_abs, raw hex

  double mean() const { return samples ? sum / static_cast<double>(samples) : 0.0; }
  double rms() const;
  bool within_bound() const { return max_abs <= bound; }
  // Adds one error sample; `describe` is called only when the sample is the new worst.
  template <typename Describe>
  void add(double error_lsb, Describe&& describe) {
    ++samples;
    sum += error_lsb;
    sum_squares += error_lsb * error_lsb;
    const double magnitude = error_lsb < 0 ? -error_lsb : error_lsb;
    if (magnitude > max_abs || samples == 1) {
      max_abs = magnitude;
      worst_input = describe();
    }
  }
};

struct sweep_options {
  uint64_t seed = 20261201;                  // for every random input
  uint64_t random_inputs = 1'000'000;        // per transform and format
  uint64_t sin_cos_q31_angles = 10'000'000;  // random q31 angles, on top of the segment edges
};

// Each returns one row per format (q15 first, then q31).
std::vector<error_stats> sweep_arithmetic(const sweep_options& options);
std::vector<error_stats> sweep_sin_cos(const sweep_options& options);
std::vector<error_stats> sweep_clarke(const sweep_options& options);
std::vector<error_stats> sweep_park(const sweep_options& options);
std::vector<error_stats> sweep_modulation(const sweep_options& options);
std::vector<error_stats> sweep_round_trips(const sweep_options& options);

// All of the above, in that order.
std::vector<error_stats> sweep_all(const sweep_options& options);

// The documented bounds (also stated in the headers), in LSB.
namespace bound {
inline constexpr double multiply = 0.5;  // a * b, mul_add, accumulator: correctly rounded
inline constexpr double sin_cos_q15 = 0.51;
inline constexpr double sin_cos_q31 = 2.0;
inline constexpr double transform = 1.0;  // Clarke family, given q inputs (measured: 0.5)
inline constexpr double park_given_pair = 0.5;
// park/inverse_park with the library's sin_cos, |v| <= 1: 0.5 + E (see park.hpp)
inline constexpr double park_with_sin_cos_q15 = 1.62;
inline constexpr double park_with_sin_cos_q31 = 2.0;
// svpwm duties in the linear range: one rounding of exact wide values
inline constexpr double svpwm_linear = 0.5 + 1.0 / 32768;
// beyond the linear range (svpwm.hpp): the limited vector's error (its rounding, the limiting
// factor's 2^-28, the circle radius rounded down) passes through the phase voltages and the
// injection twice, plus the duty's own rounding
inline constexpr double overmodulation_q15 = 3.5;
inline constexpr double overmodulation_q31 = 17.0;
// limit_magnitude, limit_d_priority, bus_normalizer: 0.5 LSB + |v| 2^-28 (voltage_limit.hpp,
// dc_bus.hpp)
inline constexpr double limiter_q15 = 0.51;
inline constexpr double limiter_q31 = 8.5;
// inverse(forward(x)) against x: the forward rounding errors (<= 0.5 each) pass through the inverse
// matrix, plus the inverse's own rounding; for Park also the deviation of the library's sine/cosine
// pair from unit length, |v| * 2E.
inline constexpr double round_trip_clarke = 1.2;                  // 0.5 + 0.5 (1/2 + sqrt(3)/2)
inline constexpr double round_trip_clarke_power_invariant = 1.1;  // 0.5 + 0.5 (1/sqrt(6) + 1/sqrt(2))
inline constexpr double round_trip_park_q15 = 3.5;                // 0.5 + 0.5 sqrt(2) + 2 * 1.12
inline constexpr double round_trip_park_q31 = 4.3;                // 0.5 + 0.5 sqrt(2) + 2 * 1.5
}  // namespace bound

}  // namespace rotorq::accuracy
