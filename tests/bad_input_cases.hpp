// Bad input: every row of the contract table in README.md ("## Contracts") that holds on a target, at
// the edges of its input range and beyond. Each case names its row (F1 ... R8) in its name and in a
// ROTORQ_SCOPE, so a failure says which promise broke. The expected values are worked by hand from
// the rules in the table and the header comments (common practice, no source, unless a comment says
// otherwise).
//
// One copy of the cases runs in two places: tests/test_bad_input.cpp maps the check macros to
// GoogleTest (TEST(BadInput, <case>), also under the sanitizer preset, so "defined result, no
// undefined behaviour" is checked by UBSan as well as by the values), and tests/target/bad_input_main.cpp
// runs them on the emulated cores with tests/target/check.hpp. So this header uses no C++ standard
// library and no floating point: only <stdint.h>, the target headers of rotorq and the macros
// ROTORQ_CHECK, ROTORQ_CHECK_FALSE, ROTORQ_CHECK_EQ / _LT / _LE / _GT / _GE, ROTORQ_SCOPE and
// ROTORQ_SCOPE_VALUE, which the includer defines first (check.hpp says what each does). The rows of
// host.hpp (H1 ... H4) need doubles and stay in tests/test_bad_input.cpp.
//
// ROTORQ_BAD_INPUT_CASES(X) lists the cases: X(name) for each function rotorq::bad_input::name.
#pragma once

#include <stdint.h>

#include "rotorq/rotorq.hpp"

#if !defined(ROTORQ_CHECK) || !defined(ROTORQ_CHECK_FALSE) || !defined(ROTORQ_CHECK_EQ) || \
    !defined(ROTORQ_CHECK_LT) || !defined(ROTORQ_CHECK_LE) || !defined(ROTORQ_CHECK_GT) || \
    !defined(ROTORQ_CHECK_GE) || !defined(ROTORQ_SCOPE) || !defined(ROTORQ_SCOPE_VALUE)
#error "define the check macros (tests/target/check.hpp, or a mapping to a test framework) first"
#endif

// NOLINTNEXTLINE(cppcoreguidelines-macro-usage): a list each runner expands in its own way
#define ROTORQ_BAD_INPUT_CASES(X)                              \
  X(F1_RawAccessAndSaturateTakeAnyValue)                       \
  X(F2_AddAndSubtractSaturate)                                 \
  X(F3_NegateAndAbsOfMinusOneGiveMax)                          \
  X(F4_MultiplyOfMinusOneCornersSaturatesAndTiesRoundUp)       \
  X(F5_MulAddSaturatesOnlyAtTheEnd)                            \
  X(F6_FormatConversionsSaturateAtTheTop)                      \
  X(K1_ConstantsOfOneOrMoreSaturate)                           \
  X(A1_AccumulatorSumsPast2To63AndBackExactly)                 \
  X(A2_AccumulatorResultSaturatesWithTheSignOfTheSum)          \
  X(T1_TurnArithmeticWrapsAround)                              \
  X(T2_SignedDifferenceTakesTheShortWayAndHalfATurnIsNegative) \
  X(T3_AdvanceWrapsForAnyStepCount)                            \
  X(T4_NarrowingAnAngleRoundsModuloOneTurn)                    \
  X(S1_SinCosQ15SaturatesThePeakAndReachesMinusOne)            \
  X(S2_SinCosQ31SaturatesThePeakAndReachesMinusOne)            \
  X(C1_ClarkeOfUnbalancedFullScaleCurrentsSaturates)           \
  X(C2_ClarkeBalancedOfAnImpossiblePairSaturates)              \
  X(C3_InverseClarkeOfALongVectorSaturates)                    \
  X(C4_PowerInvariantClarkeOutOfRangeSaturates)                \
  X(P1_ParkWithMalformedPairsSaturates)                        \
  X(M1_SvpwmOfMalformedRequestsStaysInsideInBothModes)         \
  X(L1_LimitersTreatANegativeLimitAsZero)                      \
  X(B1_BusAtOrBelowItsMinimumGivesZero)                        \
  X(W1_PeriodZeroOrOneAndOversizedMinimumPulses)               \
  X(R1_ImpossibleHallCodesAreInvalid)                          \
  X(R2_GlitchFilterDropsBouncesAndSurvivesTimerWrap)           \
  X(R3_HallTrackerInvalidCodesStallReversalAndBackwardJump)    \
  X(R3_HallTrackerBackwardJumpIsLimited)                       \
  X(R4_AngleInterpolatorBeforeSamplesSameTimeAndStale)         \
  X(R5_SpeedFromZeroTicksAndHugeMotion)                        \
  X(R7_CommutationOfUnknownTorqueAndOutOfRangeSectors)         \
  X(R8_HandoverWithUnknownTorqueStaysInSixStep)                \
  X(G1_PiRegulatorInvertedLimitsHugeGainsFullScaleErrors)

namespace rotorq::bad_input {

template <int F>
struct limits {
  static constexpr int64_t max = fixed<F>::raw_max;
  static constexpr int64_t min = fixed<F>::raw_min;
};

template <int F>
constexpr const char* format_name = F == 15 ? "q15" : "q31";

// |x| without overflow for every int64_t.
constexpr uint64_t magnitude(int64_t x) {
  return x < 0 ? uint64_t{0} - static_cast<uint64_t>(x) : static_cast<uint64_t>(x);
}

// Angles in turn32 steps, round(degrees / 360 2^32), worked by hand (the host suite checks them
// against turn32_from_degrees).
constexpr uint32_t turn32_10_degrees = 0x071c71c7u;   // 119304647.1
constexpr uint32_t turn32_70_degrees = 0x31c71c72u;   // 835132529.8
constexpr uint32_t turn32_90_degrees = 0x40000000u;   // exact
constexpr uint32_t turn32_200_degrees = 0x8e38e38eu;  // 2386092942.2
constexpr uint32_t turn32_210_degrees = 0x95555555u;  // 2505397589.3

// round((2^F - 1) / sqrt(2)): 23169.77 and 1518500249.28, worked by hand (the host suite checks them
// against the double expression).
template <int F>
constexpr int64_t max_over_sqrt2 = F == 15 ? 23170 : 1518500249;

// ---- fixed.hpp -------------------------------------------------------------------------------------

template <int F>
void check_raw_access() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  ROTORQ_CHECK_EQ(Q::from_raw(static_cast<typename Q::raw_type>(limits<F>::min)).raw(), limits<F>::min);
  ROTORQ_CHECK_EQ(Q::max().raw(), limits<F>::max);
  ROTORQ_CHECK_EQ(Q::saturate(detail::int64_min).raw(), limits<F>::min);
  ROTORQ_CHECK_EQ(Q::saturate(detail::int64_max).raw(), limits<F>::max);
  ROTORQ_CHECK_EQ(Q::saturate(limits<F>::max + 1).raw(), limits<F>::max);
  ROTORQ_CHECK_EQ(Q::saturate(limits<F>::min).raw(), limits<F>::min);  // in range: unchanged
}
inline void F1_RawAccessAndSaturateTakeAnyValue() {
  ROTORQ_SCOPE("contract row F1: from_raw / raw() / saturate(int64)");
  check_raw_access<15>();
  check_raw_access<31>();
}

template <int F>
void check_add_subtract() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  ROTORQ_CHECK_EQ((Q::max() + Q::max()).raw(), limits<F>::max);
  ROTORQ_CHECK_EQ((Q::min() + Q::min()).raw(), limits<F>::min);
  ROTORQ_CHECK_EQ((Q::min() - Q::max()).raw(), limits<F>::min);
  ROTORQ_CHECK_EQ((Q::max() - Q::min()).raw(), limits<F>::max);
  ROTORQ_CHECK_EQ((Q::max() + Q::min()).raw(), -1);  // in range: exact
  Q x = Q::max();
  x += Q::from_raw(1);
  ROTORQ_CHECK_EQ(x.raw(), limits<F>::max);
  x = Q::min();
  x -= Q::from_raw(1);
  ROTORQ_CHECK_EQ(x.raw(), limits<F>::min);
}
inline void F2_AddAndSubtractSaturate() {
  ROTORQ_SCOPE("contract row F2: a + b, a - b, +=, -=");
  check_add_subtract<15>();
  check_add_subtract<31>();
}

template <int F>
void check_negate_abs() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  ROTORQ_CHECK_EQ((-Q::min()).raw(), limits<F>::max);
  ROTORQ_CHECK_EQ(abs(Q::min()).raw(), limits<F>::max);
  ROTORQ_CHECK_EQ((-Q::max()).raw(), -limits<F>::max);
  ROTORQ_CHECK_EQ(abs(Q::from_raw(-1)).raw(), 1);
}
inline void F3_NegateAndAbsOfMinusOneGiveMax() {
  ROTORQ_SCOPE("contract row F3: -a, abs(a)");
  check_negate_abs<15>();
  check_negate_abs<31>();
}

template <int F>
void check_multiply_corners() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  ROTORQ_CHECK_EQ((Q::min() * Q::min()).raw(), limits<F>::max);   // +1 is not representable
  ROTORQ_CHECK_EQ((Q::min() * Q::max()).raw(), -limits<F>::max);  // exact: -(1 - 2^-F)
  ROTORQ_CHECK_EQ((Q::max() * Q::max()).raw(), limits<F>::max - 1);
  // ties round toward +infinity: 1 LSB * 1/2 is +1/2 LSB -> 1, -1 LSB * 1/2 is -1/2 LSB -> 0
  const Q half = Q::from_raw(static_cast<typename Q::raw_type>(int64_t{1} << (F - 1)));
  ROTORQ_CHECK_EQ((Q::from_raw(1) * half).raw(), 1);
  ROTORQ_CHECK_EQ((Q::from_raw(-1) * half).raw(), 0);
  Q x = Q::min();
  x *= Q::min();
  ROTORQ_CHECK_EQ(x.raw(), limits<F>::max);
}
inline void F4_MultiplyOfMinusOneCornersSaturatesAndTiesRoundUp() {
  ROTORQ_SCOPE("contract row F4: a * b, *=");
  check_multiply_corners<15>();
  check_multiply_corners<31>();
}

template <int F>
void check_mul_add_corners() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  ROTORQ_CHECK_EQ(mul_add(Q::min(), Q::min(), Q::zero()).raw(), limits<F>::max);
  ROTORQ_CHECK_EQ(mul_add(Q::min(), Q::min(), Q::max()).raw(), limits<F>::max);
  // (-1)(-1) + (-1) = 0 exactly: the product is not saturated before the sum (one rounding)
  ROTORQ_CHECK_EQ(mul_add(Q::min(), Q::min(), Q::min()).raw(), 0);
  ROTORQ_CHECK_EQ(mul_add(Q::min(), Q::max(), Q::min()).raw(), limits<F>::min);
}
inline void F5_MulAddSaturatesOnlyAtTheEnd() {
  ROTORQ_SCOPE("contract row F5: mul_add(a, b, c)");
  check_mul_add_corners<15>();
  check_mul_add_corners<31>();
}

inline void F6_FormatConversionsSaturateAtTheTop() {
  ROTORQ_SCOPE("contract row F6: to_q31(q15), to_q15(q31)");
  ROTORQ_CHECK_EQ(to_q31(q15::min()).raw(), limits<31>::min);
  ROTORQ_CHECK_EQ(to_q31(q15::max()).raw(), 0x7fff0000);
  // q31 max is 1 - 2^-31: nearest q15 is 1, not representable, so max
  ROTORQ_CHECK_EQ(to_q15(q31::max()).raw(), limits<15>::max);
  ROTORQ_CHECK_EQ(to_q15(q31::min()).raw(), limits<15>::min);
  ROTORQ_CHECK_EQ(to_q15(q31::from_raw(0x7fff7fff)).raw(), 0x7fff);  // below the tie
  ROTORQ_CHECK_EQ(to_q15(q31::from_raw(-0x8000)).raw(), 0);          // tie, rounds up
}

inline void K1_ConstantsOfOneOrMoreSaturate() {
  ROTORQ_SCOPE("contract row K1: constant<Q>(q62)");
  const uint64_t one = uint64_t{1} << 62;
  ROTORQ_CHECK_EQ(constant<q15>(one).raw(), limits<15>::max);
  ROTORQ_CHECK_EQ(constant<q31>(one).raw(), limits<31>::max);
  ROTORQ_CHECK_EQ(constant<q31>(~uint64_t{0}).raw(), limits<31>::max);
  ROTORQ_CHECK_EQ(constant<q15>(~uint64_t{0}).raw(), limits<15>::max);
  ROTORQ_CHECK_EQ(constant<q15>(one / 2).raw(), 0x4000);  // in range: exact
}

// ---- accumulator.hpp -------------------------------------------------------------------------------

inline void A1_AccumulatorSumsPast2To63AndBackExactly() {
  ROTORQ_SCOPE("contract row A1: accumulator mac / msc / add beyond the 64-bit range");
  // q31: (-1)(-1) = 2^62 at 62 fraction bits; four of them are 2^64, a full wrap of the int64 part
  accumulator<q31> acc;
  for (int k = 0; k < 4; ++k) acc.mac(q31::min(), q31::min());
  ROTORQ_CHECK_EQ(acc.result().raw(), limits<31>::max);  // +4, saturated, not 0
  for (int k = 0; k < 7; ++k) acc.msc(q31::min(), q31::min());
  ROTORQ_CHECK_EQ(acc.result().raw(), limits<31>::min);  // -3, saturated
  for (int k = 0; k < 3; ++k) acc.add(q31::max());
  acc.add(q31::from_raw(3));  // 3 (1 - 2^-31) + 3 LSB = 3 exactly: the sum is back at zero
  ROTORQ_CHECK_EQ(acc.result().raw(), 0);
  acc.mac(q31::from_raw(1), q31::from_raw(1 << 30));  // + 1/2 LSB: a tie, rounds up
  ROTORQ_CHECK_EQ(acc.result().raw(), 1);
  acc.clear();
  ROTORQ_CHECK_EQ(acc.result().raw(), 0);
}

inline void A2_AccumulatorResultSaturatesWithTheSignOfTheSum() {
  ROTORQ_SCOPE("contract row A2: accumulator result() out of range");
  accumulator<q15> acc;
  acc.mac(q15::min(), q15::min());
  acc.mac(q15::min(), q15::min());
  ROTORQ_CHECK_EQ(acc.result().raw(), limits<15>::max);
  acc.msc(q15::max(), q15::min());  // 2 + (1 - 2^-15): still above
  ROTORQ_CHECK_EQ(acc.result().raw(), limits<15>::max);
  for (int k = 0; k < 6; ++k) acc.msc(q15::min(), q15::min());  // 3 - 2^-15 - 6
  ROTORQ_CHECK_EQ(acc.result().raw(), limits<15>::min);
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
  ROTORQ_CHECK_EQ(reversed.result().raw(), -2);
}

// ---- turn.hpp --------------------------------------------------------------------------------------

inline void T1_TurnArithmeticWrapsAround() {
  ROTORQ_SCOPE("contract row T1: turn + - and unary -");
  ROTORQ_CHECK_EQ((turn16::from_raw(0xffff) + turn16::from_raw(1)).raw(), 0);
  ROTORQ_CHECK_EQ((turn16::from_raw(0) - turn16::from_raw(1)).raw(), 0xffff);
  ROTORQ_CHECK_EQ((-turn16::from_raw(0x8000)).raw(), 0x8000);
  ROTORQ_CHECK_EQ((-turn16::from_raw(1)).raw(), 0xffff);
  ROTORQ_CHECK_EQ((turn32::from_raw(0xffffffffu) + turn32::from_raw(2)).raw(), 1);
  ROTORQ_CHECK_EQ((turn32::from_raw(0) - turn32::from_raw(0x80000000u)).raw(), 0x80000000u);
  turn32 t = turn32::from_raw(0xc0000000u);
  t += turn32::from_raw(0x40000000u);
  ROTORQ_CHECK_EQ(t.raw(), 0);
  t -= turn32::from_raw(1);
  ROTORQ_CHECK_EQ(t.raw(), 0xffffffffu);
}

inline void T2_SignedDifferenceTakesTheShortWayAndHalfATurnIsNegative() {
  ROTORQ_SCOPE("contract row T2: signed_difference");
  ROTORQ_CHECK_EQ(signed_difference(turn16::from_raw(0), turn16::from_raw(0xffff)), 1);
  ROTORQ_CHECK_EQ(signed_difference(turn16::from_raw(0xffff), turn16::from_raw(0)), -1);
  ROTORQ_CHECK_EQ(signed_difference(turn16::from_raw(0x8000), turn16::from_raw(0)), -32768);
  ROTORQ_CHECK_EQ(signed_difference(turn16::from_raw(0), turn16::from_raw(0x8000)), -32768);
  ROTORQ_CHECK_EQ(signed_difference(turn16::from_raw(0x7fff), turn16::from_raw(0)), 32767);
  ROTORQ_CHECK_EQ(signed_difference(turn32::from_raw(0x80000000u), turn32::from_raw(0)), INT32_MIN);
  ROTORQ_CHECK_EQ(signed_difference(turn32::from_raw(5), turn32::from_raw(0xfffffffbu)), 10);
}

inline void T3_AdvanceWrapsForAnyStepCount() {
  ROTORQ_SCOPE("contract row T3: advance");
  ROTORQ_CHECK_EQ(advance(turn16::from_raw(0xffff), int16_t{1}).raw(), 0);
  ROTORQ_CHECK_EQ(advance(turn16::from_raw(0), int16_t{-32768}).raw(), 0x8000);
  ROTORQ_CHECK_EQ(advance(turn16::from_raw(0x8000), int16_t{-32768}).raw(), 0);
  ROTORQ_CHECK_EQ(advance(turn32::from_raw(1), INT32_MIN).raw(), 0x80000001u);
  ROTORQ_CHECK_EQ(advance(turn32::from_raw(0x7fffffffu), INT32_MAX).raw(), 0xfffffffeu);
}

inline void T4_NarrowingAnAngleRoundsModuloOneTurn() {
  ROTORQ_SCOPE("contract row T4: to_turn32, to_turn16");
  ROTORQ_CHECK_EQ(to_turn16(turn32::from_raw(0xffff8000u)).raw(), 0);  // tie, up, wraps
  ROTORQ_CHECK_EQ(to_turn16(turn32::from_raw(0xffff7fffu)).raw(), 0xffff);
  ROTORQ_CHECK_EQ(to_turn16(turn32::from_raw(0x00008000u)).raw(), 1);
  ROTORQ_CHECK_EQ(to_turn32(turn16::from_raw(0xffff)).raw(), 0xffff0000u);
}

// ---- sin_cos.hpp -----------------------------------------------------------------------------------

inline void S1_SinCosQ15SaturatesThePeakAndReachesMinusOne() {
  ROTORQ_SCOPE("contract row S1: sin_cos(turn16) at the quadrant angles and the ends of the range");
  const struct {
    uint16_t angle;
    int64_t sin, cos;
  } cases[] = {{0x0000, 0, 32767}, {0x4000, 32767, 0}, {0x8000, 0, -32768}, {0xc000, -32768, 0}};
  for (const auto& c : cases) {
    ROTORQ_SCOPE_VALUE("angle", c.angle);
    const sin_cos_pair<q15> got = sin_cos(turn16::from_raw(c.angle));
    ROTORQ_CHECK_EQ(got.sin.raw(), c.sin);
    ROTORQ_CHECK_EQ(got.cos.raw(), c.cos);
  }
  // one step either side of the top: exact 1 - 2.3e-9, saturated to max (the <= 1 LSB case)
  ROTORQ_CHECK_EQ(sin_cos(turn16::from_raw(0x3fff)).sin.raw(), 32767);
  ROTORQ_CHECK_EQ(sin_cos(turn16::from_raw(0x4001)).sin.raw(), 32767);
  ROTORQ_CHECK_EQ(sin_cos(turn16::from_raw(0xffff)).cos.raw(), 32767);
}

inline void S2_SinCosQ31SaturatesThePeakAndReachesMinusOne() {
  ROTORQ_SCOPE("contract row S2: sin_cos(turn32) at the quadrant angles and the ends of the range");
  const struct {
    uint32_t angle;
    int64_t sin, cos;
  } cases[] = {{0x00000000u, 0, limits<31>::max},
               {0x40000000u, limits<31>::max, 0},
               {0x80000000u, 0, limits<31>::min},
               {0xc0000000u, limits<31>::min, 0}};
  for (const auto& c : cases) {
    ROTORQ_SCOPE_VALUE("angle", c.angle);
    const sin_cos_pair<q31> got = sin_cos(turn32::from_raw(c.angle));
    ROTORQ_CHECK_EQ(got.sin.raw(), c.sin);
    ROTORQ_CHECK_EQ(got.cos.raw(), c.cos);
  }
  // the last step of the turn: cos(2 pi 2^-32) = 1 - 2e-18, max; sin is -2 pi 2^-32 = -3.14 LSB,
  // within the 2 LSB bound of -3 or -4
  const sin_cos_pair<q31> last = sin_cos(turn32::from_raw(0xffffffffu));
  ROTORQ_CHECK_EQ(last.cos.raw(), limits<31>::max);
  // |raw + 3.14159| <= 2, in units of 10^-5 LSB, so without floating point
  ROTORQ_SCOPE_VALUE("sin", last.sin.raw());
  ROTORQ_CHECK_LE(magnitude(int64_t{last.sin.raw()} * 100000 + 314159), 200000u);
}

// ---- clarke.hpp ------------------------------------------------------------------------------------

// Unbalanced full-scale phase currents (a broken sensor, a phase stuck at a rail): every output
// whose exact value is out of range saturates with the sign of the exact value.
template <int F>
void check_unbalanced_clarke() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  const int64_t max = limits<F>::max, min = limits<F>::min;
  const stationary<Q> s = clarke(phases<Q>{Q::max(), Q::min(), Q::min()});  // alpha = 4/3 - ...
  ROTORQ_CHECK_EQ(s.alpha.raw(), max);
  ROTORQ_CHECK_EQ(s.beta.raw(), 0);  // b == c: exactly zero
  const stationary<Q> t = clarke(phases<Q>{Q::min(), Q::max(), Q::max()});
  ROTORQ_CHECK_EQ(t.alpha.raw(), min);
  const stationary<Q> u = clarke(phases<Q>{Q::zero(), Q::max(), Q::min()});  // beta = 2/sqrt(3)
  ROTORQ_CHECK_EQ(u.beta.raw(), max);
  ROTORQ_CHECK_EQ(u.alpha.raw(), 0);  // (0 - (1 - 2^-F) + 1) / 3 = 2^-F / 3 -> 0
  const stationary<Q> v = clarke(phases<Q>{Q::zero(), Q::min(), Q::max()});
  ROTORQ_CHECK_EQ(v.beta.raw(), min);
  // all three at -1: a common-mode offset, removed; alpha = beta = 0
  const stationary<Q> w = clarke(phases<Q>{Q::min(), Q::min(), Q::min()});
  ROTORQ_CHECK_EQ(w.alpha.raw(), 0);
  ROTORQ_CHECK_EQ(w.beta.raw(), 0);
}
inline void C1_ClarkeOfUnbalancedFullScaleCurrentsSaturates() {
  ROTORQ_SCOPE("contract row C1: clarke");
  check_unbalanced_clarke<15>();
  check_unbalanced_clarke<31>();
}

template <int F>
void check_clarke_balanced_out_of_range() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  // beta = (a + 2b) / sqrt(3): 3 / sqrt(3) = 1.73 for a = b = 1, i.e. c = -2 (not a balanced set)
  const stationary<Q> s = clarke_balanced(Q::max(), Q::max());
  ROTORQ_CHECK_EQ(s.alpha.raw(), limits<F>::max);
  ROTORQ_CHECK_EQ(s.beta.raw(), limits<F>::max);
  const stationary<Q> t = clarke_balanced(Q::min(), Q::min());
  ROTORQ_CHECK_EQ(t.alpha.raw(), limits<F>::min);
  ROTORQ_CHECK_EQ(t.beta.raw(), limits<F>::min);
  // a = -1, b = 1 - 2^-F: (1 - 2^(1-F)) / sqrt(3), in range, not saturated
  const stationary<Q> u = clarke_balanced(Q::min(), Q::max());
  ROTORQ_CHECK_GT(u.beta.raw(), limits<F>::max / 2);
  ROTORQ_CHECK_LT(u.beta.raw(), limits<F>::max * 6 / 10);
}
inline void C2_ClarkeBalancedOfAnImpossiblePairSaturates() {
  ROTORQ_SCOPE("contract row C2: clarke_balanced");
  check_clarke_balanced_out_of_range<15>();
  check_clarke_balanced_out_of_range<31>();
}

template <int F>
void check_inverse_clarke_out_of_range() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  // b = 1/2 + sqrt(3)/2 = 1.37 for alpha = -1, beta = 1
  const phases<Q> p = inverse_clarke(stationary<Q>{Q::min(), Q::max()});
  ROTORQ_CHECK_EQ(p.a.raw(), limits<F>::min);
  ROTORQ_CHECK_EQ(p.b.raw(), limits<F>::max);
  ROTORQ_CHECK_LT(p.c.raw(), 0);  // 1/2 - sqrt(3)/2 (1 - 2^-F) = -0.366: in range
  ROTORQ_CHECK_GT(p.c.raw(), -limits<F>::max / 2);
  const phases<Q> q = inverse_clarke(stationary<Q>{Q::max(), Q::max()});
  ROTORQ_CHECK_EQ(q.c.raw(), limits<F>::min);  // -1/2 - sqrt(3)/2 = -1.37
}
inline void C3_InverseClarkeOfALongVectorSaturates() {
  ROTORQ_SCOPE("contract row C3: inverse_clarke");
  check_inverse_clarke_out_of_range<15>();
  check_inverse_clarke_out_of_range<31>();
}

template <int F>
void check_power_invariant_out_of_range() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  // alpha = (2a - b - c) / sqrt(6) = 4 / sqrt(6) = 1.63, beta = (b - c) / sqrt(2) = 1.41
  const stationary<Q> s = clarke_power_invariant(phases<Q>{Q::max(), Q::min(), Q::min()});
  ROTORQ_CHECK_EQ(s.alpha.raw(), limits<F>::max);
  const stationary<Q> t = clarke_power_invariant(phases<Q>{Q::zero(), Q::min(), Q::max()});
  ROTORQ_CHECK_EQ(t.beta.raw(), limits<F>::min);
  // a = sqrt(2/3) alpha: in range for every alpha; c = -alpha/sqrt(6) - beta/sqrt(2) = 1.12 here
  const phases<Q> p = inverse_clarke_power_invariant(stationary<Q>{Q::min(), Q::min()});
  ROTORQ_CHECK_EQ(p.c.raw(), limits<F>::max);
  ROTORQ_CHECK_GT(p.a.raw(), limits<F>::min);
  const phases<Q> q = inverse_clarke_power_invariant(stationary<Q>{Q::min(), Q::max()});
  ROTORQ_CHECK_EQ(q.b.raw(), limits<F>::max);
}
inline void C4_PowerInvariantClarkeOutOfRangeSaturates() {
  ROTORQ_SCOPE("contract rows C4, C5: clarke_power_invariant, inverse_clarke_power_invariant");
  check_power_invariant_out_of_range<15>();
  check_power_invariant_out_of_range<31>();
}

// ---- park.hpp --------------------------------------------------------------------------------------

// Malformed sine/cosine pairs (not on the unit circle: uninitialised, (0, 0), (-1, -1)) are used as
// given; the result is the correctly rounded product, saturated.
template <int F>
void check_malformed_pairs() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  const int64_t max = limits<F>::max;
  // (-1, -1): |pair| = sqrt(2); d = alpha cos + beta sin = 2 for alpha = beta = -1
  const sin_cos_pair<Q> corner{Q::min(), Q::min()};
  const rotating<Q> r = park(stationary<Q>{Q::min(), Q::min()}, corner);
  ROTORQ_CHECK_EQ(r.d.raw(), max);
  ROTORQ_CHECK_EQ(r.q.raw(), 0);  // beta cos - alpha sin = 1 - 1
  const stationary<Q> s = inverse_park(rotating<Q>{Q::min(), Q::max()}, corner);
  ROTORQ_CHECK_EQ(s.alpha.raw(), max);  // d cos - q sin = 1 + (1 - 2^-F)
  ROTORQ_CHECK_EQ(s.beta.raw(), 1);     // d sin + q cos = 1 - (1 - 2^-F) = 2^-F, exactly
  // (max, max) with a full-scale vector: 2 (1 - 2^-F)^2 saturates
  const sin_cos_pair<Q> top{Q::max(), Q::max()};
  ROTORQ_CHECK_EQ(park(stationary<Q>{Q::max(), Q::max()}, top).d.raw(), max);
  ROTORQ_CHECK_EQ(inverse_park(rotating<Q>{Q::max(), Q::min()}, top).alpha.raw(), max);
  ROTORQ_CHECK_EQ(inverse_park(rotating<Q>{Q::min(), Q::min()}, top).beta.raw(), limits<F>::min);
  // (0, 0): everything is zero, nothing undefined
  const rotating<Q> z = park(stationary<Q>{Q::min(), Q::max()}, sin_cos_pair<Q>{});
  ROTORQ_CHECK_EQ(z.d.raw(), 0);
  ROTORQ_CHECK_EQ(z.q.raw(), 0);
}
inline void P1_ParkWithMalformedPairsSaturates() {
  ROTORQ_SCOPE("contract rows P1, P2: park, inverse_park with a malformed sin_cos_pair");
  check_malformed_pairs<15>();
  check_malformed_pairs<31>();
}

// ---- svpwm.hpp, voltage_limit.hpp, dc_bus.hpp, pwm_compare.hpp ------------------------------------

template <int F>
void check_svpwm_malformed() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  const Q minus_one_raw = Q::from_raw(-1);
  const overmodulation modes[] = {overmodulation::circle, overmodulation::hexagon};
  for (const overmodulation mode : modes) {
    ROTORQ_SCOPE(mode == overmodulation::circle ? "circle" : "hexagon");
    // full scale (-1, -1), 225 degrees: far beyond the hexagon, limited, duties inside [0, max]
    const modulation<Q> full = svpwm(stationary<Q>{Q::min(), Q::min()}, mode);
    ROTORQ_CHECK(full.limited);
    ROTORQ_CHECK_EQ(full.sector, 4);  // [180, 240) degrees
    const Q full_duties[] = {full.duty.a, full.duty.b, full.duty.c};
    for (const Q d : full_duties) ROTORQ_CHECK_GE(d.raw(), 0);
    // (-1 raw, -1 raw): a tiny vector, linear, centred duties, sector of 225 degrees
    const modulation<Q> tiny = svpwm(stationary<Q>{minus_one_raw, minus_one_raw}, mode);
    ROTORQ_CHECK_FALSE(tiny.limited);
    ROTORQ_CHECK_EQ(tiny.sector, 4);
    {
      ROTORQ_SCOPE_VALUE("duty a", tiny.duty.a.raw());
      ROTORQ_CHECK_LE(magnitude(int64_t{tiny.duty.a.raw()} - (limits<F>::max + 1) / 2), 2u);
    }
    // the zero vector: all duties 1/2, sector 1
    const modulation<Q> zero = svpwm(stationary<Q>{}, mode);
    ROTORQ_CHECK_EQ(zero.duty.a.raw(), (limits<F>::max + 1) / 2);
    ROTORQ_CHECK_EQ(zero.sector, 1);
    ROTORQ_CHECK_FALSE(zero.limited);
  }
  // sine PWM at full scale clamps; six-step of the zero vector has every phase on (v_x >= 0)
  const modulation<Q> sine = sine_pwm(stationary<Q>{Q::max(), Q::zero()});
  ROTORQ_CHECK(sine.limited);
  ROTORQ_CHECK_EQ(sine.duty.a.raw(), limits<F>::max);
  const modulation<Q> six = six_step(stationary<Q>{});
  ROTORQ_CHECK_EQ(six.duty.b.raw(), limits<F>::max);
  ROTORQ_CHECK_EQ(six.sector, 1);
  const modulation<Q> six_full = six_step(stationary<Q>{Q::min(), Q::min()});
  ROTORQ_CHECK_FALSE(six_full.limited);
  ROTORQ_CHECK_EQ(six_full.sector, 5);  // nearest active vector to 225 degrees: V5 at 240 (001)
}
inline void M1_SvpwmOfMalformedRequestsStaysInsideInBothModes() {
  ROTORQ_SCOPE("contract rows M1, M2, M3: svpwm, sine_pwm, six_step");
  check_svpwm_malformed<15>();
  check_svpwm_malformed<31>();
}

template <int F>
void check_negative_limits() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  const Q minus = Q::from_raw(-5);
  const limited<stationary<Q>> s = limit_magnitude(stationary<Q>{Q::max(), Q::min()}, minus);
  ROTORQ_CHECK(s.clipped);
  ROTORQ_CHECK_EQ(s.value.alpha.raw(), 0);
  ROTORQ_CHECK_EQ(s.value.beta.raw(), 0);
  ROTORQ_CHECK_FALSE(limit_magnitude(stationary<Q>{}, minus).clipped);  // |0| is not above 0
  const limited<rotating<Q>> r = limit_magnitude(rotating<Q>{Q::min(), Q::min()}, Q::max());
  ROTORQ_CHECK(r.clipped);  // |(-1, -1)| = sqrt(2): scaled onto the limit
  {
    ROTORQ_SCOPE_VALUE("d", r.value.d.raw());
    ROTORQ_CHECK_LE(magnitude(r.value.d.raw() + max_over_sqrt2<F>), F == 15 ? 1u : 8u);  // -1/sqrt(2)
  }
  const limited<rotating<Q>> d = limit_d_priority(rotating<Q>{Q::min(), Q::max()}, minus);
  ROTORQ_CHECK(d.clipped);
  ROTORQ_CHECK_EQ(d.value.d.raw(), 0);
  ROTORQ_CHECK_EQ(d.value.q.raw(), 0);
  const limited<rotating<Q>> full = limit_d_priority(rotating<Q>{Q::min(), Q::max()}, Q::max());
  ROTORQ_CHECK_EQ(full.value.d.raw(), -limits<F>::max);  // d first, clamped to -m
  ROTORQ_CHECK_LE(magnitude(int64_t{full.value.q.raw()}), F == 15 ? 256u : 65536u);
}
inline void L1_LimitersTreatANegativeLimitAsZero() {
  ROTORQ_SCOPE("contract rows L1, L2: limit_magnitude, limit_d_priority");
  check_negative_limits<15>();
  check_negative_limits<31>();
}

template <int F>
void check_bad_bus() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  bus_normalizer<Q> bus(Q::from_raw(100));
  ROTORQ_CHECK_FALSE(bus.valid());
  ROTORQ_CHECK_EQ(bus.normalize(Q::max()).raw(), 0);  // before the first update
  const int64_t bad_buses[] = {0, -1, limits<F>::min, 100};
  for (const int64_t raw : bad_buses) {
    ROTORQ_SCOPE_VALUE("bus", raw);
    ROTORQ_CHECK_FALSE(bus.update(Q::from_raw(static_cast<typename Q::raw_type>(raw))));
    ROTORQ_CHECK_EQ(bus.normalize(Q::max()).raw(), 0);
  }
  ROTORQ_CHECK(bus.update(Q::from_raw(101)));                               // just above the minimum
  ROTORQ_CHECK_EQ(bus.normalize(Q::from_raw(1000)).raw(), limits<F>::max);  // above the bus: saturate
  ROTORQ_CHECK_EQ(bus.normalize(Q::min()).raw(), limits<F>::min);
  bus_normalizer<Q> any(Q::from_raw(-7));  // a minimum <= 0 counts as one raw step
  ROTORQ_CHECK_FALSE(any.update(Q::from_raw(1)));
  ROTORQ_CHECK(any.update(Q::from_raw(2)));
  ROTORQ_CHECK_EQ(any.normalize(Q::from_raw(1)).raw(), limits<F>::max / 2 + 1);  // 1/2, rounded up
}
inline void B1_BusAtOrBelowItsMinimumGivesZero() {
  ROTORQ_SCOPE("contract row B1: bus_normalizer");
  check_bad_bus<15>();
  check_bad_bus<31>();
}

template <int F>
void check_bad_periods() {
  ROTORQ_SCOPE(format_name<F>);
  using Q = fixed<F>;
  const phases<Q> duty{Q::max(), Q::min(), Q::from_raw(1)};
  const compare_values none = duty_to_compare(duty, 0, 5);
  ROTORQ_CHECK_EQ(none.compare.a, 0u);
  ROTORQ_CHECK_EQ(none.compare.b, 0u);
  ROTORQ_CHECK_FALSE(none.clipped);
  const compare_values one = duty_to_compare(duty, 1, 1000);  // min_pulse capped to period / 2 = 0
  ROTORQ_CHECK_EQ(one.compare.a, 1u);
  ROTORQ_CHECK_EQ(one.compare.b, 0u);  // a negative duty counts as 0
  ROTORQ_CHECK_FALSE(one.clipped);
  // oversized minimum pulse: capped to period / 2 = 50; 1/4 duty (25) widens to 50, 10 % goes to 0
  const phases<Q> small{Q::from_raw(static_cast<typename Q::raw_type>((limits<F>::max + 1) / 4)),
                        Q::from_raw(static_cast<typename Q::raw_type>((limits<F>::max + 1) / 10)), Q::max()};
  const compare_values capped = duty_to_compare(small, 100, 0xffffffffu);
  ROTORQ_CHECK_EQ(capped.compare.a, 50u);
  ROTORQ_CHECK_EQ(capped.compare.b, 0u);
  ROTORQ_CHECK_EQ(capped.compare.c, 100u);
  ROTORQ_CHECK(capped.clipped);
  ROTORQ_CHECK_EQ(duty_to_compare(phases<Q>{Q::max(), Q::max(), Q::max()}, 0xffffffffu).compare.a,
                  F == 15 ? 0xfffdffffu : 0xfffffffdu);  // round((1 - 2^-F) period)
}
inline void W1_PeriodZeroOrOneAndOversizedMinimumPulses() {
  ROTORQ_SCOPE("contract row W1: duty_to_compare");
  check_bad_periods<15>();
  check_bad_periods<31>();
}

inline uint32_t distance_steps(turn32 a, turn32 b) {
  const int32_t d = signed_difference(a, b);
  return d < 0 ? 0u - static_cast<uint32_t>(d) : static_cast<uint32_t>(d);
}

// ---- hall.hpp, hall_tracker.hpp, angle_interpolator.hpp, electrical_speed.hpp, commutation.hpp --------

inline void R1_ImpossibleHallCodesAreInvalid() {
  ROTORQ_SCOPE("contract row R1: decode_hall, hall_code");
  const uint8_t impossible[] = {0, 7, 0xf8, 0xff};
  for (const uint8_t code : impossible) {
    ROTORQ_SCOPE_VALUE("code", code);
    ROTORQ_CHECK_FALSE(decode_hall(code).valid);
    ROTORQ_CHECK_EQ(decode_hall(code).sector, 0);
  }
  ROTORQ_CHECK_FALSE(decode_hall(0b010, hall_placement::spaced_60).valid);
  ROTORQ_CHECK_FALSE(decode_hall(0b101, hall_placement::spaced_60).valid);
  ROTORQ_CHECK_EQ(decode_hall(0b11111101).sector, 0);  // bits above 2 ignored: 0b101
  ROTORQ_CHECK_EQ(hall_code(6), hall_code(0));         // sector taken modulo 6
  ROTORQ_CHECK_EQ(hall_code(255), hall_code(3));
}

inline void R2_GlitchFilterDropsBouncesAndSurvivesTimerWrap() {
  ROTORQ_SCOPE("contract row R2: hall_glitch_filter");
  hall_glitch_filter<16> filter(10);
  ROTORQ_CHECK_FALSE(filter.update(1, 0).happened);
  const hall_edge<16> first = filter.update(1, 10);
  ROTORQ_CHECK(first.happened);
  ROTORQ_CHECK_EQ(first.time, 0);                     // dated at its first reading
  ROTORQ_CHECK_FALSE(filter.update(2, 20).happened);  // a bounce ...
  ROTORQ_CHECK_FALSE(filter.update(1, 22).happened);  // ... that came back: forgotten
  ROTORQ_CHECK_FALSE(filter.update(2, 25).happened);
  ROTORQ_CHECK_FALSE(filter.update(2, 34).happened);  // held 9 < 10
  const hall_edge<16> second = filter.update(2, 35);
  ROTORQ_CHECK(second.happened);
  ROTORQ_CHECK_EQ(second.time, 25);
  // the 16-bit timer wraps between first reading and confirmation
  ROTORQ_CHECK_FALSE(filter.update(3, 65530).happened);
  const hall_edge<16> wrapped = filter.update(3, 4);
  ROTORQ_CHECK(wrapped.happened);
  ROTORQ_CHECK_EQ(wrapped.time, 65530);
  ROTORQ_CHECK_EQ(hall_glitch_filter<16>(0xffffffffu).min_dwell(), 32767u);  // capped below half the range
}

// the 120-degree code of sector s
constexpr uint8_t code_of(uint8_t s) { return hall_code(s); }

inline void R3_HallTrackerInvalidCodesStallReversalAndBackwardJump() {
  ROTORQ_SCOPE("contract row R3: hall_tracker");
  hall_tracker_config config{};
  config.stall_timeout = 5000;
  hall_tracker<32> tracker(config);
  ROTORQ_CHECK_EQ(tracker.estimate(0).source, angle_source::none);
  for (uint8_t s = 0; s < 4; ++s) tracker.update(code_of(s), uint32_t{s} * 1000);
  hall_estimate e = tracker.estimate(3500);
  ROTORQ_CHECK_EQ(e.source, angle_source::interpolated);
  ROTORQ_CHECK_EQ(e.direction, rotation::forward);
  {
    ROTORQ_SCOPE_VALUE("angle", e.angle.raw());
    ROTORQ_CHECK_LE(distance_steps(e.angle, turn32::from_raw(turn32_210_degrees)), 64u);
  }
  tracker.update(0b000, 3600);  // invalid: the sector is held, and counted
  tracker.update(0b111, 3700);
  e = tracker.estimate(3700);
  ROTORQ_CHECK(e.invalid_code);
  ROTORQ_CHECK_EQ(e.sector, 3);
  ROTORQ_CHECK_EQ(tracker.invalid_codes(), 2u);
  // stall: no edge for stall_timeout ticks
  tracker.update(code_of(3), 8000);
  e = tracker.estimate(8000);
  ROTORQ_CHECK(e.stalled);
  ROTORQ_CHECK_EQ(e.speed.raw(), 0);
  ROTORQ_CHECK_EQ(e.source, angle_source::sector_centre);
  ROTORQ_CHECK_EQ(e.angle.raw(),
                  config.calibration.entry_forward[4].raw());  // held where it was (at the next edge) ...
  tracker.update(code_of(3), 8001);
  ROTORQ_CHECK_EQ(tracker.estimate(8001).angle.raw(),
                  sector_centre(config.calibration, 3).raw());  // ... then slewed
  // reversal: back into sector 2; no speed yet, the angle goes to its centre
  tracker.update(code_of(2), 8500);
  e = tracker.estimate(8600);
  ROTORQ_CHECK_EQ(e.direction, rotation::backward);
  ROTORQ_CHECK_EQ(e.source, angle_source::sector_centre);
  ROTORQ_CHECK_EQ(e.angle.raw(), sector_centre(config.calibration, 2).raw());
  ROTORQ_CHECK_FALSE(e.stalled);
}

inline void R3_HallTrackerBackwardJumpIsLimited() {
  ROTORQ_SCOPE("contract row R3: hall_tracker, max_backward_jump");
  // a table whose edge into sector 2 (70 degrees) lies 27.5 degrees behind the centre of sector 1
  // (97.5 degrees, moved by an edge from 2 into 1 at 200 degrees)
  hall_tracker_config config{};
  config.calibration.entry_forward[2] = turn32::from_raw(turn32_70_degrees);
  config.calibration.entry_backward[1] = turn32::from_raw(turn32_200_degrees);
  config.max_backward_jump = turn32::from_raw(0x0e38e38e);  // 20 degrees
  const turn32 centre = sector_centre(config.calibration, 1);
  const turn32 jumps[] = {config.max_backward_jump, turn32::from_raw(turn32_90_degrees)};
  for (const turn32 jump : jumps) {
    ROTORQ_SCOPE_VALUE("jump", jump.raw());
    config.max_backward_jump = jump;
    hall_tracker<32> tracker(config);
    for (uint8_t s = 0; s < 3; ++s) tracker.update(code_of(s), uint32_t{s} * 1000);
    const hall_estimate e = tracker.estimate(2000);
    ROTORQ_CHECK_EQ(e.source, angle_source::interpolated);
    const turn32 expected = jump.raw() == 0x0e38e38e ? centre - jump : config.calibration.entry_forward[2];
    ROTORQ_CHECK_EQ(e.angle.raw(), expected.raw());
  }
}

inline void R4_AngleInterpolatorBeforeSamplesSameTimeAndStale() {
  ROTORQ_SCOPE("contract row R4: angle_interpolator");
  angle_interpolator<16> position(100);
  ROTORQ_CHECK_FALSE(position.estimate(5).valid);
  ROTORQ_CHECK_EQ(position.angle(5).raw(), 0u);
  position.update(turn32::from_raw(0), 0);
  position.update(turn32::from_raw(1000), 10);  // 100 steps per tick
  position.update(turn32::from_raw(3000), 10);  // same timestamp: the speed is kept
  ROTORQ_CHECK_EQ(position.estimate(20).angle.raw(), 4000u);
  const interpolated_angle stale = position.estimate(10 + 500);
  ROTORQ_CHECK(stale.stale);
  ROTORQ_CHECK_EQ(stale.angle.raw(), 13000u);                               // stops at max_extrapolation
  position.update(turn32::from_raw(0), static_cast<uint16_t>(10 + 40000));  // half the range or more apart
  ROTORQ_CHECK_EQ(position.estimate(static_cast<uint16_t>(10 + 40000)).speed.raw(), 0);
}

inline void R5_SpeedFromZeroTicksAndHugeMotion() {
  ROTORQ_SCOPE("contract rows R5, R6: speed_from_motion, steps_at, rpm_scale");
  ROTORQ_CHECK_EQ(speed_from_motion(12345, 0).raw(), 0);
  ROTORQ_CHECK_EQ(speed_from_motion(0, 7).raw(), 0);
  ROTORQ_CHECK_EQ(speed_from_motion(int64_t{1} << 61, 1).raw(), electrical_speed::raw_max);
  ROTORQ_CHECK_EQ(speed_from_motion(-(int64_t{1} << 61), 1).raw(), -electrical_speed::raw_max);
  // the most negative motion of all: its magnitude 2^63 is formed without overflow (found by the
  // target vectors under UBSan), and it saturates like any huge motion
  ROTORQ_CHECK_EQ(speed_from_motion(detail::int64_min, 1).raw(), -electrical_speed::raw_max);
  ROTORQ_CHECK_EQ(speed_from_motion(detail::int64_min, ~uint64_t{0}).raw(), -(int64_t{1} << 16) / 2);
  ROTORQ_CHECK_EQ(electrical_speed::from_raw(detail::int64_min).raw(), -electrical_speed::raw_max);
  ROTORQ_CHECK_EQ(steps_at(electrical_speed::from_raw(-(int64_t{3} << 15)), 3), -4);  // -4.5 toward zero
  ROTORQ_CHECK_EQ(
      rpm_scale(0, 1000).rpm_q8(electrical_speed::from_raw(int64_t{1} << 40)),
      rpm_scale(1, 1000).rpm_q8(electrical_speed::from_raw(int64_t{1} << 40)));  // 0 pairs count as 1
  ROTORQ_CHECK_EQ(rpm_scale(4, 0).rpm_q8(electrical_speed::from_raw(electrical_speed::raw_max)), 0);
  ROTORQ_CHECK_EQ(rpm_scale(1, 0xffffffffu).rpm_q8(electrical_speed::from_raw(electrical_speed::raw_max)),
                  0x7fffffff);
  ROTORQ_CHECK_EQ(rpm_scale(1, 0xffffffffu).rpm_q8(electrical_speed::from_raw(-electrical_speed::raw_max)),
                  -0x7fffffff);
}

inline void R7_CommutationOfUnknownTorqueAndOutOfRangeSectors() {
  ROTORQ_SCOPE("contract row R7: commutation_sector, six_step_commutation, commutation_voltage");
  const commutation_state off = six_step_commutation(2, rotation::unknown);
  ROTORQ_CHECK_FALSE(off.active);
  ROTORQ_CHECK_EQ(off.drive.a, phase_drive::floating);
  ROTORQ_CHECK_EQ(commutation_voltage(off, q15::max()).alpha.raw(), 0);
  ROTORQ_CHECK_EQ(six_step_commutation(7, rotation::forward).vector,
                  six_step_commutation(1, rotation::forward).vector);
  ROTORQ_CHECK_EQ(six_step_commutation(255, rotation::backward).vector,
                  six_step_commutation(3, rotation::backward).vector);
  const commutation_state on = six_step_commutation(0, rotation::forward);
  ROTORQ_CHECK_EQ(commutation_voltage(on, q15::min()).beta.raw(), 0);  // a negative duty counts as 0
  ROTORQ_CHECK_EQ(commutation_sector(turn32::from_raw(0xffffffffu)), 0);
}

inline void R8_HandoverWithUnknownTorqueStaysInSixStep() {
  ROTORQ_SCOPE("contract row R8: foc_handover");
  handover_config config{};
  config.foc_above = electrical_speed::from_raw(1000);
  config.six_step_below = electrical_speed::from_raw(500);
  foc_handover handover(config);
  const turn32 angle = turn32::from_raw(turn32_10_degrees);
  ROTORQ_CHECK_EQ(handover.update(angle, electrical_speed::from_raw(2000), rotation::unknown).mode,
                  drive_mode::six_step);
  const drive_command foc = handover.update(angle, electrical_speed::from_raw(2000), rotation::forward);
  ROTORQ_CHECK_EQ(foc.mode, drive_mode::foc);
  ROTORQ_CHECK_EQ(foc.current_angle.raw(), foc.six_step.vector_angle.raw());  // the switch moves nothing
  const drive_command back = handover.update(angle, electrical_speed::from_raw(2000), rotation::unknown);
  ROTORQ_CHECK_EQ(back.mode, drive_mode::six_step);  // unknown torque drops FOC at once
  ROTORQ_CHECK_FALSE(back.six_step.active);
}

// Contract row G1: every input has a defined result. Inverted limits collapse to
// floor((lo + hi) / 2); a negative symmetric limit counts as 0; negative mantissas count as 0 and
// exponents beyond [-16, 15] as the nearest end; full-scale errors with the largest gain saturate at
// the limits without overflow; the integrator never leaves the limits.
template <int F>
inline void check_pi_regulator() {
  using Q = fixed<F>;
  ROTORQ_SCOPE(F == 15 ? "q15" : "q31");
  // eighths: k / 8 of full scale, exact in both formats
  const auto eighths = [](int k) {
    return Q::from_raw(static_cast<typename Q::raw_type>(k * detail::pow2(F - 3)));
  };
  pi_regulator<Q> r({Q::max(), 1000}, {Q::max(), 1000});
  ROTORQ_CHECK_EQ(r.proportional_gain().exponent, 15);
  ROTORQ_CHECK_EQ(r.integral_gain().exponent, 15);
  for (int k = 0; k < 3; ++k) {
    // error 2 - 2^-F, gain ~ 32768: the proportional term alone saturates, so the integrator holds
    ROTORQ_CHECK_EQ(r.update(Q::max(), Q::min()).raw(), Q::max().raw());
    ROTORQ_CHECK(r.saturated());
    ROTORQ_CHECK_EQ(r.integrator_wide(), 0);
    ROTORQ_CHECK_EQ(r.update(Q::min(), Q::max()).raw(), Q::min().raw());
    ROTORQ_CHECK_EQ(r.integrator_wide(), 0);
  }
  // at the top with a small negative error the increment leads out of saturation: it is taken
  r.preset(Q::max());
  r.update(Q::zero(), Q::from_raw(1));
  ROTORQ_CHECK_LT(r.integrator_wide(), Q::raw_max * 65536);
  ROTORQ_CHECK_FALSE(r.saturated());
  r.set_limits(eighths(4), eighths(-2));  // inverted: both floor((0.5 - 0.25) / 2) = 0.125
  ROTORQ_CHECK_EQ(r.lower_limit().raw(), eighths(1).raw());
  ROTORQ_CHECK_EQ(r.upper_limit().raw(), eighths(1).raw());
  ROTORQ_CHECK_EQ(r.update(Q::min(), Q::max()).raw(), eighths(1).raw());
  ROTORQ_CHECK_EQ(r.integrator().raw(), eighths(1).raw());
  r.set_limits(Q::max(), Q::min());  // floor((max + min) / 2) = floor(-1/2) = -1 raw
  ROTORQ_CHECK_EQ(r.upper_limit().raw(), -1);
  r.set_limit(Q::min());  // negative: counts as 0
  ROTORQ_CHECK_EQ(r.lower_limit().raw(), 0);
  ROTORQ_CHECK_EQ(r.upper_limit().raw(), 0);
  ROTORQ_CHECK_EQ(r.update(Q::max(), Q::min()).raw(), 0);
  r.set_limit(Q::max());
  ROTORQ_CHECK_EQ(r.lower_limit().raw(), -Q::raw_max);
  // limits that exclude zero: the integrator is clamped into them at once, and reset goes to the
  // limit nearest zero
  r.preset(eighths(-6));
  r.set_limits(eighths(2), eighths(4));
  ROTORQ_CHECK_EQ(r.integrator().raw(), eighths(2).raw());
  r.preset(eighths(4));
  r.reset();
  ROTORQ_CHECK_EQ(r.integrator().raw(), eighths(2).raw());
  r.set_limits(eighths(-4), eighths(-1));
  ROTORQ_CHECK_EQ(r.integrator().raw(), eighths(-1).raw());

  pi_regulator<Q> negative({Q::min(), 3}, {eighths(-4), -2});  // negative mantissas: gains 0
  ROTORQ_CHECK_EQ(negative.proportional_gain().mantissa.raw(), 0);
  ROTORQ_CHECK_EQ(negative.update(Q::max(), Q::min()).raw(), 0);
  ROTORQ_CHECK_EQ(negative.integrator_wide(), 0);

  pi_regulator<Q> tiny({Q::from_raw(1), -1000}, {Q::from_raw(1), -1000});  // exponent -> -16
  ROTORQ_CHECK_EQ(tiny.proportional_gain().exponent, -16);
  tiny.update(Q::max(), Q::min());
  // 1 raw x 2^-16 x (2 - 2^-F): about 2^-(F+15) = 2 units of 2^-(F+16)
  ROTORQ_CHECK_EQ(tiny.integrator_wide(), 2);
  ROTORQ_CHECK_EQ(tiny.output().raw(), 0);

  // feedforward at full scale with the output at the other end
  pi_regulator<Q> ff({Q::max(), 15}, {Q::zero(), 0}, Q::min(), Q::max());
  ROTORQ_CHECK_EQ(ff.update(Q::min(), Q::max(), Q::max()).raw(), Q::min().raw());
  ROTORQ_CHECK_EQ(ff.update(Q::zero(), Q::zero(), Q::min()).raw(), Q::min().raw());
  ROTORQ_CHECK_EQ(ff.update(Q::zero(), Q::zero(), Q::max()).raw(), Q::max().raw());
}

inline void G1_PiRegulatorInvertedLimitsHugeGainsFullScaleErrors() {
  ROTORQ_SCOPE("contract row G1: pi_regulator");
  check_pi_regulator<15>();
  check_pi_regulator<31>();
}

}  // namespace rotorq::bad_input
