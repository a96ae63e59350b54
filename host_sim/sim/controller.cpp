// The controllers of controller.hpp: fixed_controller<F> (library only) and reference_controller (its
// double twin).
#include "rotorq/sim/controller.hpp"

#include <algorithm>
#include <cmath>

#include "rotorq/host.hpp"
#include "rotorq/ref/ref.hpp"
#include "rotorq/rotorq.hpp"

namespace rotorq::sim {

const char* name_of(arithmetic a) {
  switch (a) {
    case arithmetic::q15:
      return "q15";
    case arithmetic::q31:
      return "q31";
    case arithmetic::reference:
      break;
  }
  return "double";
}
const char* name_of(angle_input a) { return a == angle_input::hall ? "hall" : "exact"; }

namespace {

// electrical turns per capture tick for a mechanical rpm
double turns_per_tick(double rpm, const controller_config& c) {
  return rpm * c.pole_pairs / 60.0 / c.capture_timer_frequency;
}
electrical_speed speed_of(double turns_per_tick_value) {
  const double raw = std::ldexp(turns_per_tick_value, 48);
  if (!std::isfinite(raw)) return electrical_speed::zero();
  const double limit = static_cast<double>(electrical_speed::raw_max);
  return electrical_speed::from_raw(static_cast<int64_t>(std::clamp(raw, -limit, limit)));
}
double to_turns_per_tick(electrical_speed s) { return std::ldexp(static_cast<double>(s.raw()), -48); }

hall_tracker_config tracker_config(const controller_config& c) {
  hall_tracker_config t;
  t.calibration = uniform_hall_calibration(turn32_from_degrees(c.hall_first_edge_deg));
  t.averaging = speed_averaging::full_turn;
  t.stall_timeout = static_cast<uint32_t>(0.05 * c.capture_timer_frequency);  // 50 ms without an edge
  return t;
}

handover_config handover_settings(const controller_config& c) {
  handover_config h;
  if (c.six_step_only) {
    h.foc_above = electrical_speed::from_raw(electrical_speed::raw_max);
    h.six_step_below = electrical_speed::zero();
  } else if (c.foc_above_rpm < 0) {
    h.foc_above = electrical_speed::zero();
    h.six_step_below = electrical_speed::zero();
  } else {
    h.foc_above = speed_of(turns_per_tick(c.foc_above_rpm, c));
    h.six_step_below = speed_of(turns_per_tick(c.six_step_below_rpm, c));
  }
  return h;
}

double rpm_of(double turns_per_tick_value, const controller_config& c) {
  return turns_per_tick_value * c.capture_timer_frequency * 60.0 / c.pole_pairs;
}

template <int F>
using angle_of_format = typename detail::select<F == 15, turn16, turn32>::type;

template <int F>
angle_of_format<F> narrow(turn32 a) {
  if constexpr (F == 15) {
    return to_turn16(a);
  } else {
    return a;
  }
}
template <int F>
fixed<F> widen(q15 x) {
  if constexpr (F == 15) {
    return x;
  } else {
    return to_q31(x);
  }
}

// ---- the library controller ---------------------------------------------------------------------
template <int F>
class fixed_controller final : public controller {
  using Q = fixed<F>;

 public:
  explicit fixed_controller(const controller_config& c)
      : c_(c),
        id_(ref::to_pi_gain<Q>(c.current_kp_d), ref::to_pi_gain<Q>(c.current_ki_d)),
        iq_(ref::to_pi_gain<Q>(c.current_kp_q), ref::to_pi_gain<Q>(c.current_ki_q)),
        six_(ref::to_pi_gain<Q>(c.six_step_kp), ref::to_pi_gain<Q>(c.six_step_ki), Q::zero(), Q::max()),
        speed_(ref::to_pi_gain<Q>(c.speed_kp), ref::to_pi_gain<Q>(c.speed_ki)),
        tracker_(tracker_config(c)),
        exact_(0x7fffffffu),
        handover_(handover_settings(c)),
        bus_(detail::from_double<Q>(1.0 / 64)),
        rpm_(static_cast<uint32_t>(c.pole_pairs), static_cast<uint32_t>(c.capture_timer_frequency)),
        margin_(detail::from_double<Q>(c.voltage_margin / std::sqrt(3.0))),
        rpm_to_q_(static_cast<int64_t>(std::llround(std::ldexp(1.0, F + 16) / c.speed_full_scale_rpm))),
        advance_ticks_(static_cast<uint32_t>(
            std::lround(c.advance_periods * c.capture_timer_frequency / c.pwm_frequency))),
        command_(c.speed_control ? Q::zero() : detail::from_double<Q>(c.torque_current)) {
    speed_.set_limit(detail::from_double<Q>(c.current_limit));
  }

  void hall_edge(uint8_t code, uint32_t tick) override { tracker_.update(code, tick); }

  controller_output step(const controller_input& in) override {
    controller_output out;
    // currents: a code's offset from mid-scale, times 2^(F + 1 - bits)
    const int64_t mid = int64_t{1} << (c_.adc_bits - 1);
    const int64_t scale = int64_t{1} << (F + 1 - c_.adc_bits);
    const phases<Q> i{Q::saturate((in.adc.a - mid) * scale), Q::saturate((in.adc.b - mid) * scale),
                      Q::saturate((in.adc.c - mid) * scale)};
    const Q bus = detail::from_double<Q>(in.bus_voltage / c_.voltage_full_scale);
    bus_.update(bus);

    // angle at the sample and at the middle of the period the voltage is applied in
    turn32 angle_now, angle_apply;
    electrical_speed speed;
    if (c_.angle == angle_input::hall) {
      tracker_.update(in.hall_code, in.tick);
      const hall_estimate e = tracker_.estimate(in.tick);
      angle_now = e.angle;
      speed = e.speed;
      angle_apply = tracker_.estimate(in.tick + advance_ticks_).angle;
    } else {
      exact_.update(turn32_from_degrees(in.exact_turns * 360.0), in.tick, speed_of(in.exact_speed));
      angle_now = exact_.estimate(in.tick).angle;
      speed = exact_.estimate(in.tick).speed;
      angle_apply = exact_.estimate(in.tick + advance_ticks_).angle;
    }

    // speed loop
    if (c_.speed_control && periods_++ % static_cast<uint32_t>(std::max(c_.speed_divider, 1)) == 0) {
      command_ = speed_.update(detail::from_double<Q>(in.speed_reference_rpm / c_.speed_full_scale_rpm),
                               speed_in_format(speed));
    }
    // Six-step only drives: there a braking command keeps the forward vector with zero current (the
    // regulator holds the duty that balances the back-EMF, so the rotor coasts), as the reversed
    // vector at a start-up duty would short the back-EMF through the low-side switches.
    const bool braking_in_six_step = command_.raw() < 0 && handover_.mode() == drive_mode::six_step;
    const rotation torque =
        command_.raw() >= 0 || braking_in_six_step ? rotation::forward : rotation::backward;
    const drive_command d = handover_.update(angle_now, speed, torque);
    const Q magnitude = d.mode == drive_mode::six_step && command_.raw() < 0 ? Q::zero() : abs(command_);
    const stationary<Q> i_ab = clarke(i);
    const sin_cos_pair<Q> now = sin_cos(narrow<F>(angle_now));
    const rotating<Q> i_dq = park(i_ab, now);

    if (d.mode == drive_mode::six_step) {
      if (was_foc_) six_.reset();
      was_foc_ = false;
      const sin_cos_pair<Q> along = sin_cos(narrow<F>(d.six_step.vector_angle));
      const Q duty = six_.update(magnitude, park(i_ab, along).d);
      six_state_ = d.six_step;
      six_duty_ = duty;
      const drive_mode_legs legs = six_step_legs(d.six_step, duty);
      out.command = legs.command;
      // the reference in the controller's frame: |command| along the vector
      const rotating<Q> ref = park(stationary<Q>{magnitude * along.cos, magnitude * along.sin}, now);
      out.i_d_ref = to_double(ref.d) * c_.current_full_scale;
      out.i_q_ref = to_double(ref.q) * c_.current_full_scale;
    } else {
      const sin_cos_pair<Q> apply = sin_cos(narrow<F>(angle_apply));
      if (!was_foc_) {
        // bumpless: the six-step vector (per unit of the bus, floating phase at the midpoint) in volts
        // and in the rotor frame of the period it will be applied in
        const stationary<Q> v6 = commutation_voltage(six_state_, six_duty_);
        const rotating<Q> v6_dq = park(stationary<Q>{v6.alpha * bus, v6.beta * bus}, apply);
        id_.preset(v6_dq.d);
        iq_.preset(v6_dq.q);
      }
      was_foc_ = true;
      const rotating<Q> direction{widen<F>(d.current_direction.d), widen<F>(d.current_direction.q)};
      const rotating<Q> ref{magnitude * direction.d + d_current(), magnitude * direction.q};
      const Q m = bus * margin_;
      id_.set_limit(m);
      const Q v_d = id_.update(ref.d, i_dq.d);
      iq_.set_limit(limit_d_priority(rotating<Q>{v_d, Q::max()}, m).value.q);
      const Q v_q = iq_.update(ref.q, i_dq.q);
      const rotating<Q> v = limit_magnitude(rotating<Q>{v_d, v_q}, m).value;
      const stationary<Q> v_ab = bus_.normalize(inverse_park(v, apply));
      const modulation<Q> mod = svpwm(v_ab, overmodulation::circle);
      const compare_values cv = duty_to_compare(mod.duty, c_.pwm_period_counts, c_.min_pulse_counts);
      const double period = c_.pwm_period_counts;
      out.command = {leg_command{leg_mode::switched, cv.compare.a / period},
                     leg_command{leg_mode::switched, cv.compare.b / period},
                     leg_command{leg_mode::switched, cv.compare.c / period}};
      out.i_d_ref = to_double(ref.d) * c_.current_full_scale;
      out.i_q_ref = to_double(ref.q) * c_.current_full_scale;
    }
    out.i_d = to_double(i_dq.d) * c_.current_full_scale;
    out.i_q = to_double(i_dq.q) * c_.current_full_scale;
    out.angle_turns = to_turns(angle_now);
    out.speed_rpm = rpm_of(to_turns_per_tick(speed), c_);
    out.current_command = to_double(command_) * c_.current_full_scale;
    out.foc = d.mode == drive_mode::foc;
    return out;
  }

 private:
  struct drive_mode_legs {
    inverter_command command;
  };
  drive_mode_legs six_step_legs(const commutation_state& s, Q duty) const {
    // compare values through the same timer rounding as the modulator's duties
    const compare_values cv =
        duty_to_compare(phases<Q>{duty, duty, duty}, c_.pwm_period_counts, c_.min_pulse_counts);
    const double high = cv.compare.a / static_cast<double>(c_.pwm_period_counts);
    const auto leg = [&](phase_drive p) {
      if (p == phase_drive::floating) return leg_command{leg_mode::floating, 0.0};
      return leg_command{leg_mode::switched, p == phase_drive::high ? high : 0.0};
    };
    return {{leg(s.drive.a), leg(s.drive.b), leg(s.drive.c)}};
  }

  // rpm x 256 from rpm_scale, to per unit of the full-scale speed: rpm_q8 2^(F-8) / rpm_fs, as one
  // multiply by K = round(2^(F+16) / rpm_fs) and a rounding shift by 24 (speeds beyond twice full
  // scale are clamped first so the product stays below 2^63)
  Q speed_in_format(electrical_speed s) const {
    const int64_t limit = static_cast<int64_t>(2 * c_.speed_full_scale_rpm * 256);
    const int64_t rpm_q8 = detail::clamp(rpm_.rpm_q8(s), -limit, limit);
    return Q::saturate(detail::round_shift(rpm_q8 * rpm_to_q_, 24));
  }
  Q d_current() const { return detail::from_double<Q>(c_.d_current); }

  controller_config c_;
  pi_regulator<Q> id_, iq_, six_, speed_;
  hall_tracker<32> tracker_;
  angle_interpolator<32> exact_;
  foc_handover handover_;
  bus_normalizer<Q> bus_;
  rpm_scale rpm_;
  Q margin_;
  int64_t rpm_to_q_;
  uint32_t advance_ticks_;
  uint32_t periods_ = 0;
  Q command_{};
  bool was_foc_ = false;
  commutation_state six_state_{};
  Q six_duty_{};
};

// ---- the double twin ----------------------------------------------------------------------------
class reference_controller final : public controller {
 public:
  explicit reference_controller(const controller_config& c)
      : c_(c),
        id_(c.current_kp_d, c.current_ki_d),
        iq_(c.current_kp_q, c.current_ki_q),
        six_(c.six_step_kp, c.six_step_ki, 0.0, 1.0),
        speed_(c.speed_kp, c.speed_ki),
        tracker_(tracker_config(c)),
        advance_(c.advance_periods * c.capture_timer_frequency / c.pwm_frequency),
        foc_above_(c.six_step_only ? INFINITY : to_turns_per_tick(handover_settings(c).foc_above)),
        six_step_below_(to_turns_per_tick(handover_settings(c).six_step_below)),
        command_(c.speed_control ? 0.0 : c.torque_current) {
    speed_.set_limit(c.current_limit);
  }

  void hall_edge(uint8_t code, uint32_t tick) override { tracker_.update(code, tick); }

  controller_output step(const controller_input& in) override {
    controller_output out;
    const double mid = std::ldexp(1.0, c_.adc_bits - 1);
    const phases<double> i{(in.adc.a - mid) / mid, (in.adc.b - mid) / mid, (in.adc.c - mid) / mid};
    const double bus = in.bus_voltage / c_.voltage_full_scale;

    double angle_now = 0, angle_apply = 0, speed = 0;  // turns, turns per tick
    if (c_.angle == angle_input::hall) {
      tracker_.update(in.hall_code, in.tick);
      const hall_estimate e = tracker_.estimate(in.tick);
      angle_now = to_turns(e.angle);
      speed = to_turns_per_tick(e.speed);
      angle_apply = to_turns(tracker_.estimate(in.tick + static_cast<uint32_t>(std::lround(advance_))).angle);
    } else {
      angle_now = in.exact_turns;
      speed = in.exact_speed;
      angle_apply = ref::add_turns(angle_now, speed * advance_);
    }

    if (c_.speed_control && periods_++ % static_cast<uint32_t>(std::max(c_.speed_divider, 1)) == 0) {
      command_ = speed_.update(in.speed_reference_rpm / c_.speed_full_scale_rpm,
                               rpm_of(speed, c_) / c_.speed_full_scale_rpm);
    }
    const bool forward = command_ >= 0 || !foc_;  // six-step keeps the forward vector (see above)

    // the hand-over (commutation.hpp's rule in double): switch at |speed| >= foc_above with the
    // offset that keeps the current on the six-step vector, then turn it to zero by one degree per
    // period; back below six_step_below once the offset has turned back onto the vector
    const int sector = ref::commutation_sector(angle_now);
    const int vector = ref::six_step_vector(sector, forward);
    const double vector_angle = (2 * vector + 1) / 12.0;
    const double torque_axis = ref::add_turns(angle_now, forward ? 0.25 : -0.25);
    const double to_vector = ref::signed_difference_turns(vector_angle, torque_axis);
    constexpr double blend = 1.0 / 360;
    const auto step_toward = [&](double from, double to) {
      const double d = ref::signed_difference_turns(to, from);
      return std::fabs(d) <= blend ? to : from + (d < 0 ? -blend : blend);
    };
    if (!foc_) {
      if (std::fabs(speed) >= foc_above_) {
        foc_ = true;
        offset_ = to_vector;
      }
    } else if (std::fabs(speed) < six_step_below_) {
      if (std::fabs(ref::signed_difference_turns(offset_, to_vector)) <= blend) {
        foc_ = false;
      } else {
        offset_ = step_toward(offset_, to_vector);
      }
    } else {
      offset_ = step_toward(offset_, 0.0);
    }

    const double magnitude = !foc_ && command_ < 0 ? 0.0 : std::fabs(command_);  // no braking in six-step
    const stationary<double> i_ab = ref::clarke(i);
    const sin_cos_pair<double> now = ref::sin_cos_turns(angle_now);
    const rotating<double> i_dq = ref::park(i_ab, now);
    if (!foc_) {
      if (was_foc_) six_.reset();
      was_foc_ = false;
      offset_ = 0;
      const sin_cos_pair<double> along = ref::sin_cos_turns(vector_angle);
      const double duty = six_.update(magnitude, ref::park(i_ab, along).d);
      six_vector_ = vector;
      six_duty_ = duty;
      // vector k: high phase and low phase (commutation.hpp's table)
      static constexpr int high[6] = {0, 1, 1, 2, 2, 0}, low[6] = {2, 2, 0, 0, 1, 1};
      const double counts = c_.pwm_period_counts;
      const double applied = ref::duty_to_compare(duty, counts, c_.min_pulse_counts) / counts;
      for (int leg = 0; leg < 3; ++leg) {
        leg_command& l = out.command[static_cast<size_t>(leg)];
        l = leg == high[vector]  ? leg_command{leg_mode::switched, applied}
            : leg == low[vector] ? leg_command{leg_mode::switched, 0.0}
                                 : leg_command{leg_mode::floating, 0.0};
      }
      const rotating<double> r = ref::park({magnitude * along.cos, magnitude * along.sin}, now);
      out.i_d_ref = r.d * c_.current_full_scale;
      out.i_q_ref = r.q * c_.current_full_scale;
    } else {
      const sin_cos_pair<double> apply = ref::sin_cos_turns(angle_apply);
      if (!was_foc_) {
        static constexpr int high[6] = {0, 1, 1, 2, 2, 0}, low[6] = {2, 2, 0, 0, 1, 1};
        const stationary<double> v6 =
            ref::commutation_voltage(high[six_vector_], low[six_vector_], six_duty_);
        const rotating<double> v6_dq = ref::park({v6.alpha * bus, v6.beta * bus}, apply);
        id_.preset(v6_dq.d);
        iq_.preset(v6_dq.q);
      }
      was_foc_ = true;
      const double from_d = offset_ + (forward ? 0.25 : -0.25);
      const sin_cos_pair<double> direction = ref::sin_cos_turns(from_d);
      const rotating<double> ref_dq{magnitude * direction.cos + c_.d_current, magnitude * direction.sin};
      const double m = bus * c_.voltage_margin / std::sqrt(3.0);
      id_.set_limit(m);
      const double v_d = id_.update(ref_dq.d, i_dq.d);
      iq_.set_limit(std::sqrt(std::max(m * m - v_d * v_d, 0.0)));
      const double v_q = iq_.update(ref_dq.q, i_dq.q);
      const stationary<double> v_ab = ref::limit_magnitude(ref::inverse_park({v_d, v_q}, apply), m);
      const ref::modulation_result mod = ref::svpwm_min_max(
          {ref::normalize_to_bus(v_ab.alpha, bus, 1.0 / 64), ref::normalize_to_bus(v_ab.beta, bus, 1.0 / 64)},
          true);
      const double counts = c_.pwm_period_counts;
      const auto leg = [&](double duty) {
        return leg_command{leg_mode::switched,
                           ref::duty_to_compare(duty, counts, c_.min_pulse_counts) / counts};
      };
      out.command = {leg(mod.duty.a), leg(mod.duty.b), leg(mod.duty.c)};
      out.i_d_ref = ref_dq.d * c_.current_full_scale;
      out.i_q_ref = ref_dq.q * c_.current_full_scale;
    }
    out.i_d = i_dq.d * c_.current_full_scale;
    out.i_q = i_dq.q * c_.current_full_scale;
    out.angle_turns = angle_now;
    out.speed_rpm = rpm_of(speed, c_);
    out.current_command = command_ * c_.current_full_scale;
    out.foc = foc_;
    return out;
  }

 private:
  controller_config c_;
  ref::pi_regulator id_, iq_, six_, speed_;
  hall_tracker<32> tracker_;
  double advance_;
  double foc_above_, six_step_below_;
  uint32_t periods_ = 0;
  double command_ = 0;
  bool foc_ = false, was_foc_ = false;
  double offset_ = 0;
  int six_vector_ = 0;
  double six_duty_ = 0;
};

}  // namespace

std::unique_ptr<controller> make_controller(arithmetic a, const controller_config& config) {
  switch (a) {
    case arithmetic::q15:
      return std::make_unique<fixed_controller<15>>(config);
    case arithmetic::q31:
      return std::make_unique<fixed_controller<31>>(config);
    case arithmetic::reference:
      break;
  }
  return std::make_unique<reference_controller>(config);
}

}  // namespace rotorq::sim
