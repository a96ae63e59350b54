// Fuzz target: q15 and q31 arithmetic (rotorq/fixed.hpp) on raw input bytes.
// Each input is three raw values per format. Checks, for every operation: no sanitizer report; the
// result equals the specified rule computed independently with 128-bit integers (exact, then rounded
// to nearest with ties toward +infinity, then saturated); and it lies within the documented bound of
// the double twin (rotorq::ref): 0 LSB for + - -x abs (exact, clamped), 0.5 LSB for * and mul_add
// (plus 2^-20 LSB for q31, where the double product itself rounds, host_sim/reference fixed.hpp).
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/fixed.hpp"

namespace {

using namespace rotorq;
using fuzz::check;
using fuzz::lsb_error;
using fuzz::round_clamp;
using fuzz::wide;

template <int F>
void check_format(fuzz::byte_reader& in) {
  using Q = fixed<F>;
  const Q a = fuzz::take_fixed<F>(in), b = fuzz::take_fixed<F>(in), c = fuzz::take_fixed<F>(in);
  const wide ra = a.raw(), rb = b.raw(), rc = c.raw();
  const double da = to_double(a), db = to_double(b), dc = to_double(c);
  // the double twin's own rounding, in LSB (exact for q15)
  const double slack = F == 15 ? 0.0 : 1.0 / 1048576.0;

  // exact, then saturated: a shift by 0 with rounding is the identity, so round_clamp(n, 1) of 2n
  const Q sum = a + b, difference = a - b, negated = -a, magnitude = abs(a);
  check(sum.raw() == round_clamp<F>(2 * (ra + rb), 1), "a + b saturates the exact sum", a.raw(), b.raw());
  check(difference.raw() == round_clamp<F>(2 * (ra - rb), 1), "a - b saturates the exact difference", a.raw(),
        b.raw());
  check(negated.raw() == round_clamp<F>(-2 * ra, 1), "-a saturates", a.raw());
  check(magnitude.raw() == round_clamp<F>(2 * (ra < 0 ? -ra : ra), 1), "abs(a) saturates", a.raw());
  check(magnitude.raw() >= 0, "abs(a) >= 0", a.raw());
  check(lsb_error(sum, ref::add(da, db)) == 0.0, "a + b vs ref::add", a.raw(), b.raw());
  check(lsb_error(difference, ref::subtract(da, db)) == 0.0, "a - b vs ref::subtract", a.raw(), b.raw());
  check(lsb_error(negated, ref::negate(da)) == 0.0, "-a vs ref::negate", a.raw());

  const Q product = a * b;
  check(product.raw() == round_clamp<F>(ra * rb, F), "a * b rounds half up and saturates", a.raw(), b.raw());
  check(std::fabs(lsb_error(product, ref::multiply(da, db))) <= 0.5 + slack, "a * b within 0.5 LSB of ref",
        a.raw(), b.raw());
  // multiplication commutes and the compound assignment is the same operation
  Q compound = b;
  compound *= a;
  check(compound == product && b * a == product, "a * b == b * a == (b *= a)", a.raw(), b.raw());

  const Q fused = mul_add(a, b, c);
  check(fused.raw() == round_clamp<F>(ra * rb + rc * (static_cast<wide>(1) << F), F),
        "mul_add rounds once and saturates", a.raw(), b.raw(), c.raw());
  // the twin's a*b + c rounds twice in double: 2^-20 LSB covers both for q31, exact for q15
  check(std::fabs(lsb_error(fused, ref::mul_add(da, db, dc))) <= 0.5 + 2 * slack,
        "mul_add within 0.5 LSB of ref", a.raw(), b.raw(), c.raw());

  if constexpr (F == 15) {
    const q31 widened = to_q31(a);
    check(widened.raw() == int64_t{a.raw()} * 65536, "to_q31(q15) is exact", a.raw());
    check(to_q15(widened) == a, "to_q15(to_q31(x)) == x", a.raw());
  } else {
    const q15 narrowed = to_q15(a);
    check(narrowed.raw() == round_clamp<15>(ra, 16), "to_q15(q31) rounds half up and saturates", a.raw());
    check(std::fabs(lsb_error(narrowed, da)) <= 0.5, "to_q15(q31) within 0.5 LSB", a.raw());
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  check_format<15>(in);
  check_format<31>(in);
  return 0;
}
