// Fuzz target: every Clarke transform (rotorq/clarke.hpp) in q15 and q31 on raw input bytes:
// clarke, clarke_balanced, inverse_clarke, clarke_power_invariant, inverse_clarke_power_invariant.
// Checks: no sanitizer report; every output within 0.5 LSB + 2^-15 LSB of the double twin
// (rotorq::ref) evaluated on the same inputs and clamped to the range (the bound of clarke.hpp; the
// twin's own double rounding is below 2^-17 LSB for these magnitudes, inside the 2^-15 allowance);
// clarke's alpha exactly the correctly rounded (2a - b - c) / 3, computed here with integer division;
// and the outputs that clarke.hpp passes through (clarke_balanced's alpha, inverse_clarke's a) equal.
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/clarke.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/clarke.hpp"
#include "rotorq/ref/ref.hpp"

namespace {

using namespace rotorq;
using fuzz::check;
using fuzz::lsb_error;

constexpr double bound = 0.5 + 1.0 / 32768.0;

template <int F>
void within(fixed<F> got, double exact, const char* what, int64_t x, int64_t y, int64_t z = 0) {
  check(std::fabs(lsb_error(got, exact)) <= bound, what, x, y, z, got.raw());
}

template <int F>
void check_format(fuzz::byte_reader& in) {
  using Q = fixed<F>;
  const phases<Q> i{fuzz::take_fixed<F>(in), fuzz::take_fixed<F>(in), fuzz::take_fixed<F>(in)};
  const int64_t a = i.a.raw(), b = i.b.raw(), c = i.c.raw();
  const phases<double> id = ref::to_double(i);

  const stationary<Q> s = clarke(i);
  const stationary<double> sd = ref::clarke(id);
  within(s.alpha, sd.alpha, "clarke alpha within bound", a, b, c);
  within(s.beta, sd.beta, "clarke beta within bound", a, b, c);
  // round half up of n / 3 = floor((2n + 3) / 6); the numerator is below 2^35, so int64 is exact
  const int64_t numerator = 2 * (2 * a - b - c) + 3;
  const int64_t floored = numerator >= 0 ? numerator / 6 : -((-numerator + 5) / 6);
  const int64_t want_alpha =
      floored > Q::raw_max ? Q::raw_max : (floored < Q::raw_min ? Q::raw_min : floored);
  check(s.alpha.raw() == want_alpha, "clarke alpha is the correctly rounded (2a - b - c) / 3", a, b, c);

  const stationary<Q> balanced = clarke_balanced(i.a, i.b);
  const stationary<double> balanced_d = ref::clarke_balanced(id.a, id.b);
  check(balanced.alpha == i.a, "clarke_balanced alpha = a", a, b);
  within(balanced.beta, balanced_d.beta, "clarke_balanced beta within bound", a, b);

  const stationary<Q> p = clarke_power_invariant(i);
  const stationary<double> pd = ref::clarke_power_invariant(id);
  within(p.alpha, pd.alpha, "clarke_power_invariant alpha within bound", a, b, c);
  within(p.beta, pd.beta, "clarke_power_invariant beta within bound", a, b, c);

  // the inverses take an arbitrary stationary vector: the first two inputs
  const stationary<Q> v{i.a, i.b};
  const stationary<double> vd{id.a, id.b};
  const phases<Q> back = inverse_clarke(v);
  const phases<double> back_d = ref::inverse_clarke(vd);
  check(back.a == v.alpha, "inverse_clarke a = alpha", a, b);
  within(back.b, back_d.b, "inverse_clarke b within bound", a, b);
  within(back.c, back_d.c, "inverse_clarke c within bound", a, b);

  const phases<Q> back_p = inverse_clarke_power_invariant(v);
  const phases<double> back_pd = ref::inverse_clarke_power_invariant(vd);
  within(back_p.a, back_pd.a, "inverse_clarke_power_invariant a within bound", a, b);
  within(back_p.b, back_pd.b, "inverse_clarke_power_invariant b within bound", a, b);
  within(back_p.c, back_pd.c, "inverse_clarke_power_invariant c within bound", a, b);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  check_format<15>(in);
  check_format<31>(in);
  return 0;
}
