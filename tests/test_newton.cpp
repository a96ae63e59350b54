// The division-free reciprocal and reciprocal square root behind the limiters and the DC-bus
// scaling, against exact integer bounds (128-bit host integers as the exact reference).
#include "rotorq/detail/newton.hpp"

#include <gtest/gtest.h>

#include <random>
#include <vector>

namespace {

using u128 = unsigned __int128;

std::vector<uint32_t> inputs(uint32_t low, uint32_t high) {
  std::vector<uint32_t> out;
  for (uint32_t k = 0; k < 4096; ++k) {
    out.push_back(low + k);
    out.push_back(high - k);
  }
  // every start-table boundary of the reciprocal square root and its neighbours
  for (uint64_t b = uint64_t{low}; b <= high; b += uint64_t{1} << 27) {
    for (int d = -2; d <= 2; ++d) {
      const uint64_t x = b + static_cast<uint64_t>(d);
      if (x >= low && x <= high) out.push_back(static_cast<uint32_t>(x));
    }
  }
  std::mt19937_64 rng(30);
  for (int n = 0; n < 2000000; ++n)
    out.push_back(low + static_cast<uint32_t>(rng() % (uint64_t{high} - low + 1)));
  return out;
}

// R is within 2 units of 2^62 / m: |R m - 2^62| <= 2 m, exactly.
TEST(Newton, ReciprocalIsWithinTwoUnitsOfQ30) {
  for (uint32_t m : inputs(0x80000000u, 0xffffffffu)) {
    const uint32_t r = rotorq::detail::reciprocal_q30(m);
    const u128 product = static_cast<u128>(r) * m, exact = static_cast<u128>(1) << 62;
    const u128 error = product > exact ? product - exact : exact - product;
    ASSERT_LE(error, static_cast<u128>(2) * m) << "m = " << m << " R = " << r;
  }
}

// R is within 2 units of 2^46 / sqrt(m): (R - 2)^2 m <= 2^92 <= (R + 2)^2 m, exactly.
TEST(Newton, ReciprocalSquareRootIsWithinTwoUnitsOfQ30) {
  for (uint32_t m : inputs(0x40000000u, 0xffffffffu)) {
    const uint32_t r = rotorq::detail::reciprocal_sqrt_q30(m);
    const u128 exact = static_cast<u128>(1) << 92;
    const u128 below = static_cast<u128>(r - 2) * (r - 2) * m;
    const u128 above = static_cast<u128>(r + 2) * (r + 2) * m;
    ASSERT_LE(below, exact) << "m = " << m << " R = " << r;
    ASSERT_GE(above, exact) << "m = " << m << " R = " << r;
  }
}

TEST(Newton, LeadingZerosAndScalingHelpers) {
  for (int bit = 0; bit < 32; ++bit) {
    const uint32_t x = uint32_t{1} << bit;
    EXPECT_EQ(rotorq::detail::leading_zeros(x), 31 - bit);
    EXPECT_EQ(rotorq::detail::leading_zeros(x | (x - 1)), 31 - bit);
  }
  for (int bit = 0; bit < 64; ++bit) EXPECT_EQ(rotorq::detail::leading_zeros(uint64_t{1} << bit), 63 - bit);
  EXPECT_EQ(rotorq::detail::scale_by_power_of_two(-3, 2), -12);
  EXPECT_EQ(rotorq::detail::scale_by_power_of_two(-3, -1), -1);  // -1.5 rounds toward +infinity
  EXPECT_EQ(rotorq::detail::scale_by_power_of_two(3, -1), 2);
  // floor(v r / 2^30) against a 128-bit reference
  std::mt19937_64 rng(31);
  for (int n = 0; n < 1000000; ++n) {
    const auto r = static_cast<uint32_t>(rng() % ((uint64_t{1} << 30) + 1));
    const int64_t v = static_cast<int64_t>(rng() >> 1) * ((n & 1) ? -1 : 1) / 2;  // |v| < 2^62
    const __int128 exact = (static_cast<__int128>(v) * r) >> 30;
    ASSERT_EQ(rotorq::detail::multiply_q30(v, r), static_cast<int64_t>(exact)) << v << " " << r;
  }
}

}  // namespace
