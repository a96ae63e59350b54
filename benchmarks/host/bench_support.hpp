// What every host benchmark shares: tables of precomputed inputs, the loop that walks through them,
// the labels of the number types and the registration of one function's variants.
//
// Each function is timed as "<function>/<variant>": the library in q15 and q31 (or "int" and
// "timer16" / "timer32" where it has no q format), and the plain <cmath> code of plain_math.hpp in
// float and double. main.cpp (--ratios) pairs the variants of one function by that name.
#pragma once

#include <benchmark/benchmark.h>

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <random>
#include <string>
#include <type_traits>

#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"
#include "rotorq/host.hpp"
#include "rotorq/turn.hpp"

namespace rotorq::bench {

// 1024 inputs per table: enough that the branch predictor cannot learn the sequence and the compiler
// cannot fold a constant, few enough (a table is at most 32 KiB) to stay in the L1 or L2 cache, so
// the figures are of the arithmetic, not of memory. A power of two: the index wraps with a mask.
inline constexpr size_t table_size = 1024;

template <typename T>
using table = std::array<T, table_size>;

// Fills a table with make(rng) for one seed; each table has its own seed, so tables used together
// are independent.
template <typename T, typename Make>
table<T> make_table(uint64_t seed, Make make) {
  std::mt19937_64 rng(seed);
  table<T> values{};
  for (T& v : values) v = make(rng);
  return values;
}

// convert(from[k]) for every entry of a table.
template <typename T, typename From, typename Convert>
table<T> convert_table(const table<From>& from, Convert convert) {
  table<T> values{};
  for (size_t k = 0; k < table_size; ++k) values[k] = convert(from[k]);
  return values;
}

inline double uniform(std::mt19937_64& rng, double lo, double hi) {
  return std::uniform_real_distribution<double>(lo, hi)(rng);
}

// A real number in each variant's type: q15 and q31 rounded to the nearest step, float rounded, double
// as it is.
template <typename T>
T number(double x) {
  if constexpr (std::is_same_v<T, q15>) {
    return to_q15(x);
  } else if constexpr (std::is_same_v<T, q31>) {
    return to_q31(x);
  } else {
    return static_cast<T>(x);
  }
}

// A vector of length up to max_length (uniform over the disc) at any angle.
template <typename T>
stationary<T> random_vector(std::mt19937_64& rng, double max_length) {
  const double r = max_length * std::sqrt(uniform(rng, 0, 1));
  const double theta = uniform(rng, 0, 6.283185307179586477);
  return {number<T>(r * std::cos(theta)), number<T>(r * std::sin(theta))};
}

// An angle in each variant's type: turn16 for q15, turn32 for q31, radians for float and double.
template <typename T>
struct angle_type {
  using type = T;
};
template <>
struct angle_type<q15> {
  using type = turn16;
};
template <>
struct angle_type<q31> {
  using type = turn32;
};
template <typename T>
typename angle_type<T>::type angle(double turns) {
  if constexpr (std::is_same_v<T, q15>) {
    return turn16_from_degrees(360.0 * turns);
  } else if constexpr (std::is_same_v<T, q31>) {
    return turn32_from_degrees(360.0 * turns);
  } else {
    return static_cast<T>(6.283185307179586477 * turns);
  }
}

// Times `call(inputs[k])` with k walking through the table. The result is kept (DoNotOptimize), so
// the call can be neither dropped nor hoisted out of the loop; the loop and the load of the input
// are part of every figure (the row loop_overhead shows how much). flatten inlines every call whose
// body the compiler sees, library and plain code alike, so that its inlining heuristics (which
// differ between g++ and clang++, and between one call site and the next) do not decide a ratio.
template <typename Input, typename Call>
[[gnu::flatten]] void time_calls(benchmark::State& state, const table<Input>& inputs, Call call) {
  size_t k = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(call(inputs[k]));
    k = (k + 1) & (table_size - 1);
  }
}

// Variant tags for the functions without a q format.
struct integer_code {};  // an integer implementation ("int")
template <int Bits>
struct timer_width {  // a class template on the timer's width ("timer16", "timer32")
  static constexpr int bits = Bits;
};

template <typename T>
struct label;
template <>
struct label<q15> {
  static constexpr const char* text = "q15";
};
template <>
struct label<q31> {
  static constexpr const char* text = "q31";
};
template <>
struct label<float> {
  static constexpr const char* text = "float";
};
template <>
struct label<double> {
  static constexpr const char* text = "double";
};
template <>
struct label<integer_code> {
  static constexpr const char* text = "int";
};
template <>
struct label<timer_width<16>> {
  static constexpr const char* text = "timer16";
};
template <>
struct label<timer_width<32>> {
  static constexpr const char* text = "timer32";
};

template <typename T>
struct variant {
  using type = T;
};

// Registers body(variant<T>{}, state) as "<function>/<label of T>" for each T, in this order.
template <typename... Types, typename Body>
void add_function(const std::string& function, Body body) {
  (benchmark::RegisterBenchmark((function + "/" + label<Types>::text).c_str(),
                                [body](benchmark::State& state) { body(variant<Types>{}, state); }),
   ...);
}

// One per source file, called by main.cpp in the order of the table.
void register_arithmetic();
void register_transforms();
void register_modulation();
void register_rotor_angle();

}  // namespace rotorq::bench
