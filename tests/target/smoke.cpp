// The first program on an emulated core: a few rotorq functions against the results the same headers
// gave on the host (g++ on x86-64, generic port), bit for bit. If this fails, the toolchain, start-up
// code, semihosting or emulator set-up is wrong, or a port changed a result. The inputs are read
// through volatile objects, so the compiler cannot fold the calls at compile time: the core computes
// them. Prints "N passed, M failed" (check.hpp) and returns non-zero on a mismatch.
#include <stdint.h>

#include "check.hpp"
#include "rotorq/rotorq.hpp"

using namespace rotorq;

namespace {

struct sin_cos16_case {
  uint16_t angle;
  int16_t sin;
  int16_t cos;
};
// 0, 30 (rounded down), 45, 90, 217.6, 270 degrees and one step below a full turn.
volatile const sin_cos16_case sin_cos16_cases[] = {
    {0x0000, 0, 32767},       {0x1555, 16383, 28378}, {0x2000, 23170, 23170}, {0x4000, 32767, 0},
    {0x9abc, -19991, -25963}, {0xc000, -32768, 0},    {0xffff, -3, 32767},
};

struct sin_cos32_case {
  uint32_t angle;
  int32_t sin;
  int32_t cos;
};
volatile const sin_cos32_case sin_cos32_cases[] = {
    {0x00000000u, 0, 2147483647},          {0x15555555u, 1073741823, 1859775394},
    {0x20000000u, 1518500250, 1518500250}, {0x9abcdef0u, -1310276720, -1701429086},
    {0xc0000000u, -2147483647 - 1, 0},
};

volatile const int16_t currents16[3] = {12000, -2000, -10000};
volatile const int32_t currents32[3] = {1000000000, -300000000, -700000000};
volatile const uint16_t angle16 = 0x1555;
volatile const uint32_t angle32 = 0x9abcdef0u;
volatile const int16_t voltage_request[2] = {9000, 20000};  // d, q
volatile const int16_t voltage_limit = 18000;

void check_sin_cos() {
  for (const volatile sin_cos16_case& c : sin_cos16_cases) {
    const uint16_t angle = c.angle;
    ROTORQ_SCOPE_VALUE("sin_cos(turn16) at", angle);
    const sin_cos_pair<q15> p = sin_cos(turn16::from_raw(angle));
    ROTORQ_CHECK_EQ(p.sin.raw(), c.sin);
    ROTORQ_CHECK_EQ(p.cos.raw(), c.cos);
  }
  for (const volatile sin_cos32_case& c : sin_cos32_cases) {
    const uint32_t angle = c.angle;
    ROTORQ_SCOPE_VALUE("sin_cos(turn32) at", angle);
    const sin_cos_pair<q31> p = sin_cos(turn32::from_raw(angle));
    ROTORQ_CHECK_EQ(p.sin.raw(), c.sin);
    ROTORQ_CHECK_EQ(p.cos.raw(), c.cos);
  }
}

void check_fixed() {
  ROTORQ_SCOPE("fixed");
  volatile const int16_t minus_one = -32768;
  ROTORQ_CHECK_EQ((q15::from_raw(minus_one) * q15::from_raw(minus_one)).raw(), 32767);
  volatile const int16_t a = 30000;
  volatile const int16_t b = 10000;
  ROTORQ_CHECK_EQ((q15::from_raw(a) + q15::from_raw(b)).raw(), 32767);
  volatile const int16_t c = -12345;
  volatile const int16_t d = 23456;
  ROTORQ_CHECK_EQ((q15::from_raw(c) * q15::from_raw(d)).raw(), -8837);
  volatile const int32_t e = -1234567890;
  volatile const int32_t f = 987654321;
  ROTORQ_CHECK_EQ((q31::from_raw(e) * q31::from_raw(f)).raw(), -567793060);
}

void check_transforms_q15() {
  ROTORQ_SCOPE("clarke, park, inverse_park q15");
  const phases<q15> i{q15::from_raw(currents16[0]), q15::from_raw(currents16[1]),
                      q15::from_raw(currents16[2])};
  const sin_cos_pair<q15> angle = sin_cos(turn16::from_raw(angle16));
  const stationary<q15> s = clarke(i);
  ROTORQ_CHECK_EQ(s.alpha.raw(), 12000);
  ROTORQ_CHECK_EQ(s.beta.raw(), 4619);
  const rotating<q15> r = park(s, angle);
  ROTORQ_CHECK_EQ(r.d.raw(), 12702);
  ROTORQ_CHECK_EQ(r.q.raw(), -1999);
  const stationary<q15> back = inverse_park(r, angle);
  ROTORQ_CHECK_EQ(back.alpha.raw(), 12000);
  ROTORQ_CHECK_EQ(back.beta.raw(), 4619);
}

void check_transforms_q31() {
  ROTORQ_SCOPE("clarke, park q31");
  const phases<q31> i{q31::from_raw(currents32[0]), q31::from_raw(currents32[1]),
                      q31::from_raw(currents32[2])};
  const stationary<q31> s = clarke(i);
  ROTORQ_CHECK_EQ(s.alpha.raw(), 1000000000);
  ROTORQ_CHECK_EQ(s.beta.raw(), 230940108);
  const rotating<q31> r = park(s, sin_cos(turn32::from_raw(angle32)));
  ROTORQ_CHECK_EQ(r.d.raw(), -933196644);
  ROTORQ_CHECK_EQ(r.q.raw(), 427173685);
}

void check_modulation() {
  ROTORQ_SCOPE("limit_magnitude, svpwm, duty_to_compare");
  const rotating<q15> request{q15::from_raw(voltage_request[0]), q15::from_raw(voltage_request[1])};
  const limited<rotating<q15>> v = limit_magnitude(request, q15::from_raw(voltage_limit));
  ROTORQ_CHECK_EQ(v.value.d.raw(), 7387);
  ROTORQ_CHECK_EQ(v.value.q.raw(), 16415);
  ROTORQ_CHECK(v.clipped);
  const stationary<q15> vs = inverse_park(v.value, sin_cos(turn16::from_raw(angle16)));
  const modulation<q15> m = svpwm(vs, overmodulation::circle);
  ROTORQ_CHECK_EQ(m.duty.a.raw(), 13669);
  ROTORQ_CHECK_EQ(m.duty.b.raw(), 31894);
  ROTORQ_CHECK_EQ(m.duty.c.raw(), 874);
  ROTORQ_CHECK_EQ(m.sector, 2);
  const compare_values c = duty_to_compare(m.duty, 2500, 40);
  ROTORQ_CHECK_EQ(c.compare.a, 1043);
  ROTORQ_CHECK_EQ(c.compare.b, 2433);
  ROTORQ_CHECK_EQ(c.compare.c, 67);
  ROTORQ_CHECK_FALSE(c.clipped);
}

}  // namespace

int main() {
  check_sin_cos();
  check_fixed();
  check_transforms_q15();
  check_transforms_q31();
  check_modulation();
  return rotorq::check::finish();
}
