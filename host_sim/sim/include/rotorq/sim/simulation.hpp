// One closed-loop run: a scenario (machine, inverter, sensors, tuning, timeline), a controller
// (q15, q31 or double; Hall or exact angle; optionally six-step only), the plant integrated with RK4
// between control periods, and what the run measured.
//
// Timing of a period k (t_k = k / f_pwm): the currents are sampled at t_k (the PWM centre), the
// controller computes its command, and the command is applied from t_(k + control_delay) for one
// period (control_delay = 1: the compare values load at the next period, the usual single-update
// scheme); meanwhile the plant integrates [t_k, t_(k+1)] in `substeps` RK4 steps and every Hall edge
// is given to the controller with its capture tick. The controller therefore rotates the voltage
// ahead by 1.5 periods (the delay plus half the period it is applied in).
//
// Timeline: the speed reference ramps from zero at speed_ramp to speed_1, steps to speed_2 at
// speed_step_time; the constant load torque grows by load_step_torque at load_step_time.
// With speed_control off the controller holds a constant torque current instead.
#pragma once

#include <string>
#include <vector>

#include "rotorq/sim/controller.hpp"
#include "rotorq/sim/plant.hpp"

namespace rotorq::sim {

struct scenario {
  std::string name = "unnamed";
  std::string description;
  machine_parameters machine;
  inverter_parameters inverter;
  current_sensor adc;
  hall_sensors hall;
  // scaling and tuning (physical units; controller_config holds them per unit)
  double voltage_full_scale = 32;      // V at 1.0
  double speed_full_scale_rpm = 4000;  // mechanical rpm at 1.0
  double current_bandwidth_hz = 1000;  // current loop: kp = L 2 pi f, ki = R 2 pi f T (zero on R/L)
  double six_step_bandwidth_hz = 500;  // six-step current loop, same rule on the two-phase path
  double speed_bandwidth_hz = 10;      // speed loop: kp = J 2 pi f / K_t, integral corner at f/4
  int speed_divider = 10;              // speed loop every this many periods
  double current_limit = 4;            // A, |torque current command|
  double d_current = 0;                // A, constant d-axis current in FOC
  double voltage_margin = 0.95;        // of the inscribed circle V_bus / sqrt(3)
  double foc_above_rpm = 300;          // hand-over to FOC (mechanical); < 0: FOC from the start
  double six_step_below_rpm = 200;     // and back
  double capture_timer_hz = 10e6;      // Hall edge and control-step timestamps
  double pwm_timer_hz = 100e6;         // compare counter clock (centre-aligned: period = clock / 2 f)
  double min_pulse = 0;                // s, duty_to_compare's minimum pulse
  int control_delay = 1;               // periods, 0 or 1
  int substeps = 8;                    // RK4 steps per PWM period
  // timeline
  double duration = 1.0;         // s
  double speed_ramp = 10000;     // rpm per s
  double speed_1 = 1500;         // rpm
  double speed_step_time = 1e9;  // s
  double speed_2 = 1500;         // rpm
  double load_step_time = 1e9;   // s
  double load_step_torque = 0;   // N m added to the constant load
  bool speed_control = true;
  double torque_current = 0;  // A, without speed control
  // the window the steady-state figures are taken over
  double steady_start = 0.0, steady_end = 1.0;  // s
};

struct run_options {
  arithmetic math = arithmetic::q15;
  angle_input angle = angle_input::hall;
  bool six_step_only = false;
  bool record = true;  // keep the trace (figures need it)
};

// One control period's record: the plant at the sample, what the controller saw and did.
struct trace_point {
  double time = 0;
  double torque = 0;                    // N m, at the sample
  double i_d = 0, i_q = 0;              // A, true, rotor frame
  double i_d_ref = 0, i_q_ref = 0;      // A, the controller's command, in its frame
  double i_d_error = 0, i_q_error = 0;  // A, command minus the true current in the controller's frame
  double i_a = 0, i_b = 0, i_c = 0;     // A
  double speed_rpm = 0, speed_ref_rpm = 0, speed_estimate_rpm = 0;
  double electrical_angle = 0;  // rad, true, unwrapped
  double angle_error_deg = 0;   // controller's angle minus the true angle, electrical
  double current_command = 0;   // A
  bool foc = false;
};

struct window_figures {
  double start = 0, end = 0;
  double mean_torque = 0, min_torque = 0, max_torque = 0;
  double ripple_percent = 0;         // (max - min) / |mean| over the substeps of the window
  double current_error_rms = 0;      // A, |command - true current| in the controller's frame
  double i_d_mean = 0, i_d_rms = 0;  // A, true
  double fundamental = 0;            // A, peak of phase a's fundamental
  double thd_percent = 0;            // phase a, harmonics 2..50 (or to half the PWM rate)
  double angle_error_rms_deg = 0, angle_error_max_deg = 0;
  double speed_mean_rpm = 0;
  double foc_fraction = 0;
  int turns = 0;  // electrical turns the THD was taken over
};

struct run_result {
  std::string scenario;
  run_options options;
  std::vector<trace_point> trace;
  std::vector<double> substep_torque;        // N m, at the end of every substep
  std::vector<uint8_t> substep_commutating;  // 1 while a floating leg still conducts (six-step)
  std::vector<double> substep_current;       // A, length of the current vector (i_d, i_q)
  double substep = 0;                        // s
  machine_state final_state;
  double final_magnetic_energy = 0, final_kinetic_energy = 0, initial_kinetic_energy = 0;
  double handover_time = -1;  // s, first period in FOC
  double host_seconds = 0;
};

// What is wrong with a scenario (a non-positive inductance, inertia, frequency or full scale, a
// timer slower than the PWM, ...), or an empty string; run() throws std::invalid_argument with it.
std::string problem_with(const scenario& s);

// The controller configuration a scenario implies (gains from the bandwidths and the machine).
controller_config controller_settings(const scenario& s, const run_options& o);

// The speed reference and the constant load at time t.
double speed_reference(const scenario& s, double t);

run_result run(const scenario& s, const run_options& o);

window_figures figures(const run_result& r, double start, double end);

// Speed-step and load-step figures: the time from the speed step until the speed stays within 2 %
// of the new reference, and the largest drop below the reference after the load step.
struct event_figures {
  double handover_time = -1;      // s
  double speed_step_settle = -1;  // s after the step, -1 if it never settles
  double load_step_dip_rpm = 0;
};
event_figures events(const scenario& s, const run_result& r);

}  // namespace rotorq::sim
