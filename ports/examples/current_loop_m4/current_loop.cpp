// Example firmware: one current-loop step per PWM period, from the phase-current samples to the
// timer's compare values, with rotorq only: no heap, no exceptions, no floating point (the build
// checks all three, check_firmware.cmake).
#include "current_loop.hpp"

#include "rotorq/clarke.hpp"
#include "rotorq/park.hpp"
#include "rotorq/pi_regulator.hpp"
#include "rotorq/pwm_compare.hpp"
#include "rotorq/sin_cos.hpp"
#include "rotorq/svpwm.hpp"
#include "rotorq/turn.hpp"
#include "rotorq/voltage_limit.hpp"

using rotorq::q15;
using rotorq::q31;

namespace current_loop {
namespace {

// The rotor angle advances by a fixed step per period, as an open-loop start-up ramp or an angle
// tracker's estimate would: 164 / 65536 of a turn per 50 us is 50 Hz electrical.
constexpr int16_t angle_step = 164;

// The current regulators (rotorq/pi_regulator.hpp), tuned for the inductance and resistance of the
// motor (per unit of the ADC's full-scale current and the bus voltage, per period): kp = 0.75,
// ki = 1/32, output within +-voltage_limit; conditional integration keeps the integrators from
// winding up while the output is held at the limit.
constexpr rotorq::pi_regulator<q15> regulator_tuning{
    {q15::from_raw(24576), 0}, {q15::from_raw(16384), -4}, -voltage_limit, voltage_limit};

// Everything the interrupt keeps between periods. Constant-initialised: no constructor runs.
struct loop_state {
  rotorq::turn16 angle;
  volatile uint32_t reference;  // i_d (low half) and i_q (high half): one store, never torn
  rotorq::pi_regulator<q15> d;
  rotorq::pi_regulator<q15> q;
  telemetry last;
};
loop_state state{rotorq::turn16{}, 0, regulator_tuning, regulator_tuning, telemetry{}};

// A 12-bit conversion, mid-scale at zero current, to q15 of the full-scale current.
q15 from_adc(uint16_t counts) noexcept {
  return q15::from_raw(static_cast<int16_t>((static_cast<int32_t>(counts & 0x0fffu) - 2048) * 16));
}

q15 low_half(uint32_t word) noexcept { return q15::from_raw(static_cast<int16_t>(word & 0xffffu)); }
q15 high_half(uint32_t word) noexcept { return q15::from_raw(static_cast<int16_t>(word >> 16)); }

}  // namespace

void set_reference(rotorq::rotating<q15> current) noexcept {
  state.reference = static_cast<uint16_t>(current.d.raw()) | uint32_t{static_cast<uint16_t>(current.q.raw())}
                                                                 << 16;
}

// The caller reads it at the interrupt's priority or with the interrupt masked.
telemetry last_period() noexcept { return state.last; }

}  // namespace current_loop

extern "C" void current_loop_pwm_isr(void) {
  using namespace current_loop;
  const rotorq::phases<q15> i_abc{from_adc(board_adc.phase[0]), from_adc(board_adc.phase[1]),
                                  from_adc(board_adc.phase[2])};
  const uint32_t reference = state.reference;

  const rotorq::sin_cos_pair<q15> angle = rotorq::sin_cos(state.angle);  // once, for both Parks
  const rotorq::rotating<q15> i_dq = rotorq::park(rotorq::clarke(i_abc), angle);
  const rotorq::rotating<q15> v_request{state.d.update(low_half(reference), i_dq.d),
                                        state.q.update(high_half(reference), i_dq.q)};
  const rotorq::limited<rotorq::rotating<q15>> v_dq = rotorq::limit_magnitude(v_request, voltage_limit);
  const rotorq::modulation<q15> m =
      rotorq::svpwm(rotorq::inverse_park(v_dq.value, angle), rotorq::overmodulation::circle);
  const rotorq::compare_values c = rotorq::duty_to_compare(m.duty, pwm_period, min_pulse);

  board_pwm.compare[0] = c.compare.a;
  board_pwm.compare[1] = c.compare.b;
  board_pwm.compare[2] = c.compare.c;

  state.angle = rotorq::advance(state.angle, angle_step);
  state.last = telemetry{i_dq,
                         v_dq.value,
                         {rotorq::to_q31(state.d.integrator()), rotorq::to_q31(state.q.integrator())},
                         v_dq.clipped};
}
