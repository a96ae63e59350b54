// DC-bus compensation against the exact quotient (128-bit host integers as the exact reference).
#include "rotorq/dc_bus.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

namespace {

using rotorq::q15;
using rotorq::q31;

// round(v / bus) in raw steps, exact: floor((2 v 2^F + bus) / (2 bus)) for bus > 0, saturated.
template <typename Q>
int64_t exact_quotient(Q v, Q bus) {
  const __int128 numerator =
      static_cast<__int128>(v.raw()) * (static_cast<__int128>(1) << (Q::fraction_bits + 1)) + bus.raw();
  const __int128 denominator = 2 * static_cast<__int128>(bus.raw());
  __int128 q = numerator / denominator;
  if ((numerator % denominator != 0) && (numerator < 0)) --q;  // floor for negative numerators
  return static_cast<int64_t>(q < Q::raw_min ? Q::raw_min : (q > Q::raw_max ? Q::raw_max : q));
}

// Bound of dc_bus.hpp: 0.5 LSB + |result| 2^-29 (plus 2^-15 LSB of slack for the check itself).
template <typename Q>
void check_against_exact_quotient() {
  std::mt19937_64 rng(Q::fraction_bits);
  const Q minimum = Q::saturate(Q::raw_max / 64);
  rotorq::bus_normalizer<Q> bus(minimum);
  const auto span = static_cast<uint64_t>(Q::raw_max - Q::raw_min + 1);
  double worst = 0;
  for (int n = 0; n < 500000; ++n) {
    const Q b = Q::saturate(static_cast<int64_t>(rng() % static_cast<uint64_t>(Q::raw_max)) + 1);
    const Q v = Q::saturate(static_cast<int64_t>(rng() % span) + Q::raw_min);
    const bool valid = bus.update(b);
    ASSERT_EQ(valid, b.raw() > minimum.raw());
    if (!valid) {
      ASSERT_EQ(bus.normalize(v), Q::zero());
      continue;
    }
    const int64_t want = exact_quotient(v, b);
    const double error = std::fabs(static_cast<double>(bus.normalize(v).raw() - want));
    const double bound =
        0.5 + std::ldexp(std::fabs(static_cast<double>(want)), -29) + 0.5;  // +0.5: want is rounded
    ASSERT_LE(error, bound) << "v " << v.raw() << " bus " << b.raw();
    worst = std::fmax(worst, error);
  }
  ::testing::Test::RecordProperty("max_error_lsb", std::to_string(worst));
}

TEST(BusNormalizer, QuotientsMatchTheExactValueQ15) { check_against_exact_quotient<q15>(); }
TEST(BusNormalizer, QuotientsMatchTheExactValueQ31) { check_against_exact_quotient<q31>(); }

TEST(BusNormalizer, ZeroNegativeAndLowBusGiveZeroAndAFlag) {
  rotorq::bus_normalizer<q15> bus(q15::from_raw(1000));
  EXPECT_FALSE(bus.valid());  // nothing measured yet
  EXPECT_EQ(bus.normalize(q15::from_raw(500)), q15::zero());
  for (int16_t raw : {int16_t{0}, int16_t{-1}, int16_t{-32768}, int16_t{999}, int16_t{1000}}) {
    EXPECT_FALSE(bus.update(q15::from_raw(raw))) << raw;
    EXPECT_EQ(bus.normalize(rotorq::stationary<q15>{q15::max(), q15::min()}), (rotorq::stationary<q15>{}));
  }
  EXPECT_TRUE(bus.update(q15::from_raw(1001)));  // recovers at once
  EXPECT_EQ(bus.normalize(q15::from_raw(1001)), q15::max());
  // a minimum at or below zero still never lets a zero bus through
  rotorq::bus_normalizer<q31> any(q31::min());
  EXPECT_FALSE(any.update(q31::zero()));
  EXPECT_FALSE(any.update(q31::from_raw(1)));
  EXPECT_TRUE(any.update(q31::from_raw(2)));
}

TEST(BusNormalizer, RequestsAboveTheBusSaturate) {
  rotorq::bus_normalizer<q15> bus(q15::from_raw(100));
  ASSERT_TRUE(bus.update(q15::from_raw(16384)));  // half of full scale
  EXPECT_EQ(bus.normalize(q15::from_raw(8192)).raw(), 16384);
  EXPECT_EQ(bus.normalize(q15::from_raw(20000)), q15::max());
  EXPECT_EQ(bus.normalize(q15::min()), q15::min());
  const rotorq::rotating<q15> r =
      bus.normalize(rotorq::rotating<q15>{q15::from_raw(-4096), q15::from_raw(4096)});
  EXPECT_EQ(r.d.raw(), -8192);
  EXPECT_EQ(r.q.raw(), 8192);
}

}  // namespace
