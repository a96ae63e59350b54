// sin_cos, the Clarke and Park transforms and one current-loop chain (Clarke -> sin_cos -> Park ->
// inverse Park -> svpwm), each next to the same steps in float and double with std::sin and std::cos.
#include "bench_support.hpp"
#include "plain_math.hpp"
#include "rotorq/clarke.hpp"
#include "rotorq/park.hpp"
#include "rotorq/sin_cos.hpp"
#include "rotorq/svpwm.hpp"

namespace rotorq::bench {

namespace {

template <typename T>
using angle_t = typename angle_type<T>::type;

template <typename T>
const table<angle_t<T>>& angle_table() {
  static const auto values =
      make_table<angle_t<T>>(21, [](std::mt19937_64& rng) { return angle<T>(uniform(rng, 0, 1)); });
  return values;
}

// Measured phase currents: a balanced set of amplitude up to 0.75 at any angle, each phase with up
// to 1% of offset, so that the zero-sequence part is not exactly zero.
template <typename T>
phases<T> phase_currents(std::mt19937_64& rng) {
  const double amplitude = uniform(rng, 0, 0.75), theta = uniform(rng, 0, 6.283185307179586477);
  const double third = 2.0943951023931954923;
  return {number<T>(amplitude * std::cos(theta) + uniform(rng, -0.01, 0.01)),
          number<T>(amplitude * std::cos(theta - third) + uniform(rng, -0.01, 0.01)),
          number<T>(amplitude * std::cos(theta + third) + uniform(rng, -0.01, 0.01))};
}

template <typename T>
const table<phases<T>>& current_table() {
  static const auto values = make_table<phases<T>>(22, phase_currents<T>);
  return values;
}

template <typename T>
const table<stationary<T>>& vector_table() {
  static const auto values =
      make_table<stationary<T>>(23, [](std::mt19937_64& rng) { return random_vector<T>(rng, 0.75); });
  return values;
}

template <typename T>
sin_cos_pair<T> pair_at(double turns) {
  using plain::sin_cos;
  using rotorq::sin_cos;
  return sin_cos(angle<T>(turns));
}

template <typename T, typename Vector>
struct rotation_input {
  Vector v;
  sin_cos_pair<T> angle;
};

template <typename T, typename Vector>
const table<rotation_input<T, Vector>>& rotation_table() {
  static const auto values = make_table<rotation_input<T, Vector>>(24, [](std::mt19937_64& rng) {
    const stationary<T> v = random_vector<T>(rng, 0.75);
    return rotation_input<T, Vector>{{v.alpha, v.beta}, pair_at<T>(uniform(rng, 0, 1))};
  });
  return values;
}

template <typename T>
struct chain_input {
  phases<T> current;
  angle_t<T> angle;
};

template <typename T>
const table<chain_input<T>>& chain_table() {
  static const auto values = make_table<chain_input<T>>(25, [](std::mt19937_64& rng) {
    return chain_input<T>{phase_currents<T>(rng), angle<T>(uniform(rng, 0, 1))};
  });
  return values;
}

}  // namespace

void register_transforms() {
  using plain::clarke;
  using plain::clarke_balanced;
  using plain::clarke_power_invariant;
  using plain::inverse_clarke;
  using plain::inverse_clarke_power_invariant;
  using plain::inverse_park;
  using plain::park;
  using plain::sin_cos;
  using plain::svpwm;

  add_function<q15, q31, float, double>("sin_cos", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, angle_table<T>(), [](angle_t<T> a) { return sin_cos(a); });
  });
  add_function<q15, q31, float, double>("clarke", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, current_table<T>(), [](phases<T> i) { return clarke(i); });
  });
  add_function<q15, q31, float, double>("clarke_balanced", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, current_table<T>(), [](phases<T> i) { return clarke_balanced(i.a, i.b); });
  });
  add_function<q15, q31, float, double>("inverse_clarke", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, vector_table<T>(), [](stationary<T> v) { return inverse_clarke(v); });
  });
  add_function<q15, q31, float, double>("clarke_power_invariant", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, current_table<T>(), [](phases<T> i) { return clarke_power_invariant(i); });
  });
  add_function<q15, q31, float, double>("inverse_clarke_power_invariant", [](auto type,
                                                                             benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, vector_table<T>(), [](stationary<T> v) { return inverse_clarke_power_invariant(v); });
  });
  add_function<q15, q31, float, double>("park", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, rotation_table<T, stationary<T>>(),
               [](const rotation_input<T, stationary<T>>& x) { return park(x.v, x.angle); });
  });
  add_function<q15, q31, float, double>("inverse_park", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, rotation_table<T, rotating<T>>(),
               [](const rotation_input<T, rotating<T>>& x) { return inverse_park(x.v, x.angle); });
  });
  // One current-loop step without the regulators: the measured currents come back as the voltage
  // request, so about a quarter of the requests are beyond the circle and get limited.
  add_function<q15, q31, float, double>("chain", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, chain_table<T>(), [](const chain_input<T>& x) {
      const sin_cos_pair<T> angle = sin_cos(x.angle);
      return svpwm(inverse_park(park(clarke(x.current), angle), angle), overmodulation::circle);
    });
  });
}

}  // namespace rotorq::bench
