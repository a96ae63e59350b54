// The angle between position samples that come slower than the control loop: an encoder or resolver
// read at a lower rate, or an observer's output, with timestamps of a free-running 16- or 32-bit timer.
//
//   angle_interpolator<32> position(max_extrapolation_ticks);
//   position.update(sample_angle, sample_time);          // speed from the previous sample
//   position.update(sample_angle, sample_time, speed);   // or the source's own speed (an observer)
//   const interpolated_angle a = position.estimate(now); // at any time, before or after the sample
//
//   angle(t) = last sample + speed (t - t_sample)
// with the speed from the last two samples: signed_difference(angle, previous) / (t - t_previous),
// one reciprocal per sample (speed_from_motion: Newton steps, no divide instruction); the estimate
// costs two 32x32-bit multiplies. Angles wrap by themselves (turn32) and times by the timer's own
// modulo arithmetic, so neither wrap affects the result.
//
// Defined results: before the first sample the angle is 0 and valid = false; before a speed is known
// it is the last sample. Motion between two samples must stay below half a turn (Nyquist: a larger
// step is read as the shorter way back). Two samples with the same timestamp keep the previous
// speed; samples half the timer range or more apart give speed 0 (the interval is ambiguous). A
// requested time further than max_extrapolation ticks from the last sample (capped below half the
// timer range) uses max_extrapolation and sets stale = true: the angle stops instead of running on.
// Accuracy: exact for constant speed up to the speed's rounding (2^-28 relative) times the
// extrapolated motion, and the truncation to a turn32 step; the samples' own error passes through.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/timer.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/turn.hpp"

namespace rotorq {

struct interpolated_angle {
  turn32 angle{};
  electrical_speed speed{};
  bool valid = false;  // at least one sample
  bool stale = false;  // the request was beyond max_extrapolation from the last sample
};

template <int TimerBits>
class angle_interpolator {
  using timer = detail::timer_traits<TimerBits>;

 public:
  using time_type = typename timer::time_type;

  constexpr explicit angle_interpolator(uint32_t max_extrapolation = 0xffffffffu) noexcept
      : max_extrapolation_(max_extrapolation < timer::half_range ? max_extrapolation
                                                                 : timer::half_range - 1) {}

  constexpr void update(turn32 angle, time_type time) noexcept {
    if (samples_ != 0) {
      const uint32_t ticks = timer::elapsed(time, time_);
      if (ticks >= timer::half_range) {
        speed_ = electrical_speed::zero();
      } else if (ticks != 0) {
        speed_ = speed_from_motion(signed_difference(angle, angle_), ticks);
      }
    }
    if (samples_ < 2) ++samples_;
    angle_ = angle;
    time_ = time;
  }
  constexpr void update(turn32 angle, time_type time, electrical_speed speed) noexcept {
    angle_ = angle;
    time_ = time;
    speed_ = speed;
    samples_ = 2;
  }

  constexpr interpolated_angle estimate(time_type now) const noexcept {
    if (samples_ == 0) return {};
    const int32_t dt = timer::signed_elapsed(now, time_);
    const uint32_t distance = dt < 0 ? 0u - static_cast<uint32_t>(dt) : static_cast<uint32_t>(dt);
    const bool stale = distance > max_extrapolation_;
    const uint32_t ticks = stale ? max_extrapolation_ : distance;
    const auto steps = static_cast<uint32_t>(detail::steps_in(speed_.magnitude(), ticks));  // modulo a turn
    const bool ahead = (dt >= 0) == (speed_.raw() >= 0);
    return {ahead ? angle_ + turn32::from_raw(steps) : angle_ - turn32::from_raw(steps), speed_, true, stale};
  }
  constexpr turn32 angle(time_type now) const noexcept { return estimate(now).angle; }

 private:
  uint32_t max_extrapolation_;
  uint8_t samples_ = 0;
  turn32 angle_{};
  time_type time_ = 0;
  electrical_speed speed_{};
};

}  // namespace rotorq
