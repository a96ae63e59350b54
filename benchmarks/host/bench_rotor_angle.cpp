// Speed, Hall sensors, angle interpolation and commutation. speed_from_motion, rpm_q8 and the angle
// interpolator have float and double counterparts; the Hall decoder, the tracker, six-step
// commutation and the hand-over are integer logic in any implementation and are timed alone.
#include "bench_support.hpp"
#include "plain_math.hpp"
#include "rotorq/angle_interpolator.hpp"
#include "rotorq/commutation.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/hall.hpp"
#include "rotorq/hall_tracker.hpp"

namespace rotorq::bench {

namespace {

constexpr double two_pi = 6.283185307179586477;
constexpr double turn32_steps = 4294967296.0;

template <typename T>
constexpr bool is_integer_variant() {
  return std::is_same_v<T, integer_code>;
}

struct motion {
  int64_t steps;
  uint64_t ticks;
};

// One to six Hall sectors (60 degrees each, with some placement error) either way, in 50 to 200000
// ticks: the measurement a tracker makes at each edge.
const table<motion>& motion_table() {
  static const auto values = make_table<motion>(41, [](std::mt19937_64& rng) {
    const double sectors = static_cast<double>(1 + rng() % 6) + uniform(rng, -0.05, 0.05);
    const double sign = (rng() & 1u) != 0 ? 1.0 : -1.0;
    return motion{static_cast<int64_t>(sign * sectors * turn32_steps / 6),
                  static_cast<uint64_t>(uniform(rng, 50, 200000))};
  });
  return values;
}

// Electrical speeds of 1 Hz to 2 kHz either way with a 100 MHz timer, in turns per tick (speed_of
// gives the library's electrical_speed).
const table<double>& turns_per_tick_table() {
  static const auto values = make_table<double>(42, [](std::mt19937_64& rng) {
    const double hz = std::exp(uniform(rng, std::log(1.0), std::log(2000.0)));
    return ((rng() & 1u) != 0 ? hz : -hz) / 1e8;
  });
  return values;
}
electrical_speed speed_of(double turns_per_tick) {
  return electrical_speed::from_raw(static_cast<int64_t>(std::ldexp(turns_per_tick, 48)));
}

// Hall codes, one in 64 of them impossible (0b000 or 0b111).
const table<uint8_t>& hall_code_table() {
  static const auto values = make_table<uint8_t>(43, [](std::mt19937_64& rng) {
    const auto r = static_cast<uint32_t>(rng());
    if ((r & 63u) == 0) return static_cast<uint8_t>((r & 64u) != 0 ? 0b111 : 0b000);
    return hall_code(static_cast<uint8_t>((r >> 8) % 6));
  });
  return values;
}

// The codes a rotor turning at a varying speed gives at each control period: 12 electrical turns over
// the table, the speed swinging by +-50% around its mean, so an edge comes every 14 periods on
// average. The angle returns to its start at the end of the table, so walking through it again and
// again is one smooth motion.
const table<uint8_t>& hall_sequence() {
  static const table<uint8_t> values = [] {
    table<uint8_t> codes{};
    const double turns = 12, n = static_cast<double>(table_size);
    for (size_t k = 0; k < table_size; ++k) {
      const double x = static_cast<double>(k) / n;
      const double angle = turns * (x + 0.5 / two_pi * (1 - std::cos(two_pi * x)));
      codes[k] = hall_code(static_cast<uint8_t>((angle - std::floor(angle)) * 6));
    }
    return codes;
  }();
  return values;
}

// Requests from 100 ticks before the last sample to 3000 after it; beyond 2000 the estimate is stale.
const table<uint32_t>& request_offset_table() {
  static const auto values = make_table<uint32_t>(44, [](std::mt19937_64& rng) {
    return static_cast<uint32_t>(static_cast<int32_t>(uniform(rng, -100, 3000)));
  });
  return values;
}

struct commutation_input {
  uint8_t sector;
  rotation torque;
};

const table<commutation_input>& commutation_table() {
  static const auto values = make_table<commutation_input>(45, [](std::mt19937_64& rng) {
    return commutation_input{static_cast<uint8_t>(rng() % 6),
                             rng() % 10 == 0 ? rotation::backward : rotation::forward};
  });
  return values;
}

struct handover_input {
  turn32 angle;
  electrical_speed speed;
  rotation torque;
};

// A rotor speeding up and slowing down three times over the table, between 40 and 160 Hz electrical
// (updates at 20 kHz, timer at 100 MHz), so the hand-over switches to FOC above 100 Hz and back
// below 80 Hz, blending in between; one update in 200 has no torque direction.
const table<handover_input>& handover_table() {
  static const table<handover_input> values = [] {
    table<handover_input> inputs{};
    std::mt19937_64 rng(46);
    double angle = 0;
    for (size_t k = 0; k < table_size; ++k) {
      const double hz =
          100 * (1 + 0.6 * std::sin(two_pi * 3 * static_cast<double>(k) / static_cast<double>(table_size)));
      angle += hz / 20000;
      const rotation torque = rng() % 200 == 0 ? rotation::unknown : rotation::forward;
      inputs[k] = {turn32::from_raw(static_cast<uint32_t>(std::ldexp(angle - std::floor(angle), 32))),
                   speed_of(hz / 1e8), torque};
    }
    return inputs;
  }();
  return values;
}

template <int Bits>
constexpr uint32_t ticks_per_period() {
  return Bits == 16 ? 50 : 5000;  // 20 kHz control with a 1 MHz 16-bit or a 100 MHz 32-bit timer
}

}  // namespace

void register_rotor_angle() {
  add_function<integer_code, float, double>("speed_from_motion", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, motion_table(), [](const motion& m) {
      if constexpr (is_integer_variant<T>()) {
        return speed_from_motion(m.steps, m.ticks);
      } else {
        return plain::speed_from_motion<T>(m.steps, m.ticks);
      }
    });
  });
  // 4 pole pairs, 100 MHz timer.
  add_function<integer_code, float, double>("rpm_q8", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    if constexpr (is_integer_variant<T>()) {
      static const auto speeds = convert_table<electrical_speed>(turns_per_tick_table(), speed_of);
      rpm_scale scale(4, 100000000);
      benchmark::DoNotOptimize(scale);
      time_calls(state, speeds, [&scale](electrical_speed s) { return scale.rpm_q8(s); });
    } else {
      static const auto speeds =
          convert_table<T>(turns_per_tick_table(), [](double x) { return static_cast<T>(x); });
      plain::rpm_scale<T> scale(4, 100000000);
      benchmark::DoNotOptimize(scale);
      time_calls(state, speeds, [&scale](T s) { return scale.rpm(s); });
    }
  });
  add_function<integer_code>("decode_hall", [](auto, benchmark::State& state) {
    time_calls(state, hall_code_table(), [](uint8_t code) { return decode_hall(code); });
  });
  // One control period: update(code, now), then estimate(now) for the current loop.
  const auto update_and_estimate = [](auto type, benchmark::State& state) {
    constexpr int bits = decltype(type)::type::bits;
    using time_type = typename hall_tracker<bits>::time_type;
    hall_tracker_config config{};
    benchmark::DoNotOptimize(config);
    hall_tracker<bits> tracker(config);
    uint32_t now = 0;
    time_calls(state, hall_sequence(), [&tracker, &now](uint8_t code) {
      now += ticks_per_period<bits>();
      tracker.update(code, static_cast<time_type>(now));
      return tracker.estimate(static_cast<time_type>(now));
    });
  };
  add_function<timer_width<16>, timer_width<32>>("hall_tracker", update_and_estimate);
  // estimate(now) from two samples taken 1000 ticks apart (0.3 turn, 2e-6 turn per tick), held at
  // 2000 ticks from the last one.
  add_function<timer_width<16>, timer_width<32>, float, double>(
      "angle_interpolator", [](auto type, benchmark::State& state) {
        using T = typename decltype(type)::type;
        constexpr uint32_t start = 0xfffff000u;  // the timer wraps during the requests
        if constexpr (std::is_floating_point_v<T>) {
          plain::angle_interpolator<T> position(2000);
          position.update(T(0.3), start, T(2e-6));
          benchmark::DoNotOptimize(position);
          time_calls(state, request_offset_table(),
                     [&position](uint32_t offset) { return position.estimate(start + offset); });
        } else {
          constexpr int bits = T::bits;
          using time_type = typename angle_interpolator<bits>::time_type;
          angle_interpolator<bits> position(2000);
          position.update(turn32::from_raw(0x4ccccccdu), static_cast<time_type>(start - 1000));
          position.update(turn32::from_raw(0x4d4fdf3cu), static_cast<time_type>(start));
          benchmark::DoNotOptimize(position);
          time_calls(state, request_offset_table(), [&position](uint32_t offset) {
            return position.estimate(static_cast<time_type>(start + offset));
          });
        }
      });
  add_function<integer_code>("six_step_commutation", [](auto, benchmark::State& state) {
    time_calls(state, commutation_table(),
               [](const commutation_input& x) { return six_step_commutation(x.sector, x.torque); });
  });
  add_function<integer_code>("foc_handover", [](auto, benchmark::State& state) {
    handover_config config{};
    config.foc_above = speed_of(100 / 1e8);
    config.six_step_below = speed_of(80 / 1e8);
    benchmark::DoNotOptimize(config);
    foc_handover handover(config);
    time_calls(state, handover_table(),
               [&handover](const handover_input& x) { return handover.update(x.angle, x.speed, x.torque); });
  });
}

}  // namespace rotorq::bench
