// Fuzz target: sin_cos(turn16) and sin_cos(turn32) (rotorq/sin_cos.hpp) on raw input bytes.
// Checks against the double twin rotorq::ref::sin_cos (itself checked against MPFR in
// tests/test_reference.cpp), with the bounds of sin_cos.hpp: q15 within 0.51 LSB, except where the
// exact value is above (2^15 - 0.5) / 2^15, where the result must be 32767 (within 1 LSB); q31 within
// 2 LSB of the exact value clamped to the range. Also: the symmetries that hold exactly for the
// library's quadrant folding (a quarter turn swaps and negates; common practice, no source).
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/sin_cos.hpp"
#include "rotorq/sin_cos.hpp"

namespace {

using namespace rotorq;
using fuzz::check;
using fuzz::lsb_error;

template <int F>
void check_component(fixed<F> got, double exact, int64_t angle, const char* what) {
  const double error = std::fabs(lsb_error(got, exact));
  if constexpr (F == 15) {
    if (std::ldexp(exact, 15) > 32767.5) {
      check(got.raw() == 32767 && error <= 1.0, what, angle, got.raw());
      return;
    }
    check(error <= 0.51, what, angle, got.raw());
  } else {
    check(error <= 2.0, what, angle, got.raw());
  }
}

template <int N, int F>
void check_angle(turn<N> angle) {
  const sin_cos_pair<fixed<F>> got = sin_cos(angle);
  const sin_cos_pair<double> exact = ref::sin_cos(angle);
  const auto raw = static_cast<int64_t>(angle.raw());
  check_component(got.sin, exact.sin, raw,
                  F == 15 ? "sin_cos q15: sin within bound" : "sin_cos q31: sin within bound");
  check_component(got.cos, exact.cos, raw,
                  F == 15 ? "sin_cos q15: cos within bound" : "sin_cos q31: cos within bound");
  // A quarter turn ahead: sin(x + 90) = cos x exactly (the same rounded value, folded), and
  // cos(x + 90) = -sin x within 1 LSB (the negation happens before the rounding, which is not
  // symmetric at ties, and before saturation of the peak).
  const sin_cos_pair<fixed<F>> ahead =
      sin_cos(angle + turn<N>::from_raw(static_cast<typename turn<N>::raw_type>(uint64_t{1} << (N - 2))));
  check(ahead.sin == got.cos, "sin(x + quarter) == cos x", raw);
  const int64_t opposite = int64_t{ahead.cos.raw()} + int64_t{got.sin.raw()};
  check(opposite >= -1 && opposite <= 1, "cos(x + quarter) within 1 LSB of -sin x", raw);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  check_angle<16, 15>(turn16::from_raw(in.take<uint16_t>()));
  check_angle<32, 31>(turn32::from_raw(in.take<uint32_t>()));
  return 0;
}
