// Double-precision twins of rotorq/hall.hpp, rotorq/electrical_speed.hpp, rotorq/hall_tracker.hpp,
// rotorq/angle_interpolator.hpp and rotorq/commutation.hpp. Angles are in turns ([0, 1) unless said),
// speeds in turns per timer tick, times in ticks.
#pragma once

#include <cmath>

#include "rotorq/frames.hpp"
#include "rotorq/ref/clarke.hpp"
#include "rotorq/ref/turn.hpp"

namespace rotorq::ref {

// --- hall.hpp -----------------------------------------------------------------------------------
// The code that three sensors read at rotor angle `turns`, each high over the half turn starting
// at its rising edge (in turns); bit 0 is sensor A. The geometric model of decode_hall's tables:
// 120-degree placement has rising edges at 0, 1/3, 2/3 of the sensor frame, 60-degree at 0, 1/6, 1/3.
inline int hall_code_at(double turns, const double rising[3]) {
  int code = 0;
  for (int k = 0; k < 3; ++k) {
    const double into = turns - rising[k] - std::floor(turns - rising[k]);
    if (into < 0.5) code |= 1 << k;
  }
  return code;
}
// The sector (0..5) of a sensor-frame angle: floor(6 turns).
inline int hall_sector_of(double turns) {
  const int s = static_cast<int>(std::floor(6 * (turns - std::floor(turns))));
  return s > 5 ? 5 : s;
}
// Centre of sector s from the calibration's edges (turns): the mean of the two boundary means.
inline double sector_centre(const double entry_forward[6], const double entry_backward[6], int s) {
  const auto mid = [](double a, double b) { return add_turns(a, signed_difference_turns(b, a) / 2); };
  const double lower = mid(entry_forward[s], entry_backward[(s + 5) % 6]);
  const double upper = mid(entry_backward[s], entry_forward[(s + 1) % 6]);
  return mid(lower, upper);
}

// --- electrical_speed.hpp -----------------------------------------------------------------------
inline double speed_from_motion(double turns, double ticks) { return ticks == 0 ? 0.0 : turns / ticks; }
inline double rpm(double turns_per_tick, double pole_pairs, double timer_hz) {
  return turns_per_tick * timer_hz * 60.0 / (pole_pairs == 0 ? 1.0 : pole_pairs);
}

// --- hall_tracker.hpp ---------------------------------------------------------------------------
// The angle between edges: first-order extrapolation from the edge, held at the next expected edge
// (`room` turns ahead in the direction of the speed).
inline double extrapolate_to_next_edge(double edge_angle, double speed, double ticks_since_edge,
                                       double room) {
  const double moved = std::fmin(std::fabs(speed) * std::fmax(ticks_since_edge, 0.0), room);
  return add_turns(edge_angle, speed < 0 ? -moved : moved);
}
// Its error just before the next edge under constant acceleration (T_k the current interval, T_k-1
// the previous one): the sector width times (1 - T_k / T_k-1) when accelerating, 0 when the clamp
// holds it (derived from first-order extrapolation).
inline double extrapolation_error_before_edge(double sector_width, double t_k, double t_k_minus_1) {
  return t_k < t_k_minus_1 ? sector_width * (1 - t_k / t_k_minus_1) : 0.0;
}

// --- angle_interpolator.hpp ---------------------------------------------------------------------
inline double interpolate_angle(double sample, double speed, double ticks_from_sample, double max_ticks) {
  const double t = std::fmax(-max_ticks, std::fmin(max_ticks, ticks_from_sample));
  return add_turns(sample, speed * t);
}

// --- commutation.hpp ----------------------------------------------------------------------------
inline int commutation_sector(double turns) {
  const int k = static_cast<int>(std::floor(6 * (turns - std::floor(turns)) + 0.5));
  return k % 6;
}
// Stationary-frame voltage of a switching state: +1/2 high, -1/2 low, a floating phase at the
// midpoint of the other two (per unit of the bus).
inline stationary<double> commutation_voltage(int high, int low, double duty) {
  double p[3] = {0, 0, 0};
  p[high] = duty / 2;
  p[low] = -duty / 2;
  return clarke(phases<double>{p[0], p[1], p[2]});
}
// The vector (index 0..5 at 30 + 60 k degrees) that the six-step rule picks: the one whose angle is
// nearest 90 degrees ahead (forward) or behind (backward) of the sector centre.
inline int six_step_vector(int sector, bool forward) {
  const double target = sector / 6.0 + (forward ? 0.25 : -0.25);
  int best = 0;
  for (int k = 1; k < 6; ++k) {
    const double dk = std::fabs(signed_difference_turns((2 * k + 1) / 12.0, target));
    const double db = std::fabs(signed_difference_turns((2 * best + 1) / 12.0, target));
    if (dk < db) best = k;
  }
  return best;
}
// The current-angle offset that the hand-over starts FOC with: from the torque axis to the vector.
inline double handover_offset(double rotor_turns, bool forward) {
  const int k = six_step_vector(commutation_sector(rotor_turns), forward);
  return signed_difference_turns((2 * k + 1) / 12.0, add_turns(rotor_turns, forward ? 0.25 : -0.25));
}

}  // namespace rotorq::ref
