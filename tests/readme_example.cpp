// The README's current-loop example, compiled with the header checks so that it keeps building.
// Keep it identical to the README.
#include <rotorq/rotorq.hpp>
using namespace rotorq;

stationary<q15> current_step(phases<q15> i_abc, turn16 rotor_angle, rotating<q15> v_dq_command) {
  const sin_cos_pair<q15> angle = sin_cos(rotor_angle);   // once per step, used twice
  const rotating<q15> i_dq = park(clarke(i_abc), angle);  // d along the rotor flux, q 90 deg ahead
  (void)i_dq;                                             // ... regulate i_dq into v_dq_command ...
  return inverse_park(v_dq_command, angle);               // to the space-vector modulator
}
