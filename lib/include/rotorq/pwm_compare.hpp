// Duty cycles to timer compare values for centre-aligned PWM.
//
// The timer counts up from 0 to `period` and back down (centre-aligned, one PWM period is 2 * period
// ticks); a phase's high-side switch is on while the counter is below its compare value, so
// compare / period is the duty and the pulse is centred on the counter's zero. Sampling the phase
// currents at the counter's peak (all low-side switches on) is then the middle of the zero vector.
//
//   duty_to_compare(duty, period)             compare = round(duty * period) (ties toward +infinity),
//                                             duty clamped to [0, max()]; max() gives
//                                             round((1 - 2^-F) period), which is period for
//                                             period <= 2^(F-1)
//   duty_to_compare(duty, period, min_pulse)  the same, then every pulse shorter than min_pulse is
//                                             removed or widened to min_pulse, whichever is nearer
//                                             (ties widen): compare values in (0, min_pulse) go to 0
//                                             or min_pulse, values in (period - min_pulse, period) to
//                                             period or period - min_pulse
//
// Minimum-pulse clipping serves bootstrap gate drivers (the low side must be on long enough to
// recharge the bootstrap capacitor) and shunt current sampling (the low side must be on for the ADC
// window). Its effect: each phase's applied duty differs from the request by up to min_pulse / (2
// period), so the line-to-line voltage is distorted near zero and near full output, a dead band the
// current regulator sees as a small low-frequency error. min_pulse above period / 2 counts as
// period / 2. Period 0 gives all zeros; period 1 gives 0 or 1.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

namespace rotorq {

struct compare_values {
  phases<uint32_t> compare{};
  bool clipped = false;  // minimum-pulse clipping changed at least one value
};

namespace detail {

template <int F>
constexpr uint32_t compare_of(fixed<F> duty, uint32_t period) noexcept {
  const uint32_t d = duty.raw() > 0 ? static_cast<uint32_t>(duty.raw()) : 0u;  // < 2^F
  return static_cast<uint32_t>((detail::ops::mul_wide_u32(d, period) + (uint64_t{1} << (F - 1))) >>
                               F);  // <= period
}

constexpr uint32_t clip_pulse(uint32_t c, uint32_t period, uint32_t min_pulse) noexcept {
  if (c > 0 && c < min_pulse) return 2 * c < min_pulse ? 0 : min_pulse;
  const uint32_t off = period - c;
  if (off > 0 && off < min_pulse) return 2 * off < min_pulse ? period : period - min_pulse;
  return c;
}

}  // namespace detail

template <int F>
constexpr compare_values duty_to_compare(phases<fixed<F>> duty, uint32_t period,
                                         uint32_t min_pulse = 0) noexcept {
  const uint32_t pulse = min_pulse < period / 2 ? min_pulse : period / 2;
  const phases<uint32_t> exact{detail::compare_of(duty.a, period), detail::compare_of(duty.b, period),
                               detail::compare_of(duty.c, period)};
  const phases<uint32_t> clipped{detail::clip_pulse(exact.a, period, pulse),
                                 detail::clip_pulse(exact.b, period, pulse),
                                 detail::clip_pulse(exact.c, period, pulse)};
  return {clipped, clipped != exact};
}

}  // namespace rotorq
