// A small simulated motor for the rotor-angle tests: an electrical angle as a function of time
// (in timer ticks), three Hall sensors with their own edge positions, and a driver that feeds a
// tracker the way firmware does (each edge with its captured tick, then a poll every control
// period). The motors are made up for these tests.
#pragma once

#include <cmath>
#include <cstdint>
#include <functional>
#include <vector>

#include "rotorq/hall.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/rotor_angle.hpp"

namespace rotorq::test {

struct simulated_motor {
  std::function<double(double)> position;      // electrical angle in turns at a time in ticks
  double rising[3] = {0.0, 1.0 / 3, 2.0 / 3};  // sensor rising edges (turns), 120-degree placement

  int code_at(double ticks) const { return ref::hall_code_at(position(ticks), rising); }
};

// theta(t) = theta0 + w t + a t^2 / 2 (turns, ticks), optionally frozen from `stop` on.
inline std::function<double(double)> constant_acceleration(double theta0, double w, double a,
                                                           double stop = INFINITY) {
  return [=](double t) {
    const double u = std::fmin(t, stop);
    return theta0 + w * u + 0.5 * a * u * u;
  };
}

struct sample {
  uint64_t ticks;  // absolute time
  double truth;    // turns
  double estimate;
  double speed;  // turns per tick, as reported
  int direction;
  int source;
  bool stalled;
  bool invalid;
};

// Signed error estimate - truth in degrees, wrapped to [-180, 180).
inline double error_degrees(double estimate, double truth) {
  return 360.0 * ref::signed_difference_turns(estimate, truth);
}
inline double turns_of(turn32 a) { return to_turns(a); }
inline double turns_per_tick(electrical_speed s) {
  return static_cast<double>(s.raw()) / std::ldexp(1.0, 48);
}

// Feeds `tracker` over [start, start + periods * period] absolute ticks: every Hall edge with the
// tick at which the new code is first read (one edge at most per period is assumed), then the code at
// the end of the period. `before_edge(tick, tracker)` runs just before each edge is fed, `after(sample)`
// after each poll. Times are reduced modulo the timer range.
template <typename Tracker, typename BeforeEdge, typename After>
void drive(const simulated_motor& motor, Tracker& tracker, uint64_t start, uint64_t period, int periods,
           BeforeEdge&& before_edge, After&& after) {
  using time_type = typename Tracker::time_type;
  const auto timer = [](uint64_t t) { return static_cast<time_type>(t); };
  int code = motor.code_at(static_cast<double>(start));
  tracker.update(static_cast<uint8_t>(code), timer(start));
  for (int k = 0; k < periods; ++k) {
    const uint64_t t0 = start + static_cast<uint64_t>(k) * period, t1 = t0 + period;
    uint64_t from = t0;
    while (motor.code_at(static_cast<double>(t1)) != code) {
      // an edge in (from, t1]: bisect for a tick whose code differs while the one before does not
      uint64_t lo = from, hi = t1;
      while (hi - lo > 1) {
        const uint64_t mid = lo + (hi - lo) / 2;
        (motor.code_at(static_cast<double>(mid)) == code ? lo : hi) = mid;
      }
      before_edge(hi, tracker);
      code = motor.code_at(static_cast<double>(hi));
      tracker.update(static_cast<uint8_t>(code), timer(hi));
      from = hi;
    }
    tracker.update(static_cast<uint8_t>(code), timer(t1));
    const auto e = tracker.estimate(timer(t1));
    after(sample{t1, motor.position(static_cast<double>(t1)), turns_of(e.angle), turns_per_tick(e.speed),
                 static_cast<int>(e.direction), static_cast<int>(e.source), e.stalled, e.invalid_code});
  }
}

// The largest step of consecutive estimates against the reported direction (or either way when
// the direction is unknown, or while the estimate is a sector centre, which moves only by the
// tracker's slew), in degrees.
struct jump_watch {
  bool has_previous = false;
  double previous = 0;
  double worst = 0;
  void see(const sample& s) {
    if (has_previous) {
      const double d = 360.0 * ref::signed_difference_turns(s.estimate, previous);
      const bool centre = s.source == 1;  // angle_source::sector_centre
      const double against = centre || s.direction == 0 ? std::fabs(d) : s.direction > 0 ? -d : d;
      worst = std::fmax(worst, against);
    }
    has_previous = true;
    previous = s.estimate;
  }
};

}  // namespace rotorq::test
