// The target test vectors: one table of groups, each a public function (or a scripted sequence of
// calls on a stateful object) with the kinds of its inputs and the number of its outputs.
//
// The same table is compiled into the host generator (generate_vectors.cpp, which writes
// golden_vectors.inc with the generic port) and into the target runner (run_vectors.cpp, which
// checks each core's port against that file), so inputs and outputs are packed the same way on
// both sides. Every input and output is a 32-bit word: signed values sign-extended, flags and
// enumerations as small integers, 64-bit values as two words (low, high).
//
// Each group has explicit cases (inputs and expected outputs stored in the golden file, built by the
// generator from the edge values of each input kind: the corners, -1 raw, full scale, impossible
// codes, zero bus, zero period, ...) and a bulk run: `bulk` inputs drawn from a xorshift32 generator
// seeded with the group's index (or, for `sequential` groups, every input 0 .. bulk - 1), whose
// outputs are folded into one hash, compared with the golden hash.
//
// Freestanding: only <stdint.h> and the library's target headers (no C++ standard library, no
// floating point), so the RV32 toolchain, which ships none, builds it.
#pragma once

#include <stdint.h>

#include "rotorq/accumulator.hpp"
#include "rotorq/angle_interpolator.hpp"
#include "rotorq/clarke.hpp"
#include "rotorq/commutation.hpp"
#include "rotorq/dc_bus.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/hall.hpp"
#include "rotorq/hall_tracker.hpp"
#include "rotorq/park.hpp"
#include "rotorq/pi_regulator.hpp"
#include "rotorq/pwm_compare.hpp"
#include "rotorq/sin_cos.hpp"
#include "rotorq/svpwm.hpp"
#include "rotorq/turn.hpp"
#include "rotorq/voltage_limit.hpp"

namespace rotorq::vectors {

// What an input word holds; it decides its edge values and how bulk inputs are drawn.
enum class kind : uint8_t {
  q15,       // raw q15, sign-extended
  q31,       // raw q31
  turn16,    // raw turn16
  turn32,    // raw turn32
  word,      // any 32-bit value (halves of 64-bit values, counts, frequencies)
  period,    // a PWM period in timer counts
  pulse,     // a minimum pulse in timer counts
  code,      // 0..7: a Hall code or a sector, including the impossible ones
  flag,      // 0 or 1
  direction  // -1, 0, 1 (rotation)
};

inline constexpr int max_inputs = 6;
inline constexpr int max_outputs = 4;

using apply_function = void (*)(const uint32_t* in, uint32_t* out);

struct group {
  const char* name = nullptr;
  uint8_t input_count = 0;
  kind inputs[max_inputs] = {};
  uint8_t output_count = 0;
  apply_function apply = nullptr;
  uint32_t bulk = 4096;
  bool sequential = false;
};

// xorshift32 (Marsaglia 2003): 32-bit operations only, the same sequence on every core.
struct random_words {
  uint32_t state;
  constexpr uint32_t next() noexcept {
    state ^= state << 13;
    state ^= state >> 17;
    state ^= state << 5;
    return state;
  }
};

// Folds output words into a hash: FNV-1a's step on whole words (prime 16777619).
struct hash32 {
  uint32_t value = 2166136261u;
  constexpr void add(uint32_t w) noexcept { value = (value ^ w) * 16777619u; }
};

// One bulk input of a kind.
constexpr uint32_t draw(kind k, random_words& rng) noexcept {
  const uint32_t r = rng.next();
  const uint32_t s = rng.next();
  switch (k) {
    case kind::q15: {
      // every magnitude: a uniform raw value shifted right by 0..3 bits
      const int32_t raw = detail::to_signed(static_cast<uint16_t>(r & 0xffffu));
      return static_cast<uint32_t>(raw >> (s & 3u));
    }
    case kind::q31:
      return static_cast<uint32_t>(detail::to_signed(r) >> (s & 3u));
    case kind::turn16:
      return r & 0xffffu;
    case kind::turn32:
    case kind::word:
      return r;
    case kind::period:
      return r % 70001u;
    case kind::pulse:
      return r % 3000u;
    case kind::code:
      return r & 7u;
    case kind::flag:
      return r & 1u;
    case kind::direction:
      return static_cast<uint32_t>(static_cast<int32_t>(r % 3u) - 1);
  }
  return 0;
}

// The edge values of each kind, from which the explicit cases are built.
inline constexpr uint32_t q15_edges[] = {0xffff8000u, 0xffff8001u, 0xffffc000u, 0xffffffffu,
                                         0u,          1u,          16384u,      18919u /* 1/sqrt(3) */,
                                         32766u,      32767u};
inline constexpr uint32_t q31_edges[] = {0x80000000u, 0x80000001u, 0xc0000000u, 0xffffffffu,
                                         0u,          1u,          0x40000000u, 1239850263u /* 1/sqrt(3) */,
                                         0x7ffffffeu, 0x7fffffffu};
inline constexpr uint32_t turn16_edges[] = {0u,      1u,      0x2aabu, 0x3fffu, 0x4000u,
                                            0x8000u, 0xbfffu, 0xc000u, 0xfffeu, 0xffffu};
inline constexpr uint32_t turn32_edges[] = {0u,          1u,          0x2aaaaaabu, 0x3fffffffu, 0x40000000u,
                                            0x80000000u, 0xbfffffffu, 0xc0000000u, 0xfffffffeu, 0xffffffffu};
inline constexpr uint32_t word_edges[] = {0u,          1u,          2u,          1000u,
                                          0x7fffffffu, 0x80000000u, 0xfffffffeu, 0xffffffffu};
inline constexpr uint32_t period_edges[] = {0u, 1u, 2u, 3u, 2500u, 65535u, 65536u, 0xffffffffu};
inline constexpr uint32_t pulse_edges[] = {0u, 1u, 10u, 1250u, 1251u, 0xffffffffu};
inline constexpr uint32_t code_edges[] = {0u, 1u, 2u, 3u, 4u, 5u, 6u, 7u, 255u};
inline constexpr uint32_t flag_edges[] = {0u, 1u};
inline constexpr uint32_t direction_edges[] = {0xffffffffu, 0u, 1u};

struct edge_list {
  const uint32_t* values;
  uint32_t count;
};
template <uint32_t N>
constexpr edge_list list(const uint32_t (&values)[N]) noexcept {
  return {values, N};
}
constexpr edge_list edges_of(kind k) noexcept {
  switch (k) {
    case kind::q15:
      return list(q15_edges);
    case kind::q31:
      return list(q31_edges);
    case kind::turn16:
      return list(turn16_edges);
    case kind::turn32:
      return list(turn32_edges);
    case kind::word:
      return list(word_edges);
    case kind::period:
      return list(period_edges);
    case kind::pulse:
      return list(pulse_edges);
    case kind::code:
      return list(code_edges);
    case kind::flag:
      return list(flag_edges);
    case kind::direction:
      return list(direction_edges);
  }
  return list(flag_edges);
}

// ---- packing --------------------------------------------------------------------------------------

constexpr uint32_t word(int32_t v) noexcept { return static_cast<uint32_t>(v); }
constexpr uint32_t word(bool v) noexcept { return v ? 1u : 0u; }
constexpr uint32_t low_word(int64_t v) noexcept { return static_cast<uint32_t>(static_cast<uint64_t>(v)); }
constexpr uint32_t high_word(int64_t v) noexcept {
  return static_cast<uint32_t>(static_cast<uint64_t>(v) >> 32);
}
constexpr int64_t wide(uint32_t low, uint32_t high) noexcept {
  return detail::to_signed((uint64_t{high} << 32) | low);
}

constexpr q15 as_q15(uint32_t w) noexcept {
  return q15::from_raw(detail::to_signed(static_cast<uint16_t>(w)));
}
constexpr q31 as_q31(uint32_t w) noexcept { return q31::from_raw(detail::to_signed(w)); }
template <int F>
constexpr fixed<F> as_fixed(uint32_t w) noexcept {
  if constexpr (F == 15) {
    return as_q15(w);
  } else {
    return as_q31(w);
  }
}
template <int F>
constexpr uint32_t out(fixed<F> x) noexcept {
  return word(int32_t{x.raw()});
}
constexpr rotation as_rotation(uint32_t w) noexcept {
  const int32_t v = detail::to_signed(w);
  return v < 0 ? rotation::backward : (v > 0 ? rotation::forward : rotation::unknown);
}
constexpr uint32_t out(rotation r) noexcept { return word(int32_t{static_cast<int8_t>(r)}); }
template <typename Q>
constexpr kind kind_of() noexcept {
  return Q::fraction_bits == 15 ? kind::q15 : kind::q31;
}

// ---- the functions, as apply functions -----------------------------------------------------------

template <int F>
struct fixed_cases {
  using Q = fixed<F>;
  static void add(const uint32_t* in, uint32_t* o) { o[0] = out(as_fixed<F>(in[0]) + as_fixed<F>(in[1])); }
  static void sub(const uint32_t* in, uint32_t* o) { o[0] = out(as_fixed<F>(in[0]) - as_fixed<F>(in[1])); }
  static void neg(const uint32_t* in, uint32_t* o) { o[0] = out(-as_fixed<F>(in[0])); }
  static void abs(const uint32_t* in, uint32_t* o) { o[0] = out(rotorq::abs(as_fixed<F>(in[0]))); }
  static void mul(const uint32_t* in, uint32_t* o) { o[0] = out(as_fixed<F>(in[0]) * as_fixed<F>(in[1])); }
  static void mul_add(const uint32_t* in, uint32_t* o) {
    o[0] = out(rotorq::mul_add(as_fixed<F>(in[0]), as_fixed<F>(in[1]), as_fixed<F>(in[2])));
  }
  static void compare(const uint32_t* in, uint32_t* o) {
    const Q a = as_fixed<F>(in[0]), b = as_fixed<F>(in[1]);
    o[0] = (a == b ? 1u : 0u) | (a != b ? 2u : 0u) | (a < b ? 4u : 0u) | (a <= b ? 8u : 0u) |
           (a > b ? 16u : 0u) | (a >= b ? 32u : 0u);
  }
  // A scripted sequence of mac / msc / add on an accumulator, from a seed: half of the operands are
  // -1 or max, so the exact sum runs past 2^63 and back.
  static void accumulate(const uint32_t* in, uint32_t* o) {
    random_words rng{in[0] | 1u};
    accumulator<Q> acc;
    hash32 h;
    const uint32_t steps = 16 + (in[1] & 127u);
    for (uint32_t i = 0; i < steps; ++i) {
      const uint32_t r = rng.next();
      const auto operand = [&rng](uint32_t choice) {
        return (choice & 1u) != 0 ? ((choice & 2u) != 0 ? Q::min() : Q::max()) : as_fixed<F>(rng.next());
      };
      const Q a = operand(r >> 4), b = operand(r >> 8);
      switch (r & 3u) {
        case 0:
          acc.mac(a, b);
          break;
        case 1:
          acc.msc(a, b);
          break;
        case 2:
          acc.add(a);
          break;
        default:
          if ((r & 0xf000u) == 0) acc.clear();
          break;
      }
      h.add(out(acc.result()));
    }
    o[0] = h.value;
    o[1] = out(acc.result());
  }
};

template <int Bits>
struct turn_cases {
  using T = turn<Bits>;
  using raw_type = typename T::raw_type;
  using difference_type = typename T::difference_type;
  static constexpr T as_turn(uint32_t w) noexcept { return T::from_raw(static_cast<raw_type>(w)); }
  static void add(const uint32_t* in, uint32_t* o) { o[0] = (as_turn(in[0]) + as_turn(in[1])).raw(); }
  static void sub(const uint32_t* in, uint32_t* o) { o[0] = (as_turn(in[0]) - as_turn(in[1])).raw(); }
  static void neg(const uint32_t* in, uint32_t* o) { o[0] = (-as_turn(in[0])).raw(); }
  static void difference(const uint32_t* in, uint32_t* o) {
    o[0] = word(int32_t{signed_difference(as_turn(in[0]), as_turn(in[1]))});
  }
  static void advance(const uint32_t* in, uint32_t* o) {
    const auto steps = static_cast<difference_type>(detail::to_signed(in[1]));
    o[0] = rotorq::advance(as_turn(in[0]), steps).raw();
  }
};

inline void to_turn32_case(const uint32_t* in, uint32_t* o) {
  o[0] = to_turn32(turn16::from_raw(static_cast<uint16_t>(in[0]))).raw();
}
inline void to_turn16_case(const uint32_t* in, uint32_t* o) {
  o[0] = to_turn16(turn32::from_raw(in[0])).raw();
}
inline void to_q15_case(const uint32_t* in, uint32_t* o) { o[0] = out(to_q15(as_q31(in[0]))); }
inline void to_q31_case(const uint32_t* in, uint32_t* o) { o[0] = out(to_q31(as_q15(in[0]))); }

inline void sin_cos_q15_case(const uint32_t* in, uint32_t* o) {
  const sin_cos_pair<q15> p = sin_cos(turn16::from_raw(static_cast<uint16_t>(in[0])));
  o[0] = out(p.sin);
  o[1] = out(p.cos);
}
inline void sin_cos_q31_case(const uint32_t* in, uint32_t* o) {
  const sin_cos_pair<q31> p = sin_cos(turn32::from_raw(in[0]));
  o[0] = out(p.sin);
  o[1] = out(p.cos);
}

template <int F>
struct transform_cases {
  using Q = fixed<F>;
  static constexpr phases<Q> three(const uint32_t* in) noexcept {
    return {as_fixed<F>(in[0]), as_fixed<F>(in[1]), as_fixed<F>(in[2])};
  }
  static constexpr stationary<Q> pair(const uint32_t* in) noexcept {
    return {as_fixed<F>(in[0]), as_fixed<F>(in[1])};
  }
  static void put(stationary<Q> v, uint32_t* o) {
    o[0] = out(v.alpha);
    o[1] = out(v.beta);
  }
  static void put(rotating<Q> v, uint32_t* o) {
    o[0] = out(v.d);
    o[1] = out(v.q);
  }
  static void put(phases<Q> v, uint32_t* o) {
    o[0] = out(v.a);
    o[1] = out(v.b);
    o[2] = out(v.c);
  }
  static void clarke(const uint32_t* in, uint32_t* o) { put(rotorq::clarke(three(in)), o); }
  static void clarke_balanced(const uint32_t* in, uint32_t* o) {
    put(rotorq::clarke_balanced(as_fixed<F>(in[0]), as_fixed<F>(in[1])), o);
  }
  static void inverse_clarke(const uint32_t* in, uint32_t* o) { put(rotorq::inverse_clarke(pair(in)), o); }
  static void clarke_power_invariant(const uint32_t* in, uint32_t* o) {
    put(rotorq::clarke_power_invariant(three(in)), o);
  }
  static void inverse_clarke_power_invariant(const uint32_t* in, uint32_t* o) {
    put(rotorq::inverse_clarke_power_invariant(pair(in)), o);
  }
  // park(v, (sin, cos)) with the pair as given: malformed pairs included
  static void park(const uint32_t* in, uint32_t* o) {
    put(rotorq::park(pair(in), sin_cos_pair<Q>{as_fixed<F>(in[2]), as_fixed<F>(in[3])}), o);
  }
  static void inverse_park(const uint32_t* in, uint32_t* o) {
    put(rotorq::inverse_park(rotating<Q>{as_fixed<F>(in[0]), as_fixed<F>(in[1])},
                             sin_cos_pair<Q>{as_fixed<F>(in[2]), as_fixed<F>(in[3])}),
        o);
  }
  // the current-loop chain: Clarke, sin_cos, Park, inverse Park, svpwm
  static void chain(const uint32_t* in, uint32_t* o) {
    const stationary<Q> i = rotorq::clarke(three(in));
    sin_cos_pair<Q> angle{};
    if constexpr (F == 15) {
      angle = sin_cos(turn16::from_raw(static_cast<uint16_t>(in[3])));
    } else {
      angle = sin_cos(turn32::from_raw(in[3]));
    }
    const rotating<Q> dq = rotorq::park(i, angle);
    put(svpwm(rotorq::inverse_park(dq, angle)), o);
  }
  static void put(const modulation<Q>& m, uint32_t* o) {
    o[0] = out(m.duty.a);
    o[1] = out(m.duty.b);
    o[2] = out(m.duty.c);
    o[3] = word(int32_t{m.sector}) | (m.limited ? 0x100u : 0u);
  }
  static void svpwm_circle(const uint32_t* in, uint32_t* o) {
    put(svpwm(pair(in), overmodulation::circle), o);
  }
  static void svpwm_hexagon(const uint32_t* in, uint32_t* o) {
    put(svpwm(pair(in), overmodulation::hexagon), o);
  }
  static void sine_pwm(const uint32_t* in, uint32_t* o) { put(rotorq::sine_pwm(pair(in)), o); }
  static void six_step(const uint32_t* in, uint32_t* o) { put(rotorq::six_step(pair(in)), o); }
  template <typename V>
  static void put(const limited<V>& l, uint32_t* o) {
    put(l.value, o);
    o[2] = word(l.clipped);
  }
  static void limit_stationary(const uint32_t* in, uint32_t* o) {
    put(limit_magnitude(pair(in), as_fixed<F>(in[2])), o);
  }
  static void limit_rotating(const uint32_t* in, uint32_t* o) {
    put(limit_magnitude(rotating<Q>{as_fixed<F>(in[0]), as_fixed<F>(in[1])}, as_fixed<F>(in[2])), o);
  }
  static void limit_d_priority(const uint32_t* in, uint32_t* o) {
    put(rotorq::limit_d_priority(rotating<Q>{as_fixed<F>(in[0]), as_fixed<F>(in[1])}, as_fixed<F>(in[2])), o);
  }
  // bus_normalizer(minimum).update(bus), then normalize(v) and normalize(v, v) as a pair
  static void bus(const uint32_t* in, uint32_t* o) {
    bus_normalizer<Q> n(as_fixed<F>(in[0]));
    o[0] = word(n.update(as_fixed<F>(in[1])));
    o[1] = out(n.normalize(as_fixed<F>(in[2])));
    o[2] = word(n.valid());
    o[3] = out(n.normalize(rotating<Q>{as_fixed<F>(in[2]), as_fixed<F>(in[1])}).q);
  }
  static void compare(const uint32_t* in, uint32_t* o) {
    const compare_values c = duty_to_compare(three(in), in[3], in[4]);
    o[0] = c.compare.a;
    o[1] = c.compare.b;
    o[2] = c.compare.c;
    o[3] = word(c.clipped);
  }
  // A PI regulator from a seed: gains of every exponent (and out-of-range ones), limits that change
  // (inverted ones too), presets and resets, references and measurements at full scale, so the
  // anti-windup and every saturation are exercised.
  static void pi(const uint32_t* in, uint32_t* o) {
    random_words rng{in[0] | 1u};
    const auto gain = [&rng]() {
      const uint32_t r = rng.next();
      return pi_gain<Q>{as_fixed<F>(rng.next()), static_cast<int>(r % 40u) - 20};
    };
    // one draw per statement: the order of evaluation of function arguments is unspecified
    const pi_gain<Q> kp = gain();
    const pi_gain<Q> ki = gain();
    const Q high = as_fixed<F>(rng.next());
    pi_regulator<Q> reg(kp, ki, as_fixed<F>(in[1]), high);
    hash32 h;
    for (int i = 0; i < 200; ++i) {
      const uint32_t r = rng.next();
      if ((r & 63u) == 0) {
        const Q lo = as_fixed<F>(rng.next());
        reg.set_limits(lo, as_fixed<F>(rng.next()));
      }
      if ((r & 63u) == 1) reg.set_limit(as_fixed<F>(rng.next()));
      if ((r & 127u) == 2) reg.preset(as_fixed<F>(rng.next()));
      if ((r & 255u) == 3) reg.reset();
      if ((r & 255u) == 4) {
        const pi_gain<Q> p = gain();
        reg.set_gains(p, gain());
      }
      const Q reference = (r & 0x100u) != 0 ? as_fixed<F>(rng.next()) : Q::max();
      const Q measured = (r & 0x200u) != 0 ? as_fixed<F>(rng.next()) : Q::min();
      const Q feedforward = (r & 0xc00u) == 0 ? as_fixed<F>(rng.next()) : Q::zero();
      h.add(out(reg.update(reference, measured, feedforward)));
      h.add(low_word(reg.integrator_wide()) ^ (word(reg.saturated()) << 31));
      h.add(high_word(reg.integrator_wide()));
    }
    o[0] = h.value;
    o[1] = out(reg.output());
    o[2] = out(reg.lower_limit());
    o[3] = out(reg.upper_limit());
  }
  static void commutation_voltage(const uint32_t* in, uint32_t* o) {
    const commutation_state s = six_step_commutation(static_cast<uint8_t>(in[0]), as_rotation(in[1]));
    put(rotorq::commutation_voltage(s, as_fixed<F>(in[2])), o);
  }
};

// ---- speed, Hall sensors, commutation --------------------------------------------------------------

inline void speed_from_motion_case(const uint32_t* in, uint32_t* o) {
  const electrical_speed s = speed_from_motion(wide(in[0], in[1]), static_cast<uint64_t>(wide(in[2], in[3])));
  o[0] = low_word(s.raw());
  o[1] = high_word(s.raw());
}
inline void steps_at_case(const uint32_t* in, uint32_t* o) {
  const int64_t steps = steps_at(electrical_speed::from_raw(wide(in[0], in[1])), in[2]);
  o[0] = low_word(steps);
  o[1] = high_word(steps);
}
inline void rpm_case(const uint32_t* in, uint32_t* o) {
  const rpm_scale scale(in[0], in[1]);
  o[0] = word(scale.rpm_q8(electrical_speed::from_raw(wide(in[2], in[3]))));
}
inline void decode_hall_case(const uint32_t* in, uint32_t* o) {
  const hall_placement p = in[1] != 0 ? hall_placement::spaced_60 : hall_placement::spaced_120;
  const hall_reading r = decode_hall(static_cast<uint8_t>(in[0]), p);
  o[0] = r.sector;
  o[1] = word(r.valid);
  o[2] = hall_code(static_cast<uint8_t>(in[0]), p);
}
inline void calibration_case(const uint32_t* in, uint32_t* o) {
  const hall_calibration c = uniform_hall_calibration(turn32::from_raw(in[0]));
  const auto s = static_cast<uint8_t>(in[1]);
  o[0] = entry_angle(c, s, in[2] != 0).raw();
  o[1] = sector_centre(c, s).raw();
}
inline void six_step_commutation_case(const uint32_t* in, uint32_t* o) {
  const commutation_state s = six_step_commutation(static_cast<uint8_t>(in[0]), as_rotation(in[1]));
  o[0] = static_cast<uint32_t>(s.drive.a) | (static_cast<uint32_t>(s.drive.b) << 8) |
         (static_cast<uint32_t>(s.drive.c) << 16);
  o[1] = s.vector;
  o[2] = word(s.active);
  o[3] = s.vector_angle.raw();
}
inline void commutation_sector_case(const uint32_t* in, uint32_t* o) {
  o[0] = commutation_sector(turn32::from_raw(in[0]));
}

// A rotor turning at a speed that changes now and then, read by Hall sensors at a PWM rate: the
// sequence of codes has bounces, impossible codes, stops and reversals, and the time runs through
// the timer's wrap. Each call of `on_sample(code, time)` is one PWM period.
template <typename Sample>
constexpr void hall_script(uint32_t seed, uint32_t count, Sample on_sample) noexcept {
  random_words rng{seed | 1u};
  uint32_t angle = rng.next();
  uint32_t time = rng.next();  // wraps: the trackers see it modulo 2^16 or 2^32
  int32_t speed = 0x00100000;  // turn32 steps per tick
  const uint32_t period = 500 + (rng.next() & 1023u);
  for (uint32_t i = 0; i < count; ++i) {
    const uint32_t r = rng.next();
    if ((r & 255u) == 0)
      speed = detail::to_signed(rng.next()) >> (8 + (rng.next() & 7u));  // any, or reversed
    if ((r & 1023u) == 1) speed = 0;                                     // a stop
    angle += static_cast<uint32_t>(speed) * period;
    time += period;
    // cppcheck-suppress shiftTooManyBits ; the product is a 64-bit value
    uint8_t code = hall_code(static_cast<uint8_t>((uint64_t{angle} * 6) >> 32));  // the rotor's sector
    if ((r & 0x3f00u) == 0x100u)
      code = static_cast<uint8_t>((r >> 16) & 7u);  // a bounce or an impossible code
    on_sample(code, time);
  }
}

template <int TimerBits>
struct hall_cases {
  using time_type = typename detail::timer_traits<TimerBits>::time_type;
  static constexpr time_type at(uint32_t t) noexcept { return static_cast<time_type>(t); }

  static void glitch_filter(const uint32_t* in, uint32_t* o) {
    hall_glitch_filter<TimerBits> f(in[1] & 0xfffu);
    hash32 h;
    hall_script(in[0], 400, [&](uint8_t code, uint32_t t) {
      const hall_reading r = decode_hall(code);
      const hall_edge<TimerBits> e = f.update(r.valid ? r.sector : uint8_t{7}, at(t));
      h.add(word(e.happened) | (uint32_t{e.sector} << 8) | (uint32_t{f.sector()} << 16));
      h.add(e.time);
    });
    o[0] = h.value;
  }
  static void tracker(const uint32_t* in, uint32_t* o) {
    hall_tracker_config c{};
    const uint32_t options = in[1];
    c.calibration = uniform_hall_calibration(turn32::from_raw(options & 0x0fff0000u));
    c.averaging = (options & 1u) != 0 ? speed_averaging::last_edge : speed_averaging::full_turn;
    c.min_dwell = (options >> 1) & 0xffu;
    c.stall_timeout = (options & 0x200u) != 0 ? 0xffffffffu : 20000u + (options & 0xfc00u);
    c.min_speed = electrical_speed::from_raw((options & 0x10000000u) != 0 ? int64_t{1} << 30 : 0);
    if ((options & 0x20000000u) != 0) c.centre_slew = electrical_speed::from_raw(int64_t{1} << 36);
    hall_tracker<TimerBits> t(c);
    hash32 h;
    hall_script(in[0], 600, [&](uint8_t code, uint32_t time) {
      t.update(code, at(time));
      const hall_estimate e = t.estimate(at(time + 250u));
      h.add(e.angle.raw());
      h.add(low_word(e.speed.raw()));
      h.add(high_word(e.speed.raw()));
      h.add(out(e.direction) ^ (uint32_t{e.sector} << 8) ^ (static_cast<uint32_t>(e.source) << 16) ^
            (word(e.stalled) << 24) ^ (word(e.invalid_code) << 25) ^ (word(e.at_next_edge) << 26));
    });
    o[0] = h.value;
    o[1] = t.edges();
    o[2] = t.invalid_codes();
  }
  static void interpolator(const uint32_t* in, uint32_t* o) {
    angle_interpolator<TimerBits> a((in[1] & 1u) != 0 ? 0xffffffffu : in[1] & 0xffffu);
    hash32 h;
    random_words rng{in[0] | 1u};
    uint32_t angle = rng.next(), time = rng.next();
    for (int i = 0; i < 300; ++i) {
      const uint32_t r = rng.next();
      const interpolated_angle e = a.estimate(at(time + (r & 0x3fffu) - 0x1000u));
      h.add(e.angle.raw() ^ (word(e.valid) << 0) ^ (word(e.stale) << 1));
      h.add(low_word(e.speed.raw()));
      angle += r >> 12;
      time += (r >> 20) & 0x7ffu;  // zero intervals too
      if ((r & 31u) == 0) {
        a.update(turn32::from_raw(angle), at(time),
                 electrical_speed::from_raw(detail::to_signed(rng.next())));
      } else {
        a.update(turn32::from_raw(angle), at(time));
      }
    }
    o[0] = h.value;
  }
};

inline void handover_case(const uint32_t* in, uint32_t* o) {
  handover_config c{};
  c.foc_above = electrical_speed::from_raw(int64_t{in[1] & 0xffffu} << 16);
  c.six_step_below = electrical_speed::from_raw(int64_t{in[1] >> 16} << 15);
  foc_handover h(c);
  hash32 hash;
  random_words rng{in[0] | 1u};
  uint32_t angle = rng.next();
  int64_t speed = 0;
  for (int i = 0; i < 400; ++i) {
    const uint32_t r = rng.next();
    speed += detail::to_signed(r) >> 12;
    angle += static_cast<uint32_t>(speed >> 4);
    const drive_command d =
        h.update(turn32::from_raw(angle), electrical_speed::from_raw(speed), as_rotation(r % 3u - 1u));
    hash.add(static_cast<uint32_t>(d.mode) ^ (uint32_t{d.six_step.vector} << 8) ^
             (word(d.six_step.active) << 16));
    hash.add(d.offset.raw());
    hash.add(out(d.current_direction.d) ^ (out(d.current_direction.q) << 16));
    hash.add(d.current_angle.raw());
  }
  o[0] = hash.value;
  o[1] = static_cast<uint32_t>(h.mode());
}

// ---- the table ------------------------------------------------------------------------------------

template <int F>
constexpr kind k() noexcept {
  return F == 15 ? kind::q15 : kind::q31;
}

// The groups of one format and of one angle width, as macros because each name is a string literal
// pasted from the width.
// NOLINTNEXTLINE(cppcoreguidelines-macro-usage)
#define ROTORQ_FIXED_GROUPS(F)                                                                               \
  group{"q" #F "_add", 2, {k<F>(), k<F>()}, 1, fixed_cases<F>::add},                                         \
      group{"q" #F "_sub", 2, {k<F>(), k<F>()}, 1, fixed_cases<F>::sub},                                     \
      group{"q" #F "_neg", 1, {k<F>()}, 1, fixed_cases<F>::neg},                                             \
      group{"q" #F "_abs", 1, {k<F>()}, 1, fixed_cases<F>::abs},                                             \
      group{"q" #F "_mul", 2, {k<F>(), k<F>()}, 1, fixed_cases<F>::mul},                                     \
      group{"q" #F "_mul_add", 3, {k<F>(), k<F>(), k<F>()}, 1, fixed_cases<F>::mul_add},                     \
      group{"q" #F "_compare", 2, {k<F>(), k<F>()}, 1, fixed_cases<F>::compare},                             \
      group{"q" #F "_accumulator", 2, {kind::word, kind::word}, 2, fixed_cases<F>::accumulate, 512},         \
      group{"q" #F "_clarke", 3, {k<F>(), k<F>(), k<F>()}, 2, transform_cases<F>::clarke},                   \
      group{"q" #F "_clarke_balanced", 2, {k<F>(), k<F>()}, 2, transform_cases<F>::clarke_balanced},         \
      group{"q" #F "_inverse_clarke", 2, {k<F>(), k<F>()}, 3, transform_cases<F>::inverse_clarke},           \
      group{"q" #F "_clarke_power_invariant",                                                                \
            3,                                                                                               \
            {k<F>(), k<F>(), k<F>()},                                                                        \
            2,                                                                                               \
            transform_cases<F>::clarke_power_invariant},                                                     \
      group{"q" #F "_inverse_clarke_power_invariant",                                                        \
            2,                                                                                               \
            {k<F>(), k<F>()},                                                                                \
            3,                                                                                               \
            transform_cases<F>::inverse_clarke_power_invariant},                                             \
      group{"q" #F "_park", 4, {k<F>(), k<F>(), k<F>(), k<F>()}, 2, transform_cases<F>::park},               \
      group{                                                                                                 \
          "q" #F "_inverse_park", 4, {k<F>(), k<F>(), k<F>(), k<F>()}, 2, transform_cases<F>::inverse_park}, \
      group{"q" #F "_chain",                                                                                 \
            4,                                                                                               \
            {k<F>(), k<F>(), k<F>(), (F) == 15 ? kind::turn16 : kind::turn32},                               \
            4,                                                                                               \
            transform_cases<F>::chain},                                                                      \
      group{"q" #F "_svpwm_circle", 2, {k<F>(), k<F>()}, 4, transform_cases<F>::svpwm_circle},               \
      group{"q" #F "_svpwm_hexagon", 2, {k<F>(), k<F>()}, 4, transform_cases<F>::svpwm_hexagon},             \
      group{"q" #F "_sine_pwm", 2, {k<F>(), k<F>()}, 4, transform_cases<F>::sine_pwm},                       \
      group{"q" #F "_six_step", 2, {k<F>(), k<F>()}, 4, transform_cases<F>::six_step},                       \
      group{"q" #F "_limit_magnitude_stationary",                                                            \
            3,                                                                                               \
            {k<F>(), k<F>(), k<F>()},                                                                        \
            3,                                                                                               \
            transform_cases<F>::limit_stationary},                                                           \
      group{"q" #F "_limit_magnitude_rotating",                                                              \
            3,                                                                                               \
            {k<F>(), k<F>(), k<F>()},                                                                        \
            3,                                                                                               \
            transform_cases<F>::limit_rotating},                                                             \
      group{                                                                                                 \
          "q" #F "_limit_d_priority", 3, {k<F>(), k<F>(), k<F>()}, 3, transform_cases<F>::limit_d_priority}, \
      group{"q" #F "_bus_normalizer", 3, {k<F>(), k<F>(), k<F>()}, 4, transform_cases<F>::bus},              \
      group{"q" #F "_duty_to_compare",                                                                       \
            5,                                                                                               \
            {k<F>(), k<F>(), k<F>(), kind::period, kind::pulse},                                             \
            4,                                                                                               \
            transform_cases<F>::compare},                                                                    \
      group{"q" #F "_commutation_voltage",                                                                   \
            3,                                                                                               \
            {kind::code, kind::direction, k<F>()},                                                           \
            2,                                                                                               \
            transform_cases<F>::commutation_voltage},                                                        \
      group {                                                                                                \
    "q" #F "_pi_regulator", 2, {kind::word, k<F>()}, 4, transform_cases<F>::pi, 256                          \
  }

// NOLINTNEXTLINE(cppcoreguidelines-macro-usage)
#define ROTORQ_TURN_GROUPS(N)                                                                               \
  group{"turn" #N "_add", 2, {kind::turn##N, kind::turn##N}, 1, turn_cases<N>::add},                        \
      group{"turn" #N "_sub", 2, {kind::turn##N, kind::turn##N}, 1, turn_cases<N>::sub},                    \
      group{"turn" #N "_neg", 1, {kind::turn##N}, 1, turn_cases<N>::neg},                                   \
      group{                                                                                                \
          "turn" #N "_signed_difference", 2, {kind::turn##N, kind::turn##N}, 1, turn_cases<N>::difference}, \
      group {                                                                                               \
    "turn" #N "_advance", 2, {kind::turn##N, (N) == 16 ? kind::q15 : kind::q31}, 1, turn_cases<N>::advance  \
  }

inline constexpr group groups[] = {
    ROTORQ_FIXED_GROUPS(15),
    ROTORQ_FIXED_GROUPS(31),
    group{"to_q15", 1, {kind::q31}, 1, to_q15_case},
    group{"to_q31", 1, {kind::q15}, 1, to_q31_case},
    ROTORQ_TURN_GROUPS(16),
    ROTORQ_TURN_GROUPS(32),
    group{"to_turn32", 1, {kind::turn16}, 1, to_turn32_case},
    group{"to_turn16", 1, {kind::turn32}, 1, to_turn16_case},
    group{"sin_cos_q15", 1, {kind::turn16}, 2, sin_cos_q15_case, 65536, true},
    group{"sin_cos_q31", 1, {kind::turn32}, 2, sin_cos_q31_case, 65536},
    group{
        "speed_from_motion", 4, {kind::word, kind::word, kind::word, kind::word}, 2, speed_from_motion_case},
    group{"steps_at", 3, {kind::word, kind::word, kind::word}, 2, steps_at_case},
    group{"rpm_q8", 4, {kind::code, kind::word, kind::word, kind::word}, 1, rpm_case},
    group{"decode_hall", 2, {kind::code, kind::flag}, 3, decode_hall_case, 64},
    group{"hall_calibration", 3, {kind::turn32, kind::code, kind::flag}, 2, calibration_case},
    group{"commutation_sector", 1, {kind::turn32}, 1, commutation_sector_case},
    group{"six_step_commutation", 2, {kind::code, kind::direction}, 4, six_step_commutation_case, 256},
    group{"hall_glitch_filter16", 2, {kind::word, kind::word}, 1, hall_cases<16>::glitch_filter, 64},
    group{"hall_glitch_filter32", 2, {kind::word, kind::word}, 1, hall_cases<32>::glitch_filter, 64},
    group{"hall_tracker16", 2, {kind::word, kind::word}, 3, hall_cases<16>::tracker, 64},
    group{"hall_tracker32", 2, {kind::word, kind::word}, 3, hall_cases<32>::tracker, 64},
    group{"angle_interpolator16", 2, {kind::word, kind::word}, 1, hall_cases<16>::interpolator, 64},
    group{"angle_interpolator32", 2, {kind::word, kind::word}, 1, hall_cases<32>::interpolator, 64},
    group{"foc_handover", 2, {kind::word, kind::word}, 2, handover_case, 64},
};

#undef ROTORQ_FIXED_GROUPS
#undef ROTORQ_TURN_GROUPS

inline constexpr uint32_t group_count = sizeof(groups) / sizeof(groups[0]);

// The explicit cases of a group: every combination of edge values when there are at most
// max_explicit, else max_explicit combinations drawn from them.
inline constexpr uint32_t max_explicit = 160;

constexpr uint32_t combinations(const group& grp) noexcept {
  uint32_t n = 1;
  for (int w = 0; w < grp.input_count; ++w) {
    n *= edges_of(grp.inputs[w]).count;
    if (n > max_explicit) return max_explicit + 1;
  }
  return n;
}
constexpr uint32_t explicit_count(const group& grp) noexcept {
  const uint32_t n = combinations(grp);
  return n < max_explicit ? n : max_explicit;
}
// The inputs of explicit case j of group g.
constexpr void explicit_inputs(uint32_t g, uint32_t j, uint32_t* in) noexcept {
  const group& grp = groups[g];
  if (combinations(grp) <= max_explicit) {
    uint32_t rest = j;  // mixed-radix digits of j, first input fastest
    for (int w = 0; w < grp.input_count; ++w) {
      const edge_list e = edges_of(grp.inputs[w]);
      in[w] = e.values[rest % e.count];
      rest /= e.count;
    }
    return;
  }
  random_words rng{0x2545f491u ^ (g * 0x27d4eb2fu) ^ (j * 0x165667b1u)};
  for (int w = 0; w < grp.input_count; ++w) {
    const edge_list e = edges_of(grp.inputs[w]);
    in[w] = e.values[rng.next() % e.count];
  }
}

// Runs the bulk part of group g and returns the hash of its outputs.
inline uint32_t bulk_hash(uint32_t g) noexcept {
  const group& grp = groups[g];
  random_words rng{0x9e3779b9u ^ (g * 0x85ebca6bu)};
  hash32 h;
  uint32_t in[max_inputs] = {};
  uint32_t o[max_outputs] = {};
  for (uint32_t i = 0; i < grp.bulk; ++i) {
    for (int w = 0; w < grp.input_count; ++w) in[w] = grp.sequential ? i : draw(grp.inputs[w], rng);
    grp.apply(in, o);
    for (int w = 0; w < grp.output_count; ++w) h.add(o[w]);
  }
  return h.value;
}

}  // namespace rotorq::vectors
