// The position-sample interpolator: slow samples of a made-up encoder and of an observer, read by a
// fast control loop, against the double twin (ref::interpolate_angle) and the simulated rotor.
#include "rotorq/angle_interpolator.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>

#include "rotorq/host.hpp"
#include "rotorq/ref/ref.hpp"

namespace {

using rotorq::angle_interpolator;
using rotorq::turn32;

double error_steps(turn32 got, double want_turns) {
  return rotorq::ref::signed_difference_turns(rotorq::to_turns(got), want_turns) * 4294967296.0;
}

// A rotor at constant speed sampled every `sample_period` ticks (exact angles, rounded to turn32),
// read every `read_period` ticks. Between samples the estimate is the twin's extrapolation to within
// 2^-28 relative of the extrapolated motion + 2 steps (derived: speed rounding and the samples'
// own rounding), and so the rotor's angle; over both wraps (angle every turn, the timer as below).
template <int TimerBits>
void check_constant_speed(double turns_per_tick, uint64_t start, uint64_t sample_period,
                          uint64_t read_period) {
  using time_type = typename angle_interpolator<TimerBits>::time_type;
  angle_interpolator<TimerBits> position(static_cast<uint32_t>(2 * sample_period));
  const auto truth = [&](uint64_t t) { return 0.77 + turns_per_tick * static_cast<double>(t - start); };
  double worst = 0;
  uint64_t last_sample = start;
  for (uint64_t t = start; t < start + 400 * sample_period; t += read_period) {
    if (t >= last_sample + sample_period || t == start) {
      last_sample = t;
      position.update(rotorq::turn32_from_degrees(360 * truth(t)), static_cast<time_type>(t));
    }
    if (t < start + 2 * sample_period) continue;
    const rotorq::interpolated_angle a = position.estimate(static_cast<time_type>(t));
    ASSERT_TRUE(a.valid);
    ASSERT_FALSE(a.stale);
    const double twin = rotorq::ref::interpolate_angle(truth(last_sample), turns_per_tick,
                                                       static_cast<double>(t - last_sample), 1e12);
    const double moved = std::fabs(turns_per_tick) * static_cast<double>(t - last_sample) * 4294967296.0;
    const double e = std::fabs(error_steps(a.angle, twin));
    ASSERT_LE(e, moved * std::ldexp(1.0, -28) + 2.0 + 1e-6)
        << "tick " << t << " since sample " << t - last_sample;
    worst = std::fmax(worst, e);
  }
  std::printf("timer %d bits, %.3g turns/tick: largest error %.2f turn32 steps\n", TimerBits, turns_per_tick,
              worst);
}

TEST(AngleInterpolator, ConstantSpeedBetweenSlowSamples) {
  // encoder read at 1 kHz, loop at 20 kHz, 10 MHz timer: 300 Hz forward, 45 Hz backward
  check_constant_speed<32>(300.0 / 10e6, 1000, 10000, 500);
  check_constant_speed<32>(-45.0 / 10e6, (uint64_t{1} << 32) - 777777, 10000, 500);
  // 16-bit timer at 1 MHz (wraps every 65 ms): observer output at 2 kHz, loop at 16 kHz
  check_constant_speed<16>(120.0 / 1e6, 60000, 500, 62);
  check_constant_speed<16>(-600.0 / 1e6, 12345, 500, 62);
}

// The speed supplied by an observer is used as given; a request before the sample interpolates
// backward in time; beyond max_extrapolation the angle stops and says stale.
TEST(AngleInterpolator, ObserverSpeedBackwardRequestsAndStaleness) {
  angle_interpolator<32> position(1000);
  const auto speed = rotorq::electrical_speed::from_raw(int64_t{1} << 36);  // 2^20 steps per tick
  position.update(turn32::from_raw(0xfff00000u), 5000, speed);
  EXPECT_EQ(position.angle(5000).raw(), 0xfff00000u);
  EXPECT_EQ(position.angle(5001).raw(), 0u);           // wraps through zero
  EXPECT_EQ(position.angle(4999).raw(), 0xffe00000u);  // before the sample
  EXPECT_FALSE(position.estimate(6000).stale);
  const rotorq::interpolated_angle late = position.estimate(6001);
  EXPECT_TRUE(late.stale);
  EXPECT_EQ(late.angle, position.angle(6000));
  EXPECT_EQ(position.estimate(3999).angle, position.angle(4000));
  EXPECT_EQ(late.speed, speed);
}

TEST(AngleInterpolator, DefinedResultsForBadInput) {
  angle_interpolator<16> position;
  EXPECT_FALSE(position.estimate(10).valid);
  EXPECT_EQ(position.angle(10).raw(), 0u);
  position.update(turn32::from_raw(1000), 100);
  EXPECT_TRUE(position.estimate(200).valid);
  EXPECT_EQ(position.angle(200).raw(), 1000u);   // one sample: no speed yet
  position.update(turn32::from_raw(2000), 110);  // 100 steps per tick
  EXPECT_EQ(position.angle(120).raw(), 3000u);
  position.update(turn32::from_raw(2500), 110);  // same timestamp: the speed is kept
  EXPECT_EQ(position.angle(111).raw(), 2600u);
  position.update(turn32::from_raw(2500), static_cast<uint16_t>(110 + 40000));  // beyond half the range
  EXPECT_EQ(position.estimate(0).speed, rotorq::electrical_speed::zero());
  // the default extrapolation limit is half the timer range minus one
  angle_interpolator<16> unlimited;
  unlimited.update(turn32{}, 0, rotorq::speed_from_motion(1, 1));
  EXPECT_FALSE(unlimited.estimate(32767).stale);
  EXPECT_EQ(unlimited.angle(32767).raw(), 32767u);
}

}  // namespace
