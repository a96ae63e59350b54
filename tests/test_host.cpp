// Tests for rotorq/host.hpp: conversions between double and q15, q31, turn16, turn32.
//
// The expected values come from exact integer arithmetic on the bits of the double (its integer
// mantissa and power of two, from std::frexp), not from floating-point formulas like the library's:
// a value x = m 2^e converts to round(m 2^(e+F)) by floor division with an explicit remainder test,
// and an angle in degrees to round(m 2^(e+N) / 360) mod 2^N likewise. Radians have no exact integer
// form (pi is irrational), so they are checked against long double with a stated tolerance.
#include "rotorq/host.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <cstring>
#include <iomanip>
#include <limits>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "test_support.hpp"

namespace {

using rotorq::q15;
using rotorq::q31;
using rotorq::turn16;
using rotorq::turn32;

using wide = __int128;  // host-only exact reference for the angle conversions

// Random inputs come from fixed seeds. The output of std::mt19937_64 is fixed by the C++ standard but
// the std distributions are not, so values are cut from the raw bits: the same seed gives the same
// inputs with every standard library.
constexpr uint64_t seed_q31_values = 0x4057001;
constexpr uint64_t seed_q31_ties = 0x4057002;
constexpr uint64_t seed_doubles = 0x4057003;
constexpr uint64_t seed_turn32 = 0x4057004;
constexpr uint64_t seed_angles = 0x4057005;
constexpr uint64_t seed_radians = 0x4057006;

constexpr double infinity = std::numeric_limits<double>::infinity();
constexpr double quiet_nan = std::numeric_limits<double>::quiet_NaN();

// pi and 2 pi to 40 significant digits, from memory; TwoPiConstant checks them against 8 atan(1).
constexpr double pi = 3.141592653589793238462643383279502884197;
constexpr long double two_pi_long = 6.283185307179586476925286766559005768394L;

using rotorq::test::from_wide;
using rotorq::test::max_reported;
using rotorq::test::raw_hex;
using rotorq::test::raw_hi;
using rotorq::test::raw_lo;
using rotorq::test::saturated;

// A double in hex (exact) and in decimal: "0x1.8p-1 (0.75)".
std::string double_text(double x) {
  std::ostringstream text;
  text << std::hexfloat << x << std::defaultfloat << std::setprecision(17) << " (" << x << ")";
  return text.str();
}

template <typename Q>
Q convert(double x) {
  if constexpr (Q::fraction_bits == 15) {
    return rotorq::to_q15(x);
  } else {
    return rotorq::to_q31(x);
  }
}
template <int N>
rotorq::turn<N> from_degrees(double degrees) {
  if constexpr (N == 16) {
    return rotorq::turn16_from_degrees(degrees);
  } else {
    return rotorq::turn32_from_degrees(degrees);
  }
}
template <int N>
rotorq::turn<N> from_radians(double radians) {
  if constexpr (N == 16) {
    return rotorq::turn16_from_radians(radians);
  } else {
    return rotorq::turn32_from_radians(radians);
  }
}

constexpr int64_t turn_steps(int bits) { return int64_t{1} << bits; }

// A finite double as mantissa 2^exponent with an integer mantissa, |mantissa| < 2^53 (and at least
// 2^52 unless the double is 0): std::frexp gives x = f 2^e with 0.5 <= |f| < 1 (the C standard's
// definition of frexp), subnormals included.
struct binary_parts {
  int64_t mantissa;
  int exponent;
};
binary_parts split(double x) {
  int e = 0;
  const double f = std::frexp(x, &e);
  return {static_cast<int64_t>(std::ldexp(f, 53)), e - 53};
}

// floor(n / d) for d > 0: C++ division truncates toward zero, so step down when a negative n leaves
// a remainder.
wide floor_div(wide n, wide d) {
  const wide quotient = n / d;
  return (n % d != 0 && n < 0) ? quotient - 1 : quotient;
}

// The expected raw value of to_q15 / to_q31: x 2^F rounded to nearest, ties toward +infinity (the
// library's rule: common practice, no source), saturated; NaN gives 0.
template <typename Q>
int64_t expected_q(double x) {
  if (std::isnan(x)) return 0;
  if (std::isinf(x)) return x > 0 ? raw_hi<Q> : raw_lo<Q>;
  if (x == 0) return 0;
  const binary_parts p = split(x);
  const int shift = -(p.exponent + Q::fraction_bits);             // x 2^F = mantissa / 2^shift
  if (shift <= 0) return p.mantissa > 0 ? raw_hi<Q> : raw_lo<Q>;  // |x 2^F| >= 2^52
  if (shift > 62) return 0;                                       // |x 2^F| < 2^53 / 2^63 < 1/2
  const wide step = wide{1} << shift;
  const wide quotient = floor_div(p.mantissa, step);
  const wide remainder = p.mantissa - quotient * step;  // in [0, step)
  return saturated<Q>(static_cast<int64_t>(2 * remainder >= step ? quotient + 1 : quotient));
}

// 2^t mod m, by repeated squaring.
wide pow2_mod(int t, wide m) {
  wide result = 1 % m, base = 2 % m;
  for (; t > 0; t >>= 1) {
    if (t & 1) result = result * base % m;
    base = base * base % m;
  }
  return result;
}

// The expected raw value of turnN_from_degrees: floor(degrees 2^N / 360 + 1/2) mod 2^N, and 0 for NaN
// and +-Inf. With degrees = m 2^e and t = e + N + 1 this is floor((m 2^t + 360) / 720) mod 2^N:
//   t >= 0: floor(X / 720) mod 2^N = floor((X mod 720 2^N) / 720), X taken mod 720 2^N (< 2^42);
//   t < 0:  floor((m + 360 2^-t) / (720 2^-t)), a plain floor division.
int64_t expected_turn_from_degrees(double degrees, int bits) {
  if (!std::isfinite(degrees) || degrees == 0) return 0;
  const binary_parts p = split(degrees);
  const int t = p.exponent + bits + 1;
  const wide turn = wide{1} << bits;
  if (t >= 0) {
    const wide modulus = 720 * turn;
    const wide mantissa = ((p.mantissa % modulus) + modulus) % modulus;
    const wide x = (mantissa * pow2_mod(t, modulus) + 360) % modulus;
    return static_cast<int64_t>(x / 720);
  }
  const int s = -t;
  if (s > 100) return 0;  // |m / (720 2^s)| < 2^53 / 2^109: floor(1/2 + that) is 0
  const wide rounded = floor_div(wide{p.mantissa} + (wide{360} << s), wide{720} << s);
  return static_cast<int64_t>(((rounded % turn) + turn) % turn);
}

// ---------------------------------------------------------------------------------------------------
// The references themselves, on values worked by hand, before anything relies on them.

TEST(Reference, WorkedByHand) {
  EXPECT_EQ(expected_q<q15>(0.5), 16384);
  EXPECT_EQ(expected_q<q15>(std::ldexp(1.0, -16)), 1);    // half a step: up
  EXPECT_EQ(expected_q<q15>(-std::ldexp(1.0, -16)), 0);   // minus half a step: up to 0
  EXPECT_EQ(expected_q<q15>(-std::ldexp(3.0, -16)), -1);  // -1.5 steps: up to -1
  EXPECT_EQ(expected_q<q15>(1.0), 32767);
  EXPECT_EQ(expected_q<q31>(-1.0), -2147483648);
  EXPECT_EQ(expected_q<q31>(std::ldexp(1.0, -32)), 1);
  EXPECT_EQ(expected_q<q31>(1e-300), 0);
  EXPECT_EQ(expected_turn_from_degrees(90.0, 16), 16384);
  EXPECT_EQ(expected_turn_from_degrees(-90.0, 16), 49152);
  EXPECT_EQ(expected_turn_from_degrees(3690.0, 32), int64_t{1} << 30);
  EXPECT_EQ(expected_turn_from_degrees(45.0 / 16384, 16), 1);   // half a step: up
  EXPECT_EQ(expected_turn_from_degrees(-45.0 / 16384, 16), 0);  // minus half a step: up to 0
  EXPECT_EQ(expected_turn_from_degrees(359.99, 16), 65534);     // 65534.18 steps
}

// ---------------------------------------------------------------------------------------------------
// double -> q15, q31

TEST(HostQ, SpecialAndOutOfRangeValues) {
  const double tiny = std::numeric_limits<double>::denorm_min();
  const double huge = std::numeric_limits<double>::max();
  const struct {
    double x;
    int64_t q15, q31;  // expected raw values, worked by hand
  } cases[] = {
      {quiet_nan, 0, 0},
      {-quiet_nan, 0, 0},
      {infinity, 32767, 2147483647},
      {-infinity, -32768, -2147483648},
      {0.0, 0, 0},
      {-0.0, 0, 0},
      {1.0, 32767, 2147483647},
      {-1.0, -32768, -2147483648},
      {0.5, 16384, 1073741824},
      {-0.5, -16384, -1073741824},
      {2.0, 32767, 2147483647},
      {-2.0, -32768, -2147483648},
      {1e300, 32767, 2147483647},
      {-1e300, -32768, -2147483648},
      {huge, 32767, 2147483647},
      {-huge, -32768, -2147483648},
      {std::ldexp(1.0, 63), 32767, 2147483647},
      {-std::ldexp(1.0, 64), -32768, -2147483648},
      {tiny, 0, 0},
      {-tiny, 0, 0},
      {std::numeric_limits<double>::min(), 0, 0},
      {std::nextafter(1.0, 0.0), 32767, 2147483647},
      {std::nextafter(1.0, 2.0), 32767, 2147483647},
      {std::nextafter(-1.0, 0.0), -32768, -2147483648},
      {std::nextafter(-1.0, -2.0), -32768, -2147483648},
  };
  for (const auto& t : cases) {
    EXPECT_EQ(raw_hex(rotorq::to_q15(t.x)), raw_hex(t.q15, 16)) << "to_q15 of " << double_text(t.x);
    EXPECT_EQ(raw_hex(rotorq::to_q31(t.x)), raw_hex(t.q31, 32)) << "to_q31 of " << double_text(t.x);
    EXPECT_EQ(expected_q<q15>(t.x), t.q15) << "reference, q15, of " << double_text(t.x);
    EXPECT_EQ(expected_q<q31>(t.x), t.q31) << "reference, q31, of " << double_text(t.x);
  }
}

// Ties round toward +infinity on both sides of zero (worked by hand).
TEST(HostQ, TiesRoundUpAroundZero) {
  const struct {
    double steps;  // the input, in raw steps
    int64_t expected;
  } cases[] = {{0.5, 1},   {-0.5, 0}, {1.5, 2},   {-1.5, -1}, {2.5, 3},
               {-2.5, -2}, {0.25, 0}, {-0.25, 0}, {0.75, 1},  {-0.75, -1}};
  for (const auto& t : cases) {
    const double x15 = std::ldexp(t.steps, -15), x31 = std::ldexp(t.steps, -31);
    EXPECT_EQ(raw_hex(rotorq::to_q15(x15)), raw_hex(t.expected, 16)) << "to_q15 of " << double_text(x15);
    EXPECT_EQ(raw_hex(rotorq::to_q31(x31)), raw_hex(t.expected, 32)) << "to_q31 of " << double_text(x31);
  }
}

// to_double is exact and to_q15 takes it back, for all 65536 values.
TEST(HostQ, EveryQ15ValueRoundTrips) {
  int failures = 0;
  for (int32_t raw = -32768; raw <= 32767; ++raw) {
    const q15 x = q15::from_raw(static_cast<int16_t>(raw));
    const double value = rotorq::to_double(x);
    const double exact = std::ldexp(static_cast<double>(raw), -15);
    const q15 back = rotorq::to_q15(value);
    if (value == exact && back == x) continue;
    EXPECT_EQ(double_text(value), double_text(exact)) << "to_double of " << raw_hex(x);
    EXPECT_EQ(raw_hex(back), raw_hex(x)) << "to_q15(to_double(x)) of " << raw_hex(x);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

TEST(HostQ, Q31ValuesRoundTrip) {
  std::vector<int64_t> raws = {-2147483648, -2147483647, -1, 0, 1, 2147483646, 2147483647};
  for (int k = 1; k < 31; ++k) {
    for (const int64_t v : {int64_t{1} << k, (int64_t{1} << k) - 1, (int64_t{1} << k) + 1}) {
      raws.push_back(v);
      raws.push_back(-v);
    }
  }
  std::mt19937_64 rng(seed_q31_values);
  for (int i = 0; i < 1'000'000; ++i) raws.push_back(static_cast<int64_t>(rng() >> 32) - 2147483648);
  int failures = 0;
  for (const int64_t raw : raws) {
    const q31 x = q31::from_raw(static_cast<int32_t>(raw));
    const double value = rotorq::to_double(x);
    const double exact = std::ldexp(static_cast<double>(raw), -31);
    const q31 back = rotorq::to_q31(value);
    if (value == exact && back == x) continue;
    EXPECT_EQ(double_text(value), double_text(exact)) << "to_double of " << raw_hex(x);
    EXPECT_EQ(raw_hex(back), raw_hex(x)) << "to_q31(to_double(x)) of " << raw_hex(x);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// The rounding boundary between steps k and k + 1 is the tie (k + 1/2) 2^-F, exact in double: it and
// the double above it give k + 1, the double below it gives k (all saturated). Checked against that
// construction and against the exact reference.
template <typename Q>
void check_boundary(int64_t k, int& failures) {
  const double tie = std::ldexp(static_cast<double>(2 * k + 1), -(Q::fraction_bits + 1));
  const struct {
    const char* where;
    double x;
    int64_t expected;
  } points[] = {{"below the tie", std::nextafter(tie, -infinity), saturated<Q>(k)},
                {"at the tie", tie, saturated<Q>(k + 1)},
                {"above the tie", std::nextafter(tie, infinity), saturated<Q>(k + 1)}};
  for (const auto& p : points) {
    const Q actual = convert<Q>(p.x);
    const int64_t reference = expected_q<Q>(p.x);
    if (actual.raw() == p.expected && reference == p.expected) continue;
    EXPECT_EQ(raw_hex(actual), raw_hex(p.expected, Q::fraction_bits + 1))
        << p.where << " between steps " << k << " and " << k + 1 << ": " << double_text(p.x);
    EXPECT_EQ(reference, p.expected) << "reference, " << p.where << ", " << double_text(p.x);
    ++failures;
  }
}

TEST(HostQ, Q15RoundingBoundaries) {
  int failures = 0;
  for (int64_t k = -32769; k <= 32767; ++k) {
    check_boundary<q15>(k, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

TEST(HostQ, Q31RoundingBoundaries) {
  std::vector<int64_t> ks = {-2147483649, -2147483648, -2147483647, -2,         -1,
                             0,           1,           2147483645,  2147483646, 2147483647};
  std::mt19937_64 rng(seed_q31_ties);
  for (int i = 0; i < 200'000; ++i) ks.push_back(static_cast<int64_t>(rng() >> 32) - 2147483648);
  int failures = 0;
  for (const int64_t k : ks) {
    check_boundary<q31>(k, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// Random doubles against the exact reference: uniform in [-1.25, 1.25) with all 53 bits set at
// random, small magnitudes 2^-40 .. 2^0, and random bit patterns (any finite double).
std::vector<double> random_doubles() {
  std::vector<double> values;
  std::mt19937_64 rng(seed_doubles);
  for (int i = 0; i < 300'000; ++i) {
    const double unit = std::ldexp(static_cast<double>(rng() >> 11), -53);  // [0, 1)
    values.push_back(2.5 * unit - 1.25);
    const int scale = -static_cast<int>(rng() % 41);
    values.push_back((rng() % 2 == 0 ? 1.0 : -1.0) * std::ldexp(1.0 + unit, scale));
    const uint64_t bits = rng();
    double pattern = 0;
    std::memcpy(&pattern, &bits, sizeof pattern);
    if (std::isfinite(pattern)) values.push_back(pattern);
  }
  return values;
}

TEST(HostQ, RandomDoublesAgainstExactReference) {
  int failures = 0;
  for (const double x : random_doubles()) {
    const int64_t actual15 = rotorq::to_q15(x).raw(), expected15 = expected_q<q15>(x);
    const int64_t actual31 = rotorq::to_q31(x).raw(), expected31 = expected_q<q31>(x);
    if (actual15 == expected15 && actual31 == expected31) continue;
    EXPECT_EQ(raw_hex(actual15, 16), raw_hex(expected15, 16)) << "to_q15 of " << double_text(x);
    EXPECT_EQ(raw_hex(actual31, 32), raw_hex(expected31, 32)) << "to_q31 of " << double_text(x);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// ---------------------------------------------------------------------------------------------------
// degrees and radians -> turn16, turn32

TEST(HostTurn, NamedDegrees) {
  // Expected angle as a fraction of a turn, numerator over 16 (worked by hand).
  const struct {
    double degrees;
    int64_t sixteenths;
  } cases[] = {
      {0.0, 0},          {-0.0, 0},           {90.0, 4},      {180.0, 8},         {270.0, 12},
      {360.0, 0},        {-90.0, 12},         {-180.0, 8},    {-270.0, 4},        {-360.0, 0},
      {720.0, 0},        {22.5, 1},           {-22.5, 15},    {3600.0 + 90.0, 4}, {-3600.0 - 90.0, 12},
      {360e6 + 90.0, 4}, {-360e6 - 90.0, 12}, {1e-300, 0},    {-1e-300, 0},       {quiet_nan, 0},
      {-quiet_nan, 0},   {infinity, 0},       {-infinity, 0},
  };
  for (const auto& t : cases) {
    const int64_t expected16 = t.sixteenths * 4096, expected32 = t.sixteenths * (int64_t{1} << 28);
    EXPECT_EQ(raw_hex(rotorq::turn16_from_degrees(t.degrees)), raw_hex(expected16, 16))
        << "turn16_from_degrees of " << double_text(t.degrees);
    EXPECT_EQ(raw_hex(rotorq::turn32_from_degrees(t.degrees)), raw_hex(expected32, 32))
        << "turn32_from_degrees of " << double_text(t.degrees);
    EXPECT_EQ(expected_turn_from_degrees(t.degrees, 16), expected16)
        << "reference of " << double_text(t.degrees);
    EXPECT_EQ(expected_turn_from_degrees(t.degrees, 32), expected32)
        << "reference of " << double_text(t.degrees);
  }
}

TEST(HostTurn, NamedRadians) {
  // Each double below is within a few units in the last place of the named angle, far less than
  // a turn32 step (1.5e-9 rad), so the expected value is the named angle's (worked by hand).
  const struct {
    double radians;
    int64_t sixteenths;
  } cases[] = {
      {0.0, 0},       {pi / 2, 4},           {pi, 8},
      {1.5 * pi, 12}, {2 * pi, 0},           {-pi / 2, 12},
      {-pi, 8},       {-1.5 * pi, 4},        {-2 * pi, 0},
      {pi / 8, 1},    {20 * pi + pi / 2, 4}, {-(20 * pi + pi / 2), 12},
      {4 * pi, 0},    {quiet_nan, 0},        {infinity, 0},
      {-infinity, 0},
  };
  for (const auto& t : cases) {
    const int64_t expected16 = t.sixteenths * 4096, expected32 = t.sixteenths * (int64_t{1} << 28);
    EXPECT_EQ(raw_hex(rotorq::turn16_from_radians(t.radians)), raw_hex(expected16, 16))
        << "turn16_from_radians of " << double_text(t.radians);
    EXPECT_EQ(raw_hex(rotorq::turn32_from_radians(t.radians)), raw_hex(expected32, 32))
        << "turn32_from_radians of " << double_text(t.radians);
  }
}

// The degrees at raw step k are k 360 / 2^N = k 45 / 2^(N-3), exact in double, and the tie between
// steps k and k + 1 is (2k + 1) 45 / 2^(N-2), also exact. Checks at each: the step itself, the tie and
// its two neighbouring doubles, all against the exact reference, and the step and the tie also
// against the construction (k, and k + 1 mod 2^N). With `sign` = -1 the same angles are negated.
template <int N>
void check_degree_steps(const std::vector<int64_t>& ks, double sign, double offset, int& failures) {
  const int64_t turn = turn_steps(N);
  for (const int64_t k : ks) {
    const double at_step = sign * std::ldexp(static_cast<double>(45 * k), -(N - 3)) + offset;
    const double tie = sign * std::ldexp(static_cast<double>(45 * (2 * k + 1)), -(N - 2)) + offset;
    const int64_t step_expected = ((sign > 0 ? k : -k) % turn + turn) % turn;
    // A positive tie rounds up to k + 1; a negative one, -k - 1/2 steps, rounds up to -k.
    const int64_t tie_expected = ((sign > 0 ? k + 1 : -k) % turn + turn) % turn;
    const struct {
      const char* where;
      double degrees;
      int64_t constructed;  // -1: only the reference
    } points[] = {{"at the step", at_step, step_expected},
                  {"at the tie", tie, tie_expected},
                  {"below the tie", std::nextafter(tie, -infinity), -1},
                  {"above the tie", std::nextafter(tie, infinity), -1}};
    for (const auto& p : points) {
      const int64_t actual = from_degrees<N>(p.degrees).raw();
      const int64_t reference = expected_turn_from_degrees(p.degrees, N);
      const bool constructed_ok = p.constructed < 0 || reference == p.constructed;
      if (actual == reference && constructed_ok) continue;
      EXPECT_EQ(raw_hex(actual, N), raw_hex(reference, N))
          << "turn" << N << "_from_degrees " << p.where << " of step " << k << ": " << double_text(p.degrees);
      EXPECT_TRUE(constructed_ok) << "reference " << raw_hex(reference, N) << " for "
                                  << double_text(p.degrees);
      if (++failures >= max_reported) return;
    }
  }
}

std::vector<int64_t> every_turn16_step() {
  std::vector<int64_t> ks;
  for (int64_t k = 0; k < 65536; ++k) ks.push_back(k);
  return ks;
}

std::vector<int64_t> turn32_steps() {
  std::vector<int64_t> ks = {0,
                             1,
                             2,
                             (int64_t{1} << 30) - 1,
                             int64_t{1} << 30,
                             int64_t{1} << 31,
                             (int64_t{1} << 31) + 1,
                             (int64_t{3} << 30),
                             (int64_t{1} << 32) - 2,
                             (int64_t{1} << 32) - 1};
  std::mt19937_64 rng(seed_turn32);
  for (int i = 0; i < 100'000; ++i) ks.push_back(static_cast<int64_t>(rng() >> 32));
  return ks;
}

TEST(HostTurn, Turn16EveryStepAndTieInDegrees) {
  int failures = 0;
  // Large offsets are whole turns; at 360e6 degrees the sum still needs only 42 bits, so it is exact.
  for (const double offset : {0.0, 360.0, 3600.0, 360e6}) {
    check_degree_steps<16>(every_turn16_step(), 1.0, offset, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

TEST(HostTurn, Turn32StepsAndTiesInDegrees) {
  int failures = 0;
  for (const double offset : {0.0, 720.0}) {
    check_degree_steps<32>(turn32_steps(), 1.0, offset, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// Negative angles: the same steps and ties, negated. A reduction into [0, 360) that adds 360 in double
// rounds the doubles next to a small negative tie, so these are the inputs that tell whether the
// reduction is exact.
TEST(HostTurn, Turn16EveryStepAndTieInNegativeDegrees) {
  int failures = 0;
  for (const double offset : {0.0, -3600.0}) {
    check_degree_steps<16>(every_turn16_step(), -1.0, offset, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

TEST(HostTurn, Turn32StepsAndTiesInNegativeDegrees) {
  int failures = 0;
  check_degree_steps<32>(turn32_steps(), -1.0, 0.0, failures);
  ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
}

// Random angles against the exact reference: uniform in [-1e4, 1e4) degrees, small magnitudes, and
// random bit patterns (any finite double, up to 1.8e308 degrees).
TEST(HostTurn, RandomDegreesAgainstExactReference) {
  std::vector<double> angles;
  std::mt19937_64 rng(seed_angles);
  for (int i = 0; i < 100'000; ++i) {
    const double unit = std::ldexp(static_cast<double>(rng() >> 11), -53);
    angles.push_back(2e4 * unit - 1e4);
    angles.push_back((rng() % 2 == 0 ? 1.0 : -1.0) * std::ldexp(1.0 + unit, -static_cast<int>(rng() % 40)));
    const uint64_t bits = rng();
    double pattern = 0;
    std::memcpy(&pattern, &bits, sizeof pattern);
    if (std::isfinite(pattern)) angles.push_back(pattern);
  }
  int failures = 0;
  for (const double degrees : angles) {
    const int64_t actual16 = rotorq::turn16_from_degrees(degrees).raw();
    const int64_t actual32 = rotorq::turn32_from_degrees(degrees).raw();
    const int64_t expected16 = expected_turn_from_degrees(degrees, 16);
    const int64_t expected32 = expected_turn_from_degrees(degrees, 32);
    if (actual16 == expected16 && actual32 == expected32) continue;
    EXPECT_EQ(raw_hex(actual16, 16), raw_hex(expected16, 16))
        << "turn16_from_degrees of " << double_text(degrees);
    EXPECT_EQ(raw_hex(actual32, 32), raw_hex(expected32, 32))
        << "turn32_from_degrees of " << double_text(degrees);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// Radians against long double: steps = radians 2^N / (2 pi) mod 2^N. The library reduces by the
// double nearest 2 pi, which is 2.4e-16 short; for |radians| <= 1e4 that, the double roundings and
// the long double reference together stay below 3e-4 of a turn32 step. So: the nearest step, except
// within 1e-3 of a step of a tie, where either neighbour is accepted.
struct radian_expectation {
  int64_t lower, upper;  // both acceptable when near a tie; otherwise lower == upper
};
radian_expectation expected_turn_from_radians(double radians, int bits) {
  const long double turn = std::ldexp(1.0L, bits);
  long double steps = std::fmod(static_cast<long double>(radians) / two_pi_long * turn, turn);
  if (steps < 0) steps += turn;
  const long double below = std::floor(steps);
  const long double fraction = steps - below;
  const int64_t m = turn_steps(bits);
  const int64_t low = static_cast<int64_t>(below) % m, high = (low + 1) % m;
  if (std::fabs(fraction - 0.5L) < 1e-3L) return {low, high};
  return fraction < 0.5L ? radian_expectation{low, low} : radian_expectation{high, high};
}

template <int N>
void check_radians(double radians, int& failures) {
  const int64_t actual = from_radians<N>(radians).raw();
  const radian_expectation expected = expected_turn_from_radians(radians, N);
  if (actual == expected.lower || actual == expected.upper) return;
  EXPECT_EQ(raw_hex(actual, N), raw_hex(expected.lower, N))
      << "turn" << N << "_from_radians of " << double_text(radians)
      << (expected.lower != expected.upper ? " (or the step above)" : "");
  ++failures;
}

TEST(HostTurn, RadiansAgainstLongDouble) {
  if (std::numeric_limits<long double>::digits < 64) GTEST_SKIP() << "needs a long double of 64 bits or more";
  std::mt19937_64 rng(seed_radians);
  int failures = 0;
  for (int i = 0; i < 200'000; ++i) {
    const double unit = std::ldexp(static_cast<double>(rng() >> 11), -53);
    const double radians =
        i % 2 == 0 ? 2e4 * unit - 1e4
                   : (rng() % 2 == 0 ? 1.0 : -1.0) * std::ldexp(1.0 + unit, -static_cast<int>(rng() % 40));
    check_radians<16>(radians, failures);
    check_radians<32>(radians, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// ---------------------------------------------------------------------------------------------------
// turn16, turn32 -> turns, degrees, radians

// The reference constants, checked against the standard library's atan (8 atan(1) = 2 pi).
TEST(HostTurn, TwoPiConstant) {
  if (std::numeric_limits<long double>::digits < 64) GTEST_SKIP() << "needs a long double of 64 bits or more";
  const long double from_atan = 8 * std::atan(1.0L);
  EXPECT_LE(std::fabs(from_atan - two_pi_long), 4 * std::numeric_limits<long double>::epsilon());
  EXPECT_EQ(pi, static_cast<double>(from_atan / 2));
}

// to_turns and to_degrees are exact: k / 2^N and k 45 / 2^(N-3), both exact in double. to_radians
// is within one rounding: within half a unit in the last place (plus the 2.4e-16 by which the double
// 2 pi falls short, scaled) of k 2 pi / 2^N. All lie in [0, 1), [0, 360), [0, 2 pi).
template <int N>
void check_to_double(int64_t k, int& failures) {
  using raw_type = typename rotorq::turn<N>::raw_type;
  const rotorq::turn<N> t = rotorq::turn<N>::from_raw(static_cast<raw_type>(k));
  const double turns = rotorq::to_turns(t), degrees = rotorq::to_degrees(t), radians = rotorq::to_radians(t);
  const double exact_turns = std::ldexp(static_cast<double>(k), -N);
  const double exact_degrees = std::ldexp(static_cast<double>(45 * k), -(N - 3));
  const long double exact_radians = static_cast<long double>(k) * two_pi_long / std::ldexp(1.0L, N);
  const long double radian_error = std::fabs(static_cast<long double>(radians) - exact_radians);
  const long double radian_bound =
      0.5L * (std::nextafter(radians, infinity) - radians) + 3e-16L * exact_turns;
  const bool ok = turns == exact_turns && degrees == exact_degrees && radian_error <= radian_bound &&
                  turns >= 0 && turns < 1 && degrees >= 0 && degrees < 360 && radians >= 0 &&
                  radians < 2 * pi;
  if (ok) return;
  EXPECT_EQ(double_text(turns), double_text(exact_turns)) << "to_turns of " << raw_hex(t);
  EXPECT_EQ(double_text(degrees), double_text(exact_degrees)) << "to_degrees of " << raw_hex(t);
  EXPECT_LE(radian_error, radian_bound) << "to_radians of " << raw_hex(t) << " = " << double_text(radians);
  EXPECT_LT(degrees, 360.0) << "to_degrees of " << raw_hex(t);
  EXPECT_LT(radians, 2 * pi) << "to_radians of " << raw_hex(t);
  ++failures;
}

TEST(HostTurn, ToTurnsDegreesRadians) {
  if (std::numeric_limits<long double>::digits < 64) GTEST_SKIP() << "needs a long double of 64 bits or more";
  int failures = 0;
  for (const int64_t k : every_turn16_step()) {
    check_to_double<16>(k, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
  for (const int64_t k : turn32_steps()) {
    check_to_double<32>(k, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
  EXPECT_EQ(rotorq::to_degrees(turn16::from_raw(16384)), 90.0);
  EXPECT_EQ(rotorq::to_degrees(turn32::from_raw(0xc0000000u)), 270.0);
  EXPECT_LT(rotorq::to_degrees(turn32::from_raw(0xffffffffu)), 360.0);
  EXPECT_LT(rotorq::to_radians(turn32::from_raw(0xffffffffu)), 2 * pi);
}

// turn -> double -> turn gives the same angle, through degrees and through radians.
template <int N>
void check_round_trip(int64_t k, int& failures) {
  using raw_type = typename rotorq::turn<N>::raw_type;
  const rotorq::turn<N> t = rotorq::turn<N>::from_raw(static_cast<raw_type>(k));
  const rotorq::turn<N> via_degrees = from_degrees<N>(rotorq::to_degrees(t));
  const rotorq::turn<N> via_radians = from_radians<N>(rotorq::to_radians(t));
  if (via_degrees == t && via_radians == t) return;
  EXPECT_EQ(raw_hex(via_degrees), raw_hex(t)) << "through degrees: " << double_text(rotorq::to_degrees(t));
  EXPECT_EQ(raw_hex(via_radians), raw_hex(t)) << "through radians: " << double_text(rotorq::to_radians(t));
  ++failures;
}

TEST(HostTurn, RoundTrips) {
  int failures = 0;
  for (const int64_t k : every_turn16_step()) {
    check_round_trip<16>(k, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
  for (const int64_t k : turn32_steps()) {
    check_round_trip<32>(k, failures);
    ASSERT_LT(failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

}  // namespace
