// The double twins of host_sim/reference are the yardstick of every other test, so they are checked
// against outside references themselves: MPFR for sine and cosine, the published matrices and their
// properties for Clarke and Park.
#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "mpfr_oracle.hpp"
#include "rotorq/ref/ref.hpp"

namespace {

using rotorq::phases;
using rotorq::stationary;

TEST(ReferenceSinCos, AgreesWithMpfrToAFewUnitsInTheLastPlace) {
  // 2^-50 is below 2^-19 of a q31 LSB: the twin is exact for all the tests' purposes.
  const double tolerance = std::ldexp(1.0, -50);
  std::mt19937_64 rng(2718);
  for (int n = 0; n < 300000; ++n) {
    const uint32_t raw = n < 65536 ? static_cast<uint32_t>(n) << 16 : static_cast<uint32_t>(rng());
    const auto got = rotorq::ref::sin_cos(rotorq::turn32::from_raw(raw));
    ASSERT_NEAR(got.sin, rotorq::test::scaled_sin_cos_turns(raw, 32, 0, false), tolerance) << raw;
    ASSERT_NEAR(got.cos, rotorq::test::scaled_sin_cos_turns(raw, 32, 0, true), tolerance) << raw;
  }
}

// The amplitude-invariant matrix 2/3 [1 -1/2 -1/2; 0 sqrt(3)/2 -sqrt(3)/2] and the power-invariant
// sqrt(2/3) [same] (IEC 62428:2008; E. Clarke, Circuit Analysis of A-C Power Systems, 1943), entry by
// entry: the image of each unit phase vector is a column of the matrix.
TEST(ReferenceClarke, ColumnsAreThoseOfThePublishedMatrices) {
  const double h = std::sqrt(3.0) / 2.0;
  const double columns[3][2] = {{1.0, 0.0}, {-0.5, h}, {-0.5, -h}};
  for (int k = 0; k < 3; ++k) {
    const phases<double> unit{k == 0 ? 1.0 : 0.0, k == 1 ? 1.0 : 0.0, k == 2 ? 1.0 : 0.0};
    const stationary<double> amp = rotorq::ref::clarke(unit);
    EXPECT_NEAR(amp.alpha, 2.0 / 3.0 * columns[k][0], 1e-15) << k;
    EXPECT_NEAR(amp.beta, 2.0 / 3.0 * columns[k][1], 1e-15) << k;
    const stationary<double> pow = rotorq::ref::clarke_power_invariant(unit);
    EXPECT_NEAR(pow.alpha, std::sqrt(2.0 / 3.0) * columns[k][0], 1e-15) << k;
    EXPECT_NEAR(pow.beta, std::sqrt(2.0 / 3.0) * columns[k][1], 1e-15) << k;
  }
  const stationary<double> s = rotorq::ref::clarke({1.0, -0.5, -0.5});
  EXPECT_NEAR(s.alpha, 1.0, 1e-15);
  EXPECT_NEAR(s.beta, 0.0, 1e-15);
}

// Properties of the same matrices on zero-sequence-free sets: the power-invariant form preserves the
// Euclidean norm (it is orthonormal there), the amplitude-invariant one scales it by sqrt(2/3); each
// inverse undoes its forward transform; clarke_balanced equals clarke with c = -a - b.
TEST(ReferenceClarke, NormsInversesAndBalancedForm) {
  std::mt19937_64 rng(1943);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  for (int n = 0; n < 10000; ++n) {
    const double a = u(rng), b = u(rng);
    const phases<double> x{a, b, -a - b};
    const double norm = std::sqrt(x.a * x.a + x.b * x.b + x.c * x.c);
    const stationary<double> p = rotorq::ref::clarke_power_invariant(x);
    EXPECT_NEAR(std::hypot(p.alpha, p.beta), norm, 1e-14);
    const stationary<double> s = rotorq::ref::clarke(x);
    EXPECT_NEAR(std::hypot(s.alpha, s.beta), std::sqrt(2.0 / 3.0) * norm, 1e-14);
    const phases<double> back = rotorq::ref::inverse_clarke(s);
    const phases<double> back_p = rotorq::ref::inverse_clarke_power_invariant(p);
    for (auto [got, want] : {std::pair{back.a, x.a}, std::pair{back.b, x.b}, std::pair{back.c, x.c},
                             std::pair{back_p.a, x.a}, std::pair{back_p.b, x.b}, std::pair{back_p.c, x.c}}) {
      EXPECT_NEAR(got, want, 1e-14);
    }
    const stationary<double> bal = rotorq::ref::clarke_balanced(a, b);
    EXPECT_NEAR(bal.alpha, s.alpha, 1e-15);
    EXPECT_NEAR(bal.beta, s.beta, 1e-15);
  }
}

// Park (1929): a rotation of the stationary frame by -theta. It preserves length, is undone by the
// inverse, and maps the unit vector at angle theta to d = 1, q = 0.
TEST(ReferencePark, IsARotationByMinusTheta) {
  std::mt19937_64 rng(1929);
  std::uniform_real_distribution<double> u(-1.0, 1.0);
  for (int n = 0; n < 10000; ++n) {
    const auto angle = rotorq::ref::sin_cos_turns(u(rng));
    const stationary<double> v{u(rng), u(rng)};
    const rotorq::rotating<double> r = rotorq::ref::park(v, angle);
    EXPECT_NEAR(std::hypot(r.d, r.q), std::hypot(v.alpha, v.beta), 1e-14);
    const stationary<double> back = rotorq::ref::inverse_park(r, angle);
    EXPECT_NEAR(back.alpha, v.alpha, 1e-14);
    EXPECT_NEAR(back.beta, v.beta, 1e-14);
    const rotorq::rotating<double> unit = rotorq::ref::park({angle.cos, angle.sin}, angle);
    EXPECT_NEAR(unit.d, 1.0, 1e-15);
    EXPECT_NEAR(unit.q, 0.0, 1e-15);
  }
}

}  // namespace
