// Calls every target function with values the compiler cannot see, so that a freestanding build
// keeps all of their code (tests/compile_headers.cmake inspects the object).
#include "rotorq/rotorq.hpp"

using namespace rotorq;

extern "C" {

void rotorq_usage_q15(const int16_t* in, uint16_t raw_angle, int16_t* out) {
  const phases<q15> i{q15::from_raw(in[0]), q15::from_raw(in[1]), q15::from_raw(in[2])};
  const sin_cos_pair<q15> angle = sin_cos(turn16::from_raw(raw_angle));
  const stationary<q15> s = clarke(i);
  const stationary<q15> sb = clarke_balanced(i.a, i.b);
  const stationary<q15> sp = clarke_power_invariant(i);
  const rotating<q15> r = park(s, angle);
  const stationary<q15> back = inverse_park(r, angle);
  const phases<q15> p = inverse_clarke(back);
  const phases<q15> pp = inverse_clarke_power_invariant(sp);
  accumulator<q15> acc;
  acc.mac(p.a, pp.b);
  acc.msc(sb.beta, i.c);
  out[0] = acc.result().raw();
  out[1] = mul_add(p.b, p.c, pp.a * pp.c).raw();
  out[2] = (p.c - pp.b + (-sb.alpha)).raw();
  out[3] = to_q15(to_q31(r.q)).raw();

  const limited<rotating<q15>> l =
      limit_d_priority(limit_magnitude(r, q15::from_raw(in[3])).value, q15::from_raw(in[4]));
  bus_normalizer<q15> bus(q15::from_raw(in[5]));
  bus.update(q15::from_raw(in[6]));
  const stationary<q15> v = bus.normalize(inverse_park(l.value, angle));
  const modulation<q15> m = svpwm(v, in[7] != 0 ? overmodulation::circle : overmodulation::hexagon);
  const compare_values c =
      duty_to_compare(m.duty, static_cast<uint32_t>(in[8]), static_cast<uint32_t>(in[9]));
  out[4] = static_cast<int16_t>(c.compare.a + c.compare.b + c.compare.c + m.sector);
  out[5] = static_cast<int16_t>(sine_pwm(v).duty.a.raw() + six_step(v).duty.b.raw());

  pi_regulator<q15> current({q15::from_raw(in[10]), -2}, {q15::from_raw(in[11]), -8});
  current.set_limit(q15::from_raw(in[12]));
  current.preset(r.d);
  out[6] = current.update(s.alpha, r.q, m.duty.c).raw();
}

void rotorq_usage_q31(const int32_t* in, uint32_t raw_angle, int32_t* out) {
  const phases<q31> i{q31::from_raw(in[0]), q31::from_raw(in[1]), q31::from_raw(in[2])};
  const sin_cos_pair<q31> angle = sin_cos(turn32::from_raw(raw_angle));
  const stationary<q31> s = clarke(i);
  const stationary<q31> sb = clarke_balanced(i.a, i.b);
  const stationary<q31> sp = clarke_power_invariant(i);
  const rotating<q31> r = park(s, angle);
  const stationary<q31> back = inverse_park(r, angle);
  const phases<q31> p = inverse_clarke(back);
  const phases<q31> pp = inverse_clarke_power_invariant(sp);
  accumulator<q31> acc;
  acc.mac(p.a, pp.b);
  acc.msc(sb.beta, i.c);
  out[0] = acc.result().raw();
  out[1] = mul_add(p.b, p.c, pp.a * pp.c).raw();
  out[2] = (p.c - pp.b + (-sb.alpha)).raw();
  out[3] = signed_difference(turn32::from_raw(raw_angle), advance(turn32{}, in[3]));

  const limited<rotating<q31>> l =
      limit_d_priority(limit_magnitude(r, q31::from_raw(in[4])).value, q31::from_raw(in[5]));
  bus_normalizer<q31> bus(q31::from_raw(in[6]));
  bus.update(q31::from_raw(in[7]));
  const stationary<q31> v = bus.normalize(inverse_park(l.value, angle));
  const modulation<q31> m = svpwm(v, in[8] != 0 ? overmodulation::circle : overmodulation::hexagon);
  const compare_values c =
      duty_to_compare(m.duty, static_cast<uint32_t>(in[9]), static_cast<uint32_t>(in[10]));
  out[4] = static_cast<int32_t>(c.compare.a + c.compare.b + c.compare.c + m.sector);
  out[5] = sine_pwm(v).duty.a.raw() ^ six_step(v).duty.b.raw();
}

// Rotor angle: Hall decoding, the tracker (32- and 16-bit timers), the interpolator, six-step
// commutation and the hand-over to FOC.
void rotorq_usage_rotor_angle(const uint32_t* in, int32_t* out) {
  hall_tracker_config config;
  config.calibration = uniform_hall_calibration(turn32::from_raw(in[0]));
  config.min_dwell = in[1];
  config.stall_timeout = in[2];
  config.min_speed = electrical_speed::from_raw(static_cast<int64_t>(in[3]));
  config.averaging = in[4] != 0 ? speed_averaging::full_turn : speed_averaging::last_edge;
  hall_tracker<32> tracker(config);
  hall_tracker<16> tracker16(config);
  for (uint32_t k = 0; k < 8; ++k) {
    const auto code = static_cast<uint8_t>(in[5 + k] & 7u);
    tracker.update(code, in[13 + k]);
    tracker16.update(code, static_cast<uint16_t>(in[13 + k]));
  }
  const hall_estimate e = tracker.estimate(in[21]);
  const turn16 a16 = to_turn16(tracker16.angle(static_cast<uint16_t>(in[21])));
  angle_interpolator<32> position(in[22]);
  position.update(turn32::from_raw(in[23]), in[24]);
  position.update(turn32::from_raw(in[25]), in[26]);
  const interpolated_angle p = position.estimate(in[27]);
  const rpm_scale rpm(in[28], in[29]);

  const rotation torque = in[30] != 0 ? rotation::forward : rotation::backward;
  const commutation_state s = six_step_commutation(commutation_sector(e.angle), torque);
  const stationary<q15> v = commutation_voltage(s, q15::from_raw(static_cast<int16_t>(in[31])));
  handover_config h;
  h.foc_above = electrical_speed::from_raw(static_cast<int64_t>(in[32]));
  h.six_step_below = electrical_speed::from_raw(static_cast<int64_t>(in[33]));
  foc_handover handover(h);
  const drive_command c = handover.update(p.angle, e.speed, torque);
  const hall_reading r = decode_hall(static_cast<uint8_t>(in[34]), hall_placement::spaced_60);

  out[0] = static_cast<int32_t>(e.angle.raw() ^ a16.raw());
  out[1] = static_cast<int32_t>(p.angle.raw()) + rpm.rpm_q8(e.speed) + rpm.rpm_q8(p.speed);
  out[2] = v.alpha.raw() + v.beta.raw() + static_cast<int32_t>(s.drive.a) + c.current_direction.q.raw();
  out[3] = static_cast<int32_t>(c.current_angle.raw()) + static_cast<int32_t>(c.mode) + r.sector +
           static_cast<int32_t>(e.source) + static_cast<int32_t>(tracker.invalid_codes());
  out[4] = static_cast<int32_t>(steps_at(speed_from_motion(static_cast<int32_t>(in[35]), in[36]), in[37]));
}
}
