// From the voltage request to the timer: the limiters, the bus normalizer, the modulators, the compare
// values, and the PI regulator that produces the request, each next to float and double code.
#include "bench_support.hpp"
#include "plain_math.hpp"
#include "rotorq/dc_bus.hpp"
#include "rotorq/pwm_compare.hpp"
#include "rotorq/svpwm.hpp"
#include "rotorq/voltage_limit.hpp"
#if __has_include("rotorq/pi_regulator.hpp")
#include "rotorq/pi_regulator.hpp"
#define ROTORQ_BENCH_PI_REGULATOR 1
#endif

namespace rotorq::bench {

namespace {

// Requests up to 0.75 of the bus: about 40% lie beyond the inscribed circle (1/sqrt(3)) and a third
// beyond the hexagon, so each modulator takes both of its paths.
template <typename T>
const table<stationary<T>>& request_table() {
  static const auto values =
      make_table<stationary<T>>(31, [](std::mt19937_64& rng) { return random_vector<T>(rng, 0.75); });
  return values;
}

template <typename T>
struct limit_input {
  rotating<T> v;
  T limit;
};

// Vectors up to full scale against limits from 0.3 to 0.95: about half are limited.
template <typename T>
const table<limit_input<T>>& limit_table() {
  static const auto values = make_table<limit_input<T>>(32, [](std::mt19937_64& rng) {
    const stationary<T> v = random_vector<T>(rng, 1.0);
    return limit_input<T>{{v.alpha, v.beta}, number<T>(uniform(rng, 0.3, 0.95))};
  });
  return values;
}

template <typename T>
struct bus_input {
  T bus;
  stationary<T> v;
};

// A bus between half and full scale, below the minimum (0.05) one sample in 64; requests up to 0.4.
template <typename T>
const table<bus_input<T>>& bus_table() {
  static const auto values = make_table<bus_input<T>>(33, [](std::mt19937_64& rng) {
    const bool low = (rng() & 63u) == 0;
    return bus_input<T>{number<T>(low ? uniform(rng, 0, 0.05) : uniform(rng, 0.5, 1.0)),
                        random_vector<T>(rng, 0.4)};
  });
  return values;
}

// Duties anywhere in [0, 1], so that minimum-pulse clipping acts at both ends now and then.
template <typename T>
const table<phases<T>>& duty_table() {
  static const auto values = make_table<phases<T>>(34, [](std::mt19937_64& rng) {
    return phases<T>{number<T>(uniform(rng, 0, 1)), number<T>(uniform(rng, 0, 1)),
                     number<T>(uniform(rng, 0, 1))};
  });
  return values;
}

template <typename T>
struct regulator_input {
  T reference, measured;
};

// Small errors mostly; one in eight is large (up to 1.8), and some of those saturate the output.
template <typename T>
const table<regulator_input<T>>& regulator_table() {
  static const auto values = make_table<regulator_input<T>>(35, [](std::mt19937_64& rng) {
    const double reference = uniform(rng, -0.8, 0.8);
    const double error = (rng() & 7u) == 0 ? uniform(rng, -1.8, 1.8) : uniform(rng, -0.05, 0.05);
    return regulator_input<T>{number<T>(reference), number<T>(std::clamp(reference + error, -1.0, 0.99))};
  });
  return values;
}

template <typename T>
constexpr bool is_fixed() {
  return std::is_same_v<T, q15> || std::is_same_v<T, q31>;
}

}  // namespace

void register_modulation() {
  using plain::duty_to_compare;
  using plain::limit_d_priority;
  using plain::limit_magnitude;
  using plain::sine_pwm;
  using plain::six_step;
  using plain::svpwm;

  add_function<q15, q31, float, double>("svpwm_circle", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, request_table<T>(), [](stationary<T> v) { return svpwm(v, overmodulation::circle); });
  });
  add_function<q15, q31, float, double>("svpwm_hexagon", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, request_table<T>(), [](stationary<T> v) { return svpwm(v, overmodulation::hexagon); });
  });
  add_function<q15, q31, float, double>("sine_pwm", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, request_table<T>(), [](stationary<T> v) { return sine_pwm(v); });
  });
  add_function<q15, q31, float, double>("six_step", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, request_table<T>(), [](stationary<T> v) { return six_step(v); });
  });
  add_function<q15, q31, float, double>("limit_magnitude", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, limit_table<T>(),
               [](const limit_input<T>& x) { return limit_magnitude(x.v, x.limit); });
  });
  add_function<q15, q31, float, double>("limit_d_priority", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, limit_table<T>(),
               [](const limit_input<T>& x) { return limit_d_priority(x.v, x.limit); });
  });
  // One sample: update(bus), then normalize the request (the reciprocal and two multiplies).
  add_function<q15, q31, float, double>("bus_normalizer", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    using normalizer = std::conditional_t<is_fixed<T>(), rotorq::bus_normalizer<T>, plain::bus_normalizer<T>>;
    normalizer bus(number<T>(0.05));
    benchmark::DoNotOptimize(bus);  // the minimum is not a constant the compiler may fold
    time_calls(state, bus_table<T>(), [&bus](const bus_input<T>& x) {
      bus.update(x.bus);
      return bus.normalize(x.v);
    });
  });
  // 20 kHz at 100 MHz, 400 ns minimum pulse; period and pulse are not compile-time constants.
  add_function<q15, q31, float, double>("duty_to_compare", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    uint32_t period = 2500, min_pulse = 40;
    benchmark::DoNotOptimize(period);
    benchmark::DoNotOptimize(min_pulse);
    time_calls(state, duty_table<T>(),
               [period, min_pulse](phases<T> duty) { return duty_to_compare(duty, period, min_pulse); });
  });
#ifdef ROTORQ_BENCH_PI_REGULATOR
  // One update: kp = 0.8, ki = 0.01, output limits +-0.9.
  add_function<q15, q31, float, double>("pi_regulator", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    const auto run = [&state](auto& regulator) {
      benchmark::DoNotOptimize(regulator);  // gains and limits are not constants the compiler may fold
      time_calls(state, regulator_table<T>(), [&regulator](const regulator_input<T>& x) {
        return regulator.update(x.reference, x.measured);
      });
    };
    if constexpr (is_fixed<T>()) {
      pi_regulator<T> regulator({number<T>(0.8), 0}, {number<T>(0.64), -6}, number<T>(-0.9), number<T>(0.9));
      run(regulator);
    } else {
      plain::pi_regulator<T> regulator(T(0.8), T(0.01), T(-0.9), T(0.9));
      run(regulator);
    }
  });
#endif
}

}  // namespace rotorq::bench
