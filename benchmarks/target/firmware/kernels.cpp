// The fixed-point kernels: each public function in q15 and q31 (kernels.hpp says how they are
// called), and the current-loop chain inlined into one function.
#include "kernels.hpp"

#include "rotorq/rotorq.hpp"

namespace rotorq_cycles {

using namespace rotorq;

rotorq::bus_normalizer<q15> bus_q15(q15::from_raw(1638));
rotorq::bus_normalizer<q31> bus_q31(q31::from_raw(107374182));
rotorq::hall_tracker<16> hall16;
rotorq::hall_tracker<32> hall32;
rotorq::angle_interpolator<16> position16;
rotorq::angle_interpolator<32> position32;
rotorq::hall_glitch_filter<16> glitch16(100);  // 2 PWM periods of 50 ticks
rotorq::hall_glitch_filter<32> glitch32(100);

// State that only its kernel uses, kept across the calls of a region as in firmware (not constants
// the compiler could fold): a current regulator per format, the rpm conversion of a 2-pole-pair motor
// on a 1 MHz timer (configured at start-up, the one division), and the hand-over between six-step
// and FOC around 20 and 15 Hz electrical.
// kp 0.625, ki 0.025 (0.8 2^-5), limits +-0.95, in each format
rotorq::pi_regulator<q15> regulator_q15({q15::from_raw(20480), 0}, {q15::from_raw(26214), -5},
                                        q15::from_raw(-31130), q15::from_raw(31130));
rotorq::pi_regulator<q31> regulator_q31({q31::from_raw(1342177280), 0}, {q31::from_raw(1717986918), -5},
                                        q31::from_raw(-2040109465), q31::from_raw(2040109465));
rotorq::rpm_scale rpm(2, 1000000);
rotorq::foc_handover handover({electrical_speed::from_raw(int64_t{0x00400000} * 65536 / 50),
                               electrical_speed::from_raw(int64_t{0x00300000} * 65536 / 50)});

namespace {

template <int F>
const fixed_input<F>& in(const void* p) {
  return *static_cast<const fixed_input<F>*>(p);
}
template <typename T>
void put(void* p, const T& value) {
  *static_cast<T*>(p) = value;
}

template <int F>
ROTORQ_CYCLES_KERNEL void add(const void* i, void* o) {
  put(o, in<F>(i).a + in<F>(i).b);
}
template <int F>
ROTORQ_CYCLES_KERNEL void subtract(const void* i, void* o) {
  put(o, in<F>(i).a - in<F>(i).b);
}
template <int F>
ROTORQ_CYCLES_KERNEL void multiply(const void* i, void* o) {
  put(o, in<F>(i).a * in<F>(i).b);
}
template <int F>
ROTORQ_CYCLES_KERNEL void multiply_add(const void* i, void* o) {
  put(o, mul_add(in<F>(i).a, in<F>(i).b, in<F>(i).c));
}
// A fresh accumulator per call: a b - b c + c, rounded once.
template <int F>
ROTORQ_CYCLES_KERNEL void accumulate(const void* i, void* o) {
  const fixed_input<F>& x = in<F>(i);
  accumulator<fixed<F>> sum;
  sum.mac(x.a, x.b);
  sum.msc(x.b, x.c);
  sum.add(x.c);
  put(o, sum.result());
}
template <int F>
ROTORQ_CYCLES_KERNEL void sine_cosine(const void* i, void* o) {
  put(o, sin_cos(in<F>(i).angle));
}
template <int F>
ROTORQ_CYCLES_KERNEL void clarke_kernel(const void* i, void* o) {
  put(o, clarke(in<F>(i).currents));
}
template <int F>
ROTORQ_CYCLES_KERNEL void clarke_balanced_kernel(const void* i, void* o) {
  put(o, clarke_balanced(in<F>(i).currents.a, in<F>(i).currents.b));
}
template <int F>
ROTORQ_CYCLES_KERNEL void clarke_power_kernel(const void* i, void* o) {
  put(o, clarke_power_invariant(in<F>(i).currents));
}
template <int F>
ROTORQ_CYCLES_KERNEL void inverse_clarke_kernel(const void* i, void* o) {
  put(o, inverse_clarke(in<F>(i).voltage));
}
template <int F>
ROTORQ_CYCLES_KERNEL void inverse_clarke_power_kernel(const void* i, void* o) {
  put(o, inverse_clarke_power_invariant(in<F>(i).voltage));
}
template <int F>
ROTORQ_CYCLES_KERNEL void park_kernel(const void* i, void* o) {
  const fixed_input<F>& x = in<F>(i);
  put(o, park(stationary<fixed<F>>{x.currents.a, x.currents.b}, x.pair));
}
template <int F>
ROTORQ_CYCLES_KERNEL void inverse_park_kernel(const void* i, void* o) {
  put(o, inverse_park(in<F>(i).request, in<F>(i).pair));
}
template <int F>
ROTORQ_CYCLES_KERNEL void svpwm_circle(const void* i, void* o) {
  put(o, svpwm(in<F>(i).voltage, overmodulation::circle));
}
template <int F>
ROTORQ_CYCLES_KERNEL void svpwm_hexagon(const void* i, void* o) {
  put(o, svpwm(in<F>(i).voltage, overmodulation::hexagon));
}
template <int F>
ROTORQ_CYCLES_KERNEL void sine_pwm_kernel(const void* i, void* o) {
  put(o, sine_pwm(in<F>(i).voltage));
}
template <int F>
ROTORQ_CYCLES_KERNEL void six_step_kernel(const void* i, void* o) {
  put(o, six_step(in<F>(i).voltage));
}
template <int F>
ROTORQ_CYCLES_KERNEL void limit_kernel(const void* i, void* o) {
  put(o, limit_magnitude(in<F>(i).request, in<F>(i).limit));
}
template <int F>
ROTORQ_CYCLES_KERNEL void limit_d_priority_kernel(const void* i, void* o) {
  put(o, limit_d_priority(in<F>(i).request, in<F>(i).limit));
}
template <int F>
ROTORQ_CYCLES_KERNEL void bus_update(const void* i, void* o) {
  if constexpr (F == 15) {
    put(o, bus_q15.update(in<F>(i).bus));
  } else {
    put(o, bus_q31.update(in<F>(i).bus));
  }
}
template <int F>
ROTORQ_CYCLES_KERNEL void bus_normalize(const void* i, void* o) {
  if constexpr (F == 15) {
    put(o, bus_q15.normalize(in<F>(i).voltage));
  } else {
    put(o, bus_q31.normalize(in<F>(i).voltage));
  }
}
template <int F>
ROTORQ_CYCLES_KERNEL void compare_kernel(const void* i, void* o) {
  put(o, duty_to_compare(in<F>(i).duty, 2500u, 40u));  // 20 kHz at 100 MHz, 400 ns minimum pulse
}

template <int F>
ROTORQ_CYCLES_KERNEL void regulator_update(const void* i, void* o) {
  if constexpr (F == 15) {
    put(o, regulator_q15.update(in<F>(i).reference, in<F>(i).measured));
  } else {
    put(o, regulator_q31.update(in<F>(i).reference, in<F>(i).measured));
  }
}

// The vector of a sector and torque direction, and its voltage at a duty.
template <int F>
struct commutation_result {
  commutation_state state;
  stationary<fixed<F>> voltage;
};
template <int F>
ROTORQ_CYCLES_KERNEL void commutation_kernel(const void* i, void* o) {
  const fixed_input<F>& x = in<F>(i);
  commutation_result<F> r;
  r.state = six_step_commutation(x.sector, x.torque);
  r.voltage = commutation_voltage(r.state, x.duty.a);
  put(o, r);
}

// One current-loop step without the regulators: the measured currents into the rotor frame, and the
// voltage request back out to duties, with one sin_cos for both (the README's example).
template <int F>
struct chain_result {
  rotating<fixed<F>> current;
  modulation<fixed<F>> duty;
};
template <int F>
ROTORQ_CYCLES_KERNEL void chain(const void* i, void* o) {
  const fixed_input<F>& x = in<F>(i);
  const sin_cos_pair<fixed<F>> angle = sin_cos(x.angle);
  chain_result<F> r;
  r.current = park(clarke(x.currents), angle);
  r.duty = svpwm(inverse_park(x.request, angle), overmodulation::circle);
  put(o, r);
}

template <int TimerBits>
ROTORQ_CYCLES_KERNEL void hall_update_estimate(const void* i, void* o) {
  const auto& s = *static_cast<const hall_sample<TimerBits>*>(i);
  hall_tracker<TimerBits>& t = []() -> hall_tracker<TimerBits>& {
    if constexpr (TimerBits == 16) {
      return hall16;
    } else {
      return hall32;
    }
  }();
  t.update(s.code, s.time);
  put(o, t.estimate(s.time));
}

template <int TimerBits>
angle_interpolator<TimerBits>& position() {
  if constexpr (TimerBits == 16) {
    return position16;
  } else {
    return position32;
  }
}
template <int TimerBits>
ROTORQ_CYCLES_KERNEL void interpolator_update(const void* i, void* o) {
  const auto& s = *static_cast<const position_sample<TimerBits>*>(i);
  position<TimerBits>().update(s.angle, s.time);
  put(o, true);
}
template <int TimerBits>
ROTORQ_CYCLES_KERNEL void interpolator_estimate(const void* i, void* o) {
  using time_type = typename detail::timer_traits<TimerBits>::time_type;
  put(o, position<TimerBits>().estimate(*static_cast<const time_type*>(i)));
}

const motion_input& motion_of(const void* p) { return *static_cast<const motion_input*>(p); }
ROTORQ_CYCLES_KERNEL void speed_kernel(const void* i, void* o) {
  put(o, speed_from_motion(motion_of(i).steps, motion_of(i).ticks));
}
ROTORQ_CYCLES_KERNEL void rpm_kernel(const void* i, void* o) { put(o, rpm.rpm_q8(motion_of(i).speed)); }
ROTORQ_CYCLES_KERNEL void decode_hall_kernel(const void* i, void* o) {
  put(o, decode_hall(motion_of(i).code));
}

template <int TimerBits>
ROTORQ_CYCLES_KERNEL void glitch_filter_update(const void* i, void* o) {
  const auto& s = *static_cast<const sector_sample<TimerBits>*>(i);
  if constexpr (TimerBits == 16) {
    put(o, glitch16.update(s.sector, s.time));
  } else {
    put(o, glitch32.update(s.sector, s.time));
  }
}

ROTORQ_CYCLES_KERNEL void handover_update(const void* i, void* o) {
  const auto& s = *static_cast<const handover_sample*>(i);
  put(o, handover.update(s.angle, s.speed, s.torque));
}

}  // namespace

extern "C" ROTORQ_CYCLES_KERNEL void rotorq_cycles_empty(const void* input, void* output) {
  (void)input;
  (void)output;
}

#define ROTORQ_CYCLES_FIXED(F, group)                                                                \
  kernel_entry{"multiply", "q" #F, multiply<F>, group},                                              \
      kernel_entry{"mul_add", "q" #F, multiply_add<F>, group},                                       \
      kernel_entry{"sin_cos", "q" #F, sine_cosine<F>, group},                                        \
      kernel_entry{"clarke", "q" #F, clarke_kernel<F>, group},                                       \
      kernel_entry{"inverse_clarke", "q" #F, inverse_clarke_kernel<F>, group},                       \
      kernel_entry{"park", "q" #F, park_kernel<F>, group},                                           \
      kernel_entry{"inverse_park", "q" #F, inverse_park_kernel<F>, group},                           \
      kernel_entry{"svpwm_circle", "q" #F, svpwm_circle<F>, group},                                  \
      kernel_entry{"limit_magnitude", "q" #F, limit_kernel<F>, group},                               \
      kernel_entry{"bus_update", "q" #F, bus_update<F>, group},                                      \
      kernel_entry{"bus_normalize", "q" #F, bus_normalize<F>, group},                                \
      kernel_entry{"duty_to_compare", "q" #F, compare_kernel<F>, group},                             \
      kernel_entry{"chain", "q" #F, chain<F>, group}, kernel_entry{"add", "q" #F, add<F>, group},    \
      kernel_entry{"subtract", "q" #F, subtract<F>, group},                                          \
      kernel_entry{"accumulator", "q" #F, accumulate<F>, group},                                     \
      kernel_entry{"clarke_balanced", "q" #F, clarke_balanced_kernel<F>, group},                     \
      kernel_entry{"clarke_power_invariant", "q" #F, clarke_power_kernel<F>, group},                 \
      kernel_entry{"inverse_clarke_power_invariant", "q" #F, inverse_clarke_power_kernel<F>, group}, \
      kernel_entry{"svpwm_hexagon", "q" #F, svpwm_hexagon<F>, group},                                \
      kernel_entry{"sine_pwm", "q" #F, sine_pwm_kernel<F>, group},                                   \
      kernel_entry{"six_step", "q" #F, six_step_kernel<F>, group},                                   \
      kernel_entry{"limit_d_priority", "q" #F, limit_d_priority_kernel<F>, group},                   \
      kernel_entry{"pi_regulator", "q" #F, regulator_update<F>, group}, kernel_entry {               \
    "commutation", "q" #F, commutation_kernel<F>, group                                              \
  }

const kernel_entry fixed_kernels[] = {
    ROTORQ_CYCLES_FIXED(15, fixed15),
    ROTORQ_CYCLES_FIXED(31, fixed31),
    kernel_entry{"hall_tracker", "t16", hall_update_estimate<16>, hall_t16},
    kernel_entry{"hall_tracker", "t32", hall_update_estimate<32>, hall_t32},
    kernel_entry{"interpolator_update", "t16", interpolator_update<16>, position_t16},
    kernel_entry{"interpolator_update", "t32", interpolator_update<32>, position_t32},
    kernel_entry{"interpolator_estimate", "t16", interpolator_estimate<16>, time_t16},
    kernel_entry{"interpolator_estimate", "t32", interpolator_estimate<32>, time_t32},
    kernel_entry{"glitch_filter", "t16", glitch_filter_update<16>, sector_t16},
    kernel_entry{"glitch_filter", "t32", glitch_filter_update<32>, sector_t32},
    kernel_entry{"speed_from_motion", "-", speed_kernel, motion_group},
    kernel_entry{"rpm_q8", "-", rpm_kernel, motion_group},
    kernel_entry{"decode_hall", "-", decode_hall_kernel, motion_group},
    kernel_entry{"foc_handover", "-", handover_update, handover_group},
};
const unsigned fixed_kernel_count = sizeof(fixed_kernels) / sizeof(fixed_kernels[0]);

#undef ROTORQ_CYCLES_FIXED

}  // namespace rotorq_cycles
