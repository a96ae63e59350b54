// Timestamps of a free-running 16- or 32-bit timer, compared wrap-safely.
//
// A timer of N bits counts modulo 2^N, so the time from `then` to `now` is (now - then) modulo 2^N:
// unsigned subtraction, defined for every pair of values. It is unambiguous while the true interval
// is below 2^N ticks; the signed form below treats intervals of 2^(N-1) ticks or more as negative,
// so callers keep their intervals (stall timeouts, extrapolation limits) below half the range.
#pragma once

#include "rotorq/detail/integer.hpp"

namespace rotorq::detail {

template <int TimerBits>
struct timer_traits {
  static_assert(TimerBits == 16 || TimerBits == 32, "rotorq supports 16- and 32-bit timers");
  using time_type = typename select<TimerBits == 16, uint16_t, uint32_t>::type;
  static constexpr uint32_t half_range = uint32_t{1} << (TimerBits - 1);

  // (now - then) modulo 2^N, in [0, 2^N).
  static constexpr uint32_t elapsed(time_type now, time_type then) noexcept {
    return static_cast<time_type>(now - then);
  }
  // The same interval as a signed value in [-2^(N-1), 2^(N-1)): negative when `now` is before `then`.
  static constexpr int32_t signed_elapsed(time_type now, time_type then) noexcept {
    const uint32_t e = elapsed(now, then);
    return e < half_range ? static_cast<int32_t>(e)
                          : -static_cast<int32_t>((half_range - 1) - (e - half_range)) - 1;
  }
};

}  // namespace rotorq::detail
