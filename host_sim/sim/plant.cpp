// The simulated drive hardware (plant.hpp): machine equations, inverter legs, RK4.
#include "rotorq/sim/plant.hpp"

#include <algorithm>
#include <cmath>

namespace rotorq::sim {

namespace {

constexpr double half_sqrt3 = 0.86602540378443864676;
constexpr double inv_sqrt3 = 0.57735026918962576451;

// x + h k, component by component
machine_state add_scaled(const machine_state& x, const machine_state& k, double h) {
  return {x.i_d + h * k.i_d,
          x.i_q + h * k.i_q,
          x.speed + h * k.speed,
          x.angle + h * k.angle,
          x.energy_in + h * k.energy_in,
          x.copper_loss + h * k.copper_loss,
          x.friction_loss + h * k.friction_loss,
          x.load_work + h * k.load_work,
          x.dynamometer_work + h * k.dynamometer_work,
          x.commutation_residue + h * k.commutation_residue};
}

double ramped_sign(double current, double ramp) {
  if (ramp <= 0) return current > 0 ? 1.0 : (current < 0 ? -1.0 : 0.0);
  return std::clamp(current / ramp, -1.0, 1.0);
}

double leg_of(const phases<double>& p, int leg) { return leg == 0 ? p.a : (leg == 1 ? p.b : p.c); }
void set_leg(phases<double>& p, int leg, double v) { (leg == 0 ? p.a : (leg == 1 ? p.b : p.c)) = v; }

}  // namespace

int current_sensor::counts(double current, int phase) const {
  const double mid = std::ldexp(1.0, bits - 1);
  const auto p = static_cast<size_t>(phase);
  const double value = (current * (1 + gain_error[p]) + offset[p]) / full_scale * mid;
  if (!std::isfinite(value)) return static_cast<int>(mid);  // a diverged run reads mid-scale
  const double code = std::floor(value + 0.5) + mid;
  return static_cast<int>(std::clamp(code, 0.0, 2 * mid - 1));
}

double current_sensor::current_of(int counts) const {
  const double mid = std::ldexp(1.0, bits - 1);
  return (counts - mid) / mid * full_scale;
}

uint8_t hall_sensors::code_at(double turns) const {
  unsigned code = 0;
  for (size_t k = 0; k < 3; ++k) {
    const double into = turns - rising_deg[k] / 360.0;
    if (into - std::floor(into) < 0.5) code |= 1u << k;
  }
  return static_cast<uint8_t>(code);
}

plant::plant(const machine_parameters& machine, const inverter_parameters& inverter, const hall_sensors& hall,
             int substeps)
    : machine_(machine),
      inverter_(inverter),
      hall_(hall),
      substeps_(std::max(substeps, 1)),
      step_(1.0 / (inverter.pwm_frequency * std::max(substeps, 1))) {}

double plant::electrical_angle() const { return machine_.pole_pairs * state_.angle; }
double plant::electrical_turns() const {
  const double t = electrical_angle() / (2 * M_PI);
  return t - std::floor(t);
}
double plant::torque() const {
  const machine_parameters& m = machine_;
  return 1.5 * m.pole_pairs *
         (m.flux_linkage * state_.i_q + (m.inductance_d - m.inductance_q) * state_.i_d * state_.i_q);
}
phases<double> plant::currents() const {
  const double theta = electrical_angle();
  const double c = std::cos(theta), s = std::sin(theta);
  const double alpha = state_.i_d * c - state_.i_q * s, beta = state_.i_d * s + state_.i_q * c;
  return {alpha, -alpha / 2 + half_sqrt3 * beta, -alpha / 2 - half_sqrt3 * beta};
}
double plant::leg_current(int leg) const { return leg_of(currents(), leg); }
double plant::magnetic_energy() const {
  return 0.75 *
         (machine_.inductance_d * state_.i_d * state_.i_d + machine_.inductance_q * state_.i_q * state_.i_q);
}
double plant::kinetic_energy() const { return 0.5 * machine_.inertia * state_.speed * state_.speed; }

plant::rates plant::derivative(const machine_state& x, const inverter_command& command) const {
  const machine_parameters& m = machine_;
  const inverter_parameters& inv = inverter_;
  const double theta = m.pole_pairs * x.angle;
  const double c = std::cos(theta), s = std::sin(theta);
  const double w = m.pole_pairs * x.speed;
  const double alpha = x.i_d * c - x.i_q * s, beta = x.i_d * s + x.i_q * c;
  const phases<double> i{alpha, -alpha / 2 + half_sqrt3 * beta, -alpha / 2 - half_sqrt3 * beta};

  // d/q current rates for given terminal voltages (the star point floats: Clarke drops the
  // zero-sequence part)
  const auto current_rates = [&](const phases<double>& v, double& did, double& diq) {
    const double v_alpha = (2 * v.a - v.b - v.c) / 3, v_beta = (v.b - v.c) * inv_sqrt3;
    const double v_d = v_alpha * c + v_beta * s, v_q = -v_alpha * s + v_beta * c;
    did = (v_d - m.resistance * x.i_d + w * m.inductance_q * x.i_q) / m.inductance_d;
    diq = (v_q - m.resistance * x.i_q - w * (m.inductance_d * x.i_d + m.flux_linkage)) / m.inductance_q;
  };
  // the rate of one phase current: d/dt (R(theta) i_dq) = R(theta) di_dq/dt + w (-i_beta, i_alpha)
  const auto phase_rate = [&](double did, double diq, int leg) {
    const double da = did * c - diq * s - w * beta, db = did * s + diq * c + w * alpha;
    const phases<double> r{da, -da / 2 + half_sqrt3 * db, -da / 2 - half_sqrt3 * db};
    return leg_of(r, leg);
  };

  rates out{};
  phases<double> v{};
  for (int leg = 0; leg < 3; ++leg) {
    const leg_command& l = command[static_cast<size_t>(leg)];
    if (l.mode == leg_mode::floating) continue;
    const double sign = ramped_sign(leg_of(i, leg), inv.current_ramp);
    const double duty =
        std::clamp(std::clamp(l.duty, 0.0, 1.0) - sign * inv.dead_time * inv.pwm_frequency, 0.0, 1.0);
    set_leg(v, leg, duty * inv.bus_voltage - sign * inv.device_drop);
  }
  double did = 0, diq = 0;
  if (all_off_) {
    v = {};
  } else {
    if (floating_ >= 0) {
      const double bottom = -inv.device_drop, top = inv.bus_voltage + inv.device_drop;
      double voltage = 0;
      // the conducting diode is chosen by the current's sign at the start of the substep and kept for
      // all its stages (a sign taken per stage would flip the rail when a stage overshoots zero)
      if (!held_at_zero_ && diode_current_positive_) {
        voltage = bottom;  // the low-side diode carries it
      } else if (!held_at_zero_) {
        voltage = top;
      } else {
        // the voltage that keeps the current at zero: the rate is affine in the terminal voltage
        set_leg(v, floating_, 0.0);
        current_rates(v, did, diq);
        const double r0 = phase_rate(did, diq, floating_);
        set_leg(v, floating_, inv.bus_voltage);
        current_rates(v, did, diq);
        const double r1 = phase_rate(did, diq, floating_);
        const double solved = r1 != r0 ? -r0 * inv.bus_voltage / (r1 - r0) : 0.0;
        voltage = std::clamp(solved, bottom, top);
        out.floating_clamped = voltage != solved;
      }
      set_leg(v, floating_, voltage);
    }
    current_rates(v, did, diq);
  }

  const double electromagnetic =
      1.5 * m.pole_pairs * (m.flux_linkage * x.i_q + (m.inductance_d - m.inductance_q) * x.i_d * x.i_q);
  const double load = m.load_torque + m.load_quadratic * x.speed * std::fabs(x.speed);
  const bool locked = m.locked_speed_rpm >= 0;
  const double net = electromagnetic - m.viscous_friction * x.speed - load;
  out.d.i_d = all_off_ ? 0.0 : did;
  out.d.i_q = all_off_ ? 0.0 : diq;
  out.d.speed = locked ? 0.0 : net / m.inertia;
  out.d.angle = x.speed;
  out.d.energy_in = v.a * i.a + v.b * i.b + v.c * i.c;
  out.d.copper_loss = m.resistance * (i.a * i.a + i.b * i.b + i.c * i.c);
  out.d.friction_loss = m.viscous_friction * x.speed * x.speed;
  out.d.load_work = load * x.speed;
  out.d.dynamometer_work = locked ? -net * x.speed : 0.0;
  out.terminal = v;
  return out;
}

void plant::rk4_step(const inverter_command& command) {
  const double h = step_;
  const rates k1 = derivative(state_, command);
  terminal_ = k1.terminal;
  const rates k2 = derivative(add_scaled(state_, k1.d, h / 2), command);
  const rates k3 = derivative(add_scaled(state_, k2.d, h / 2), command);
  const rates k4 = derivative(add_scaled(state_, k3.d, h), command);
  machine_state sum = add_scaled(k1.d, k2.d, 2.0);
  sum = add_scaled(sum, k3.d, 2.0);
  sum = add_scaled(sum, k4.d, 1.0);
  state_ = add_scaled(state_, sum, h / 6);
  time_ += h;
}

// After a substep: a floating leg whose diode current reached zero is held at zero from now on
// (the state is moved onto i = 0 in that phase, keeping the current between the other two); a held
// leg whose required voltage passes a rail conducts through a diode again.
void plant::settle_floating_leg(const inverter_command& command, double current_before) {
  if (floating_ < 0 || all_off_) return;
  const double now = leg_current(floating_);
  if (!held_at_zero_) {
    if (now == 0 || (current_before > 0) != (now > 0)) {
      held_at_zero_ = true;
    } else {
      return;
    }
  } else if (derivative(state_, command).floating_clamped) {
    held_at_zero_ = false;
    return;
  }
  const phases<double> i = currents();
  const int y = (floating_ + 1) % 3, z = (floating_ + 2) % 3;
  const double through = (leg_of(i, y) - leg_of(i, z)) / 2;
  phases<double> p{};
  set_leg(p, y, through);
  set_leg(p, z, -through);
  const double alpha = (2 * p.a - p.b - p.c) / 3, beta = (p.b - p.c) * inv_sqrt3;
  const double theta = electrical_angle();
  const double c = std::cos(theta), s = std::sin(theta);
  const double before = magnetic_energy();
  state_.i_d = alpha * c + beta * s;
  state_.i_q = -alpha * s + beta * c;
  state_.commutation_residue += before - magnetic_energy();
}

void plant::apply_command(const inverter_command& command) {
  int floating = -1, count = 0;
  for (int leg = 0; leg < 3; ++leg) {
    if (command[static_cast<size_t>(leg)].mode == leg_mode::floating) {
      floating = leg;
      ++count;
    }
  }
  all_off_ = count >= 2;
  if (all_off_) {
    state_.i_d = state_.i_q = 0;
    floating_ = -1;
    return;
  }
  if (floating != floating_) held_at_zero_ = floating >= 0 && leg_current(floating) == 0;
  floating_ = floating;
}

}  // namespace rotorq::sim
