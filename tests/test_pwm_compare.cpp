// Duty to timer compare values: the rounding rule written out independently, and minimum-pulse
// clipping over every compare value of small periods.
#include "rotorq/pwm_compare.hpp"

#include <gtest/gtest.h>

#include <vector>

#include "rotorq/host.hpp"
#include "rotorq/ref/svpwm.hpp"

namespace {

using rotorq::phases;
using rotorq::q15;
using rotorq::q31;

TEST(DutyToCompare, EveryQ15DutyRoundsToTheNearestCount) {
  for (uint32_t period : {0u, 1u, 2u, 3u, 999u, 1000u, 16384u, 20000u, 65535u}) {
    for (int32_t raw = -32768; raw < 32768; ++raw) {
      const q15 d = q15::from_raw(static_cast<int16_t>(raw));
      const auto got = rotorq::duty_to_compare(phases<q15>{d, d, d}, period);
      // nearest count to duty * period, ties up; negative duties are 0 (rule of pwm_compare.hpp)
      const int64_t twice = 2 * static_cast<int64_t>(raw < 0 ? 0 : raw) * period;  // 2 duty period 2^15
      const auto want = static_cast<uint32_t>((twice + 32768) / 65536);
      ASSERT_EQ(got.compare.a, want) << raw << " " << period;
      ASSERT_LE(got.compare.a, period);
      ASSERT_FALSE(got.clipped);
    }
  }
  EXPECT_EQ(rotorq::duty_to_compare(phases<q15>{q15::max(), q15::max(), q15::max()}, 16384).compare.a,
            16384u);
  const auto q31_full =
      rotorq::duty_to_compare(phases<q31>{q31::max(), q31::zero(), q31::min()}, 0xffffffffu);
  // round((1 - 2^-31)(2^32 - 1)) = round(2^32 - 3 + 2^-31) = 2^32 - 3
  EXPECT_EQ(q31_full.compare.a, 0xfffffffdu);
  EXPECT_EQ(q31_full.compare.b, 0u);
  EXPECT_EQ(q31_full.compare.c, 0u);
}

TEST(DutyToCompare, MinimumPulseRemovesOrWidensShortPulses) {
  const uint32_t period = 100, min_pulse = 10;
  for (int32_t raw = 0; raw < 32768; ++raw) {
    const q15 d = q15::from_raw(static_cast<int16_t>(raw));
    const uint32_t plain = rotorq::duty_to_compare(phases<q15>{d, d, d}, period).compare.a;
    const auto got = rotorq::duty_to_compare(phases<q15>{d, q15::zero(), d}, period, min_pulse);
    uint32_t want = plain;
    if (plain > 0 && plain < min_pulse) want = plain < 5 ? 0 : min_pulse;  // high pulse too short
    if (plain < period && plain > period - min_pulse) want = period - plain < 5 ? period : period - min_pulse;
    ASSERT_EQ(got.compare.a, want) << plain;
    ASSERT_EQ(got.compare.c, want) << plain;
    ASSERT_EQ(got.compare.b, 0u);
    ASSERT_EQ(got.clipped, want != plain) << plain;
    // no pulse (high or low) shorter than the minimum survives
    ASSERT_TRUE(want == 0 || want == period || (want >= min_pulse && period - want >= min_pulse)) << plain;
  }
}

// The double twin agrees for every q15 duty, several periods and minimum pulses.
TEST(DutyToCompare, MatchesTheDoubleTwin) {
  for (uint32_t period : {7u, 100u, 2500u}) {
    for (uint32_t min_pulse : {0u, 3u, 40u, 5000u}) {
      for (int32_t raw = -40; raw < 32768; raw += (raw < 40 || raw > 32700) ? 1 : 37) {
        const q15 d = q15::from_raw(static_cast<int16_t>(raw));
        const uint32_t got = rotorq::duty_to_compare(phases<q15>{d, d, d}, period, min_pulse).compare.a;
        const double want = rotorq::ref::duty_to_compare(rotorq::to_double(d), period, min_pulse);
        ASSERT_EQ(static_cast<double>(got), want) << raw << " " << period << " " << min_pulse;
      }
    }
  }
}

TEST(DutyToCompare, OversizedMinimumCountsAsHalfThePeriod) {
  const q15 quarter = q15::from_raw(8192);
  const auto got = rotorq::duty_to_compare(phases<q15>{quarter, quarter, quarter}, 10, 1000);
  // 2.5 -> 3 counts, below the effective minimum of 5, nearer to 5 than to 0 (3 >= 2.5)
  EXPECT_EQ(got.compare.a, 5u);
  EXPECT_TRUE(got.clipped);
}

}  // namespace
