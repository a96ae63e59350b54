// Bad input: every row of the contract table in README.md ("## Contracts") at the edges of its input
// range and beyond. Each test names its row (F1 ... H4) in its name and in a SCOPED_TRACE, so a
// failure says which promise broke. The expected values are worked by hand from the rules in the
// table and the header comments (common practice, no source, unless a comment says otherwise); this
// suite runs under the sanitizer preset too, so "defined result, no undefined behaviour" is checked
// by UBSan as well as by the values.
#include <gtest/gtest.h>

#include <cmath>
#include <cstdint>
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

}  // namespace
