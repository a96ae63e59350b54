// Double-precision twins of rotorq/svpwm.hpp, rotorq/voltage_limit.hpp, rotorq/dc_bus.hpp and
// rotorq/pwm_compare.hpp.
//
// Two independent constructions of centred space-vector PWM are given: min-max zero-sequence
// injection (the library's method) and the sector/dwell-time construction of van der Broeck,
// Skudelny and Stanke, "Analysis and realization of a pulsewidth modulator based on voltage space
// vectors", IEEE Trans. Ind. Appl. 24(1), 1988: in the sector between active vectors V_k and V_k+1
// the dwell times are T_k = sqrt(3) |v| sin(60 deg - theta') and T_k+1 = sqrt(3) |v| sin(theta')
// (per unit of the PWM period, theta' the angle within the sector, v normalised to V_dc), and the
// zero time 1 - T_k - T_k+1 is split equally between V0 and V7.
#pragma once

#include <algorithm>
#include <cmath>

#include "rotorq/frames.hpp"
#include "rotorq/ref/clarke.hpp"

namespace rotorq::ref {

struct modulation_result {
  phases<double> duty;
  int sector = 1;
  bool limited = false;
};

inline int sector_of_angle(double alpha, double beta) {
  if (alpha == 0.0 && beta == 0.0) return 1;
  double degrees = std::atan2(beta, alpha) * 180.0 / M_PI;
  if (degrees < 0) degrees += 360.0;
  const int k = static_cast<int>(degrees / 60.0);
  return std::min(k, 5) + 1;
}

inline stationary<double> scale(stationary<double> v, double k) { return {v.alpha * k, v.beta * k}; }

// Min-max injection, with the two overmodulation choices (circle: scale to 1/sqrt(3); hexagon: scale
// the centred phase voltages radially onto the hexagon when max - min > 1).
inline modulation_result svpwm_min_max(stationary<double> v, bool circle) {
  const double inscribed = 1.0 / std::sqrt(3.0);
  const double length = std::hypot(v.alpha, v.beta);
  bool limited = false;
  if (circle && length > inscribed) {
    v = scale(v, inscribed / length);
    limited = true;
  }
  const phases<double> p = inverse_clarke(v);
  const double high = std::max({p.a, p.b, p.c}), low = std::min({p.a, p.b, p.c});
  const double middle = (high + low) / 2, spread = high - low;
  const double k = (!circle && spread > 1.0) ? 1.0 / spread : 1.0;
  limited = limited || k != 1.0;
  const auto duty = [&](double x) { return std::clamp(0.5 + (x - middle) * k, 0.0, 1.0); };
  return {{duty(p.a), duty(p.b), duty(p.c)}, sector_of_angle(v.alpha, v.beta), limited};
}

// Dwell-time construction, for |v| <= 1/sqrt(3).
inline phases<double> svpwm_dwell_time(stationary<double> v) {
  // switching states of the active vectors V1..V6 (a, b, c), V1 along alpha
  static constexpr int states[6][3] = {{1, 0, 0}, {1, 1, 0}, {0, 1, 0}, {0, 1, 1}, {0, 0, 1}, {1, 0, 1}};
  const int sector = sector_of_angle(v.alpha, v.beta);
  double theta = std::atan2(v.beta, v.alpha);
  if (theta < 0) theta += 2 * M_PI;
  const double within = theta - (sector - 1) * M_PI / 3;  // [0, 60 deg)
  const double length = std::hypot(v.alpha, v.beta);
  const double t_first = std::sqrt(3.0) * length * std::sin(M_PI / 3 - within);
  const double t_second = std::sqrt(3.0) * length * std::sin(within);
  const double t_zero = 1.0 - t_first - t_second;
  const int* first = states[sector - 1];
  const int* second = states[sector % 6];
  const auto duty = [&](int x) { return t_zero / 2 + t_first * first[x] + t_second * second[x]; };
  return {duty(0), duty(1), duty(2)};
}

inline modulation_result sine_pwm(stationary<double> v) {
  const phases<double> p = inverse_clarke(v);
  const auto duty = [](double x) { return std::clamp(0.5 + x, 0.0, 1.0); };
  const bool limited = std::fabs(p.a) > 0.5 || std::fabs(p.b) > 0.5 || std::fabs(p.c) > 0.5;
  return {{duty(p.a), duty(p.b), duty(p.c)}, sector_of_angle(v.alpha, v.beta), limited};
}

inline phases<double> six_step(stationary<double> v) {
  const phases<double> p = inverse_clarke(v);
  return {p.a >= 0 ? 1.0 : 0.0, p.b >= 0 ? 1.0 : 0.0, p.c >= 0 ? 1.0 : 0.0};
}

inline stationary<double> limit_magnitude(stationary<double> v, double m) {
  const double length = std::hypot(v.alpha, v.beta);
  m = std::max(m, 0.0);
  return length > m ? scale(v, m / length) : v;
}

inline rotating<double> limit_d_priority(rotating<double> v, double m) {
  m = std::max(m, 0.0);
  const double d = std::clamp(v.d, -m, m);
  const double q_limit = std::sqrt(std::max(m * m - d * d, 0.0));
  return {d, std::clamp(v.q, -q_limit, q_limit)};
}

// v / bus, with the library's rule for a bus at or below the minimum: zero.
inline double normalize_to_bus(double v, double bus, double minimum_bus) {
  return bus > std::max(minimum_bus, 0.0) ? v / bus : 0.0;
}

// duty * period rounded to the nearest count (ties up), duty clamped to [0, 1]; then minimum-pulse
// clipping to the nearer of removing and widening (ties widen), min_pulse at most period / 2.
inline double duty_to_compare(double duty, double period, double min_pulse) {
  const double c = std::floor(std::clamp(duty, 0.0, 1.0) * period + 0.5);
  const double pulse = std::min(min_pulse, std::floor(period / 2));
  if (c > 0 && c < pulse) return 2 * c < pulse ? 0 : pulse;
  if (period - c > 0 && period - c < pulse) return 2 * (period - c) < pulse ? period : period - pulse;
  return c;
}

}  // namespace rotorq::ref
