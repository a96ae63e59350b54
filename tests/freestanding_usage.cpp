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
}
