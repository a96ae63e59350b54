// The simulated drive hardware: a permanent-magnet synchronous machine in its rotor (d/q) frame, a
// three-phase average-model inverter, phase-current sensing and three Hall sensors. Host code in
// double precision; nothing here is part of the library.
//
// Machine (amplitude-invariant d/q frame, d along the magnet flux, q 90 electrical degrees ahead;
// the standard PMSM model, Krause, Wasynczuk and Sudhoff, Analysis of Electric Machinery and Drive
// Systems, ch. 15, from memory):
//   v_d = R i_d + L_d di_d/dt - w L_q i_q
//   v_q = R i_q + L_q di_q/dt + w (L_d i_d + psi)
//   T   = 3/2 p (psi i_q + (L_d - L_q) i_d i_q)
//   J dW/dt = T - B W - T_load(W),   dtheta_m/dt = W,   w = p W,   theta = p theta_m
// with W the mechanical and w the electrical speed (rad/s), psi the peak phase flux linkage of the
// magnets (so the peak phase back-EMF is w psi), L_d = L_q for a non-salient machine. The load is a
// constant torque opposing forward rotation at every speed (a hill) plus k W |W| (a fan). A locked
// speed replaces the mechanics with a dynamometer that holds W and absorbs or supplies the torque.
//
// Inverter (average model over one PWM period, common practice, no source): each leg is either
// switched with a duty d (terminal voltage d V_dc against the negative rail) or floating. Dead time
// t_d costs a duty of t_d f_pwm against the current's direction (one delayed edge per period), and
// each conducting device drops V_f against the current: v = clamp(d - s t_d f_pwm, 0, 1) V_dc - s V_f
// with s = clamp(i / i_ramp, -1, 1), a sign function ramped over +-i_ramp so the equations stay
// continuous for the integrator. A floating leg conducts through its diodes while its current flows
// (v = -V_f for i > 0, V_dc + V_f for i < 0); once the current reaches zero it is held there and the
// terminal takes whatever voltage keeps it there, until that voltage would pass a rail. At most one
// leg may float (six-step); a command with two or more floating legs turns the inverter off and the
// currents are set to zero at once (they would decay through the diodes within about L I / V_dc).
//
// Sensors. Phase currents are read at the PWM centre, which for centre-aligned PWM is the period's
// average current, so the average model's current is what the ADC sees; each phase has its own offset
// and gain error, and the reading is quantised to `bits` over +-full_scale and clamped. Hall sensors
// switch at their own rising-edge angles (electrical degrees, with placement error); an edge is
// captured at the timer tick it falls in.
//
// Integration: classical fourth-order Runge-Kutta with a fixed step, `substeps` per PWM period; the
// inverter's command is held over each period. An energy ledger is integrated with the state: the
// electrical input (sum over the phases of terminal voltage times current, which equals 3/2 (v_d i_d
// + v_q i_q)), copper loss, friction, load work and the dynamometer's work, so that the energy balance
// can be checked against the stored magnetic (3/4 (L_d i_d^2 + L_q i_q^2)) and kinetic energy (plus
// the tiny magnetic energy removed when a floating leg's current is set to zero).
#pragma once

#include <array>
#include <cmath>
#include <cstdint>

#include "rotorq/frames.hpp"

namespace rotorq::sim {

struct machine_parameters {
  double resistance = 0.5;     // ohm, per phase
  double inductance_d = 1e-3;  // H
  double inductance_q = 1e-3;  // H
  double flux_linkage = 0.01;  // V s, peak phase flux linkage of the magnets
  int pole_pairs = 4;
  double inertia = 1e-4;           // kg m^2
  double viscous_friction = 0.0;   // N m s / rad
  double load_torque = 0.0;        // N m, constant, opposing forward rotation
  double load_quadratic = 0.0;     // N m s^2 / rad^2: k W |W|
  double locked_speed_rpm = -1.0;  // >= 0: a dynamometer holds this mechanical speed
};

struct inverter_parameters {
  double bus_voltage = 24.0;    // V
  double pwm_frequency = 20e3;  // Hz
  double dead_time = 0.0;       // s
  double device_drop = 0.0;     // V, per conducting device
  double current_ramp = 0.02;   // A, width of the ramped current sign of dead time and drop
};

enum class leg_mode : uint8_t { switched, floating };
struct leg_command {
  leg_mode mode = leg_mode::switched;
  double duty = 0.5;  // [0, 1], switched legs only
};
using inverter_command = std::array<leg_command, 3>;

struct current_sensor {
  int bits = 12;
  double full_scale = 10.0;                      // A at the ends of the ADC range
  std::array<double, 3> offset = {0, 0, 0};      // A
  std::array<double, 3> gain_error = {0, 0, 0};  // relative
  int counts(double current, int phase) const;   // 0 .. 2^bits - 1
  double current_of(int counts) const;           // the ideal reading of a code, A
};

struct hall_sensors {
  // Electrical angle (degrees) of each sensor's rising edge turning forward: nominally 30, 150 and
  // 270 degrees (sensor A, B, C; the sensor frame 30 degrees behind the rotor's d axis), plus the
  // placement error of each.
  std::array<double, 3> rising_deg = {30.0, 150.0, 270.0};
  uint8_t code_at(double electrical_turns) const;
};

// The machine state and the energy ledger (J), integrated together.
struct machine_state {
  double i_d = 0, i_q = 0;  // A
  double speed = 0;         // mechanical rad/s
  double angle = 0;         // mechanical rad, unwrapped
  double energy_in = 0, copper_loss = 0, friction_loss = 0, load_work = 0, dynamometer_work = 0;
  // magnetic energy removed when a floating leg's last diode current (what overshot zero within a
  // substep) is set to zero; not integrated, added at each such step
  double commutation_residue = 0;
};

struct hall_edge_event {
  double time = 0;  // s
  uint8_t code = 0;
};

class plant {
 public:
  plant(const machine_parameters& machine, const inverter_parameters& inverter, const hall_sensors& hall,
        int substeps);

  // Integrates one PWM period with the given command; Hall edges during it are appended to `edges`
  // (in time order). `on_substep(time, state)` runs after every substep.
  template <typename OnSubstep>
  void run_period(const inverter_command& command, std::array<hall_edge_event, 16>& edges, int& edge_count,
                  OnSubstep&& on_substep);

  const machine_state& state() const { return state_; }
  machine_state& state() { return state_; }
  double time() const { return time_; }
  double electrical_angle() const;    // rad, unwrapped
  double electrical_turns() const;    // [0, 1)
  double torque() const;              // N m
  phases<double> currents() const;    // A
  double leg_current(int leg) const;  // A, phase 0..2
  uint8_t hall_code() const { return hall_.code_at(electrical_turns()); }
  double magnetic_energy() const;  // J
  double kinetic_energy() const;   // J
  double step() const { return step_; }
  machine_parameters& machine() { return machine_; }
  const machine_parameters& machine() const { return machine_; }
  const inverter_parameters& inverter() const { return inverter_; }
  // A floating leg still conducts through its diodes (six-step commutation in progress).
  bool commutating() const { return floating_ >= 0 && !held_at_zero_ && !all_off_; }
  // The terminal voltages (against the negative rail) the last substep started with.
  const phases<double>& terminal_voltages() const { return terminal_; }

 private:
  struct rates {
    machine_state d;
    phases<double> terminal;
    bool floating_clamped = false;  // the floating leg's held-current voltage passed a rail
  };
  rates derivative(const machine_state& x, const inverter_command& command) const;
  void rk4_step(const inverter_command& command);
  void settle_floating_leg(const inverter_command& command, double current_before);
  void apply_command(const inverter_command& command);

  machine_parameters machine_;
  inverter_parameters inverter_;
  hall_sensors hall_;
  int substeps_;
  double step_;
  machine_state state_;
  double time_ = 0;
  int floating_ = -1;                    // the floating leg of the current command, or -1
  bool held_at_zero_ = false;            // its current is held at zero
  bool diode_current_positive_ = false;  // otherwise: which diode conducts during this substep
  bool all_off_ = false;
  phases<double> terminal_{};
};

// --- inline: the period loop (templated on the callback) ----------------------------------------
template <typename OnSubstep>
void plant::run_period(const inverter_command& command, std::array<hall_edge_event, 16>& edges,
                       int& edge_count, OnSubstep&& on_substep) {
  apply_command(command);
  edge_count = 0;
  for (int k = 0; k < substeps_; ++k) {
    const double t0 = time_;
    const double u0 = electrical_angle() / (2 * 3.14159265358979323846);
    const uint8_t code0 = hall_code();
    const double current_before = floating_ >= 0 ? leg_current(floating_) : 0.0;
    diode_current_positive_ = current_before > 0;
    rk4_step(command);
    settle_floating_leg(command, current_before);
    const double u1 = electrical_angle() / (2 * 3.14159265358979323846);
    if (hall_code() != code0 && u1 != u0) {
      // each sensor's boundaries sit at rising + n/2 turns; at most one is crossed per substep
      struct crossing {
        double time;
        int sensor;
      };
      crossing found[3];
      int n = 0;
      const double low = u0 < u1 ? u0 : u1, high = u0 < u1 ? u1 : u0;
      for (int s = 0; s < 3; ++s) {
        const double r = hall_.rising_deg[static_cast<size_t>(s)] / 360.0;
        const double m = std::floor(2 * (high - r));
        const double boundary = r + m / 2;
        if (boundary > low && boundary <= high) {
          found[n++] = {t0 + (boundary - u0) / (u1 - u0) * (time_ - t0), s};
        }
      }
      for (int i = 0; i < n; ++i) {
        for (int j = i + 1; j < n; ++j) {
          if (found[j].time < found[i].time) {
            const crossing c = found[i];
            found[i] = found[j];
            found[j] = c;
          }
        }
      }
      uint8_t code = code0;
      for (int i = 0; i < n && edge_count < static_cast<int>(edges.size()); ++i) {
        code = static_cast<uint8_t>(code ^ (1u << found[i].sensor));
        edges[static_cast<size_t>(edge_count++)] = {found[i].time, code};
      }
      // a boundary within rounding of the substep's end: report the code as it is now
      if (code != hall_code() && edge_count < static_cast<int>(edges.size())) {
        edges[static_cast<size_t>(edge_count++)] = {time_, hall_code()};
      }
    }
    on_substep(time_, state_);
  }
}

}  // namespace rotorq::sim
