// The README's current-loop example, compiled with the header checks so that it keeps building.
// Keep it identical to the README.
#include <rotorq/rotorq.hpp>
using namespace rotorq;

// Called from the PWM interrupt. Voltages are scaled like the bus measurement (1.0 = 100 V, say).
compare_values current_step(phases<q15> i_abc, turn16 rotor_angle, q15 v_bus, rotating<q15> v_dq_request) {
  static bus_normalizer<q15> bus(q15::from_raw(1638));  // below 5% of full scale: zero output
  bus.update(v_bus);                                    // one reciprocal per sample

  const sin_cos_pair<q15> angle = sin_cos(rotor_angle);   // once per step, used twice
  const rotating<q15> i_dq = park(clarke(i_abc), angle);  // d along the rotor flux, q 90 deg ahead
  (void)i_dq;  // ... the current regulators turn i_dq into v_dq_request ...

  const rotating<q15> v_dq = limit_magnitude(v_dq_request, v_bus).value;
  const stationary<q15> v = bus.normalize(inverse_park(v_dq, angle));  // per unit of the bus
  const modulation<q15> m = svpwm(v, overmodulation::circle);
  return duty_to_compare(m.duty, 2500, 40);  // 20 kHz at 100 MHz, 400 ns minimum pulse
}
