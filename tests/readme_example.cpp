// The README's current-loop example, compiled with the header checks so that it keeps building.
// Keep it identical to the README.
#include <rotorq/rotorq.hpp>
using namespace rotorq;

// Called from the PWM interrupt. Per unit: currents of the sensor's full scale, voltages of the bus
// measurement's (1.0 = 100 V, say).
compare_values current_step(phases<q15> i_abc, turn16 rotor_angle, q15 v_bus, rotating<q15> i_dq_ref) {
  // gains are placeholders for the drive's own: kp = 0.625, ki = 0.625 / 32 per period
  static pi_regulator<q15> id_loop({q15::from_raw(20480), 0}, {q15::from_raw(20480), -5});
  static pi_regulator<q15> iq_loop({q15::from_raw(20480), 0}, {q15::from_raw(20480), -5});
  static bus_normalizer<q15> bus(q15::from_raw(1638));  // below 5% of full scale: zero output
  bus.update(v_bus);                                    // one reciprocal per sample

  const sin_cos_pair<q15> angle = sin_cos(rotor_angle);   // once per step, used twice
  const rotating<q15> i_dq = park(clarke(i_abc), angle);  // d along the rotor flux, q 90 deg ahead

  id_loop.set_limit(v_bus);  // d first; q gets what the bus has left (anti-windup on both)
  const q15 v_d = id_loop.update(i_dq_ref.d, i_dq.d);
  iq_loop.set_limit(limit_d_priority(rotating<q15>{v_d, q15::max()}, v_bus).value.q);
  const rotating<q15> v_dq{v_d, iq_loop.update(i_dq_ref.q, i_dq.q)};

  const stationary<q15> v = bus.normalize(inverse_park(v_dq, angle));  // per unit of the bus
  const modulation<q15> m = svpwm(v, overmodulation::circle);
  return duty_to_compare(m.duty, 2500, 40);  // 20 kHz at 100 MHz, 400 ns minimum pulse
}
