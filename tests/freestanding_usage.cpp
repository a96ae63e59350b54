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
}
}
