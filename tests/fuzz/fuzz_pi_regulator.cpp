// Fuzz target: pi_regulator (pi_regulator.hpp) in q15 and q31 on raw input bytes: any gains
// (negative mantissas, exponents far outside [-16, 15]), any limits (inverted, negative symmetric
// limits), and a stream of updates, presets, resets and limit changes with any references,
// measurements and feedforward values. Checked after every operation:
//   - the output and the integrator inside the (collapsed) limits, saturated() as defined;
//   - bit for bit the rule written out independently in 128-bit integers
//     (tests/pi_regulator_model.hpp);
//   - the double twin (ref/pi_regulator.hpp), started from the same held integrator, within the
//     header's bound: 0.5 LSB + 2^-16 LSB (two products rounded to 2^-16 LSB), plus 2^-20 LSB for the
//     twin's own double rounding.
#include <cmath>
#include <cstddef>
#include <cstdint>

#include "../pi_regulator_model.hpp"
#include "fuzz_support.hpp"
#include "rotorq/host.hpp"
#include "rotorq/pi_regulator.hpp"
#include "rotorq/ref/pi_regulator.hpp"

namespace {

using namespace rotorq;
using fuzz::check;

template <int F>
void check_state(const pi_regulator<fixed<F>>& r, const test::pi_model<F>& m, const char* what) {
  const int64_t lo = r.lower_limit().raw(), hi = r.upper_limit().raw();
  check(lo == static_cast<int64_t>(m.lo) && hi == static_cast<int64_t>(m.hi), "limits as specified", lo, hi);
  check(lo <= hi, "lower limit <= upper limit", lo, hi);
  check(r.integrator_wide() >= lo * 65536 && r.integrator_wide() <= hi * 65536,
        "integrator inside the limits", r.integrator_wide(), lo, hi);
  check(r.integrator_wide() == static_cast<int64_t>(m.integrator), what, r.integrator_wide(),
        static_cast<int64_t>(m.integrator));
}

template <int F>
void run(fuzz::byte_reader& in) {
  using Q = fixed<F>;
  const Q kp_m = fuzz::take_fixed<F>(in), ki_m = fuzz::take_fixed<F>(in);
  const auto kp_e = in.take<int8_t>(), ki_e = in.take<int8_t>();
  const Q lo = fuzz::take_fixed<F>(in), hi = fuzz::take_fixed<F>(in);
  pi_regulator<Q> r({kp_m, kp_e}, {ki_m, ki_e}, lo, hi);
  test::pi_model<F> m;
  m.set_gains(kp_m.raw(), kp_e, ki_m.raw(), ki_e);
  m.set_limits(lo.raw(), hi.raw());
  check_state(r, m, "integrator as specified after construction");
  ref::pi_regulator twin(ref::gain_value(r.proportional_gain()), ref::gain_value(r.integral_gain()));

  const double lsb = std::ldexp(1.0, -F);
  const double bound = (0.5 + std::ldexp(1.0, -16) + std::ldexp(1.0, -20)) * lsb;
  const int steps = in.take<uint8_t>() & 63;
  for (int k = 0; k < steps && !in.exhausted(); ++k) {
    const auto op = in.take<uint8_t>();
    const Q a = fuzz::take_fixed<F>(in), b = fuzz::take_fixed<F>(in), c = fuzz::take_fixed<F>(in);
    switch (op & 7) {
      case 0:
        r.set_limits(a, b);
        m.set_limits(a.raw(), b.raw());
        check_state(r, m, "integrator unchanged by set_limits");
        break;
      case 1:
        r.set_limit(a);
        m.set_limit(a.raw());
        check_state(r, m, "integrator unchanged by set_limit");
        break;
      case 2:
        r.preset(a);
        m.preset(a.raw());
        check_state(r, m, "preset as specified");
        break;
      case 3:
        r.reset();
        m.reset();
        check_state(r, m, "reset clears the integrator");
        check(r.output() == Q::zero() && !r.saturated(), "reset clears the output");
        break;
      default: {
        const Q feedforward = (op & 8) != 0 ? c : Q::zero();
        twin.set_limits(to_double(r.lower_limit()), to_double(r.upper_limit()));
        twin.set_integrator(std::ldexp(static_cast<double>(r.integrator_wide()), -(F + 16)));
        const Q u = r.update(a, b, feedforward);
        const int64_t want = m.update(a.raw(), b.raw(), feedforward.raw());
        check(u.raw() == want, "update as specified", a.raw(), b.raw(), u.raw(), want);
        check(r.saturated() == m.saturated, "saturated as specified", a.raw(), b.raw(), r.saturated());
        check_state(r, m, "integrator as specified after update");
        check(u >= r.lower_limit() && u <= r.upper_limit(), "output inside the limits", u.raw());
        check(r.output() == u, "output() is the last result", u.raw());
        const double twin_u = twin.update(to_double(a), to_double(b), to_double(feedforward));
        check(std::fabs(to_double(u) - twin_u) <= bound, "within 0.5 + 2^-16 LSB of the double twin", a.raw(),
              b.raw(), u.raw(), static_cast<int64_t>(std::ldexp(twin_u, F)));
        break;
      }
    }
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  run<15>(in);
  run<31>(in);
  return 0;
}
