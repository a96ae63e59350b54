// Electrical speed in a fixed-point format, and its conversion to revolutions per minute.
//
// electrical_speed holds turn32 steps per timer tick with 16 fractional bits: raw / 2^16 steps of
// 2^-32 turn per tick, that is raw / 2^48 electrical turns per tick. Positive is the forward
// direction (increasing angle, alpha toward beta). Its range is |raw| <= 2^47 - 1 (just under half
// a turn per tick, the most a sampled angle can tell apart); results beyond it saturate.
//
//   speed_from_motion(steps, ticks)   (steps turn32 steps) / (ticks timer ticks), rounded to
//                                     nearest, within 2^-28 relative + 0.5 raw of exact. No division:
//                                     the reciprocal of the interval comes from a normalised start
//                                     and three Newton steps (detail/newton.hpp), so a core without a
//                                     hardware divider pays a few multiplies. ticks == 0 gives 0.
//   rpm_scale(pole_pairs, timer_hz)   converter to mechanical rpm; the constructor divides once (at
//                                     configuration, not on the hot path), rpm_q8(speed) then takes
//                                     one 32x32-bit multiply: rpm * 256, rounded, saturated to int32.
//
// Resolution. One raw unit is timer_hz / 2^48 electrical turns per second: 3.6e-7 Hz at 100 MHz,
// far below what a measurement delivers. What limits a measured speed is the timer: an interval of
// T ticks is known to +-1 tick, so a speed measured over T ticks is good to 1/T relative (a 60 degree
// interval of 1000 ticks: 0.1 %; averaging over a full turn, 6000 ticks: 0.017 %). rpm_q8 adds at
// most 2^-29 relative and 1/512 rpm of rounding, and saturates beyond +-2^23 rpm.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/newton.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/detail/speed_math.hpp"

namespace rotorq {

class electrical_speed {
 public:
  static constexpr int fraction_bits = 16;  // of turn32 steps per tick
  static constexpr int64_t raw_max = detail::pow2(47) - 1;

  constexpr electrical_speed() noexcept = default;
  // Saturates to [-raw_max, raw_max].
  static constexpr electrical_speed from_raw(int64_t raw) noexcept {
    return electrical_speed(detail::clamp(raw, -raw_max, raw_max));
  }
  static constexpr electrical_speed zero() noexcept { return electrical_speed(0); }
  constexpr int64_t raw() const noexcept { return raw_; }
  // |raw|, at most raw_max.
  constexpr uint64_t magnitude() const noexcept {
    return raw_ < 0 ? static_cast<uint64_t>(-raw_) : static_cast<uint64_t>(raw_);
  }

  friend constexpr electrical_speed operator-(electrical_speed s) noexcept {
    return electrical_speed(-s.raw_);
  }
  friend constexpr bool operator==(electrical_speed a, electrical_speed b) noexcept {
    return a.raw_ == b.raw_;
  }
  friend constexpr bool operator!=(electrical_speed a, electrical_speed b) noexcept {
    return a.raw_ != b.raw_;
  }
  friend constexpr bool operator<(electrical_speed a, electrical_speed b) noexcept { return a.raw_ < b.raw_; }
  friend constexpr bool operator>(electrical_speed a, electrical_speed b) noexcept { return a.raw_ > b.raw_; }
  friend constexpr bool operator<=(electrical_speed a, electrical_speed b) noexcept {
    return a.raw_ <= b.raw_;
  }
  friend constexpr bool operator>=(electrical_speed a, electrical_speed b) noexcept {
    return a.raw_ >= b.raw_;
  }

 private:
  constexpr explicit electrical_speed(int64_t raw) noexcept : raw_(raw) {}
  int64_t raw_ = 0;  // |raw_| <= raw_max, so negation never overflows
};

// The speed of a motion of `steps` turn32 steps (signed, any value; beyond |raw_max| per tick the
// result saturates) in `ticks` timer ticks.
constexpr electrical_speed speed_from_motion(int64_t steps, uint64_t ticks) noexcept {
  if (steps == 0 || ticks == 0) return electrical_speed::zero();
  // negated in unsigned arithmetic: |INT64_MIN| = 2^63 is a magnitude too
  const uint64_t magnitude = steps < 0 ? 0 - static_cast<uint64_t>(steps) : static_cast<uint64_t>(steps);
  const auto q = static_cast<int64_t>(
      detail::quotient_q16(magnitude, ticks, static_cast<uint64_t>(electrical_speed::raw_max)));
  return electrical_speed::from_raw(steps < 0 ? -q : q);
}

// The signed number of turn32 steps covered at `speed` in `ticks` ticks (|result| < 2^63), rounded
// toward zero.
constexpr int64_t steps_at(electrical_speed speed, uint32_t ticks) noexcept {
  const auto s = static_cast<int64_t>(detail::steps_in(speed.magnitude(), ticks));
  return speed.raw() < 0 ? -s : s;
}

class rpm_scale {
 public:
  // rpm = turns per tick * timer_hz * 60 / pole_pairs; pole_pairs 0 counts as 1, timer_hz 0 gives 0.
  constexpr rpm_scale(uint32_t pole_pairs, uint32_t timer_hz) noexcept {
    const uint64_t pairs = pole_pairs == 0 ? 1 : pole_pairs;
    if (timer_hz == 0) return;
    const uint64_t per_turn_per_tick = uint64_t{timer_hz} * 60;  // < 2^38
    // The one division, at configuration: K = 60 timer_hz 2^24 / pole_pairs, with the numerator first
    // shifted up to 64 bits so that the quotient keeps at least 33 significant bits whatever the
    // pole pairs (the truncation stays below 2^-32 of K).
    const uint64_t numerator = per_turn_per_tick << 24;  // < 2^62
    const int extra = detail::leading_zeros(numerator);
    const uint64_t k = (numerator << extra) / pairs;  // K 2^extra, >= 2^32
    const detail::mantissa32 n = detail::normalize32(k);
    mantissa_ = n.mantissa;
    exponent_ = n.exponent - extra;
  }

  // Mechanical rpm * 256, rounded to nearest, saturated to the int32 range.
  constexpr int32_t rpm_q8(electrical_speed speed) const noexcept {
    if (mantissa_ == 0 || speed.raw() == 0) return 0;
    const detail::mantissa32 s = detail::normalize32(speed.magnitude());
    const uint64_t p = detail::ops::mul_wide_u32(s.mantissa, mantissa_);
    // rpm * 256 = raw 2^-48 K 2^-24 2^8 = p 2^(e_s + e_k - 64)
    const int shift = 64 - s.exponent - exponent_;
    const uint64_t limit = 0x7fffffffu;
    const uint64_t value = shift <= 0 ? limit : detail::round_shift_unsigned(p, shift);
    const auto magnitude = static_cast<int32_t>(value < limit ? value : limit);
    return speed.raw() < 0 ? -magnitude : magnitude;
  }

 private:
  uint32_t mantissa_ = 0;
  int exponent_ = 0;
};

}  // namespace rotorq
