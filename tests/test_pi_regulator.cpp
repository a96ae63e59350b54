// pi_regulator against outside results: the open-loop ramp (the integral of a constant error is a
// line), the closed-loop step response of a PI on a first-order plant with pole-zero cancellation
// (a first-order response), anti-windup recovery next to a regulator without it, the specified
// rounding written out independently in 128-bit integers (tests/pi_regulator_model.hpp), every
// corner raw value, and the double twin (ref/pi_regulator.hpp) within the header's bound.
#include "rotorq/pi_regulator.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <random>
#include <vector>

#include "pi_regulator_model.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/pi_regulator.hpp"
#include "test_support.hpp"

namespace {

using rotorq::pi_gain;
using rotorq::pi_regulator;
using rotorq::q15;
using rotorq::q31;
using rotorq::test::from_wide;
using rotorq::test::raw_hex;

template <typename Q>
double lsb() {
  return std::ldexp(1.0, -Q::fraction_bits);
}
template <typename Q>
Q q(double x) {
  return rotorq::detail::from_double<Q>(x);
}

// Gains spanning the whole exponent range, above and below 1.
template <typename Q>
std::vector<double> sample_gains() {
  return {0.0, std::ldexp(1.0, -20), 1e-4, 0.013, 0.3, 0.5, 0.999, 1.0, 1.7, 7.25, 300.0, 32000.0};
}

// The integral of a constant is a line (calculus; the textbook open-loop step response of a PI,
// e.g. Franklin, Powell and Emami-Naeini, Feedback Control of Dynamic Systems, ch. 4, from memory):
// with a constant error e, u_k = kp e + k ki e after k updates, until a limit. Checked within the
// header's bound: 0.5 LSB + 2^-17 LSB for the output plus k 2^-17 LSB of integrator rounding.
template <typename Q>
void check_ramp() {
  for (double kp : sample_gains<Q>()) {
    for (double ki : {std::ldexp(1.0, -24), 1e-3, 0.01, 0.07}) {
      for (double e : {0.3, -0.0123, 1.5, -2.0 + lsb<Q>(), 7 * lsb<Q>()}) {
        const pi_gain<Q> gp = rotorq::ref::to_pi_gain<Q>(kp), gi = rotorq::ref::to_pi_gain<Q>(ki);
        pi_regulator<Q> r(gp, gi);
        const double kpv = rotorq::ref::gain_value(gp), kiv = rotorq::ref::gain_value(gi);
        const Q reference = e > 1 ? Q::max() : (e < -1 ? Q::min() : q<Q>(e));
        const Q measured = e > 1 ? q<Q>(1 - lsb<Q>() - e) : (e < -1 ? q<Q>(-1 - e) : Q::zero());
        const double exact_e = rotorq::to_double(reference) - rotorq::to_double(measured);
        for (int k = 1; k <= 200; ++k) {
          const Q u = r.update(reference, measured);
          const double p = std::clamp(kpv * exact_e, -4.0, 4.0);
          const double line = std::clamp(p + k * kiv * exact_e, -1.0, 1.0 - lsb<Q>());
          const double bound = (0.5 + (k + 1) * std::ldexp(1.0, -17)) * lsb<Q>();
          // once the line meets a limit the integrator takes only the part of the increment that
          // brings the output there, so the output is the clamped line
          ASSERT_LE(std::fabs(rotorq::to_double(u) - line), bound)
              << "kp " << kpv << " ki " << kiv << " e " << exact_e << " k " << k << " got " << raw_hex(u);
        }
      }
    }
  }
}
TEST(PiRegulator, OpenLoopRampIsALine) {
  check_ramp<q15>();
  check_ramp<q31>();
}

// A PI on a first-order plant tau dy/dt = -y + g u, sampled with a zero-order hold (a = exp(-T/tau),
// y_k+1 = a y_k + g (1 - a) u_k). The regulator's transfer function kp + ki z/(z - 1) has its zero at
// kp / (kp + ki); placing it on the plant's pole a (ki = kp (1 - a) / a) leaves the loop
// K/(z - 1) with K = (kp + ki) g (1 - a), so the closed-loop step response is first order:
// y_k = r (1 - (1 - K)^k), the sampled e^(-t/tau_c) (pole-zero cancellation; Franklin, Powell and
// Workman, Digital Control of Dynamic Systems, ch. 5, from memory). The measurement is rounded to the
// format and so is the output, each by 0.5 LSB; through the loop (unit gain from the measurement,
// g (1 - a)/K per step from the output) that stays within a few LSB: bound 4 LSB.
template <typename Q>
void check_first_order_step() {
  struct plant_case {
    double tau_steps, gain, closed_loop_k, reference;
  };
  // the cases keep the output inside [-1, 1) (its first value (kp + ki) r = K r / (g (1 - a)) is the
  // largest), so the limits play no part
  for (const plant_case c : {plant_case{20, 1.0, 0.04, 0.5}, plant_case{200, 0.5, 0.002, -0.3},
                             plant_case{8, 2.0, 0.2, 0.25}, plant_case{1000, 1.0, 0.0005, 0.9}}) {
    const double a = std::exp(-1.0 / c.tau_steps), b = c.gain * (1 - a);
    const double kp_total = c.closed_loop_k / b;  // kp + ki
    const double kp = kp_total * a, ki = kp_total * (1 - a);
    const pi_gain<Q> gp = rotorq::ref::to_pi_gain<Q>(kp), gi = rotorq::ref::to_pi_gain<Q>(ki);
    // the analytic response uses the gains as rounded into the format
    const double kpv = rotorq::ref::gain_value(gp), kiv = rotorq::ref::gain_value(gi);
    pi_regulator<Q> r(gp, gi);
    const Q reference = q<Q>(c.reference);
    double y = 0, worst = 0;
    // with rounded gains the zero sits at kpv / (kpv + kiv) instead of a: the exact response of that
    // loop is computed alongside in double (the same difference equations, no rounding)
    double y_exact = 0, integrator_exact = 0;
    for (int k = 1; k <= 2000; ++k) {
      const Q u = r.update(reference, q<Q>(y));
      y = a * y + b * rotorq::to_double(u);
      const double e = rotorq::to_double(reference) - y_exact;
      integrator_exact += kiv * e;
      y_exact = a * y_exact + b * (kpv * e + integrator_exact);
      worst = std::max(worst, std::fabs(y - y_exact));
      // the analytic first-order curve, for the ideal gains
      const double first_order = rotorq::to_double(reference) * (1 - std::pow(1 - c.closed_loop_k, k));
      ASSERT_NEAR(y_exact, first_order, 2e-4 * std::fabs(c.reference) + 64 * lsb<Q>())
          << "tau " << c.tau_steps << " k " << k;
    }
    EXPECT_LE(worst, 4 * lsb<Q>()) << "tau " << c.tau_steps << ": " << worst / lsb<Q>() << " LSB";
  }
}
TEST(PiRegulator, FirstOrderPlantStepIsTheAnalyticFirstOrderResponse) {
  check_first_order_step<q15>();
  check_first_order_step<q31>();
}

// Integrator windup (Astrom and Hagglund, Advanced PID Control, ISA 2006, ch. 3, from memory): a
// setpoint the plant cannot reach drives the output to its limit; without anti-windup the
// integrator keeps growing, so when the setpoint comes back into reach the output stays saturated
// until the integrator has unwound, and the plant overshoots. With conditional integration the
// output leaves the limit within a step or two of the error changing sign.
template <typename Q>
void check_windup_recovery() {
  const double a = std::exp(-1.0 / 50), b = 1 - a;  // unit-gain plant, tau = 50 steps
  const double kp = 0.5, ki = 0.02, hi = 0.6;
  pi_regulator<Q> r(rotorq::ref::to_pi_gain<Q>(kp), rotorq::ref::to_pi_gain<Q>(ki), q<Q>(-hi), q<Q>(hi));
  double y = 0, y_plain = 0, integrator_plain = 0;
  int saturated_after_fixed = -1, saturated_after_plain = -1;
  int settled_fixed = 0, settled_plain = 0;  // the last step after the switch with |y - 0.3| > 0.01
  const int switch_step = 1500;
  for (int k = 0; k < 5000; ++k) {
    const double reference = k < switch_step ? 0.9 : 0.3;  // 0.9 is beyond the plant's reach of 0.6
    const double y_before = y;
    const double u = rotorq::to_double(r.update(q<Q>(reference), q<Q>(y)));
    y = a * y + b * u;
    // no anti-windup: the integrator is never held; only the output is clamped
    const double e = reference - y_plain;
    integrator_plain += ki * e;
    const double u_plain = std::clamp(kp * e + integrator_plain, -hi, hi);
    y_plain = a * y_plain + b * u_plain;
    if (k == switch_step - 1) {
      // at the limit the integrator holds exactly what puts the output there, hi - kp e: it has
      // not wound up to the limit itself (which plain integrator clamping would do)
      EXPECT_NEAR(rotorq::to_double(r.integrator()), hi - kp * (0.9 - y_before), 2 * lsb<Q>() + 1e-6);
    }
    if (k >= switch_step) {
      if (saturated_after_fixed < 0 && !r.saturated()) saturated_after_fixed = k - switch_step;
      if (saturated_after_plain < 0 && u_plain < hi) saturated_after_plain = k - switch_step;
      if (std::fabs(y - 0.3) > 0.01) settled_fixed = k - switch_step;
      if (std::fabs(y_plain - 0.3) > 0.01) settled_plain = k - switch_step;
    }
  }
  EXPECT_GE(saturated_after_fixed, 0);
  EXPECT_LE(saturated_after_fixed, 2) << "steps at the limit after the setpoint came into reach";
  EXPECT_GE(saturated_after_plain, 1000) << "the regulator without anti-windup should stay wound up";
  // settling to within 0.01: a few plant time constants with anti-windup, the unwinding time without
  EXPECT_LE(settled_fixed, 400);
  EXPECT_GE(settled_plain, 1500);
  EXPECT_NEAR(y, 0.3, 4 * lsb<Q>() + 1e-6);
}
TEST(PiRegulator, AntiWindupLeavesSaturationAtOnce) {
  check_windup_recovery<q15>();
  check_windup_recovery<q31>();
}

// Small errors still integrate: a q15 regulator with ki = 2^-10 and a 1 LSB error gains 2^-10 LSB
// per update, which a q15 integrator would round away every time; after 1024 updates the held
// integrator is exactly 1 LSB (the wide integrator keeps 16 more bits).
TEST(PiRegulator, SmallErrorsStillIntegrate) {
  pi_regulator<q15> r({q15::zero(), 0}, {q15::from_raw(16384), -9});  // kp 0, ki 2^-10
  for (int k = 0; k < 1024; ++k) r.update(q15::from_raw(1), q15::zero());
  EXPECT_EQ(r.integrator_wide(), int64_t{1} << 16);
  EXPECT_EQ(r.output(), q15::from_raw(1));
  pi_regulator<q31> r31({q31::zero(), 0}, {q31::from_raw(1 << 30), -15});  // ki 2^-16
  for (int k = 0; k < 65536; ++k) r31.update(q31::from_raw(1), q31::zero());
  EXPECT_EQ(r31.integrator_wide(), int64_t{1} << 16);
}

// Preset: with zero error the next output is the preset value (bumpless transfer); the preset is
// clamped to the limits; reset clears it.
template <typename Q>
void check_preset() {
  pi_regulator<Q> r(rotorq::ref::to_pi_gain<Q>(3.0), rotorq::ref::to_pi_gain<Q>(0.01), q<Q>(-0.5), q<Q>(0.7));
  for (double v : {0.0, 0.25, -0.4, 0.7 - lsb<Q>(), -0.5}) {
    r.preset(q<Q>(v));
    EXPECT_EQ(r.update(q<Q>(0.1), q<Q>(0.1)), q<Q>(v)) << v;
  }
  r.preset(Q::max());
  EXPECT_EQ(r.update(Q::zero(), Q::zero()), q<Q>(0.7));
  r.preset(Q::min());
  EXPECT_EQ(r.update(Q::zero(), Q::zero()), q<Q>(-0.5));
  r.reset();
  EXPECT_EQ(r.update(Q::zero(), Q::zero()), Q::zero());
  EXPECT_EQ(r.integrator_wide(), 0);
  EXPECT_FALSE(r.saturated());
}
TEST(PiRegulator, PresetGivesTheNextOutputAndResetClears) {
  check_preset<q15>();
  check_preset<q31>();
}

// The specified rule, bit for bit, against the independent 128-bit model over every corner: errors
// from the edge values of the format (full scale both ways), gains at the ends of the mantissa and
// exponent ranges and beyond, symmetric, one-sided and inverted limits, and feedforward.
template <typename Q>
void check_exact_rule() {
  constexpr int F = Q::fraction_bits;
  const std::vector<Q> edges = rotorq::test::edge_values<Q>();
  std::vector<Q> values;  // every fourth edge value keeps the sweep small, ends always included
  for (size_t k = 0; k < edges.size(); k += 4) values.push_back(edges[k]);
  values.push_back(Q::max());
  const int64_t mantissas[] = {Q::raw_min, -1, 0, 1, Q::raw_max / 3, Q::raw_max};
  const int exponents[] = {-100, -16, -1, 0, 1, 15, 16, 100};
  struct limit_case {
    Q lo, hi;
  };
  const limit_case limits[] = {{Q::min(), Q::max()},
                               {q<Q>(-0.25), q<Q>(0.5)},
                               {q<Q>(0.5), q<Q>(-0.25)},
                               {Q::max(), Q::min()},
                               {q<Q>(0.1), q<Q>(0.1)}};
  int mismatches = 0;
  for (const int64_t mp : mantissas) {
    for (const int ep : exponents) {
      for (const int ei : {-16, 0, 15, 40}) {
        for (const limit_case& l : limits) {
          const int64_t mi = (Q::raw_max - mp) / 2;  // in range for every mp
          const pi_gain<Q> kp{from_wide<Q>(mp), ep}, ki{from_wide<Q>(mi), ei};
          pi_regulator<Q> r(kp, ki, l.lo, l.hi);
          rotorq::test::pi_model<F> m;
          m.set_gains(mp, ep, mi, ei);
          m.set_limits(l.lo.raw(), l.hi.raw());
          ASSERT_EQ(r.lower_limit().raw(), static_cast<int64_t>(m.lo));
          ASSERT_EQ(r.upper_limit().raw(), static_cast<int64_t>(m.hi));
          for (size_t i = 0; i < values.size(); ++i) {
            const Q reference = values[i], measured = values[(i * 7 + 3) % values.size()];
            const Q ff = values[(i * 5 + 1) % values.size()];
            const Q feedforward = (i % 3 == 0) ? ff : Q::zero();
            const Q got = r.update(reference, measured, feedforward);
            const int64_t want = m.update(reference.raw(), measured.raw(), feedforward.raw());
            if ((got.raw() != want || r.integrator_wide() != static_cast<int64_t>(m.integrator) ||
                 r.saturated() != m.saturated) &&
                ++mismatches <= rotorq::test::max_reported) {
              ADD_FAILURE() << "F " << F << " kp " << mp << "*2^" << ep << " ki exp " << ei << " limits "
                            << raw_hex(l.lo) << " " << raw_hex(l.hi) << " ref " << raw_hex(reference)
                            << " meas " << raw_hex(measured) << ": got " << raw_hex(got) << " want "
                            << raw_hex(want, F + 1);
            }
            ASSERT_GE(got.raw(), r.lower_limit().raw());
            ASSERT_LE(got.raw(), r.upper_limit().raw());
            if (i % 11 == 10) {  // preset and reset now and then, at the extremes too
              r.preset(values[i / 2]);
              m.preset(values[i / 2].raw());
            }
          }
        }
      }
    }
  }
  EXPECT_EQ(mismatches, 0);
}
TEST(PiRegulator, FollowsTheSpecifiedRuleExactly) {
  check_exact_rule<q15>();
  check_exact_rule<q31>();
}

// Seeded runs against the twin, as the fuzz target does it on random bytes: one step from a shared
// integrator (saturation included) within 0.5 LSB + 2^-16 LSB, the header's bound; over a run that
// never saturates, within the accumulated 0.5 + (k + 1) 2^-17 LSB.
template <typename Q>
void check_twin() {
  std::mt19937_64 rng(20261201);
  const auto uniform = [&](double lo, double hi) {
    return lo + (hi - lo) * std::ldexp(static_cast<double>(rng() >> 11), -53);
  };
  for (int run = 0; run < 40; ++run) {
    const double kp = std::exp(uniform(std::log(1e-3), std::log(50.0)));
    const double ki = std::exp(uniform(std::log(1e-6), std::log(0.5)));
    const pi_gain<Q> gp = rotorq::ref::to_pi_gain<Q>(kp), gi = rotorq::ref::to_pi_gain<Q>(ki);
    const bool saturating = run % 2 == 1;
    const double hi = saturating ? uniform(0.05, 0.9) : 1 - lsb<Q>(),
                 lo = saturating ? -uniform(0.05, 0.9) : -1;
    pi_regulator<Q> r(gp, gi, q<Q>(lo), q<Q>(hi));
    rotorq::ref::pi_regulator twin(rotorq::ref::gain_value(gp), rotorq::ref::gain_value(gi),
                                   rotorq::to_double(r.lower_limit()), rotorq::to_double(r.upper_limit()));
    const double scale = saturating ? 1.0 : 0.9 / (kp + 200 * ki) / 2;  // keeps the free run inside
    for (int k = 1; k <= 200; ++k) {
      const Q reference = q<Q>(uniform(-scale, scale)), measured = q<Q>(uniform(-scale, scale));
      if (saturating)
        twin.set_integrator(std::ldexp(static_cast<double>(r.integrator_wide()), -(Q::fraction_bits + 16)));
      const double want = twin.update(rotorq::to_double(reference), rotorq::to_double(measured));
      const double got = rotorq::to_double(r.update(reference, measured));
      // one step from a shared integrator: 0.5 + 2 x 2^-17 LSB; a free run: 0.5 + (k + 1) 2^-17 LSB;
      // plus 2^-20 LSB for the twin's own double rounding (q31 products have 64 bits)
      const double bound =
          (0.5 + (saturating ? 2 : k + 1) * std::ldexp(1.0, -17) + std::ldexp(1.0, -20)) * lsb<Q>();
      ASSERT_LE(std::fabs(got - want), bound)
          << "run " << run << " step " << k << ": " << (got - want) / lsb<Q>() << " LSB";
      if (!saturating) {
        ASSERT_FALSE(r.saturated()) << "run " << run << " step " << k;
      }
    }
  }
}
TEST(PiRegulator, MatchesItsDoubleTwin) {
  check_twin<q15>();
  check_twin<q31>();
}

// The host gain conversion: within half a mantissa step (relative 2^-F) of the value, for values
// in range; the ends saturate.
template <typename Q>
void check_gain_conversion() {
  for (double g : {std::ldexp(1.0, -16), 1e-3, 0.5, 0.75, 1.0, 1.0 - 1e-12, 3.3, 1000.0, 32767.0}) {
    const double back = rotorq::ref::gain_value(rotorq::ref::to_pi_gain<Q>(g));
    EXPECT_LE(std::fabs(back - g), g * std::ldexp(1.0, -Q::fraction_bits)) << g;
  }
  EXPECT_EQ(rotorq::ref::gain_value(rotorq::ref::to_pi_gain<Q>(1e9)), rotorq::to_double(Q::max()) * 32768.0);
  EXPECT_EQ(rotorq::ref::gain_value(rotorq::ref::to_pi_gain<Q>(-1.0)), 0.0);
  EXPECT_EQ(rotorq::ref::gain_value(rotorq::ref::to_pi_gain<Q>(std::nan(""))), 0.0);
}
TEST(PiRegulator, GainsFromDouble) {
  check_gain_conversion<q15>();
  check_gain_conversion<q31>();
}

// Contract row G1 (bad input) is in tests/bad_input_cases.hpp, so it runs on the emulated cores too.

}  // namespace
