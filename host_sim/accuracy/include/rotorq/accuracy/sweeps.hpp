// Accuracy sweeps: every rotorq function against its double twin, with the error in LSB of the
// output format. The tests assert these figures against the documented bounds and the
// rotorq-accuracy tool prints the same figures (and writes them into the README), so the published
// numbers are the tested ones.
//
// Error convention: computed - clamp(exact, min, max), where exact is the double twin evaluated on
// the exact values of the same inputs; a result that saturates because the exact value is outside
// the range therefore counts as exact. For functions with several outputs, each output is one sample.
#pragma once

#include <array>
#include <cstdint>
#include <functional>
#include <string>
#include <vector>

namespace rotorq::accuracy {

// What a function's output stands for in a drive, for stating its error in physical units.
// angle: a sine or cosine value (its error is an angle error in rad); rotor_angle: a binary angle,
// whose LSB is one step of 2^fraction_bits per turn.
enum class quantity { value, current, voltage, angle, duty, rotor_angle };

// Error histogram: bins of 1/16 LSB over [-4, 4) LSB, plus one bin below and one above.
struct histogram {
  static constexpr int bins_per_lsb = 16;
  static constexpr int range_lsb = 4;
  static constexpr int bin_count = 2 * range_lsb * bins_per_lsb;
  std::array<uint64_t, bin_count> counts{};
  uint64_t below = 0, above = 0;
  void add(double error_lsb) {
    const double position = (error_lsb + range_lsb) * bins_per_lsb;
    if (position < 0) {
      ++below;
    } else if (position >= bin_count) {
      ++above;
    } else {
      ++counts[static_cast<size_t>(position)];
    }
  }
  void merge(const histogram& other);
  // the lower edge of bin i, in LSB
  static double edge(int i) { return static_cast<double>(i) / bins_per_lsb - range_lsb; }
};

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
  int fraction_bits = 15;   // of the output format: 1 LSB = 2^-fraction_bits of full scale
  quantity kind = quantity::value;
  histogram errors;

  double mean() const { return samples ? sum / static_cast<double>(samples) : 0.0; }
  double rms() const;
  bool within_bound() const { return max_abs <= bound; }
  // Adds one error sample; `describe` is called only when the sample is the new worst.
  template <typename Describe>
  void add(double error_lsb, Describe&& describe) {
    ++samples;
    errors.add(error_lsb);
    sum += error_lsb;
    sum_squares += error_lsb * error_lsb;
    const double magnitude = error_lsb < 0 ? -error_lsb : error_lsb;
    if (magnitude > max_abs || samples == 1) {
      max_abs = magnitude;
      worst_input = describe();
    }
  }
  // Combines the samples of two sweeps of the same function (for threads).
  void merge(const error_stats& other);
};

struct sweep_options {
  uint64_t seed = 20261201;                  // for every random input
  uint64_t random_inputs = 1'000'000;        // per transform and format
  uint64_t sin_cos_q31_angles = 10'000'000;  // random q31 angles, on top of the segment edges
  bool exhaustive_sin_cos_q31 = false;       // all 2^32 angles instead (threads, ~30 s on 2 cores)
  unsigned threads = 0;                      // for the exhaustive sweep; 0 = every core
  std::function<void(double)> progress;      // called with the fraction done, from one thread
};

// Data behind the report's plots.
struct plot_data {
  // sin_cos error (LSB) against the angle: q15 at every angle (x in turns); q31 as the lowest and
  // highest error in each of 65536 blocks of 65536 consecutive angles (exhaustive sweeps only)
  std::vector<double> q15_angle, q15_sin, q15_cos;
  std::vector<double> q31_angle, q31_low, q31_high;
  // park(v, sin_cos(theta)) q15: the largest |error| (LSB) over 64 rotor angles for each vector of a
  // map_size x map_size grid over [-1, 1]^2 (row-major, alpha along a row)
  int map_size = 0;
  std::vector<double> park_map;
};

// The rows of sweep_all, and the plot data when `plots` is non-null.
std::vector<error_stats> sweep_report(const sweep_options& options, plot_data* plots);

// Each returns one row per format (q15 first, then q31).
std::vector<error_stats> sweep_arithmetic(const sweep_options& options);
// With plots non-null, an exhaustive q31 sweep also fills plots->q31_*.
std::vector<error_stats> sweep_sin_cos(const sweep_options& options, plot_data* plots = nullptr);
std::vector<error_stats> sweep_clarke(const sweep_options& options);
std::vector<error_stats> sweep_park(const sweep_options& options);
std::vector<error_stats> sweep_modulation(const sweep_options& options);
std::vector<error_stats> sweep_rotor_angle(const sweep_options& options);
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
// angle_interpolator against its twin, in turn32 steps: the speed's relative error (2^-28) times
// the extrapolated distance, plus the truncation of the steps (angle_interpolator.hpp)
inline constexpr double interpolator = 4.0;
// hall_tracker at constant speed against the exact rotor angle, in turn32 steps: 0.5 degrees
inline constexpr double hall_tracker_constant_speed = 0.5 / 360.0 * 4294967296.0;
// exact integer or switching functions (duty_to_compare, six_step): no error at all
inline constexpr double exact = 0.0;
// inverse(forward(x)) against x: the forward rounding errors (<= 0.5 each) pass through the inverse
// matrix, plus the inverse's own rounding; for Park also the deviation of the library's sine/cosine
// pair from unit length, |v| * 2E.
inline constexpr double round_trip_clarke = 1.2;                  // 0.5 + 0.5 (1/2 + sqrt(3)/2)
inline constexpr double round_trip_clarke_power_invariant = 1.1;  // 0.5 + 0.5 (1/sqrt(6) + 1/sqrt(2))
inline constexpr double round_trip_park_q15 = 3.5;                // 0.5 + 0.5 sqrt(2) + 2 * 1.12
inline constexpr double round_trip_park_q31 = 4.3;                // 0.5 + 0.5 sqrt(2) + 2 * 1.5
}  // namespace bound

}  // namespace rotorq::accuracy
