// Clarke transforms: textbook values and identities, exact integer references, dense q15 grids and
// saturation. (Seeded random sweeps of every output against the double twin are in test_accuracy.)
#include "rotorq/clarke.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <random>
#include <string>

#include "rotorq/host.hpp"
#include "rotorq/ref/clarke.hpp"

namespace {

using rotorq::phases;
using rotorq::q15;
using rotorq::q31;
using rotorq::stationary;

template <typename Q>
std::string hex(Q x) {
  char text[24];
  std::snprintf(text, sizeof text, "0x%llx",
                static_cast<unsigned long long>(static_cast<uint64_t>(x.raw()) &
                                                (Q::fraction_bits == 15 ? 0xffffu : 0xffffffffu)));
  return text;
}

template <typename Q>
double lsb_error(Q got, double exact) {
  const double scaled = std::ldexp(exact, Q::fraction_bits);
  const double target =
      std::fmin(std::fmax(scaled, static_cast<double>(Q::raw_min)), static_cast<double>(Q::raw_max));
  return static_cast<double>(got.raw()) - target;
}

// Correct rounding plus the documented 2^-15 LSB allowance for the constant (clarke.hpp).
constexpr double rounding_bound = 0.5 + 1.0 / 32768.0;

// Textbook check values of the amplitude-invariant transform (IEC 62428:2008; E. Clarke, Circuit
// Analysis of A-C Power Systems, 1943): (1, -1/2, -1/2) -> (1, 0) and (0, sqrt(3)/2, -sqrt(3)/2) -> (0, 1).
TEST(Clarke, TextbookPointsMapToTheAxes) {
  const phases<q31> on_alpha{q31::max(), rotorq::to_q31(-0.5), rotorq::to_q31(-0.5)};
  const stationary<q31> s = rotorq::clarke(on_alpha);
  EXPECT_EQ(s.alpha, q31::max());
  EXPECT_EQ(s.beta.raw(), 0);
  const double h = std::sqrt(3.0) / 2.0;
  const phases<q15> on_beta{q15::zero(), rotorq::to_q15(h), rotorq::to_q15(-h)};
  const stationary<q15> t = rotorq::clarke(on_beta);
  EXPECT_EQ(t.alpha.raw(), 0);
  EXPECT_LE(std::abs(t.beta.raw() - 32767), 1);
}

// A balanced set of amplitude A at angle theta maps to A (cos theta, sin theta) in the
// amplitude-invariant form and to sqrt(3/2) A (cos theta, sin theta) in the power-invariant form
// (both follow from the matrices above; common practice, no separate source).
TEST(Clarke, BalancedSetsBecomeARotatingVectorOfTheRightLength) {
  for (int step = 0; step < 360; ++step) {
    const double theta = step * M_PI / 180.0;
    const double amplitude = 0.75;
    const phases<q31> i{rotorq::to_q31(amplitude * std::cos(theta)),
                        rotorq::to_q31(amplitude * std::cos(theta - 2 * M_PI / 3)),
                        rotorq::to_q31(amplitude * std::cos(theta + 2 * M_PI / 3))};
    const stationary<q31> s = rotorq::clarke(i);
    // input quantisation is 0.5 LSB per phase, so allow 1 LSB after the transform plus its rounding
    EXPECT_LE(std::fabs(lsb_error(s.alpha, amplitude * std::cos(theta))), 1.5) << step;
    EXPECT_LE(std::fabs(lsb_error(s.beta, amplitude * std::sin(theta))), 1.5) << step;
    const stationary<q31> p = rotorq::clarke_power_invariant(i);
    const double k = std::sqrt(1.5) * amplitude;
    EXPECT_LE(std::fabs(lsb_error(p.alpha, k * std::cos(theta))), 1.5) << step;
    EXPECT_LE(std::fabs(lsb_error(p.beta, k * std::sin(theta))), 1.5) << step;
  }
}

// Instantaneous power of a zero-sequence-free set: p = va ia + vb ib + vc ic equals
// 3/2 (v_alpha i_alpha + v_beta i_beta) in the amplitude-invariant form and
// v_alpha i_alpha + v_beta i_beta in the power-invariant one (IEC 62428:2008).
TEST(Clarke, PowerRelationHoldsForTheFixedPointOutputs) {
  std::mt19937_64 rng(62428);
  std::uniform_real_distribution<double> uniform(-0.45, 0.45);
  for (int n = 0; n < 20000; ++n) {
    const q15 va = rotorq::to_q15(uniform(rng)), vb = rotorq::to_q15(uniform(rng));
    const q15 ia = rotorq::to_q15(uniform(rng)), ib = rotorq::to_q15(uniform(rng));
    const phases<q15> v{va, vb, -(va + vb)}, i{ia, ib, -(ia + ib)};
    double p = 0;
    for (auto [x, y] : {std::pair{v.a, i.a}, std::pair{v.b, i.b}, std::pair{v.c, i.c}}) {
      p += rotorq::to_double(x) * rotorq::to_double(y);
    }
    const stationary<q15> vs = rotorq::clarke(v), is = rotorq::clarke(i);
    const double p_amplitude = 1.5 * (rotorq::to_double(vs.alpha) * rotorq::to_double(is.alpha) +
                                      rotorq::to_double(vs.beta) * rotorq::to_double(is.beta));
    const stationary<q15> vp = rotorq::clarke_power_invariant(v), ip = rotorq::clarke_power_invariant(i);
    const double p_power = rotorq::to_double(vp.alpha) * rotorq::to_double(ip.alpha) +
                           rotorq::to_double(vp.beta) * rotorq::to_double(ip.beta);
    // each output is off by at most ~0.5 LSB; |v|, |i| < 1, so the products differ by < 4 LSB
    const double lsb = 1.0 / 32768.0;
    EXPECT_NEAR(p_amplitude, p, 4 * lsb) << n;
    EXPECT_NEAR(p_power, p, 4 * lsb) << n;
  }
}

// clarke's alpha = (2a - b - c) / 3 is the correctly rounded value: round-half-up of a rational with
// denominator 3 is floor((n + 1) / 3) (there are no ties), written here with exact integer division.
template <typename Q>
int64_t exact_alpha(phases<Q> i) {
  const int64_t n = 2 * int64_t{i.a.raw()} - i.b.raw() - i.c.raw() + 1;
  const int64_t floored = n >= 0 ? n / 3 : -((-n + 2) / 3);
  return std::min(std::max(floored, Q::raw_min), Q::raw_max);
}

template <typename Q>
void check_alpha_is_correctly_rounded(uint64_t seed, int count) {
  std::mt19937_64 rng(seed);
  const int64_t span = Q::raw_max - Q::raw_min + 1;
  for (int n = 0; n < count; ++n) {
    const auto pick = [&] {
      return Q::saturate(static_cast<int64_t>(rng() % static_cast<uint64_t>(span)) + Q::raw_min);
    };
    const phases<Q> i{pick(), pick(), pick()};
    ASSERT_EQ(rotorq::clarke(i).alpha.raw(), exact_alpha(i))
        << "a=" << hex(i.a) << " b=" << hex(i.b) << " c=" << hex(i.c);
  }
}

TEST(Clarke, AlphaIsCorrectlyRoundedInBothFormats) {
  check_alpha_is_correctly_rounded<q15>(1, 2000000);
  check_alpha_is_correctly_rounded<q31>(2, 2000000);
}

// Dense q15 grids of the two-input functions against the double twin: every a against 521 values of
// b (all edges and a stride that visits every residue class of small steps).
TEST(ClarkeQ15, DenseGridsOfTheTwoInputFunctionsAreCorrectlyRounded) {
  std::vector<int32_t> second;
  for (int32_t b = -32768; b < 32768; b += 127) second.push_back(b);
  for (int32_t b : {-32767, -1, 1, 32766, 32767}) second.push_back(b);
  for (int32_t a = -32768; a < 32768; ++a) {
    const q15 x = q15::from_raw(static_cast<int16_t>(a));
    for (int32_t b : second) {
      const q15 y = q15::from_raw(static_cast<int16_t>(b));
      const double xd = rotorq::to_double(x), yd = rotorq::to_double(y);
      const stationary<q15> bal = rotorq::clarke_balanced(x, y);
      const stationary<double> bal_ref = rotorq::ref::clarke_balanced(xd, yd);
      ASSERT_EQ(bal.alpha, x);
      ASSERT_LE(std::fabs(lsb_error(bal.beta, bal_ref.beta)), rounding_bound) << hex(x) << " " << hex(y);
      const phases<q15> inv = rotorq::inverse_clarke(stationary<q15>{x, y});
      const phases<double> inv_ref = rotorq::ref::inverse_clarke({xd, yd});
      ASSERT_EQ(inv.a, x);
      ASSERT_LE(std::fabs(lsb_error(inv.b, inv_ref.b)), rounding_bound) << hex(x) << " " << hex(y);
      ASSERT_LE(std::fabs(lsb_error(inv.c, inv_ref.c)), rounding_bound) << hex(x) << " " << hex(y);
      const phases<q15> pinv = rotorq::inverse_clarke_power_invariant(stationary<q15>{x, y});
      const phases<double> pinv_ref = rotorq::ref::inverse_clarke_power_invariant({xd, yd});
      ASSERT_LE(std::fabs(lsb_error(pinv.a, pinv_ref.a)), rounding_bound) << hex(x) << " " << hex(y);
      ASSERT_LE(std::fabs(lsb_error(pinv.b, pinv_ref.b)), rounding_bound) << hex(x) << " " << hex(y);
      ASSERT_LE(std::fabs(lsb_error(pinv.c, pinv_ref.c)), rounding_bound) << hex(x) << " " << hex(y);
    }
  }
}

// Unbalanced full-scale inputs saturate instead of wrapping: (a + 2b) / sqrt(3) > 1 gives max,
// and the three-input forms pin at the limits with the sign of the exact value.
TEST(Clarke, OutOfRangeResultsSaturateWithTheRightSign) {
  for (auto [a, b] :
       {std::pair{32767, 32767}, std::pair{0, 32767}, std::pair{-32768, -32768}, std::pair{-1, -32768}}) {
    const q15 x = q15::from_raw(static_cast<int16_t>(a)), y = q15::from_raw(static_cast<int16_t>(b));
    const double exact = (rotorq::to_double(x) + 2 * rotorq::to_double(y)) / std::sqrt(3.0);
    EXPECT_EQ(rotorq::clarke_balanced(x, y).beta, exact > 0 ? q15::max() : q15::min()) << a << " " << b;
  }
  const phases<q31> worst{q31::max(), q31::min(), q31::min()};  // alpha = 4/3
  EXPECT_EQ(rotorq::clarke(worst).alpha, q31::max());
  EXPECT_EQ(rotorq::clarke_power_invariant(worst).alpha, q31::max());
  const phases<q31> corner{q31::min(), q31::max(), q31::max()};
  EXPECT_EQ(rotorq::clarke(corner).alpha, q31::min());
  const phases<q31> beta_corner{q31::zero(), q31::min(), q31::max()};  // beta = -2/sqrt(3)
  EXPECT_EQ(rotorq::clarke(beta_corner).beta, q31::min());
  EXPECT_EQ(rotorq::clarke_power_invariant(beta_corner).beta, q31::min());
  const stationary<q31> big{q31::min(), q31::max()};
  const phases<q31> inv = rotorq::inverse_clarke(big);  // b = 1/2 + sqrt(3)/2 > 1
  EXPECT_EQ(inv.b, q31::max());
  EXPECT_LE(std::fabs(lsb_error(inv.c, 0.5 - std::sqrt(3.0) / 2.0 * rotorq::to_double(q31::max()))),
            rounding_bound);
}

TEST(Clarke, IsUsableInConstantExpressions) {
  constexpr stationary<q15> s =
      rotorq::clarke(phases<q15>{q15::from_raw(16384), q15::from_raw(-8192), q15::from_raw(-8192)});
  static_assert(s.alpha.raw() == 16384 && s.beta.raw() == 0);
  SUCCEED();
}

}  // namespace
