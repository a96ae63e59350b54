// Bad input: every row of the contract table in README.md ("## Contracts") at the edges of its input
// range and beyond. Each test names its row (F1 ... H4) in its name and in a SCOPED_TRACE, so a
// failure says which promise broke. The expected values are worked by hand from the rules in the
// table and the header comments (common practice, no source, unless a comment says otherwise); this
// suite runs under the sanitizer preset too, so "defined result, no undefined behaviour" is checked
// by UBSan as well as by the values.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <iomanip>
#include <limits>
#include <sstream>
#include <string>

#include "rotorq/host.hpp"
#include "rotorq/rotorq.hpp"

namespace {

using namespace rotorq;

constexpr double inf = std::numeric_limits<double>::infinity();
constexpr double quiet_nan = std::numeric_limits<double>::quiet_NaN();
constexpr double signalling_nan = std::numeric_limits<double>::signaling_NaN();

// "0x8000 (-32768)": a raw value as two's-complement hex of its format's width and in decimal.
std::string raw_hex(int64_t raw, int bits) {
  const uint64_t mask = bits >= 64 ? ~uint64_t{0} : (uint64_t{1} << bits) - 1;
  std::ostringstream text;
  text << "0x" << std::hex << (static_cast<uint64_t>(raw) & mask) << std::dec << " (" << raw << ")";
  return text.str();
}
template <int F>
std::string raw_hex(fixed<F> x) {
  return raw_hex(x.raw(), F + 1);
}
template <int N>
std::string raw_hex(turn<N> t) {
  return raw_hex(static_cast<int64_t>(t.raw()), N);
}
template <int F>
std::string want(int64_t raw) {
  return raw_hex(raw, F + 1);
}

template <int F>
struct limits {
  static constexpr int64_t max = fixed<F>::raw_max;
  static constexpr int64_t min = fixed<F>::raw_min;
};

// ---- fixed.hpp -------------------------------------------------------------------------------------

template <int F>
void check_raw_access() {
  using Q = fixed<F>;
  EXPECT_EQ(raw_hex(Q::from_raw(static_cast<typename Q::raw_type>(limits<F>::min))), want<F>(limits<F>::min));
  EXPECT_EQ(raw_hex(Q::max()), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(Q::saturate(detail::int64_min)), want<F>(limits<F>::min));
  EXPECT_EQ(raw_hex(Q::saturate(detail::int64_max)), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(Q::saturate(limits<F>::max + 1)), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(Q::saturate(limits<F>::min)), want<F>(limits<F>::min));  // in range: unchanged
}
TEST(BadInput, F1_RawAccessAndSaturateTakeAnyValue) {
  SCOPED_TRACE("contract row F1: from_raw / raw() / saturate(int64)");
  check_raw_access<15>();
  check_raw_access<31>();
}

template <int F>
void check_add_subtract() {
  using Q = fixed<F>;
  EXPECT_EQ(raw_hex(Q::max() + Q::max()), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(Q::min() + Q::min()), want<F>(limits<F>::min));
  EXPECT_EQ(raw_hex(Q::min() - Q::max()), want<F>(limits<F>::min));
  EXPECT_EQ(raw_hex(Q::max() - Q::min()), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(Q::max() + Q::min()), want<F>(-1));  // in range: exact
  Q x = Q::max();
  x += Q::from_raw(1);
  EXPECT_EQ(raw_hex(x), want<F>(limits<F>::max));
  x = Q::min();
  x -= Q::from_raw(1);
  EXPECT_EQ(raw_hex(x), want<F>(limits<F>::min));
}
TEST(BadInput, F2_AddAndSubtractSaturate) {
  SCOPED_TRACE("contract row F2: a + b, a - b, +=, -=");
  check_add_subtract<15>();
  check_add_subtract<31>();
}

template <int F>
void check_negate_abs() {
  using Q = fixed<F>;
  EXPECT_EQ(raw_hex(-Q::min()), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(abs(Q::min())), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(-Q::max()), want<F>(-limits<F>::max));
  EXPECT_EQ(raw_hex(abs(Q::from_raw(-1))), want<F>(1));
}
TEST(BadInput, F3_NegateAndAbsOfMinusOneGiveMax) {
  SCOPED_TRACE("contract row F3: -a, abs(a)");
  check_negate_abs<15>();
  check_negate_abs<31>();
}

template <int F>
void check_multiply_corners() {
  using Q = fixed<F>;
  EXPECT_EQ(raw_hex(Q::min() * Q::min()), want<F>(limits<F>::max));   // +1 is not representable
  EXPECT_EQ(raw_hex(Q::min() * Q::max()), want<F>(-limits<F>::max));  // exact: -(1 - 2^-F)
  EXPECT_EQ(raw_hex(Q::max() * Q::max()), want<F>(limits<F>::max - 1));
  // ties round toward +infinity: 1 LSB * 1/2 is +1/2 LSB -> 1, -1 LSB * 1/2 is -1/2 LSB -> 0
  const Q half = Q::from_raw(static_cast<typename Q::raw_type>(int64_t{1} << (F - 1)));
  EXPECT_EQ(raw_hex(Q::from_raw(1) * half), want<F>(1));
  EXPECT_EQ(raw_hex(Q::from_raw(-1) * half), want<F>(0));
  Q x = Q::min();
  x *= Q::min();
  EXPECT_EQ(raw_hex(x), want<F>(limits<F>::max));
}
TEST(BadInput, F4_MultiplyOfMinusOneCornersSaturatesAndTiesRoundUp) {
  SCOPED_TRACE("contract row F4: a * b, *=");
  check_multiply_corners<15>();
  check_multiply_corners<31>();
}

template <int F>
void check_mul_add_corners() {
  using Q = fixed<F>;
  EXPECT_EQ(raw_hex(mul_add(Q::min(), Q::min(), Q::zero())), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(mul_add(Q::min(), Q::min(), Q::max())), want<F>(limits<F>::max));
  // (-1)(-1) + (-1) = 0 exactly: the product is not saturated before the sum (one rounding)
  EXPECT_EQ(raw_hex(mul_add(Q::min(), Q::min(), Q::min())), want<F>(0));
  EXPECT_EQ(raw_hex(mul_add(Q::min(), Q::max(), Q::min())), want<F>(limits<F>::min));
}
TEST(BadInput, F5_MulAddSaturatesOnlyAtTheEnd) {
  SCOPED_TRACE("contract row F5: mul_add(a, b, c)");
  check_mul_add_corners<15>();
  check_mul_add_corners<31>();
}

TEST(BadInput, F6_FormatConversionsSaturateAtTheTop) {
  SCOPED_TRACE("contract row F6: to_q31(q15), to_q15(q31)");
  EXPECT_EQ(raw_hex(to_q31(q15::min())), want<31>(limits<31>::min));
  EXPECT_EQ(raw_hex(to_q31(q15::max())), want<31>(0x7fff0000));
  // q31 max is 1 - 2^-31: nearest q15 is 1, not representable, so max
  EXPECT_EQ(raw_hex(to_q15(q31::max())), want<15>(limits<15>::max));
  EXPECT_EQ(raw_hex(to_q15(q31::min())), want<15>(limits<15>::min));
  EXPECT_EQ(raw_hex(to_q15(q31::from_raw(0x7fff7fff))), want<15>(0x7fff));  // below the tie
  EXPECT_EQ(raw_hex(to_q15(q31::from_raw(-0x8000))), want<15>(0));          // tie, rounds up
}

TEST(BadInput, K1_ConstantsOfOneOrMoreSaturate) {
  SCOPED_TRACE("contract row K1: constant<Q>(q62)");
  const uint64_t one = uint64_t{1} << 62;
  EXPECT_EQ(raw_hex(constant<q15>(one)), want<15>(limits<15>::max));
  EXPECT_EQ(raw_hex(constant<q31>(one)), want<31>(limits<31>::max));
  EXPECT_EQ(raw_hex(constant<q31>(~uint64_t{0})), want<31>(limits<31>::max));
  EXPECT_EQ(raw_hex(constant<q15>(~uint64_t{0})), want<15>(limits<15>::max));
  EXPECT_EQ(raw_hex(constant<q15>(one / 2)), want<15>(0x4000));  // in range: exact
}

// ---- accumulator.hpp -------------------------------------------------------------------------------

TEST(BadInput, A1_AccumulatorSumsPast2To63AndBackExactly) {
  SCOPED_TRACE("contract row A1: accumulator mac / msc / add beyond the 64-bit range");
  // q31: (-1)(-1) = 2^62 at 62 fraction bits; four of them are 2^64, a full wrap of the int64 part
  accumulator<q31> acc;
  for (int k = 0; k < 4; ++k) acc.mac(q31::min(), q31::min());
  EXPECT_EQ(raw_hex(acc.result()), want<31>(limits<31>::max));  // +4, saturated, not 0
  for (int k = 0; k < 7; ++k) acc.msc(q31::min(), q31::min());
  EXPECT_EQ(raw_hex(acc.result()), want<31>(limits<31>::min));  // -3, saturated
  for (int k = 0; k < 3; ++k) acc.add(q31::max());
  acc.add(q31::from_raw(3));  // 3 (1 - 2^-31) + 3 LSB = 3 exactly: the sum is back at zero
  EXPECT_EQ(raw_hex(acc.result()), want<31>(0));
  acc.mac(q31::from_raw(1), q31::from_raw(1 << 30));  // + 1/2 LSB: a tie, rounds up
  EXPECT_EQ(raw_hex(acc.result()), want<31>(1));
  acc.clear();
  EXPECT_EQ(raw_hex(acc.result()), want<31>(0));
}

TEST(BadInput, A2_AccumulatorResultSaturatesWithTheSignOfTheSum) {
  SCOPED_TRACE("contract row A2: accumulator result() out of range");
  accumulator<q15> acc;
  acc.mac(q15::min(), q15::min());
  acc.mac(q15::min(), q15::min());
  EXPECT_EQ(raw_hex(acc.result()), want<15>(limits<15>::max));
  acc.msc(q15::max(), q15::min());  // 2 + (1 - 2^-15): still above
  EXPECT_EQ(raw_hex(acc.result()), want<15>(limits<15>::max));
  for (int k = 0; k < 6; ++k) acc.msc(q15::min(), q15::min());  // 3 - 2^-15 - 6
  EXPECT_EQ(raw_hex(acc.result()), want<15>(limits<15>::min));
  // order does not matter: the same terms the other way round
  accumulator<q15> reversed;
  for (int k = 0; k < 6; ++k) reversed.msc(q15::min(), q15::min());
  reversed.msc(q15::max(), q15::min());
  reversed.mac(q15::min(), q15::min());
  reversed.mac(q15::min(), q15::min());
  reversed.add(q15::max());
  reversed.add(q15::max());
  reversed.add(q15::max());
  reversed.add(q15::from_raw(2));  // -3 - 2^-15 + 3 (1 - 2^-15) + 2 LSB = -2 LSB
  EXPECT_EQ(raw_hex(reversed.result()), want<15>(-2));
}

// ---- turn.hpp --------------------------------------------------------------------------------------

TEST(BadInput, T1_TurnArithmeticWrapsAround) {
  SCOPED_TRACE("contract row T1: turn + - and unary -");
  EXPECT_EQ(raw_hex(turn16::from_raw(0xffff) + turn16::from_raw(1)), raw_hex(0, 16));
  EXPECT_EQ(raw_hex(turn16::from_raw(0) - turn16::from_raw(1)), raw_hex(0xffff, 16));
  EXPECT_EQ(raw_hex(-turn16::from_raw(0x8000)), raw_hex(0x8000, 16));
  EXPECT_EQ(raw_hex(-turn16::from_raw(1)), raw_hex(0xffff, 16));
  EXPECT_EQ(raw_hex(turn32::from_raw(0xffffffffu) + turn32::from_raw(2)), raw_hex(1, 32));
  EXPECT_EQ(raw_hex(turn32::from_raw(0) - turn32::from_raw(0x80000000u)), raw_hex(0x80000000, 32));
  turn32 t = turn32::from_raw(0xc0000000u);
  t += turn32::from_raw(0x40000000u);
  EXPECT_EQ(raw_hex(t), raw_hex(0, 32));
  t -= turn32::from_raw(1);
  EXPECT_EQ(raw_hex(t), raw_hex(0xffffffff, 32));
}

TEST(BadInput, T2_SignedDifferenceTakesTheShortWayAndHalfATurnIsNegative) {
  SCOPED_TRACE("contract row T2: signed_difference");
  EXPECT_EQ(signed_difference(turn16::from_raw(0), turn16::from_raw(0xffff)), 1);
  EXPECT_EQ(signed_difference(turn16::from_raw(0xffff), turn16::from_raw(0)), -1);
  EXPECT_EQ(signed_difference(turn16::from_raw(0x8000), turn16::from_raw(0)), -32768);
  EXPECT_EQ(signed_difference(turn16::from_raw(0), turn16::from_raw(0x8000)), -32768);
  EXPECT_EQ(signed_difference(turn16::from_raw(0x7fff), turn16::from_raw(0)), 32767);
  EXPECT_EQ(signed_difference(turn32::from_raw(0x80000000u), turn32::from_raw(0)), INT32_MIN);
  EXPECT_EQ(signed_difference(turn32::from_raw(5), turn32::from_raw(0xfffffffbu)), 10);
}

TEST(BadInput, T3_AdvanceWrapsForAnyStepCount) {
  SCOPED_TRACE("contract row T3: advance");
  EXPECT_EQ(raw_hex(advance(turn16::from_raw(0xffff), int16_t{1})), raw_hex(0, 16));
  EXPECT_EQ(raw_hex(advance(turn16::from_raw(0), int16_t{-32768})), raw_hex(0x8000, 16));
  EXPECT_EQ(raw_hex(advance(turn16::from_raw(0x8000), int16_t{-32768})), raw_hex(0, 16));
  EXPECT_EQ(raw_hex(advance(turn32::from_raw(1), INT32_MIN)), raw_hex(0x80000001, 32));
  EXPECT_EQ(raw_hex(advance(turn32::from_raw(0x7fffffffu), INT32_MAX)), raw_hex(0xfffffffe, 32));
}

TEST(BadInput, T4_NarrowingAnAngleRoundsModuloOneTurn) {
  SCOPED_TRACE("contract row T4: to_turn32, to_turn16");
  EXPECT_EQ(raw_hex(to_turn16(turn32::from_raw(0xffff8000u))), raw_hex(0, 16));  // tie, up, wraps
  EXPECT_EQ(raw_hex(to_turn16(turn32::from_raw(0xffff7fffu))), raw_hex(0xffff, 16));
  EXPECT_EQ(raw_hex(to_turn16(turn32::from_raw(0x00008000u))), raw_hex(1, 16));
  EXPECT_EQ(raw_hex(to_turn32(turn16::from_raw(0xffff))), raw_hex(0xffff0000, 32));
}

// ---- sin_cos.hpp -----------------------------------------------------------------------------------

TEST(BadInput, S1_SinCosQ15SaturatesThePeakAndReachesMinusOne) {
  SCOPED_TRACE("contract row S1: sin_cos(turn16) at the quadrant angles and the ends of the range");
  const struct {
    uint16_t angle;
    int64_t sin, cos;
  } cases[] = {{0x0000, 0, 32767}, {0x4000, 32767, 0}, {0x8000, 0, -32768}, {0xc000, -32768, 0}};
  for (const auto& c : cases) {
    const sin_cos_pair<q15> got = sin_cos(turn16::from_raw(c.angle));
    EXPECT_EQ(raw_hex(got.sin), want<15>(c.sin)) << "angle " << raw_hex(c.angle, 16);
    EXPECT_EQ(raw_hex(got.cos), want<15>(c.cos)) << "angle " << raw_hex(c.angle, 16);
  }
  // one step either side of the top: exact 1 - 2.3e-9, saturated to max (the <= 1 LSB case)
  EXPECT_EQ(raw_hex(sin_cos(turn16::from_raw(0x3fff)).sin), want<15>(32767));
  EXPECT_EQ(raw_hex(sin_cos(turn16::from_raw(0x4001)).sin), want<15>(32767));
  EXPECT_EQ(raw_hex(sin_cos(turn16::from_raw(0xffff)).cos), want<15>(32767));
}

TEST(BadInput, S2_SinCosQ31SaturatesThePeakAndReachesMinusOne) {
  SCOPED_TRACE("contract row S2: sin_cos(turn32) at the quadrant angles and the ends of the range");
  const struct {
    uint32_t angle;
    int64_t sin, cos;
  } cases[] = {{0x00000000u, 0, limits<31>::max},
               {0x40000000u, limits<31>::max, 0},
               {0x80000000u, 0, limits<31>::min},
               {0xc0000000u, limits<31>::min, 0}};
  for (const auto& c : cases) {
    const sin_cos_pair<q31> got = sin_cos(turn32::from_raw(c.angle));
    EXPECT_EQ(raw_hex(got.sin), want<31>(c.sin)) << "angle " << raw_hex(c.angle, 32);
    EXPECT_EQ(raw_hex(got.cos), want<31>(c.cos)) << "angle " << raw_hex(c.angle, 32);
  }
  // the last step of the turn: cos(2 pi 2^-32) = 1 - 2e-18, max; sin is -2 pi 2^-32 = -3.14 LSB,
  // within the 2 LSB bound of -3 or -4
  const sin_cos_pair<q31> last = sin_cos(turn32::from_raw(0xffffffffu));
  EXPECT_EQ(raw_hex(last.cos), want<31>(limits<31>::max));
  EXPECT_LE(std::abs(last.sin.raw() + 3.14159), 2.0) << raw_hex(last.sin);
}

// ---- clarke.hpp ------------------------------------------------------------------------------------

// Unbalanced full-scale phase currents (a broken sensor, a phase stuck at a rail): every output
// whose exact value is out of range saturates with the sign of the exact value.
template <int F>
void check_unbalanced_clarke() {
  using Q = fixed<F>;
  const int64_t max = limits<F>::max, min = limits<F>::min;
  const stationary<Q> s = clarke(phases<Q>{Q::max(), Q::min(), Q::min()});  // alpha = 4/3 - ...
  EXPECT_EQ(raw_hex(s.alpha), want<F>(max));
  EXPECT_EQ(raw_hex(s.beta), want<F>(0));  // b == c: exactly zero
  const stationary<Q> t = clarke(phases<Q>{Q::min(), Q::max(), Q::max()});
  EXPECT_EQ(raw_hex(t.alpha), want<F>(min));
  const stationary<Q> u = clarke(phases<Q>{Q::zero(), Q::max(), Q::min()});  // beta = 2/sqrt(3)
  EXPECT_EQ(raw_hex(u.beta), want<F>(max));
  EXPECT_EQ(raw_hex(u.alpha), want<F>(0));  // (0 - (1 - 2^-F) + 1) / 3 = 2^-F / 3 -> 0
  const stationary<Q> v = clarke(phases<Q>{Q::zero(), Q::min(), Q::max()});
  EXPECT_EQ(raw_hex(v.beta), want<F>(min));
  // all three at -1: a common-mode offset, removed; alpha = beta = 0
  const stationary<Q> w = clarke(phases<Q>{Q::min(), Q::min(), Q::min()});
  EXPECT_EQ(raw_hex(w.alpha), want<F>(0));
  EXPECT_EQ(raw_hex(w.beta), want<F>(0));
}
TEST(BadInput, C1_ClarkeOfUnbalancedFullScaleCurrentsSaturates) {
  SCOPED_TRACE("contract row C1: clarke");
  check_unbalanced_clarke<15>();
  check_unbalanced_clarke<31>();
}

template <int F>
void check_clarke_balanced_out_of_range() {
  using Q = fixed<F>;
  // beta = (a + 2b) / sqrt(3): 3 / sqrt(3) = 1.73 for a = b = 1, i.e. c = -2 (not a balanced set)
  const stationary<Q> s = clarke_balanced(Q::max(), Q::max());
  EXPECT_EQ(raw_hex(s.alpha), want<F>(limits<F>::max));
  EXPECT_EQ(raw_hex(s.beta), want<F>(limits<F>::max));
  const stationary<Q> t = clarke_balanced(Q::min(), Q::min());
  EXPECT_EQ(raw_hex(t.alpha), want<F>(limits<F>::min));
  EXPECT_EQ(raw_hex(t.beta), want<F>(limits<F>::min));
  // a = -1, b = 1 - 2^-F: (1 - 2^(1-F)) / sqrt(3), in range, not saturated
  const stationary<Q> u = clarke_balanced(Q::min(), Q::max());
  EXPECT_GT(u.beta.raw(), limits<F>::max / 2);
  EXPECT_LT(u.beta.raw(), limits<F>::max * 6 / 10);
}
TEST(BadInput, C2_ClarkeBalancedOfAnImpossiblePairSaturates) {
  SCOPED_TRACE("contract row C2: clarke_balanced");
  check_clarke_balanced_out_of_range<15>();
  check_clarke_balanced_out_of_range<31>();
}

template <int F>
void check_inverse_clarke_out_of_range() {
  using Q = fixed<F>;
  // b = 1/2 + sqrt(3)/2 = 1.37 for alpha = -1, beta = 1
  const phases<Q> p = inverse_clarke(stationary<Q>{Q::min(), Q::max()});
  EXPECT_EQ(raw_hex(p.a), want<F>(limits<F>::min));
  EXPECT_EQ(raw_hex(p.b), want<F>(limits<F>::max));
  EXPECT_LT(p.c.raw(), 0);  // 1/2 - sqrt(3)/2 (1 - 2^-F) = -0.366: in range
  EXPECT_GT(p.c.raw(), -limits<F>::max / 2);
  const phases<Q> q = inverse_clarke(stationary<Q>{Q::max(), Q::max()});
  EXPECT_EQ(raw_hex(q.c), want<F>(limits<F>::min));  // -1/2 - sqrt(3)/2 = -1.37
}
TEST(BadInput, C3_InverseClarkeOfALongVectorSaturates) {
  SCOPED_TRACE("contract row C3: inverse_clarke");
  check_inverse_clarke_out_of_range<15>();
  check_inverse_clarke_out_of_range<31>();
}

template <int F>
void check_power_invariant_out_of_range() {
  using Q = fixed<F>;
  // alpha = (2a - b - c) / sqrt(6) = 4 / sqrt(6) = 1.63, beta = (b - c) / sqrt(2) = 1.41
  const stationary<Q> s = clarke_power_invariant(phases<Q>{Q::max(), Q::min(), Q::min()});
  EXPECT_EQ(raw_hex(s.alpha), want<F>(limits<F>::max));
  const stationary<Q> t = clarke_power_invariant(phases<Q>{Q::zero(), Q::min(), Q::max()});
  EXPECT_EQ(raw_hex(t.beta), want<F>(limits<F>::min));
  // a = sqrt(2/3) alpha: in range for every alpha; c = -alpha/sqrt(6) - beta/sqrt(2) = 1.12 here
  const phases<Q> p = inverse_clarke_power_invariant(stationary<Q>{Q::min(), Q::min()});
  EXPECT_EQ(raw_hex(p.c), want<F>(limits<F>::max));
  EXPECT_GT(p.a.raw(), limits<F>::min);
  const phases<Q> q = inverse_clarke_power_invariant(stationary<Q>{Q::min(), Q::max()});
  EXPECT_EQ(raw_hex(q.b), want<F>(limits<F>::max));
}
TEST(BadInput, C4_PowerInvariantClarkeOutOfRangeSaturates) {
  SCOPED_TRACE("contract rows C4, C5: clarke_power_invariant, inverse_clarke_power_invariant");
  check_power_invariant_out_of_range<15>();
  check_power_invariant_out_of_range<31>();
}

// ---- park.hpp --------------------------------------------------------------------------------------

// Malformed sine/cosine pairs (not on the unit circle: uninitialised, (0, 0), (-1, -1)) are used as
// given; the result is the correctly rounded product, saturated.
template <int F>
void check_malformed_pairs() {
  using Q = fixed<F>;
  const int64_t max = limits<F>::max;
  // (-1, -1): |pair| = sqrt(2); d = alpha cos + beta sin = 2 for alpha = beta = -1
  const sin_cos_pair<Q> corner{Q::min(), Q::min()};
  const rotating<Q> r = park(stationary<Q>{Q::min(), Q::min()}, corner);
  EXPECT_EQ(raw_hex(r.d), want<F>(max));
  EXPECT_EQ(raw_hex(r.q), want<F>(0));  // beta cos - alpha sin = 1 - 1
  const stationary<Q> s = inverse_park(rotating<Q>{Q::min(), Q::max()}, corner);
  EXPECT_EQ(raw_hex(s.alpha), want<F>(max));  // d cos - q sin = 1 + (1 - 2^-F)
  EXPECT_EQ(raw_hex(s.beta), want<F>(1));     // d sin + q cos = 1 - (1 - 2^-F) = 2^-F, exactly
  // (max, max) with a full-scale vector: 2 (1 - 2^-F)^2 saturates
  const sin_cos_pair<Q> top{Q::max(), Q::max()};
  EXPECT_EQ(raw_hex(park(stationary<Q>{Q::max(), Q::max()}, top).d), want<F>(max));
  EXPECT_EQ(raw_hex(inverse_park(rotating<Q>{Q::max(), Q::min()}, top).alpha), want<F>(max));
  EXPECT_EQ(raw_hex(inverse_park(rotating<Q>{Q::min(), Q::min()}, top).beta), want<F>(limits<F>::min));
  // (0, 0): everything is zero, nothing undefined
  const rotating<Q> z = park(stationary<Q>{Q::min(), Q::max()}, sin_cos_pair<Q>{});
  EXPECT_EQ(raw_hex(z.d), want<F>(0));
  EXPECT_EQ(raw_hex(z.q), want<F>(0));
}
TEST(BadInput, P1_ParkWithMalformedPairsSaturates) {
  SCOPED_TRACE("contract rows P1, P2: park, inverse_park with a malformed sin_cos_pair");
  check_malformed_pairs<15>();
  check_malformed_pairs<31>();
}

// ---- host.hpp --------------------------------------------------------------------------------------

template <typename Q, typename Convert>
void check_from_double(Convert convert) {
  const int F = Q::fraction_bits;
  const int64_t max = Q::raw_max, min = Q::raw_min;
  const auto bits = F + 1;
  const struct {
    double x;
    int64_t raw;
    const char* what;
  } cases[] = {{quiet_nan, 0, "NaN"},
               {-quiet_nan, 0, "-NaN"},
               {signalling_nan, 0, "signalling NaN"},
               {inf, max, "+Inf"},
               {-inf, min, "-Inf"},
               {1.0, max, "1"},
               {-1.0, min, "-1"},
               {std::nextafter(-1.0, -2.0), min, "just below -1"},
               {1e308, max, "1e308"},
               {-1e308, min, "-1e308"},
               {std::numeric_limits<double>::denorm_min(), 0, "smallest subnormal"},
               {-std::numeric_limits<double>::denorm_min(), 0, "negative smallest subnormal"},
               {std::ldexp(0.5, -F), 1, "+1/2 LSB (tie, up)"},
               {std::ldexp(-0.5, -F), 0, "-1/2 LSB (tie, up)"},
               {std::ldexp(static_cast<double>(max) + 0.5, -F), max, "max + 1/2 LSB"}};
  for (const auto& c : cases) {
    EXPECT_EQ(raw_hex(convert(c.x).raw(), bits), raw_hex(c.raw, bits)) << c.what;
  }
}
TEST(BadInput, H1_DoubleToFixedHandlesNanInfAndOutOfRange) {
  SCOPED_TRACE("contract row H1: to_q15(double), to_q31(double)");
  check_from_double<q15>([](double x) { return to_q15(x); });
  check_from_double<q31>([](double x) { return to_q31(x); });
}

TEST(BadInput, H2_ToDoubleIsExactAtTheCorners) {
  SCOPED_TRACE("contract row H2: to_double");
  EXPECT_EQ(to_double(q15::min()), -1.0);
  EXPECT_EQ(to_double(q31::min()), -1.0);
  EXPECT_EQ(to_double(q15::max()), 1.0 - std::ldexp(1.0, -15));
  EXPECT_EQ(to_double(q31::max()), 1.0 - std::ldexp(1.0, -31));
}

TEST(BadInput, H3_AnglesFromNonFiniteOrHugeDoublesAreDefined) {
  SCOPED_TRACE("contract row H3: turn16/32_from_degrees, turn16/32_from_radians");
  for (double x : {quiet_nan, -quiet_nan, inf, -inf}) {
    EXPECT_EQ(raw_hex(turn16_from_degrees(x)), raw_hex(0, 16)) << x;
    EXPECT_EQ(raw_hex(turn32_from_degrees(x)), raw_hex(0, 32)) << x;
    EXPECT_EQ(raw_hex(turn16_from_radians(x)), raw_hex(0, 16)) << x;
    EXPECT_EQ(raw_hex(turn32_from_radians(x)), raw_hex(0, 32)) << x;
  }
  EXPECT_EQ(raw_hex(turn16_from_degrees(360.0)), raw_hex(0, 16));
  EXPECT_EQ(raw_hex(turn16_from_degrees(-90.0)), raw_hex(0xc000, 16));
  // -360 2^40 + 180 is exact in double; fmod keeps the sign: -180 degrees, half a turn
  EXPECT_EQ(raw_hex(turn32_from_degrees(-360.0 * std::ldexp(1.0, 40) + 180.0)), raw_hex(0x80000000, 32));
  // 2^60 degrees: the residue 2^60 mod 360 computed in integers, then its nearest turn32 step
  uint64_t residue = 1;
  for (int k = 0; k < 60; ++k) residue = residue * 2 % 360;
  const auto step = static_cast<int64_t>(std::llround(std::ldexp(static_cast<double>(residue) / 360.0, 32)));
  EXPECT_EQ(raw_hex(turn32_from_degrees(std::ldexp(1.0, 60))), raw_hex(step, 32)) << "residue " << residue;
  // beyond about 1e4 rad, the reduction is by the double nearest 2 pi (documented): defined, and
  // the same as reducing that remainder
  const double huge = 1e300;
  EXPECT_EQ(raw_hex(turn16_from_radians(huge)),
            raw_hex(turn16_from_radians(std::fmod(huge, 6.283185307179586476925286766559))));
}

TEST(BadInput, H4_AngleToDoubleStaysInsideTheHalfOpenRange) {
  SCOPED_TRACE("contract row H4: to_turns, to_degrees, to_radians");
  const turn32 last = turn32::from_raw(0xffffffffu);
  EXPECT_LT(to_turns(last), 1.0);
  EXPECT_LT(to_degrees(last), 360.0);
  EXPECT_LT(to_radians(last), 6.283185307179586476925286766559);
  EXPECT_LT(to_degrees(turn16::from_raw(0xffff)), 360.0);
  EXPECT_EQ(to_degrees(turn16::from_raw(0)), 0.0);
  EXPECT_GT(to_radians(last), 6.28318530);
}

// ---- svpwm.hpp, voltage_limit.hpp, dc_bus.hpp, pwm_compare.hpp ------------------------------------

template <int F>
void check_svpwm_malformed() {
  using Q = fixed<F>;
  const Q minus_one_raw = Q::from_raw(-1);
  for (overmodulation mode : {overmodulation::circle, overmodulation::hexagon}) {
    SCOPED_TRACE(mode == overmodulation::circle ? "circle" : "hexagon");
    // full scale (-1, -1), 225 degrees: far beyond the hexagon, limited, duties inside [0, max]
    const modulation<Q> full = svpwm(stationary<Q>{Q::min(), Q::min()}, mode);
    EXPECT_TRUE(full.limited);
    EXPECT_EQ(full.sector, 4);  // [180, 240) degrees
    for (Q d : {full.duty.a, full.duty.b, full.duty.c}) EXPECT_GE(d.raw(), 0) << raw_hex(d);
    // (-1 raw, -1 raw): a tiny vector, linear, centred duties, sector of 225 degrees
    const modulation<Q> tiny = svpwm(stationary<Q>{minus_one_raw, minus_one_raw}, mode);
    EXPECT_FALSE(tiny.limited);
    EXPECT_EQ(tiny.sector, 4);
    EXPECT_LE(std::llabs(int64_t{tiny.duty.a.raw()} - (limits<F>::max + 1) / 2), 2) << raw_hex(tiny.duty.a);
    // the zero vector: all duties 1/2, sector 1
    const modulation<Q> zero = svpwm(stationary<Q>{}, mode);
    EXPECT_EQ(raw_hex(zero.duty.a), want<F>((limits<F>::max + 1) / 2));
    EXPECT_EQ(zero.sector, 1);
    EXPECT_FALSE(zero.limited);
  }
  // sine PWM at full scale clamps; six-step of the zero vector has every phase on (v_x >= 0)
  const modulation<Q> sine = sine_pwm(stationary<Q>{Q::max(), Q::zero()});
  EXPECT_TRUE(sine.limited);
  EXPECT_EQ(raw_hex(sine.duty.a), want<F>(limits<F>::max));
  const modulation<Q> six = six_step(stationary<Q>{});
  EXPECT_EQ(raw_hex(six.duty.b), want<F>(limits<F>::max));
  EXPECT_EQ(six.sector, 1);
  const modulation<Q> six_full = six_step(stationary<Q>{Q::min(), Q::min()});
  EXPECT_FALSE(six_full.limited);
  EXPECT_EQ(six_full.sector, 5);  // nearest active vector to 225 degrees: V5 at 240 (001)
}
TEST(BadInput, M1_SvpwmOfMalformedRequestsStaysInsideInBothModes) {
  SCOPED_TRACE("contract rows M1, M2, M3: svpwm, sine_pwm, six_step");
  check_svpwm_malformed<15>();
  check_svpwm_malformed<31>();
}

template <int F>
void check_negative_limits() {
  using Q = fixed<F>;
  const Q minus = Q::from_raw(-5);
  const limited<stationary<Q>> s = limit_magnitude(stationary<Q>{Q::max(), Q::min()}, minus);
  EXPECT_TRUE(s.clipped);
  EXPECT_EQ(raw_hex(s.value.alpha), want<F>(0));
  EXPECT_EQ(raw_hex(s.value.beta), want<F>(0));
  EXPECT_FALSE(limit_magnitude(stationary<Q>{}, minus).clipped);  // |0| is not above 0
  const limited<rotating<Q>> r = limit_magnitude(rotating<Q>{Q::min(), Q::min()}, Q::max());
  EXPECT_TRUE(r.clipped);  // |(-1, -1)| = sqrt(2): scaled onto the limit
  EXPECT_LE(std::llabs(r.value.d.raw() + std::llround(limits<F>::max * 0.70710678118654752)), F == 15 ? 1 : 8)
      << raw_hex(r.value.d);  // -1/sqrt(2)
  const limited<rotating<Q>> d = limit_d_priority(rotating<Q>{Q::min(), Q::max()}, minus);
  EXPECT_TRUE(d.clipped);
  EXPECT_EQ(raw_hex(d.value.d), want<F>(0));
  EXPECT_EQ(raw_hex(d.value.q), want<F>(0));
  const limited<rotating<Q>> full = limit_d_priority(rotating<Q>{Q::min(), Q::max()}, Q::max());
  EXPECT_EQ(raw_hex(full.value.d), want<F>(-limits<F>::max));  // d first, clamped to -m
  EXPECT_LE(std::llabs(int64_t{full.value.q.raw()}), F == 15 ? 256 : 65536) << raw_hex(full.value.q);
}
TEST(BadInput, L1_LimitersTreatANegativeLimitAsZero) {
  SCOPED_TRACE("contract rows L1, L2: limit_magnitude, limit_d_priority");
  check_negative_limits<15>();
  check_negative_limits<31>();
}

template <int F>
void check_bad_bus() {
  using Q = fixed<F>;
  bus_normalizer<Q> bus(Q::from_raw(100));
  EXPECT_FALSE(bus.valid());
  EXPECT_EQ(raw_hex(bus.normalize(Q::max())), want<F>(0));  // before the first update
  for (int64_t raw : {int64_t{0}, int64_t{-1}, limits<F>::min, int64_t{100}}) {
    EXPECT_FALSE(bus.update(Q::from_raw(static_cast<typename Q::raw_type>(raw)))) << raw;
    EXPECT_EQ(raw_hex(bus.normalize(Q::max())), want<F>(0)) << raw;
  }
  EXPECT_TRUE(bus.update(Q::from_raw(101)));                                      // just above the minimum
  EXPECT_EQ(raw_hex(bus.normalize(Q::from_raw(1000))), want<F>(limits<F>::max));  // above the bus: saturate
  EXPECT_EQ(raw_hex(bus.normalize(Q::min())), want<F>(limits<F>::min));
  bus_normalizer<Q> any(Q::from_raw(-7));  // a minimum <= 0 counts as one raw step
  EXPECT_FALSE(any.update(Q::from_raw(1)));
  EXPECT_TRUE(any.update(Q::from_raw(2)));
  EXPECT_EQ(raw_hex(any.normalize(Q::from_raw(1))), want<F>(limits<F>::max / 2 + 1));  // 1/2, rounded up
}
TEST(BadInput, B1_BusAtOrBelowItsMinimumGivesZero) {
  SCOPED_TRACE("contract row B1: bus_normalizer");
  check_bad_bus<15>();
  check_bad_bus<31>();
}

template <int F>
void check_bad_periods() {
  using Q = fixed<F>;
  const phases<Q> duty{Q::max(), Q::min(), Q::from_raw(1)};
  const compare_values none = duty_to_compare(duty, 0, 5);
  EXPECT_EQ(none.compare.a, 0u);
  EXPECT_EQ(none.compare.b, 0u);
  EXPECT_FALSE(none.clipped);
  const compare_values one = duty_to_compare(duty, 1, 1000);  // min_pulse capped to period / 2 = 0
  EXPECT_EQ(one.compare.a, 1u);
  EXPECT_EQ(one.compare.b, 0u);  // a negative duty counts as 0
  EXPECT_FALSE(one.clipped);
  // oversized minimum pulse: capped to period / 2 = 50; 1/4 duty (25) widens to 50, 10 % goes to 0
  const phases<Q> small{Q::from_raw(static_cast<typename Q::raw_type>((limits<F>::max + 1) / 4)),
                        Q::from_raw(static_cast<typename Q::raw_type>((limits<F>::max + 1) / 10)), Q::max()};
  const compare_values capped = duty_to_compare(small, 100, 0xffffffffu);
  EXPECT_EQ(capped.compare.a, 50u);
  EXPECT_EQ(capped.compare.b, 0u);
  EXPECT_EQ(capped.compare.c, 100u);
  EXPECT_TRUE(capped.clipped);
  EXPECT_EQ(duty_to_compare(phases<Q>{Q::max(), Q::max(), Q::max()}, 0xffffffffu).compare.a,
            F == 15 ? 0xfffdffffu : 0xfffffffdu);  // round((1 - 2^-F) period)
}
TEST(BadInput, W1_PeriodZeroOrOneAndOversizedMinimumPulses) {
  SCOPED_TRACE("contract row W1: duty_to_compare");
  check_bad_periods<15>();
  check_bad_periods<31>();
}

uint32_t distance_steps(turn32 a, turn32 b) {
  const int32_t d = signed_difference(a, b);
  return d < 0 ? 0u - static_cast<uint32_t>(d) : static_cast<uint32_t>(d);
}

// ---- hall.hpp, hall_tracker.hpp, angle_interpolator.hpp, electrical_speed.hpp, commutation.hpp --------

TEST(BadInput, R1_ImpossibleHallCodesAreInvalid) {
  SCOPED_TRACE("contract row R1: decode_hall, hall_code");
  for (uint8_t code : {uint8_t{0}, uint8_t{7}, uint8_t{0xf8}, uint8_t{0xff}}) {
    EXPECT_FALSE(decode_hall(code).valid) << int{code};
    EXPECT_EQ(decode_hall(code).sector, 0) << int{code};
  }
  EXPECT_FALSE(decode_hall(0b010, hall_placement::spaced_60).valid);
  EXPECT_FALSE(decode_hall(0b101, hall_placement::spaced_60).valid);
  EXPECT_EQ(decode_hall(0b11111101).sector, 0);  // bits above 2 ignored: 0b101
  EXPECT_EQ(hall_code(6), hall_code(0));         // sector taken modulo 6
  EXPECT_EQ(hall_code(255), hall_code(3));
}

TEST(BadInput, R2_GlitchFilterDropsBouncesAndSurvivesTimerWrap) {
  SCOPED_TRACE("contract row R2: hall_glitch_filter");
  hall_glitch_filter<16> filter(10);
  EXPECT_FALSE(filter.update(1, 0).happened);
  const hall_edge<16> first = filter.update(1, 10);
  EXPECT_TRUE(first.happened);
  EXPECT_EQ(first.time, 0);                     // dated at its first reading
  EXPECT_FALSE(filter.update(2, 20).happened);  // a bounce ...
  EXPECT_FALSE(filter.update(1, 22).happened);  // ... that came back: forgotten
  EXPECT_FALSE(filter.update(2, 25).happened);
  EXPECT_FALSE(filter.update(2, 34).happened);  // held 9 < 10
  const hall_edge<16> second = filter.update(2, 35);
  EXPECT_TRUE(second.happened);
  EXPECT_EQ(second.time, 25);
  // the 16-bit timer wraps between first reading and confirmation
  EXPECT_FALSE(filter.update(3, 65530).happened);
  const hall_edge<16> wrapped = filter.update(3, 4);
  EXPECT_TRUE(wrapped.happened);
  EXPECT_EQ(wrapped.time, 65530);
  EXPECT_EQ(hall_glitch_filter<16>(0xffffffffu).min_dwell(), 32767u);  // capped below half the range
}

// the 120-degree code of sector s
constexpr uint8_t code_of(uint8_t s) { return hall_code(s); }

TEST(BadInput, R3_HallTrackerInvalidCodesStallReversalAndBackwardJump) {
  SCOPED_TRACE("contract row R3: hall_tracker");
  hall_tracker_config config{};
  config.stall_timeout = 5000;
  hall_tracker<32> tracker(config);
  EXPECT_EQ(tracker.estimate(0).source, angle_source::none);
  for (uint8_t s = 0; s < 4; ++s) tracker.update(code_of(s), uint32_t{s} * 1000);
  hall_estimate e = tracker.estimate(3500);
  EXPECT_EQ(e.source, angle_source::interpolated);
  EXPECT_EQ(e.direction, rotation::forward);
  EXPECT_LE(distance_steps(e.angle, turn32_from_degrees(210.0)), 64u) << raw_hex(e.angle);
  tracker.update(0b000, 3600);  // invalid: the sector is held, and counted
  tracker.update(0b111, 3700);
  e = tracker.estimate(3700);
  EXPECT_TRUE(e.invalid_code);
  EXPECT_EQ(e.sector, 3);
  EXPECT_EQ(tracker.invalid_codes(), 2u);
  // stall: no edge for stall_timeout ticks
  tracker.update(code_of(3), 8000);
  e = tracker.estimate(8000);
  EXPECT_TRUE(e.stalled);
  EXPECT_EQ(e.speed.raw(), 0);
  EXPECT_EQ(e.source, angle_source::sector_centre);
  EXPECT_EQ(e.angle, config.calibration.entry_forward[4]);  // held where it was (at the next edge) ...
  tracker.update(code_of(3), 8001);
  EXPECT_EQ(tracker.estimate(8001).angle, sector_centre(config.calibration, 3));  // ... then slewed
  // reversal: back into sector 2; no speed yet, the angle goes to its centre
  tracker.update(code_of(2), 8500);
  e = tracker.estimate(8600);
  EXPECT_EQ(e.direction, rotation::backward);
  EXPECT_EQ(e.source, angle_source::sector_centre);
  EXPECT_EQ(e.angle, sector_centre(config.calibration, 2));
  EXPECT_FALSE(e.stalled);
}

TEST(BadInput, R3_HallTrackerBackwardJumpIsLimited) {
  SCOPED_TRACE("contract row R3: hall_tracker, max_backward_jump");
  // a table whose edge into sector 2 (70 degrees) lies 27.5 degrees behind the centre of sector 1
  // (97.5 degrees, moved by an edge from 2 into 1 at 200 degrees)
  hall_tracker_config config{};
  config.calibration.entry_forward[2] = turn32_from_degrees(70.0);
  config.calibration.entry_backward[1] = turn32_from_degrees(200.0);
  config.max_backward_jump = turn32::from_raw(0x0e38e38e);  // 20 degrees
  const turn32 centre = sector_centre(config.calibration, 1);
  for (const turn32 jump : {config.max_backward_jump, turn32_from_degrees(90.0)}) {
    config.max_backward_jump = jump;
    hall_tracker<32> tracker(config);
    for (uint8_t s = 0; s < 3; ++s) tracker.update(code_of(s), uint32_t{s} * 1000);
    const hall_estimate e = tracker.estimate(2000);
    EXPECT_EQ(e.source, angle_source::interpolated);
    const turn32 expected = jump.raw() == 0x0e38e38e ? centre - jump : config.calibration.entry_forward[2];
    EXPECT_EQ(raw_hex(e.angle), raw_hex(expected)) << "jump " << raw_hex(jump);
  }
}

TEST(BadInput, R4_AngleInterpolatorBeforeSamplesSameTimeAndStale) {
  SCOPED_TRACE("contract row R4: angle_interpolator");
  angle_interpolator<16> position(100);
  EXPECT_FALSE(position.estimate(5).valid);
  EXPECT_EQ(position.angle(5).raw(), 0u);
  position.update(turn32::from_raw(0), 0);
  position.update(turn32::from_raw(1000), 10);  // 100 steps per tick
  position.update(turn32::from_raw(3000), 10);  // same timestamp: the speed is kept
  EXPECT_EQ(position.estimate(20).angle.raw(), 4000u);
  const interpolated_angle stale = position.estimate(10 + 500);
  EXPECT_TRUE(stale.stale);
  EXPECT_EQ(stale.angle.raw(), 13000u);                                     // stops at max_extrapolation
  position.update(turn32::from_raw(0), static_cast<uint16_t>(10 + 40000));  // half the range or more apart
  EXPECT_EQ(position.estimate(static_cast<uint16_t>(10 + 40000)).speed.raw(), 0);
}

TEST(BadInput, R5_SpeedFromZeroTicksAndHugeMotion) {
  SCOPED_TRACE("contract rows R5, R6: speed_from_motion, steps_at, rpm_scale");
  EXPECT_EQ(speed_from_motion(12345, 0).raw(), 0);
  EXPECT_EQ(speed_from_motion(0, 7).raw(), 0);
  EXPECT_EQ(speed_from_motion(int64_t{1} << 61, 1).raw(), electrical_speed::raw_max);
  EXPECT_EQ(speed_from_motion(-(int64_t{1} << 61), 1).raw(), -electrical_speed::raw_max);
  EXPECT_EQ(electrical_speed::from_raw(detail::int64_min).raw(), -electrical_speed::raw_max);
  EXPECT_EQ(steps_at(electrical_speed::from_raw(-(int64_t{3} << 15)), 3), -4);  // -4.5 toward zero
  EXPECT_EQ(rpm_scale(0, 1000).rpm_q8(electrical_speed::from_raw(int64_t{1} << 40)),
            rpm_scale(1, 1000).rpm_q8(electrical_speed::from_raw(int64_t{1} << 40)));  // 0 pairs count as 1
  EXPECT_EQ(rpm_scale(4, 0).rpm_q8(electrical_speed::from_raw(electrical_speed::raw_max)), 0);
  EXPECT_EQ(rpm_scale(1, 0xffffffffu).rpm_q8(electrical_speed::from_raw(electrical_speed::raw_max)),
            0x7fffffff);
  EXPECT_EQ(rpm_scale(1, 0xffffffffu).rpm_q8(electrical_speed::from_raw(-electrical_speed::raw_max)),
            -0x7fffffff);
}

TEST(BadInput, R7_CommutationOfUnknownTorqueAndOutOfRangeSectors) {
  SCOPED_TRACE("contract row R7: commutation_sector, six_step_commutation, commutation_voltage");
  const commutation_state off = six_step_commutation(2, rotation::unknown);
  EXPECT_FALSE(off.active);
  EXPECT_EQ(off.drive.a, phase_drive::floating);
  EXPECT_EQ(commutation_voltage(off, q15::max()).alpha.raw(), 0);
  EXPECT_EQ(six_step_commutation(7, rotation::forward).vector,
            six_step_commutation(1, rotation::forward).vector);
  EXPECT_EQ(six_step_commutation(255, rotation::backward).vector,
            six_step_commutation(3, rotation::backward).vector);
  const commutation_state on = six_step_commutation(0, rotation::forward);
  EXPECT_EQ(commutation_voltage(on, q15::min()).beta.raw(), 0);  // a negative duty counts as 0
  EXPECT_EQ(commutation_sector(turn32::from_raw(0xffffffffu)), 0);
}

TEST(BadInput, R8_HandoverWithUnknownTorqueStaysInSixStep) {
  SCOPED_TRACE("contract row R8: foc_handover");
  handover_config config{};
  config.foc_above = electrical_speed::from_raw(1000);
  config.six_step_below = electrical_speed::from_raw(500);
  foc_handover handover(config);
  const turn32 angle = turn32_from_degrees(10.0);
  EXPECT_EQ(handover.update(angle, electrical_speed::from_raw(2000), rotation::unknown).mode,
            drive_mode::six_step);
  const drive_command foc = handover.update(angle, electrical_speed::from_raw(2000), rotation::forward);
  EXPECT_EQ(foc.mode, drive_mode::foc);
  EXPECT_EQ(foc.current_angle, foc.six_step.vector_angle);  // the switch moves nothing
  const drive_command back = handover.update(angle, electrical_speed::from_raw(2000), rotation::unknown);
  EXPECT_EQ(back.mode, drive_mode::six_step);  // unknown torque drops FOC at once
  EXPECT_FALSE(back.six_step.active);
}

}  // namespace
