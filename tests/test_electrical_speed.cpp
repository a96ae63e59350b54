// Speed in turn32 steps per tick (Q16) from a motion and an interval, against exact 128-bit integer
// quotients and the double twin; the rpm conversion against its double twin.
#include "rotorq/electrical_speed.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

#include "rotorq/ref/ref.hpp"

namespace {

using rotorq::electrical_speed;

// round(steps 2^16 / ticks), exactly, saturated (the specification written out with 128 bits)
int64_t exact_speed(int64_t steps, uint64_t ticks) {
  const unsigned __int128 m = static_cast<unsigned __int128>(steps < 0 ? -steps : steps) << 16;
  const unsigned __int128 q = (m + ticks / 2) / ticks;
  const auto limited = static_cast<int64_t>(q > static_cast<unsigned __int128>(electrical_speed::raw_max)
                                                ? electrical_speed::raw_max
                                                : static_cast<int64_t>(q));
  return steps < 0 ? -limited : limited;
}

// speed_from_motion is within 2^-28 relative + 0.5 raw of exact (electrical_speed.hpp), over motions
// up to a few turns and intervals from 1 tick to 2^35 ticks, including the edges of each binade.
TEST(ElectricalSpeed, SpeedFromMotionIsWithinItsBound) {
  std::mt19937_64 rng(20240611);
  double worst = 0;
  for (int k = 0; k < 400000; ++k) {
    const int step_bits = static_cast<int>(rng() % 34), tick_bits = static_cast<int>(rng() % 36);
    int64_t steps =
        static_cast<int64_t>(rng() >> (64 - step_bits - 1)) + (k % 3 == 0 ? (int64_t{1} << step_bits) : 0);
    if (k % 2) steps = -steps;
    uint64_t ticks = (rng() >> (64 - tick_bits - 1)) + 1;
    if (k % 5 == 0) ticks = uint64_t{1} << tick_bits;
    const int64_t want = exact_speed(steps, ticks);
    const int64_t got = rotorq::speed_from_motion(steps, ticks).raw();
    const double allowed = std::fabs(static_cast<double>(want)) * std::ldexp(1.0, -28) + 0.5 + 1e-9;
    const double error = std::fabs(static_cast<double>(got - want));
    if (std::llabs(want) == electrical_speed::raw_max) continue;  // saturated: checked below
    if (std::llabs(want) > (int64_t{1} << 30))
      worst = std::fmax(worst, error / std::fabs(static_cast<double>(want)));
    ASSERT_LE(error, allowed + 0.5) << "steps " << steps << " ticks " << ticks << " got " << got << " want "
                                    << want;
    // the double twin, in turns per tick
    const double twin = rotorq::ref::speed_from_motion(std::ldexp(static_cast<double>(steps), -32),
                                                       static_cast<double>(ticks));
    ASSERT_NEAR(std::ldexp(static_cast<double>(got), -48), twin,
                std::fabs(twin) * 1e-8 + std::ldexp(1.0, -48));
  }
  std::printf("speed_from_motion: largest relative error above 2^30 raw %.3g (bound 2^-28 = %.3g)\n", worst,
              std::ldexp(1.0, -28));
}

TEST(ElectricalSpeed, EdgeCases) {
  EXPECT_EQ(rotorq::speed_from_motion(12345, 0), electrical_speed::zero());
  EXPECT_EQ(rotorq::speed_from_motion(0, 77), electrical_speed::zero());
  EXPECT_EQ(rotorq::speed_from_motion(int64_t{1} << 32, 1).raw(), electrical_speed::raw_max);  // saturates
  EXPECT_EQ(rotorq::speed_from_motion(-(int64_t{1} << 32), 1).raw(), -electrical_speed::raw_max);
  EXPECT_EQ(rotorq::speed_from_motion(1, 65536).raw(), 1);  // the smallest speed: 1 step in 2^16 ticks
  EXPECT_EQ(rotorq::speed_from_motion(1000, 1000).raw(), 65536);
  EXPECT_EQ(electrical_speed::from_raw(int64_t{1} << 60).raw(), electrical_speed::raw_max);
  EXPECT_EQ((-electrical_speed::from_raw(5)).raw(), -5);
}

// steps_at is floor(|speed| ticks / 2^16) with the speed's sign, exactly.
TEST(ElectricalSpeed, StepsAtIsExact) {
  std::mt19937_64 rng(7);
  for (int k = 0; k < 200000; ++k) {
    const auto raw = static_cast<int64_t>(rng() >> 17) * (k % 2 ? -1 : 1);  // |raw| < 2^47
    const auto ticks = static_cast<uint32_t>(rng());
    const electrical_speed s = electrical_speed::from_raw(raw);
    const unsigned __int128 p = static_cast<unsigned __int128>(s.magnitude()) * ticks;
    const auto want = static_cast<int64_t>(p >> 16) * (raw < 0 ? -1 : 1);
    ASSERT_EQ(rotorq::steps_at(s, ticks), want) << "raw " << raw << " ticks " << ticks;
  }
}

// rpm: turns per tick * f_timer * 60 / pole pairs (the definition), against the double twin for
// made-up drives; within 2^-29 relative + 1/512 rpm, saturated beyond 2^23 rpm.
TEST(ElectricalSpeed, RpmMatchesTheTwin) {
  struct drive_case {
    uint32_t pole_pairs, timer_hz;
  };
  // the last two keep the configuration quotient small (many pole pairs, a slow timer), where a
  // plain integer division would lose the bound's precision
  const drive_case cases[] = {{1, 1000000},      {4, 72000000},  {7, 170000000},         {2, 32768},
                              {21, 4000000000u}, {65535, 32768}, {0x7fffffffu, 2097153u}};
  std::mt19937_64 rng(3);
  for (const drive_case& c : cases) {
    const rotorq::rpm_scale scale(c.pole_pairs, c.timer_hz);
    for (int k = 0; k < 20000; ++k) {
      const auto raw = static_cast<int64_t>(rng() >> (17 + rng() % 40)) * (k % 2 ? -1 : 1);
      const electrical_speed s = electrical_speed::from_raw(raw);
      const double want =
          256 * rotorq::ref::rpm(std::ldexp(static_cast<double>(raw), -48), c.pole_pairs, c.timer_hz);
      const int32_t got = scale.rpm_q8(s);
      if (std::fabs(want) >= 2147483647.0) {
        ASSERT_EQ(got, want > 0 ? 2147483647 : -2147483647) << raw;
        continue;
      }
      ASSERT_NEAR(got, want, std::fabs(want) * std::ldexp(1.0, -28) + 0.5 + 1e-6)
          << "pole pairs " << c.pole_pairs << " timer " << c.timer_hz << " raw " << raw;
    }
  }
  // Found by fuzz_rotor_angle: the fastest speed with 2^31 - 1 pole pairs at 2097153 Hz is
  // 7.500007 rpm x 256; a configuration quotient truncated to 20 bits gave 7, not 8.
  {
    const electrical_speed fastest = electrical_speed::from_raw(0x7fffffffffff);
    const double want = 256 * rotorq::ref::rpm(std::ldexp(0x7fffffffffff * 1.0, -48), 0x7fffffffu, 2097153u);
    EXPECT_NEAR(rotorq::rpm_scale(0x7fffffffu, 2097153u).rpm_q8(fastest), want,
                0.5 + want * std::ldexp(1.0, -28));
  }
  // A check value (derived): 1/6 turn per 1000 ticks at 1 MHz is 166.67 Hz electrical, 10000 rpm
  // electrical, 2500 rpm with 4 pole pairs.
  const electrical_speed sixth = rotorq::speed_from_motion(int64_t{1} << 32, 6000);
  EXPECT_NEAR(rotorq::rpm_scale(4, 1000000).rpm_q8(sixth) / 256.0, 2500.0, 0.01);
  EXPECT_EQ(rotorq::rpm_scale(0, 1000000).rpm_q8(sixth), rotorq::rpm_scale(1, 1000000).rpm_q8(sixth));
  EXPECT_EQ(rotorq::rpm_scale(3, 0).rpm_q8(sixth), 0);
}

}  // namespace
