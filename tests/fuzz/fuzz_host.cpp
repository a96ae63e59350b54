// Fuzz target: the host conversions (rotorq/host.hpp) on doubles made from raw input bytes, so NaNs
// (every payload), infinities, subnormals and huge values all occur. Checks: no sanitizer report
// (in particular no out-of-range float-to-integer conversion); to_q15/to_q31 give 0 for NaN, max for
// +Inf, min for -Inf, and otherwise the nearest step (ties toward +infinity) saturated, computed here
// in long double (64-bit significand: x 2^F + 1/2 is exact for every double that does not saturate);
// to_double is exact and converts back to the same value; the angle conversions give 0 for NaN and
// +-Inf, and otherwise within one step of the long-double value of x / period modulo one turn (the
// library divides in double once); to_turns, to_degrees, to_radians lie in [0, 1), [0, 360), [0, 2 pi).
#include <cmath>
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/host.hpp"

namespace {

using namespace rotorq;
using fuzz::check;

int64_t bits_of(double x) {
  int64_t bits = 0;
  std::memcpy(&bits, &x, sizeof bits);
  return bits;
}

template <int F>
int64_t expected_fixed(double x) {
  if (std::isnan(x)) return 0;
  const long double scaled = std::ldexp(static_cast<long double>(x), F);
  if (scaled >= static_cast<long double>(fixed<F>::raw_max)) return fixed<F>::raw_max;
  if (scaled <= static_cast<long double>(fixed<F>::raw_min)) return fixed<F>::raw_min;
  return static_cast<int64_t>(std::floor(scaled + 0.5L));
}

template <int N>
void check_angle(turn<N> got, double x, long double period, const char* what) {
  if (!std::isfinite(x)) {
    check(got.raw() == 0, what, bits_of(x));
    return;
  }
  const long double one_turn = std::ldexp(1.0L, N);
  // fmod is exact; the division and scaling carry 64 bits, far more than the one step allowed
  const long double steps = std::ldexp(std::fmod(static_cast<long double>(x), period) / period, N);
  long double distance = std::fmod(std::fabs(steps - static_cast<long double>(got.raw())), one_turn);
  distance = std::fmin(distance, one_turn - distance);
  check(distance <= 1.0L, what, bits_of(x), static_cast<int64_t>(got.raw()));
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  const double x = in.take<double>();
  const int64_t bits = bits_of(x);

  const q15 a = to_q15(x);
  const q31 b = to_q31(x);
  check(a.raw() == expected_fixed<15>(x), "to_q15(double): nearest, ties up, saturated, NaN -> 0", bits);
  check(b.raw() == expected_fixed<31>(x), "to_q31(double): nearest, ties up, saturated, NaN -> 0", bits);
  check(to_q15(to_double(a)) == a && to_q31(to_double(b)) == b, "to_double is exact and converts back", bits);
  check(std::ldexp(to_double(b), 31) == static_cast<double>(b.raw()), "to_double(q31) is raw / 2^31", bits);

  // host.hpp reduces radians modulo the double nearest 2 pi, not 2 pi itself (2.4e-16 apart; for
  // |x| <= 1e4 that moves the result by less than 3e-4 of a turn32 step, test_host.cpp checks that
  // range against the true 2 pi); far beyond that range only the reduction by this period is defined,
  // so it is the reference here.
  const long double two_pi = static_cast<long double>(6.283185307179586476925286766559);
  check_angle(turn16_from_degrees(x), x, 360.0L, "turn16_from_degrees within one step");
  check_angle(turn32_from_degrees(x), x, 360.0L, "turn32_from_degrees within one step");
  check_angle(turn16_from_radians(x), x, two_pi, "turn16_from_radians within one step");
  check_angle(turn32_from_radians(x), x, two_pi, "turn32_from_radians within one step");

  const turn32 t = turn32::from_raw(in.take<uint32_t>());
  const double turns = to_turns(t), degrees = to_degrees(t), radians = to_radians(t);
  const auto raw = static_cast<int64_t>(t.raw());
  check(turns >= 0.0 && turns < 1.0, "to_turns in [0, 1)", raw);
  check(degrees >= 0.0 && degrees < 360.0, "to_degrees in [0, 360)", raw);
  check(radians >= 0.0 && radians < 6.283185307179586, "to_radians in [0, 2 pi)", raw);
  check(turn32_from_degrees(degrees) == t, "turn32_from_degrees(to_degrees(t)) == t", raw);
  return 0;
}
