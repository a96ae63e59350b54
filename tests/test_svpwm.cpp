// Space-vector modulation against its two double-precision constructions (min-max injection and the
// dwell-time construction of van der Broeck, Skudelny and Stanke, IEEE Trans. Ind. Appl. 24(1),
// 1988), the textbook check values and limits, and every kind of bad request.
#include "rotorq/svpwm.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <random>
#include <string>
#include <vector>

#include "rotorq/host.hpp"
#include "rotorq/ref/ref.hpp"

namespace {

using rotorq::overmodulation;
using rotorq::phases;
using rotorq::q15;
using rotorq::q31;
using rotorq::stationary;

template <typename Q>
double lsb(Q x) {
  return static_cast<double>(x.raw());
}
template <typename Q>
double scale() {
  return std::ldexp(1.0, Q::fraction_bits);
}
// |computed - exact| in LSB, with exact duties of 1 standing for max() (1 - 2^-F).
template <typename Q>
double duty_error(Q got, double exact) {
  const double target = std::fmin(exact * scale<Q>(), static_cast<double>(Q::raw_max));
  return std::fabs(lsb(got) - target);
}
template <typename Q>
std::string describe(stationary<Q> v) {
  char text[64];
  std::snprintf(text, sizeof text, "alpha raw %lld beta raw %lld", static_cast<long long>(v.alpha.raw()),
                static_cast<long long>(v.beta.raw()));
  return text;
}

// Requests in the linear range: a polar grid (radius steps of 1/64 of 1/sqrt(3), angle steps of
// 1.4 degrees) plus seeded random points of the disc.
template <typename Q>
std::vector<stationary<Q>> linear_requests() {
  std::vector<stationary<Q>> out;
  const double inscribed = 1.0 / std::sqrt(3.0) * (1 - 1e-9);
  for (int r = 0; r <= 64; ++r) {
    for (int k = 0; k < 256; ++k) {
      const double radius = inscribed * r / 64.0, theta = 2 * M_PI * k / 256.0;
      out.push_back({rotorq::detail::from_double<Q>(radius * std::cos(theta)),
                     rotorq::detail::from_double<Q>(radius * std::sin(theta))});
    }
  }
  std::mt19937_64 rng(1988);
  std::uniform_real_distribution<double> u(-inscribed, inscribed);
  while (out.size() < 200000) {
    const double a = u(rng), b = u(rng);
    if (a * a + b * b <= inscribed * inscribed) {
      out.push_back({rotorq::detail::from_double<Q>(a), rotorq::detail::from_double<Q>(b)});
    }
  }
  return out;
}

template <typename Q>
void check_linear_range_against_both_constructions() {
  double worst = 0;
  for (const stationary<Q>& v : linear_requests<Q>()) {
    const stationary<double> x{rotorq::to_double(v.alpha), rotorq::to_double(v.beta)};
    if (std::hypot(x.alpha, x.beta) > 1.0 / std::sqrt(3.0)) continue;  // rounding pushed it out
    const rotorq::modulation<Q> got = rotorq::svpwm(v, overmodulation::hexagon);
    const phases<double> dwell = rotorq::ref::svpwm_dwell_time(x);
    const rotorq::ref::modulation_result min_max = rotorq::ref::svpwm_min_max(x, false);
    ASSERT_FALSE(got.limited) << describe(v);
    for (auto [d, dw, mm] :
         {std::tuple{got.duty.a, dwell.a, min_max.duty.a}, std::tuple{got.duty.b, dwell.b, min_max.duty.b},
          std::tuple{got.duty.c, dwell.c, min_max.duty.c}}) {
      // the two double constructions agree (to rounding of double)
      ASSERT_NEAR(dw, mm, 1e-12) << describe(v);
      // duties: 0.5 LSB (correct rounding) + 2^-15 LSB for the constant (svpwm.hpp)
      const double e = duty_error(d, dw);
      ASSERT_LE(e, 0.5 + 1.0 / 32768) << describe(v);
      worst = std::fmax(worst, e);
    }
    // circle mode changes nothing inside its circle (radius 1/sqrt(3) rounded down), bit for bit
    const int64_t m = rotorq::detail::inscribed_circle<Q::fraction_bits>().raw();
    const auto a = static_cast<__int128>(v.alpha.raw()), b = static_cast<__int128>(v.beta.raw());
    const rotorq::modulation<Q> circle = rotorq::svpwm(v, overmodulation::circle);
    if (a * a + b * b <= static_cast<__int128>(m) * m) {
      ASSERT_EQ(circle.duty, got.duty) << describe(v);
    }
    ASSERT_EQ(circle.sector, rotorq::ref::sector_of_angle(x.alpha, x.beta)) << describe(v);
  }
  ::testing::Test::RecordProperty("max_duty_error_lsb", std::to_string(worst));
}

TEST(Svpwm, LinearRangeMatchesMinMaxAndDwellTimeConstructionsQ15) {
  check_linear_range_against_both_constructions<q15>();
}
TEST(Svpwm, LinearRangeMatchesMinMaxAndDwellTimeConstructionsQ31) {
  check_linear_range_against_both_constructions<q31>();
}

// Check values (centred SVPWM, common practice, no source): angle 0, |v| = 1/2 gives
// (7/8, 1/8, 1/8); angle 30 degrees, |v| = 1/sqrt(3) gives (1, 1/2, 0).
TEST(Svpwm, CheckValues) {
  const rotorq::modulation<q15> m = rotorq::svpwm(stationary<q15>{q15::from_raw(16384), q15::zero()});
  EXPECT_EQ(m.duty.a.raw(), 28672);
  EXPECT_EQ(m.duty.b.raw(), 4096);
  EXPECT_EQ(m.duty.c.raw(), 4096);
  EXPECT_EQ(m.sector, 1);
  const rotorq::modulation<q31> n = rotorq::svpwm(stationary<q31>{q31::from_raw(1 << 30), q31::zero()});
  EXPECT_EQ(n.duty.a.raw(), 7 << 28);
  EXPECT_EQ(n.duty.b.raw(), 1 << 28);
  EXPECT_EQ(n.duty.c.raw(), 1 << 28);
  const double r = 1.0 / std::sqrt(3.0);
  const stationary<q31> corner{rotorq::to_q31(r * std::cos(M_PI / 6)),
                               rotorq::to_q31(r * std::sin(M_PI / 6))};
  for (overmodulation mode : {overmodulation::circle, overmodulation::hexagon}) {
    const rotorq::modulation<q31> c = rotorq::svpwm(corner, mode);
    EXPECT_LE(duty_error(c.duty.a, 1.0), 1.0);
    EXPECT_LE(duty_error(c.duty.b, 0.5), 1.0);
    EXPECT_LE(duty_error(c.duty.c, 0.0), 1.0);
  }
}

// Line-to-line voltages are what the modulator preserves (the zero sequence cancels):
// duty_a - duty_b = v_ab / V_dc = 3/2 alpha - sqrt(3)/2 beta, within 1 LSB.
TEST(Svpwm, LineToLineVoltagesArePreservedInTheLinearRange) {
  for (const stationary<q15>& v : linear_requests<q15>()) {
    const rotorq::modulation<q15> m = rotorq::svpwm(v, overmodulation::hexagon);
    const double alpha = rotorq::to_double(v.alpha), beta = rotorq::to_double(v.beta);
    if (std::hypot(alpha, beta) > 1.0 / std::sqrt(3.0)) continue;
    const double v_ab = 1.5 * alpha - std::sqrt(3.0) / 2 * beta;
    const double v_bc = std::sqrt(3.0) * beta;
    ASSERT_LE(std::fabs(lsb(m.duty.a) - lsb(m.duty.b) - v_ab * 32768), 1.0) << describe(v);
    ASSERT_LE(std::fabs(lsb(m.duty.b) - lsb(m.duty.c) - v_bc * 32768), 1.0) << describe(v);
  }
}

// The fundamental of a periodic pattern over one electrical turn, from N samples: the Fourier
// coefficient (2/N) sum f(theta) cos(theta - phase) of the first harmonic.
template <typename F>
double fundamental(F&& f, int n = 65536) {
  double c = 0, s = 0;
  for (int k = 0; k < n; ++k) {
    const double theta = 2 * M_PI * k / n;
    const double y = f(theta);
    c += y * std::cos(theta);
    s += y * std::sin(theta);
  }
  return 2.0 / n * std::hypot(c, s);
}

// Six-step: each phase-to-midpoint voltage is a +-V_dc/2 square wave, whose fundamental is
// (4/pi)(V_dc/2) = 2 V_dc / pi (Fourier series of a square wave, common practice, no source).
// At the linear limit |v| = 1/sqrt(3) SVPWM gives a line-to-line fundamental of V_dc, and sine PWM
// at |v| = 1/2 a phase fundamental of V_dc / 2 (both follow from the definitions above).
TEST(Svpwm, FundamentalsOfSixStepSvpwmAndSinePwm) {
  const auto request = [](double theta, double radius) {
    return stationary<q31>{rotorq::to_q31(radius * std::cos(theta)),
                           rotorq::to_q31(radius * std::sin(theta))};
  };
  const double six = fundamental(
      [&](double t) { return rotorq::to_double(rotorq::six_step(request(t, 0.3)).duty.a) - 0.5; });
  EXPECT_NEAR(six / (2 / M_PI), 1.0, 1e-3);
  const double line = fundamental([&](double t) {
    const auto m = rotorq::svpwm(request(t, 1.0 / std::sqrt(3.0) - 1e-9));
    return rotorq::to_double(m.duty.a) - rotorq::to_double(m.duty.b);
  });
  EXPECT_NEAR(line, 1.0, 1e-3);
  const double sine = fundamental(
      [&](double t) { return rotorq::to_double(rotorq::sine_pwm(request(t, 0.5 - 1e-9)).duty.a) - 0.5; });
  EXPECT_NEAR(sine, 0.5, 1e-3);
}

// Overmodulation: for a fixed angle, growing requests give output vectors that never shrink (within
// the 1 LSB of rounding), keep the request's angle (circle), end on the circle (circle) or on the
// hexagon edge (hexagon, max - min = 1).
TEST(Svpwm, OvermodulationKeepsAngleAndNeverShrinks) {
  for (int k = 0; k < 360; k += 7) {
    const double theta = (k + 0.37) * M_PI / 180.0;
    for (overmodulation mode : {overmodulation::circle, overmodulation::hexagon}) {
      double previous = 0;
      for (int step = 1; step <= 200; ++step) {
        // up to the edge of the representable square, so the request keeps its angle
        const double reach = 0.999 / std::fmax(std::fabs(std::cos(theta)), std::fabs(std::sin(theta)));
        const double radius = reach * step / 200.0;
        const stationary<q15> v{rotorq::to_q15(radius * std::cos(theta)),
                                rotorq::to_q15(radius * std::sin(theta))};
        const rotorq::modulation<q15> m = rotorq::svpwm(v, mode);
        const phases<double> d{rotorq::to_double(m.duty.a), rotorq::to_double(m.duty.b),
                               rotorq::to_double(m.duty.c)};
        const stationary<double> out = rotorq::ref::clarke(d);  // the zero sequence drops out
        const double length = std::hypot(out.alpha, out.beta);
        // never shrinks by more than the rounding of the limited vector and of the duties, and a duty of
        // 1 saturating to 1 - 2^-15 (3 LSB in all)
        ASSERT_GE(length, previous - 3.0 / 32768) << k << " " << step << " mode " << int(mode);
        previous = std::fmax(previous, length);
        const double requested = std::hypot(rotorq::to_double(v.alpha), rotorq::to_double(v.beta));
        if (m.limited) {
          const double angle_error =
              std::remainder(std::atan2(out.beta, out.alpha) -
                                 std::atan2(rotorq::to_double(v.beta), rotorq::to_double(v.alpha)),
                             2 * M_PI);
          // within one turn16 step (2 pi / 65536 rad)
          ASSERT_LE(std::fabs(angle_error), 2 * M_PI / 65536) << k << " " << step << " mode " << int(mode);
        }
        if (mode == overmodulation::circle && requested > 0.6) {
          ASSERT_NEAR(length, 1.0 / std::sqrt(3.0), 2.0 / 32768) << k << " " << step;
          ASSERT_TRUE(m.limited);
        }
        if (mode == overmodulation::hexagon && m.limited) {
          const double spread = std::fmax(d.a, std::fmax(d.b, d.c)) - std::fmin(d.a, std::fmin(d.b, d.c));
          ASSERT_NEAR(spread, 1.0, 2.0 / 32768) << k << " " << step;
        }
      }
    }
  }
}

// Any request at all (every combination of raw corners and a seeded random sweep) gives duties in
// [0, max] in every mode, and a sector in 1..6.
template <typename Q>
void check_any_request_gives_valid_duties() {
  std::vector<Q> values{Q::min(),       Q::saturate(Q::raw_min + 1), Q::saturate(-1), Q::zero(),
                        Q::saturate(1), Q::saturate(Q::raw_max - 1), Q::max()};
  std::vector<stationary<Q>> requests;
  for (Q a : values) {
    for (Q b : values) requests.push_back({a, b});
  }
  std::mt19937_64 rng(6);
  for (int n = 0; n < 100000; ++n) {
    const auto span = static_cast<uint64_t>(Q::raw_max - Q::raw_min + 1);
    requests.push_back({Q::saturate(static_cast<int64_t>(rng() % span) + Q::raw_min),
                        Q::saturate(static_cast<int64_t>(rng() % span) + Q::raw_min)});
  }
  for (const stationary<Q>& v : requests) {
    for (const rotorq::modulation<Q>& m :
         {rotorq::svpwm(v, overmodulation::circle), rotorq::svpwm(v, overmodulation::hexagon),
          rotorq::sine_pwm(v), rotorq::six_step(v)}) {
      for (Q d : {m.duty.a, m.duty.b, m.duty.c}) ASSERT_GE(d.raw(), 0) << describe(v);
      ASSERT_GE(m.sector, 1) << describe(v);
      ASSERT_LE(m.sector, 6) << describe(v);
    }
  }
}

TEST(Svpwm, AnyRequestGivesDutiesInRangeQ15) { check_any_request_gives_valid_duties<q15>(); }
TEST(Svpwm, AnyRequestGivesDutiesInRangeQ31) { check_any_request_gives_valid_duties<q31>(); }

TEST(Svpwm, SectorsFollowTheAngle) {
  for (int degrees = 0; degrees < 360; ++degrees) {
    const double t = degrees * M_PI / 180.0 + 1e-6;
    const stationary<q31> v{rotorq::to_q31(0.4 * std::cos(t)), rotorq::to_q31(0.4 * std::sin(t))};
    EXPECT_EQ(rotorq::svpwm(v).sector, degrees / 60 + 1) << degrees;
  }
  EXPECT_EQ(rotorq::svpwm(stationary<q15>{}).sector, 1);
  EXPECT_FALSE(rotorq::svpwm(stationary<q15>{}).limited);
}

TEST(SinePwm, IsLinearUpToHalfAndClampsBeyond) {
  const stationary<q15> half{q15::from_raw(16384), q15::zero()};
  const rotorq::modulation<q15> m = rotorq::sine_pwm(half);
  EXPECT_FALSE(m.limited);
  EXPECT_EQ(m.duty.a, q15::max());  // 1/2 + 1/2 = 1
  EXPECT_EQ(m.duty.b.raw(), 8192);  // 1/2 - 1/4
  const rotorq::modulation<q15> over = rotorq::sine_pwm(stationary<q15>{q15::from_raw(20000), q15::zero()});
  EXPECT_TRUE(over.limited);
  EXPECT_EQ(over.duty.a, q15::max());
}

TEST(SixStep, StatesFollowTheSixActiveVectors) {
  // V1 = (1,0,0) around 0 degrees, V2 = (1,1,0) around 60, ... (the usual numbering)
  const int expected[6][3] = {{1, 0, 0}, {1, 1, 0}, {0, 1, 0}, {0, 1, 1}, {0, 0, 1}, {1, 0, 1}};
  for (int k = 0; k < 6; ++k) {
    const double t = k * M_PI / 3;
    const rotorq::modulation<q15> m = rotorq::six_step(
        stationary<q15>{rotorq::to_q15(0.5 * std::cos(t)), rotorq::to_q15(0.5 * std::sin(t))});
    EXPECT_EQ(m.sector, k + 1);
    EXPECT_EQ(m.duty.a == q15::max(), expected[k][0] == 1) << k;
    EXPECT_EQ(m.duty.b == q15::max(), expected[k][1] == 1) << k;
    EXPECT_EQ(m.duty.c == q15::max(), expected[k][2] == 1) << k;
  }
}

}  // namespace
