// The straightforward floating-point code the library is timed against: each function written the way
// a firmware engineer with an FPU would write it, in float or double, with std::sin, std::cos and
// std::sqrt from <cmath>. Constants are multiplied, not divided by; there is no saturation where the
// arithmetic cannot overflow. Each returns the library's result type with Real in place of q15/q31,
// so that both sides hand back the same amount of data, and is declared inline, as the library's
// constexpr functions implicitly are, so that the compiler's inlining treats both sides alike.
// An unqualified call picks the library's overload for q15/q31 (fixed<F> is more specialized than
// Real) and these for float/double. Timing references only: the accuracy reference is the double
// twin in host_sim/reference.
#pragma once

#include <algorithm>
#include <cmath>
#include <cstdint>

#include "rotorq/frames.hpp"
#include "rotorq/pwm_compare.hpp"
#include "rotorq/svpwm.hpp"
#include "rotorq/voltage_limit.hpp"

namespace rotorq::bench::plain {

template <typename Real>
struct k {
  static constexpr Real one_third = static_cast<Real>(0.33333333333333333333);
  static constexpr Real inv_sqrt3 = static_cast<Real>(0.57735026918962576451);
  static constexpr Real sqrt3_over_2 = static_cast<Real>(0.86602540378443864676);
  static constexpr Real sqrt_2_over_3 = static_cast<Real>(0.81649658092772603273);  // sqrt(2/3)
  static constexpr Real inv_sqrt6 = static_cast<Real>(0.40824829046386301637);
  static constexpr Real inv_sqrt2 = static_cast<Real>(0.70710678118654752440);
  static constexpr Real half = static_cast<Real>(0.5);
};

template <typename Real>
inline Real mul_add(Real a, Real b, Real c) {
  return a * b + c;
}

template <typename Real>
inline sin_cos_pair<Real> sin_cos(Real radians) {
  return {std::sin(radians), std::cos(radians)};
}

// ---- Clarke and Park ------------------------------------------------------------------------------

template <typename Real>
inline stationary<Real> clarke(phases<Real> i) {
  return {(2 * i.a - i.b - i.c) * k<Real>::one_third, (i.b - i.c) * k<Real>::inv_sqrt3};
}

template <typename Real>
inline stationary<Real> clarke_balanced(Real a, Real b) {
  return {a, (a + 2 * b) * k<Real>::inv_sqrt3};
}

template <typename Real>
inline phases<Real> inverse_clarke(stationary<Real> v) {
  const Real half_alpha = v.alpha * k<Real>::half;
  const Real beta_part = v.beta * k<Real>::sqrt3_over_2;
  return {v.alpha, beta_part - half_alpha, -beta_part - half_alpha};
}

template <typename Real>
inline stationary<Real> clarke_power_invariant(phases<Real> i) {
  return {(i.a - (i.b + i.c) * k<Real>::half) * k<Real>::sqrt_2_over_3, (i.b - i.c) * k<Real>::inv_sqrt2};
}

template <typename Real>
inline phases<Real> inverse_clarke_power_invariant(stationary<Real> v) {
  const Real alpha_part = v.alpha * k<Real>::inv_sqrt6;
  const Real beta_part = v.beta * k<Real>::inv_sqrt2;
  return {v.alpha * k<Real>::sqrt_2_over_3, beta_part - alpha_part, -beta_part - alpha_part};
}

template <typename Real>
inline rotating<Real> park(stationary<Real> v, sin_cos_pair<Real> angle) {
  return {v.alpha * angle.cos + v.beta * angle.sin, v.beta * angle.cos - v.alpha * angle.sin};
}

template <typename Real>
inline stationary<Real> inverse_park(rotating<Real> v, sin_cos_pair<Real> angle) {
  return {v.d * angle.cos - v.q * angle.sin, v.d * angle.sin + v.q * angle.cos};
}

// ---- limiters -------------------------------------------------------------------------------------

template <typename Real>
inline bool scale_onto(Real& x, Real& y, Real m) {
  const Real limit = std::max(m, Real(0));
  const Real length_squared = x * x + y * y;
  if (length_squared <= limit * limit) return false;
  const Real factor = limit / std::sqrt(length_squared);
  x *= factor;
  y *= factor;
  return true;
}

template <typename Real>
inline limited<stationary<Real>> limit_magnitude(stationary<Real> v, Real m) {
  const bool clipped = scale_onto(v.alpha, v.beta, m);
  return {v, clipped};
}

template <typename Real>
inline limited<rotating<Real>> limit_magnitude(rotating<Real> v, Real m) {
  const bool clipped = scale_onto(v.d, v.q, m);
  return {v, clipped};
}

template <typename Real>
inline limited<rotating<Real>> limit_d_priority(rotating<Real> v, Real m) {
  const Real limit = std::max(m, Real(0));
  const Real d = std::clamp(v.d, -limit, limit);
  const Real q_limit = std::sqrt(limit * limit - d * d);
  const Real q = std::clamp(v.q, -q_limit, q_limit);
  return {{d, q}, d != v.d || q != v.q};
}

// ---- modulation -----------------------------------------------------------------------------------

// The 60-degree sector (1..6) of the vector whose phase voltages are p, from the order of the phases:
// bit 2 a > b, bit 1 b > c, bit 0 c > a.
template <typename Real>
inline uint8_t sector_of(const phases<Real>& p) {
  static constexpr uint8_t by_order[8] = {1, 4, 2, 3, 6, 5, 1, 1};
  return by_order[(p.a > p.b ? 4 : 0) | (p.b > p.c ? 2 : 0) | (p.c > p.a ? 1 : 0)];
}

// Min-max injection: duty_x = 1/2 + v_x - (max + min) / 2, with the request first limited to the
// inscribed circle (circle) or, beyond the hexagon, scaled onto its edge (hexagon).
template <typename Real>
inline modulation<Real> svpwm(stationary<Real> v, overmodulation mode) {
  bool was_limited = false;
  if (mode == overmodulation::circle) was_limited = scale_onto(v.alpha, v.beta, k<Real>::inv_sqrt3);
  const phases<Real> p = inverse_clarke(v);
  const Real high = std::max({p.a, p.b, p.c});
  const Real low = std::min({p.a, p.b, p.c});
  const Real middle = (high + low) * k<Real>::half;
  const uint8_t sector = sector_of(p);
  if (mode == overmodulation::hexagon && high - low > 1) {
    const Real scale = 1 / (high - low);
    return {{k<Real>::half + (p.a - middle) * scale, k<Real>::half + (p.b - middle) * scale,
             k<Real>::half + (p.c - middle) * scale},
            sector,
            true};
  }
  return {{k<Real>::half + p.a - middle, k<Real>::half + p.b - middle, k<Real>::half + p.c - middle},
          sector,
          was_limited};
}

template <typename Real>
inline modulation<Real> sine_pwm(stationary<Real> v) {
  const phases<Real> p = inverse_clarke(v);
  const auto duty = [](Real x) { return std::clamp(k<Real>::half + x, Real(0), Real(1)); };
  const bool clamped = std::max({std::abs(p.a), std::abs(p.b), std::abs(p.c)}) > k<Real>::half;
  return {{duty(p.a), duty(p.b), duty(p.c)}, sector_of(p), clamped};
}

template <typename Real>
inline modulation<Real> six_step(stationary<Real> v) {
  const phases<Real> p = inverse_clarke(v);
  const auto duty = [](Real x) { return x >= 0 ? Real(1) : Real(0); };
  static constexpr uint8_t vector_of_state[8] = {1, 5, 3, 4, 1, 6, 2, 1};  // a b c on = bits 2 1 0
  const int state = (p.a >= 0 ? 4 : 0) | (p.b >= 0 ? 2 : 0) | (p.c >= 0 ? 1 : 0);
  return {{duty(p.a), duty(p.b), duty(p.c)}, vector_of_state[state], false};
}

// Volts to per unit of the bus: one reciprocal per sample, a multiply per component.
template <typename Real>
class bus_normalizer {
 public:
  explicit bus_normalizer(Real minimum_bus) : minimum_(minimum_bus) {}
  bool update(Real bus) {
    valid_ = bus > minimum_;
    inverse_ = valid_ ? 1 / bus : Real(0);
    return valid_;
  }
  stationary<Real> normalize(stationary<Real> v) const { return {v.alpha * inverse_, v.beta * inverse_}; }

 private:
  Real minimum_;
  Real inverse_ = 0;
  bool valid_ = false;
};

template <typename Real>
inline compare_values duty_to_compare(phases<Real> duty, uint32_t period, uint32_t min_pulse) {
  const uint32_t pulse = std::min(min_pulse, period / 2);
  const auto count = [period](Real d) {
    return static_cast<uint32_t>(std::clamp(d, Real(0), Real(1)) * static_cast<Real>(period) + k<Real>::half);
  };
  const auto clip = [period, pulse](uint32_t c) {
    if (c > 0 && c < pulse) return 2 * c < pulse ? 0 : pulse;
    if (c < period && period - c < pulse) return 2 * (period - c) < pulse ? period : period - pulse;
    return c;
  };
  const phases<uint32_t> exact{count(duty.a), count(duty.b), count(duty.c)};
  const phases<uint32_t> clipped{clip(exact.a), clip(exact.b), clip(exact.c)};
  return {clipped, clipped != exact};
}

// ---- regulator ------------------------------------------------------------------------------------

// u = clamp(kp e + I + feedforward, lo, hi), I += ki e unless that pushes u past a limit (the
// integrator then takes the part of the step that reaches the limit, never a step back).
template <typename Real>
class pi_regulator {
 public:
  pi_regulator(Real kp, Real ki, Real lo, Real hi) : kp_(kp), ki_(ki), lo_(lo), hi_(hi) {}
  Real update(Real reference, Real measured, Real feedforward = 0) {
    const Real error = reference - measured;
    const Real proportional = kp_ * error + feedforward;
    const Real step = ki_ * error;
    const Real moved = integrator_ + step;
    const Real next = step > 0 ? std::max(integrator_, std::min(moved, hi_ - proportional))
                               : std::min(integrator_, std::max(moved, lo_ - proportional));
    integrator_ = std::clamp(next, lo_, hi_);
    return std::clamp(proportional + integrator_, lo_, hi_);
  }

 private:
  Real kp_, ki_, lo_, hi_;
  Real integrator_ = 0;
};

// ---- speed and angle ------------------------------------------------------------------------------

// Turns per tick of a motion of `steps` turn32 steps in `ticks` ticks.
template <typename Real>
inline Real speed_from_motion(int64_t steps, uint64_t ticks) {
  constexpr auto step = static_cast<Real>(2.3283064365386962890625e-10);  // 2^-32 turn
  return ticks == 0 ? Real(0) : static_cast<Real>(steps) * step / static_cast<Real>(ticks);
}

// Mechanical rpm from turns per tick: one multiply by 60 timer_hz / pole_pairs.
template <typename Real>
class rpm_scale {
 public:
  rpm_scale(uint32_t pole_pairs, uint32_t timer_hz)
      : factor_(static_cast<Real>(60.0 * timer_hz / std::max(pole_pairs, 1u))) {}
  Real rpm(Real turns_per_tick) const { return turns_per_tick * factor_; }

 private:
  Real factor_;
};

// The angle (in turns, [0, 1)) at `now` from one sample and a speed, held beyond max_extrapolation.
template <typename Real>
class angle_interpolator {
 public:
  struct estimate_type {
    Real angle;
    bool stale;
  };
  explicit angle_interpolator(uint32_t max_extrapolation)
      : max_ticks_(static_cast<Real>(max_extrapolation)) {}
  void update(Real angle_turns, uint32_t time, Real turns_per_tick) {
    angle_ = angle_turns;
    time_ = time;
    speed_ = turns_per_tick;
  }
  estimate_type estimate(uint32_t now) const {
    const auto dt = static_cast<Real>(static_cast<int32_t>(now - time_));
    const bool stale = std::abs(dt) > max_ticks_;
    const Real ticks = std::clamp(dt, -max_ticks_, max_ticks_);
    const Real a = angle_ + speed_ * ticks;
    return {a - std::floor(a), stale};
  }

 private:
  Real max_ticks_;
  Real angle_ = 0;
  uint32_t time_ = 0;
  Real speed_ = 0;
};

}  // namespace rotorq::bench::plain
