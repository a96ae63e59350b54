// The rotor angle between Hall edges: a small class the caller owns (no heap), fed the Hall code
// with timestamps of a free-running 16- or 32-bit timer, giving the angle at any later timestamp.
//
//   hall_tracker<32> tracker(config);
//   tracker.update(code, capture_time);   // from the edge interrupt, with the captured time
//   tracker.update(code, now);            // every control period: glitch filter, stall timeout
//   const hall_estimate e = tracker.estimate(now);   // angle, speed, direction, what it is based on
//
// Method (first-order extrapolation between edges, common practice for low-resolution position
// sensors): at each accepted edge the tracker takes the calibrated angle of that edge
// (hall_calibration, per direction) and a speed from the edge intervals; between edges
//   angle(t) = edge angle + speed (t - t_edge),
// clamped so that it never runs past the angle of the next expected edge (it waits there until the
// edge comes). The speed is the calibrated angle covered divided by the time taken over the last
// edge interval (speed_averaging::last_edge: follows acceleration at once, carries the sensor
// placement error) or over the last six intervals (speed_averaging::full_turn: exactly one turn over
// their sum, which cancels placement error; until six intervals are seen, over those there are).
// One reciprocal per edge (speed_from_motion: Newton steps, no divide instruction); estimate() then
// costs two 32x32-bit multiplies.
//
// Defined results for every bad input:
//   invalid code (0b000 / 0b111 for 120-degree placement)   ignored: the last sector is held, the
//        estimate says invalid_code while it lasts, invalid_codes() counts them
//   bouncing edges   a change shorter than min_dwell ticks is dropped (hall_glitch_filter); a real
//        edge is confirmed min_dwell ticks after it is first read (dated at its first reading), and
//        until then the angle waits at the edge
//   reversal, a skipped sector, the first sector after start   the speed history restarts: the angle
//        falls back to the sector centre until two edges in one direction give a speed again
//   slow rotor   a speed below min_speed (checked at each edge) gives the sector centre
//   stall   no edge for stall_timeout ticks: sector centre, speed 0, stalled = true
//   timer wrap   all intervals are unsigned differences modulo the timer range; an interval is
//        unambiguous below half the range, so stall_timeout is capped just below it (update() must run
//        at least that often); a timestamp earlier than the last edge counts as the edge time
//
// Jumps. While interpolating in one direction the angle never steps back, not even at an edge: the
// extrapolation is held at the next edge's angle, which is where the re-sync starts. At an edge the
// new reference is in any case placed at most max_backward_jump behind the angle reported just
// before (a guard for tables whose edges disagree with the clamp). A fall-back to the sector centre
// (reversal, slow rotor, stall) starts from the angle reported at that moment and moves it to the
// centre, either way, no faster than centre_slew (turn32 steps per tick, applied in update(); the
// default moves it at once): with centre_slew = limit / control period the current loop never sees
// a step larger than the limit. Forward steps at an edge (catching up with an accelerating rotor,
// or from a held angle to the edge) are the correction toward a measured position and are not
// limited.
//
// Accuracy (tests/test_hall_tracker.cpp). At constant speed the error is within the rotor's motion
// in one timer tick plus 2 ticks of error in the speed's interval T spread over a sector:
// 360 f_e / f_t + 120 / T degrees (f_e electrical, f_t timer frequency; T = f_t / f_e turn-averaged,
// a sixth of that per edge), so 0.5 degrees needs roughly f_t >= 1000 f_e. Under acceleration the
// error just before an edge is 60 degrees (1 - T_k / T_k-1), the error of first-order extrapolation;
// decelerating, the clamp keeps it near 0. A sensor displaced by d degrees and not calibrated costs d
// with turn-averaged speed, about 1.8 d per edge. The angle is truncated to a turn32 step; the
// arithmetic itself is within 4 steps of its double twin.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/timer.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/hall.hpp"
#include "rotorq/rotation.hpp"
#include "rotorq/turn.hpp"

namespace rotorq {

enum class speed_averaging : uint8_t { last_edge, full_turn };
enum class angle_source : uint8_t { none, sector_centre, interpolated };

struct hall_tracker_config {
  hall_calibration calibration = uniform_hall_calibration();
  hall_placement placement = hall_placement::spaced_120;
  speed_averaging averaging = speed_averaging::full_turn;
  uint32_t min_dwell = 0;                // glitch filter, ticks
  uint32_t stall_timeout = 0xffffffffu;  // ticks without an edge; capped below half the timer range
  electrical_speed min_speed{};          // below it (at an edge): sector centre
  turn32 max_backward_jump = turn32::from_raw(0x0e38e38e);  // 20 degrees
  // how fast a fall-back moves the angle to the sector centre; the default moves it at once
  electrical_speed centre_slew = electrical_speed::from_raw(electrical_speed::raw_max);
};

struct hall_estimate {
  turn32 angle{};
  electrical_speed speed{};  // zero while stalled or unknown
  rotation direction = rotation::unknown;
  uint8_t sector = 0;  // 0..5, the accepted sector (0 before the first)
  angle_source source = angle_source::none;
  bool stalled = false;
  bool invalid_code = false;  // the last code read was impossible
  bool at_next_edge = false;  // the extrapolation is held at the next expected edge
};

template <int TimerBits>
class hall_tracker {
  using timer = detail::timer_traits<TimerBits>;

 public:
  using time_type = typename timer::time_type;

  constexpr explicit hall_tracker(const hall_tracker_config& config = hall_tracker_config{}) noexcept
      : config_(config),
        filter_(config.min_dwell),
        max_jump_(config.max_backward_jump.raw() < 0x80000000u ? config.max_backward_jump.raw()
                                                               : 0x7fffffffu),
        window_(config.averaging == speed_averaging::full_turn ? 6 : 1) {
    config_.stall_timeout =
        config.stall_timeout < timer::half_range ? config.stall_timeout : timer::half_range - 1;
  }

  // Feed the Hall code read at `time` (the capture time of an edge, or the current time).
  constexpr void update(uint8_t code, time_type time) noexcept {
    const hall_reading r = decode_hall(code, config_.placement);
    invalid_ = !r.valid;
    if (!r.valid) {
      if (invalid_count_ != 0xffffffffu) ++invalid_count_;
    } else {
      const hall_edge<TimerBits> edge = filter_.update(r.sector, time);
      if (edge.happened) accept_edge(edge.sector, edge.time);
    }
    if (source_ == angle_source::none) return;
    if (!stalled_ && timer::signed_elapsed(time, edge_time_) >= static_cast<int32_t>(config_.stall_timeout)) {
      if (source_ == angle_source::interpolated) fall_back(interpolate(time).angle, time);
      stalled_ = true;
      count_ = 0;
      speed_ = electrical_speed::zero();
    }
    if (source_ == angle_source::sector_centre) {
      const int32_t dt = timer::signed_elapsed(time, slew_time_);
      if (dt > 0) {
        const uint64_t allowed = detail::steps_in(config_.centre_slew.magnitude(), static_cast<uint32_t>(dt));
        held_ = step_toward(held_, sector_centre(config_.calibration, sector_),
                            allowed < 0x80000000u ? static_cast<uint32_t>(allowed) : 0x80000000u);
        slew_time_ = time;
      }
    }
  }

  constexpr hall_estimate estimate(time_type now) const noexcept {
    hall_estimate e{};
    e.invalid_code = invalid_;
    if (source_ == angle_source::none) return e;
    e.sector = sector_;
    e.direction = direction_;
    e.source = source_;
    e.stalled = stalled_;
    e.speed = stalled_ ? electrical_speed::zero() : speed_;
    if (source_ == angle_source::sector_centre) {
      e.angle = held_;
      return e;
    }
    const extrapolation x = interpolate(now);
    e.angle = x.angle;
    e.at_next_edge = x.at_limit;
    return e;
  }
  constexpr turn32 angle(time_type now) const noexcept { return estimate(now).angle; }

  constexpr uint32_t invalid_codes() const noexcept { return invalid_count_; }
  constexpr uint32_t edges() const noexcept { return edge_count_; }
  constexpr const hall_tracker_config& config() const noexcept { return config_; }

 private:
  struct extrapolation {
    turn32 angle;
    bool at_limit = false;
  };

  constexpr extrapolation interpolate(time_type now) const noexcept {
    const int32_t dt = timer::signed_elapsed(now, ref_time_);
    const uint64_t steps = dt > 0 ? detail::steps_in(speed_.magnitude(), static_cast<uint32_t>(dt)) : 0;
    const bool at_limit = steps >= limit_steps_;
    const uint32_t s = at_limit ? limit_steps_ : static_cast<uint32_t>(steps);
    return {
        direction_ == rotation::forward ? ref_angle_ + turn32::from_raw(s) : ref_angle_ - turn32::from_raw(s),
        at_limit};
  }

  // `from` moved toward `to` by at most `limit` steps.
  static constexpr turn32 step_toward(turn32 from, turn32 to, uint32_t limit) noexcept {
    const int32_t d = signed_difference(to, from);
    const uint32_t distance = d < 0 ? 0u - static_cast<uint32_t>(d) : static_cast<uint32_t>(d);
    if (distance <= limit) return to;
    return d < 0 ? from - turn32::from_raw(limit) : from + turn32::from_raw(limit);
  }

  // Hold the angle reported at `time` and move it toward the sector centre from then on.
  constexpr void fall_back(turn32 reported, time_type time) noexcept {
    held_ = reported;
    slew_time_ = time;
    source_ = angle_source::sector_centre;
  }

  constexpr void accept_edge(uint8_t s, time_type t) noexcept {
    ++edge_count_;
    if (source_ == angle_source::none) {
      sector_ = s;
      edge_time_ = t;
      held_ = sector_centre(config_.calibration, s);
      slew_time_ = t;
      source_ = angle_source::sector_centre;
      return;
    }
    const turn32 before = source_ == angle_source::interpolated ? interpolate(t).angle : held_;
    const rotation turning = s == detail::next_sector(sector_)       ? rotation::forward
                             : s == detail::previous_sector(sector_) ? rotation::backward
                                                                     : rotation::unknown;
    const bool forward = turning == rotation::forward;
    const turn32 edge_angle = entry_angle(config_.calibration, s, forward);
    const uint32_t interval = timer::elapsed(t, edge_time_);
    if (turning != rotation::unknown && turning == direction_ && edge_angle_known_ && !stalled_ &&
        interval < config_.stall_timeout) {
      head_ = static_cast<uint8_t>(head_ == 5 ? 0 : head_ + 1);
      interval_[head_] = interval;
      step_[head_] = signed_difference(edge_angle, edge_angle_);
      if (count_ < 6) ++count_;
    } else {
      count_ = 0;
    }
    direction_ = turning;
    edge_angle_ = edge_angle;
    edge_angle_known_ = turning != rotation::unknown;
    sector_ = s;
    edge_time_ = t;
    stalled_ = false;

    // the speed over the last min(count, window) intervals; |sum of steps| <= 6 * 2^31
    uint64_t ticks = 0;
    int64_t steps = 0;
    const uint8_t n = count_ < window_ ? count_ : window_;
    for (uint8_t k = 0, i = head_; k < n; ++k, i = static_cast<uint8_t>(i == 0 ? 5 : i - 1)) {
      ticks += interval_[i];
      steps += step_[i];
    }
    speed_ = n == 0 ? electrical_speed::zero() : speed_from_motion(steps, ticks);
    const bool usable = n != 0 && (forward ? speed_.raw() > 0 : speed_.raw() < 0) &&
                        speed_.magnitude() >= config_.min_speed.magnitude();
    if (!usable) {
      if (source_ == angle_source::interpolated) fall_back(before, t);
      return;
    }
    // Re-sync at the edge, at most max_jump_ behind the angle reported just before.
    const int32_t sign = forward ? 1 : -1;
    const int64_t ahead = int64_t{signed_difference(edge_angle, before)} * sign;
    ref_angle_ = edge_angle;
    if (ahead < -int64_t{max_jump_}) {
      ref_angle_ = forward ? before - turn32::from_raw(max_jump_) : before + turn32::from_raw(max_jump_);
    }
    ref_time_ = t;
    const turn32 next_edge = entry_angle(
        config_.calibration, forward ? detail::next_sector(s) : detail::previous_sector(s), forward);
    const int64_t room = int64_t{signed_difference(next_edge, ref_angle_)} * sign;
    limit_steps_ = room > 0 ? static_cast<uint32_t>(room) : 0;
    source_ = angle_source::interpolated;
  }

  hall_tracker_config config_;
  hall_glitch_filter<TimerBits> filter_;
  uint32_t max_jump_ = 0;
  uint8_t window_ = 6;

  angle_source source_ = angle_source::none;
  uint8_t sector_ = 0;
  rotation direction_ = rotation::unknown;
  bool stalled_ = false;
  bool invalid_ = false;
  bool edge_angle_known_ = false;
  time_type edge_time_ = 0;
  turn32 edge_angle_{};

  // the last six edge intervals and the calibrated angle each covered (a ring, newest at head_)
  uint32_t interval_[6] = {};
  int32_t step_[6] = {};
  uint8_t head_ = 0;
  uint8_t count_ = 0;
  electrical_speed speed_{};

  turn32 ref_angle_{};
  time_type ref_time_ = 0;
  uint32_t limit_steps_ = 0;
  turn32 held_{};
  time_type slew_time_ = 0;

  uint32_t invalid_count_ = 0;
  uint32_t edge_count_ = 0;
};

}  // namespace rotorq
