// Voltage limiters against their double twins and the exact geometry of the circle.
#include "rotorq/voltage_limit.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <vector>

#include "rotorq/host.hpp"
#include "rotorq/ref/ref.hpp"

namespace {

using rotorq::q15;
using rotorq::q31;
using rotorq::rotating;
using rotorq::stationary;

template <typename Q>
Q random_q(std::mt19937_64& rng) {
  const auto span = static_cast<uint64_t>(Q::raw_max - Q::raw_min + 1);
  return Q::saturate(static_cast<int64_t>(rng() % span) + Q::raw_min);
}
template <typename Q>
double in_lsb(double x) {
  return std::ldexp(x, Q::fraction_bits);
}

// Bounds of voltage_limit.hpp: 0.5 LSB + |v| 2^-28, i.e. 0.51 LSB (q15) and 0.5 + 8 LSB (q31).
template <typename Q>
double limit_bound() {
  return Q::fraction_bits == 15 ? 0.51 : 8.5;
}

template <typename Q>
void check_magnitude_limit() {
  std::mt19937_64 rng(Q::fraction_bits);
  std::vector<Q> corners{Q::min(), Q::saturate(-1), Q::zero(), Q::saturate(1), Q::max()};
  double worst = 0;
  for (int n = 0; n < 300000; ++n) {
    const rotating<Q> v =
        n < 25 ? rotating<Q>{corners[static_cast<size_t>(n % 5)], corners[static_cast<size_t>(n / 5)]}
               : rotating<Q>{random_q<Q>(rng), random_q<Q>(rng)};
    // limits across the whole range, including tiny ones and zero
    const Q m = (n % 4 == 0) ? Q::saturate(static_cast<int64_t>(rng() % 64))
                             : Q::saturate(std::llabs(random_q<Q>(rng).raw()));
    const auto got = rotorq::limit_magnitude(v, m);
    const rotating<double> x{rotorq::to_double(v.d), rotorq::to_double(v.q)};
    const double length = std::hypot(x.d, x.q), limit = rotorq::to_double(m);
    ASSERT_EQ(got.clipped, length > limit) << n;
    if (!got.clipped) {
      ASSERT_EQ(got.value, v) << n;  // untouched inside the limit
      continue;
    }
    const double k = limit / length;
    const double ed = std::fabs(got.value.d.raw() - in_lsb<Q>(x.d * k));
    const double eq = std::fabs(got.value.q.raw() - in_lsb<Q>(x.q * k));
    ASSERT_LE(ed, limit_bound<Q>()) << n << " d";
    ASSERT_LE(eq, limit_bound<Q>()) << n << " q";
    worst = std::fmax(worst, std::fmax(ed, eq));
    // the stationary-frame overload is the same computation
    const auto s = rotorq::limit_magnitude(stationary<Q>{v.d, v.q}, m);
    ASSERT_EQ(s.value.alpha, got.value.d);
    ASSERT_EQ(s.value.beta, got.value.q);
  }
  ::testing::Test::RecordProperty("max_error_lsb", std::to_string(worst));
}

TEST(LimitMagnitude, ScalesToTheLimitKeepingTheAngleQ15) { check_magnitude_limit<q15>(); }
TEST(LimitMagnitude, ScalesToTheLimitKeepingTheAngleQ31) { check_magnitude_limit<q31>(); }

TEST(LimitMagnitude, NegativeOrZeroLimitGivesTheZeroVector) {
  const rotating<q15> v{q15::from_raw(1000), q15::from_raw(-2000)};
  for (q15 m : {q15::zero(), q15::from_raw(-5), q15::min()}) {
    const auto got = rotorq::limit_magnitude(v, m);
    EXPECT_TRUE(got.clipped);
    EXPECT_EQ(got.value, (rotating<q15>{}));
  }
  EXPECT_FALSE(rotorq::limit_magnitude(rotating<q15>{}, q15::zero()).clipped);
}

template <typename Q>
void check_d_priority() {
  std::mt19937_64 rng(100 + Q::fraction_bits);
  for (int n = 0; n < 300000; ++n) {
    const rotating<Q> v{random_q<Q>(rng), random_q<Q>(rng)};
    const Q m = Q::saturate(std::llabs(random_q<Q>(rng).raw()));
    const auto got = rotorq::limit_d_priority(v, m);
    const rotating<double> want =
        rotorq::ref::limit_d_priority({rotorq::to_double(v.d), rotorq::to_double(v.q)}, rotorq::to_double(m));
    // d is clamped exactly; q to within the square-root error
    ASSERT_EQ(got.value.d.raw(), static_cast<int64_t>(std::llround(in_lsb<Q>(want.d)))) << n;
    ASSERT_LE(std::fabs(got.value.q.raw() - in_lsb<Q>(want.q)), limit_bound<Q>() + 0.5) << n;
    ASSERT_EQ(got.clipped, got.value != v) << n;
    // never outside the circle of radius m by more than the rounding
    const double length = std::hypot(rotorq::to_double(got.value.d), rotorq::to_double(got.value.q));
    ASSERT_LE(in_lsb<Q>(length - rotorq::to_double(m)), limit_bound<Q>() + 0.5) << n;
  }
}

TEST(LimitDPriority, KeepsDAndGivesQWhatIsLeftQ15) { check_d_priority<q15>(); }
TEST(LimitDPriority, KeepsDAndGivesQWhatIsLeftQ31) { check_d_priority<q31>(); }

TEST(LimitDPriority, DAboveTheLimitTakesItAllAndQGetsNothing) {
  const auto got = rotorq::limit_d_priority(rotating<q15>{q15::from_raw(-30000), q15::from_raw(5000)},
                                            q15::from_raw(20000));
  EXPECT_EQ(got.value.d.raw(), -20000);
  EXPECT_EQ(got.value.q.raw(), 0);
  EXPECT_TRUE(got.clipped);
}

}  // namespace
