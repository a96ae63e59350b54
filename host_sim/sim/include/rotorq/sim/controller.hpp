// The drive controller under test, in three arithmetics: q15 and q31 built from the library only
// (pi_regulator, clarke, park, sin_cos, limit_d_priority, limit_magnitude, inverse_park,
// bus_normalizer, svpwm, duty_to_compare, hall_tracker or angle_interpolator, six_step_commutation,
// commutation_voltage, foc_handover, rpm_scale), and its double twin (the same algorithm in double
// precision on the rotorq::ref functions). Each period:
//
//   ADC counts -> phase currents -> clarke -> park(angle at the sample) -> i_d, i_q
//   speed loop (every speed_divider periods): PI(speed reference, speed) -> torque current command
//   foc_handover(angle, speed, sign of the command):
//     six-step: the current along the commutation vector -> PI -> high-side duty of the vector's
//               high phase, the low phase switched low, the third floating
//     FOC:      current command (|command| along the hand-over's current direction, plus a constant
//               d-axis current) -> PI on d (limit m) and q (limit sqrt(m^2 - v_d^2), d priority) ->
//               limit_magnitude(m) -> inverse_park(angle advanced to the middle of the period the
//               voltage will be applied in) -> per unit of the bus -> svpwm (circle) -> compare values
//   with m = voltage_margin V_bus / sqrt(3), the inscribed circle of the hexagon.
//
// On the switch to FOC the d and q integrators are preset with the six-step voltage vector (the
// library's commutation_voltage, in the rotor frame), so the voltage continues without a step; the
// hand-over itself keeps the current's angle continuous. The double twin shares the angle source
// (the library's hall_tracker, or the exact angle), so comparing the three isolates the arithmetic of
// the current and speed loops.
#pragma once

#include <cstdint>
#include <memory>

#include "rotorq/sim/plant.hpp"

namespace rotorq::sim {

enum class arithmetic : uint8_t { q15, q31, reference };
enum class angle_input : uint8_t { hall, exact };

const char* name_of(arithmetic a);
const char* name_of(angle_input a);

// Everything a controller needs, in per-unit values computed once from the scenario (the firmware's
// configuration); each controller rounds them into its own format.
struct controller_config {
  double current_full_scale = 10;  // A at 1.0 (the ADC's full scale)
  int adc_bits = 12;
  double voltage_full_scale = 32;      // V at 1.0
  double speed_full_scale_rpm = 4000;  // mechanical rpm at 1.0
  int pole_pairs = 4;
  double pwm_frequency = 20e3;            // Hz
  double capture_timer_frequency = 10e6;  // Hz, the timer that dates Hall edges and control steps
  uint32_t pwm_period_counts = 2500;      // compare counts at duty 1
  uint32_t min_pulse_counts = 0;
  // regulators, per unit
  double current_kp_d = 0, current_ki_d = 0;  // V_fs per I_fs; ki per period
  double current_kp_q = 0, current_ki_q = 0;
  double six_step_kp = 0, six_step_ki = 0;  // duty per I_fs; ki per period
  double speed_kp = 0, speed_ki = 0;        // I_fs per rpm_fs; ki per speed update
  int speed_divider = 10;
  double current_limit = 0.5;  // per unit of I_fs
  double d_current = 0;        // per unit, FOC only
  double voltage_margin = 0.95;
  bool speed_control = true;
  double torque_current = 0;  // per unit, when speed_control is false
  // angle and hand-over
  angle_input angle = angle_input::hall;
  double hall_first_edge_deg = 30;  // the calibration's edge into Hall sector 0 (ideal sensors)
  double advance_periods = 1.5;     // the voltage's angle: sample time + this many periods
  double foc_above_rpm = 300;       // mechanical; < 0: FOC from the first period
  double six_step_below_rpm = 200;
  bool six_step_only = false;
};

struct controller_input {
  phases<int> adc{};       // phase current counts
  double bus_voltage = 0;  // V, as measured
  uint8_t hall_code = 0;   // the code at the sample
  uint32_t tick = 0;       // capture timer at the sample
  double exact_turns = 0;  // electrical angle, [0, 1)
  double exact_speed = 0;  // electrical turns per capture tick
  double speed_reference_rpm = 0;
};

struct controller_output {
  inverter_command command{};
  double i_d_ref = 0, i_q_ref = 0;  // A, in the controller's frame
  double i_d = 0, i_q = 0;          // A, measured, in the controller's frame
  double angle_turns = 0;           // the controller's rotor angle at the sample
  double speed_rpm = 0;             // its speed, mechanical
  double current_command = 0;       // A, signed torque current from the speed loop
  bool foc = false;
};

class controller {
 public:
  controller() = default;
  controller(const controller&) = delete;
  controller& operator=(const controller&) = delete;
  controller(controller&&) = delete;
  controller& operator=(controller&&) = delete;
  virtual ~controller() = default;
  virtual void hall_edge(uint8_t code, uint32_t tick) = 0;
  virtual controller_output step(const controller_input& in) = 0;
};

std::unique_ptr<controller> make_controller(arithmetic a, const controller_config& config);

}  // namespace rotorq::sim
