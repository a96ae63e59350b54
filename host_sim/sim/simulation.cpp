// One closed-loop run and its figures (simulation.hpp).
#include "rotorq/sim/simulation.hpp"

#include <algorithm>
#include <chrono>
#include <cmath>
#include <complex>
#include <limits>
#include <stdexcept>

namespace rotorq::sim {

namespace {
constexpr double two_pi = 6.283185307179586476925286766559;
double rpm_to_rad_s(double rpm) { return rpm * two_pi / 60.0; }
}  // namespace

std::string problem_with(const scenario& s) {
  const machine_parameters& m = s.machine;
  const auto positive = [](double x) { return std::isfinite(x) && x > 0; };
  const auto non_negative = [](double x) { return std::isfinite(x) && x >= 0; };
  if (!non_negative(m.resistance)) return "resistance must be >= 0";
  if (!positive(m.inductance_d) || !positive(m.inductance_q)) return "inductances must be > 0";
  if (!positive(m.flux_linkage)) return "flux-linkage must be > 0";
  if (m.pole_pairs < 1 || m.pole_pairs > 1000) return "pole-pairs must be 1..1000";
  if (!positive(m.inertia)) return "inertia must be > 0";
  if (!non_negative(m.viscous_friction) || !std::isfinite(m.load_torque) || !non_negative(m.load_quadratic)) {
    return "friction and quadratic load must be >= 0, the load torque finite";
  }
  if (!std::isfinite(m.locked_speed_rpm)) return "locked-speed must be finite";
  const inverter_parameters& i = s.inverter;
  if (!positive(i.bus_voltage) || !positive(i.pwm_frequency))
    return "bus-voltage and pwm-frequency must be > 0";
  if (!non_negative(i.dead_time) || i.dead_time * i.pwm_frequency >= 0.5)
    return "dead-time must be in [0, T/2)";
  if (!non_negative(i.device_drop) || !non_negative(i.current_ramp))
    return "device-drop, current-ramp must be >= 0";
  if (s.adc.bits < 8 || s.adc.bits > 16 || !positive(s.adc.full_scale))
    return "adc: 8..16 bits, full scale > 0";
  if (!positive(s.voltage_full_scale) || !(s.speed_full_scale_rpm >= 1) ||
      !std::isfinite(s.speed_full_scale_rpm)) {
    return "voltage-full-scale must be > 0, speed-full-scale >= 1 rpm";
  }
  if (!positive(s.current_bandwidth_hz) || !positive(s.six_step_bandwidth_hz) ||
      !positive(s.speed_bandwidth_hz)) {
    return "bandwidths must be > 0";
  }
  if (!(s.capture_timer_hz >= s.inverter.pwm_frequency) ||
      !(s.pwm_timer_hz >= 2 * s.inverter.pwm_frequency) || !std::isfinite(s.capture_timer_hz) ||
      !std::isfinite(s.pwm_timer_hz)) {
    return "the timers must count faster than the PWM";
  }
  if (!positive(s.duration) || s.duration * s.inverter.pwm_frequency > 1e8)
    return "duration: > 0, 1e8 periods at most";
  if (s.substeps < 1 || s.control_delay < 0 || s.control_delay > 1)
    return "substeps >= 1, control-delay 0 or 1";
  return {};
}

controller_config controller_settings(const scenario& s, const run_options& o) {
  const machine_parameters& m = s.machine;
  controller_config c;
  c.current_full_scale = s.adc.full_scale;
  c.adc_bits = s.adc.bits;
  c.voltage_full_scale = s.voltage_full_scale;
  c.speed_full_scale_rpm = s.speed_full_scale_rpm;
  c.pole_pairs = m.pole_pairs;
  c.pwm_frequency = s.inverter.pwm_frequency;
  c.capture_timer_frequency = s.capture_timer_hz;
  const double period = 1.0 / s.inverter.pwm_frequency;
  c.pwm_period_counts = static_cast<uint32_t>(std::lround(s.pwm_timer_hz * period / 2));
  c.min_pulse_counts = static_cast<uint32_t>(std::lround(s.min_pulse / period * c.pwm_period_counts));

  // Current loops: the zero of kp + ki/(s T) on the plant's pole R/L leaves an integrator with
  // crossover at the bandwidth (common practice, no source): kp = L w_c, ki = R w_c T per period.
  const double per_unit = s.adc.full_scale / s.voltage_full_scale;  // volts per amp -> per unit
  const double wc = two_pi * s.current_bandwidth_hz;
  c.current_kp_d = m.inductance_d * wc * per_unit;
  c.current_ki_d = m.resistance * wc * period * per_unit;
  c.current_kp_q = m.inductance_q * wc * per_unit;
  c.current_ki_q = m.resistance * wc * period * per_unit;
  // Six-step: the line voltage d V_dc drives two phases in series (2R, 2L); the regulated quantity
  // is the current vector's length, 2/sqrt(3) times the phase current, so duty per amp of it is
  // sqrt(3) (R + s L) / V_dc with L the mean of L_d and L_q.
  const double w6 = two_pi * s.six_step_bandwidth_hz;
  const double l_mean = (m.inductance_d + m.inductance_q) / 2;
  c.six_step_kp = std::sqrt(3.0) * l_mean * w6 / s.inverter.bus_voltage * s.adc.full_scale;
  c.six_step_ki = std::sqrt(3.0) * m.resistance * w6 * period / s.inverter.bus_voltage * s.adc.full_scale;
  // Speed loop: J dW/dt = K_t i, K_t = 3/2 p psi; kp = J w_s / K_t gives crossover at w_s, the
  // integral corner at w_s / 4 (common practice, no source).
  const double kt = 1.5 * m.pole_pairs * m.flux_linkage;
  const double ws = two_pi * s.speed_bandwidth_hz;
  const double speed_period = period * std::max(s.speed_divider, 1);
  const double kp_speed = m.inertia * ws / kt;  // A per rad/s
  c.speed_kp = kp_speed * rpm_to_rad_s(s.speed_full_scale_rpm) / s.adc.full_scale;
  c.speed_ki = c.speed_kp * ws / 4 * speed_period;
  c.speed_divider = std::max(s.speed_divider, 1);
  c.current_limit = s.current_limit / s.adc.full_scale;
  c.d_current = s.d_current / s.adc.full_scale;
  c.voltage_margin = s.voltage_margin;
  c.speed_control = s.speed_control;
  c.torque_current = s.torque_current / s.adc.full_scale;
  c.angle = o.angle;
  c.hall_first_edge_deg = 30;
  c.advance_periods = s.control_delay + 0.5;
  c.foc_above_rpm = s.foc_above_rpm;
  c.six_step_below_rpm = s.six_step_below_rpm;
  c.six_step_only = o.six_step_only;
  return c;
}

double speed_reference(const scenario& s, double t) {
  if (t >= s.speed_step_time) return s.speed_2;
  return std::min(s.speed_1, s.speed_ramp * t);
}

run_result run(const scenario& s, const run_options& o) {
  if (const std::string problem = problem_with(s); !problem.empty()) throw std::invalid_argument(problem);
  const auto start = std::chrono::steady_clock::now();
  run_result r;
  r.scenario = s.name;
  r.options = o;
  plant p(s.machine, s.inverter, s.hall, s.substeps);
  if (s.machine.locked_speed_rpm >= 0) p.state().speed = rpm_to_rad_s(s.machine.locked_speed_rpm);
  r.initial_kinetic_energy = p.kinetic_energy();
  r.substep = p.step();
  const controller_config config = controller_settings(s, o);
  const std::unique_ptr<controller> ctl = make_controller(o.math, config);

  const double f = s.inverter.pwm_frequency;
  const auto periods = static_cast<int64_t>(std::llround(s.duration * f));
  if (o.record) {
    r.trace.reserve(static_cast<size_t>(periods));
    r.substep_torque.reserve(static_cast<size_t>(periods * s.substeps));
    r.substep_commutating.reserve(static_cast<size_t>(periods * s.substeps));
    r.substep_current.reserve(static_cast<size_t>(periods * s.substeps));
  }
  inverter_command zero_voltage{};  // every leg switched at duty 1/2
  inverter_command pending = zero_voltage;
  std::array<hall_edge_event, 16> edges{};
  int edge_count = 0;
  const double base_load = s.machine.load_torque;
  const auto ticks = [&](double t) {
    return static_cast<uint32_t>(static_cast<uint64_t>(std::floor(t * s.capture_timer_hz)));
  };
  for (int64_t k = 0; k < periods; ++k) {
    const double t = static_cast<double>(k) / f;
    p.machine().load_torque = base_load + (t >= s.load_step_time ? s.load_step_torque : 0.0);

    controller_input in;
    const phases<double> i = p.currents();
    in.adc = {s.adc.counts(i.a, 0), s.adc.counts(i.b, 1), s.adc.counts(i.c, 2)};
    in.bus_voltage = s.inverter.bus_voltage;
    in.hall_code = p.hall_code();
    in.tick = ticks(t);
    in.exact_turns = p.electrical_turns();
    in.exact_speed = s.machine.pole_pairs * p.state().speed / two_pi / s.capture_timer_hz;
    in.speed_reference_rpm = s.speed_control ? speed_reference(s, t) : 0.0;
    const controller_output out = ctl->step(in);
    if (out.foc && r.handover_time < 0) r.handover_time = t;

    if (o.record) {
      trace_point tp;
      tp.time = t;
      tp.torque = p.torque();
      tp.i_d = p.state().i_d;
      tp.i_q = p.state().i_q;
      tp.i_d_ref = out.i_d_ref;
      tp.i_q_ref = out.i_q_ref;
      // the true current in the controller's frame
      const double theta = two_pi * out.angle_turns;
      const double alpha = (2 * i.a - i.b - i.c) / 3, beta = (i.b - i.c) / std::sqrt(3.0);
      const double d = alpha * std::cos(theta) + beta * std::sin(theta);
      const double q = -alpha * std::sin(theta) + beta * std::cos(theta);
      tp.i_d_error = out.i_d_ref - d;
      tp.i_q_error = out.i_q_ref - q;
      tp.i_a = i.a;
      tp.i_b = i.b;
      tp.i_c = i.c;
      tp.speed_rpm = p.state().speed * 60.0 / two_pi;
      tp.speed_ref_rpm = in.speed_reference_rpm;
      tp.speed_estimate_rpm = out.speed_rpm;
      tp.electrical_angle = p.electrical_angle();
      const double e = out.angle_turns - in.exact_turns;
      tp.angle_error_deg = 360.0 * (e - std::floor(e + 0.5));
      tp.current_command = out.current_command;
      tp.foc = out.foc;
      r.trace.push_back(tp);
    }

    const inverter_command applied = s.control_delay > 0 ? pending : out.command;
    pending = out.command;
    p.run_period(applied, edges, edge_count, [&](double, const machine_state&) {
      if (o.record) {
        r.substep_torque.push_back(p.torque());
        r.substep_commutating.push_back(p.commutating() ? 1 : 0);
        r.substep_current.push_back(std::hypot(p.state().i_d, p.state().i_q));
      }
    });
    for (int e = 0; e < edge_count; ++e) {
      ctl->hall_edge(edges[static_cast<size_t>(e)].code, ticks(edges[static_cast<size_t>(e)].time));
    }
  }
  r.final_state = p.state();
  r.final_magnetic_energy = p.magnetic_energy();
  r.final_kinetic_energy = p.kinetic_energy();
  r.host_seconds = std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
  return r;
}

window_figures figures(const run_result& r, double start, double end) {
  window_figures w;
  w.start = start;
  w.end = end;
  std::vector<const trace_point*> points;
  for (const trace_point& t : r.trace) {
    if (t.time >= start && t.time < end) points.push_back(&t);
  }
  if (points.size() < 2) return w;

  // torque over every substep of the window
  const auto first = static_cast<size_t>(std::max(0.0, std::ceil(start / r.substep)));
  const auto last = std::min(r.substep_torque.size(), static_cast<size_t>(std::floor(end / r.substep)));
  double sum = 0, low = std::numeric_limits<double>::infinity(), high = -low;
  for (size_t k = first; k < last; ++k) {
    sum += r.substep_torque[k];
    low = std::min(low, r.substep_torque[k]);
    high = std::max(high, r.substep_torque[k]);
  }
  const double n = static_cast<double>(last > first ? last - first : 1);
  w.mean_torque = sum / n;
  w.min_torque = low;
  w.max_torque = high;
  w.ripple_percent = 100.0 * (high - low) / std::fabs(w.mean_torque);

  double error2 = 0, id_sum = 0, id2 = 0, angle2 = 0, angle_max = 0, speed = 0, foc = 0;
  for (const trace_point* t : points) {
    error2 += t->i_d_error * t->i_d_error + t->i_q_error * t->i_q_error;
    id_sum += t->i_d;
    id2 += t->i_d * t->i_d;
    angle2 += t->angle_error_deg * t->angle_error_deg;
    angle_max = std::max(angle_max, std::fabs(t->angle_error_deg));
    speed += t->speed_rpm;
    foc += t->foc ? 1 : 0;
  }
  const double count = static_cast<double>(points.size());
  w.current_error_rms = std::sqrt(error2 / count);
  w.i_d_mean = id_sum / count;
  w.i_d_rms = std::sqrt(id2 / count);
  w.angle_error_rms_deg = std::sqrt(angle2 / count);
  w.angle_error_max_deg = angle_max;
  w.speed_mean_rpm = speed / count;
  w.foc_fraction = foc / count;

  // THD of phase a by Fourier analysis over whole electrical turns, in the angle domain:
  // c_h = 1/(pi M) integral i_a(theta) e^(-j h theta) dtheta over M turns (trapezoid rule); at
  // constant speed this is the usual time-domain series. Harmonics 2..50, or up to half the control
  // rate, which is as far as the period samples reach.
  const double theta0 = points.front()->electrical_angle;
  const double span = points.back()->electrical_angle - theta0;
  const int turns = static_cast<int>(std::floor(std::fabs(span) / two_pi));
  w.turns = turns;
  if (turns >= 1) {
    const double target = two_pi * turns;
    size_t end_index = 0;
    double best = std::numeric_limits<double>::infinity();
    for (size_t k = 0; k < points.size(); ++k) {
      const double distance = std::fabs(std::fabs(points[k]->electrical_angle - theta0) - target);
      if (distance < best) {
        best = distance;
        end_index = k;
      }
    }
    const double seconds = points[end_index]->time - points.front()->time;
    const double f_electrical = turns / seconds;
    const double sample_rate = count / (points.back()->time - points.front()->time + 1e-300);
    const int harmonics =
        std::max(1, std::min(50, static_cast<int>(std::floor(sample_rate / 2 / f_electrical))));
    std::vector<std::complex<double>> c(static_cast<size_t>(harmonics) + 1);
    for (size_t k = 0; k + 1 <= end_index; ++k) {
      const double a0 = points[k]->electrical_angle, a1 = points[k + 1]->electrical_angle;
      for (int h = 1; h <= harmonics; ++h) {
        const std::complex<double> f0 = points[k]->i_a * std::polar(1.0, -h * a0);
        const std::complex<double> f1 = points[k + 1]->i_a * std::polar(1.0, -h * a1);
        c[static_cast<size_t>(h)] += 0.5 * (f0 + f1) * (a1 - a0);
      }
    }
    double harmonic2 = 0;
    for (int h = 2; h <= harmonics; ++h) harmonic2 += std::norm(c[static_cast<size_t>(h)]);
    const double fundamental = std::abs(c[1]);
    w.fundamental = fundamental / (M_PI * turns);
    w.thd_percent = fundamental > 0 ? 100.0 * std::sqrt(harmonic2) / fundamental : 0.0;
  }
  return w;
}

event_figures events(const scenario& s, const run_result& r) {
  event_figures e;
  e.handover_time = r.handover_time;
  if (s.speed_step_time < s.duration) {
    const double until = std::min(s.load_step_time, s.duration);
    double last_out = -1;
    bool any = false;
    for (const trace_point& t : r.trace) {
      if (t.time < s.speed_step_time || t.time >= until) continue;
      any = true;
      if (std::fabs(t.speed_rpm - s.speed_2) > 0.02 * std::fabs(s.speed_2)) last_out = t.time;
    }
    const double last_time = until - 1.0 / s.inverter.pwm_frequency;
    e.speed_step_settle =
        !any || last_out >= last_time - 1e-9 ? -1 : std::max(0.0, last_out - s.speed_step_time);
  }
  if (s.load_step_time < s.duration) {
    for (const trace_point& t : r.trace) {
      if (t.time >= s.load_step_time)
        e.load_step_dip_rpm = std::max(e.load_step_dip_rpm, t.speed_ref_rpm - t.speed_rpm);
    }
  }
  return e;
}

}  // namespace rotorq::sim
