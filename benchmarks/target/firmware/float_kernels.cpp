// The float baseline: the straightforward single-precision code a firmware engineer would otherwise
// write, with sinf and cosf from the C library's libm (picolibc), compiled with the same flags as the
// fixed-point kernels. Hardware FPU on the Cortex-M4F, M7 and M33 (hard-float ABI), the compiler's
// soft-float routines on the Cortex-M0+, M3 and RV32IMC.
//
// The formulas are the textbook ones (amplitude-invariant Clarke; Park with d along the rotor
// angle; centred space-vector modulation by min-max injection, limited to the circle of radius
// 1/sqrt(3) with one square root and one division when the request is beyond it, or to the hexagon
// with one division beyond its edge; the PI regulator with the same clamping anti-windup as
// pi_regulator; speed as a quotient of the converted integers). They compute only what a float user
// needs: no saturation, no sector number. Integer logic (six-step, Hall codes, commutation, the
// hand-over) and the plain arithmetic have no float twin.
#include <math.h>

#include "kernels.hpp"

namespace rotorq_cycles {

namespace {

struct float_phases {
  float a, b, c;
};
struct float_vector {
  float x, y;  // alpha, beta or d, q
};

constexpr float one_third = 0.333333333f;
constexpr float inverse_sqrt3 = 0.577350269f;
constexpr float half_sqrt3 = 0.866025404f;
constexpr float inverse_sqrt6 = 0.408248290f;
constexpr float inverse_sqrt2 = 0.707106781f;
constexpr float sqrt_two_thirds = 0.816496581f;

const float_input& in(const void* p) { return *static_cast<const float_input*>(p); }
template <typename T>
void put(void* p, const T& value) {
  *static_cast<T*>(p) = value;
}

inline float_vector clarke(float_phases i) {
  return {(2.0f * i.a - i.b - i.c) * one_third, (i.b - i.c) * inverse_sqrt3};
}
inline float_phases inverse_clarke(float_vector v) {
  return {v.x, -0.5f * v.x + half_sqrt3 * v.y, -0.5f * v.x - half_sqrt3 * v.y};
}
inline float_vector park(float_vector v, float s, float c) { return {v.x * c + v.y * s, -v.x * s + v.y * c}; }
inline float_vector inverse_park(float_vector v, float s, float c) {
  return {v.x * c - v.y * s, v.x * s + v.y * c};
}
inline float_vector clarke_power_invariant(float_phases i) {
  return {(2.0f * i.a - i.b - i.c) * inverse_sqrt6, (i.b - i.c) * inverse_sqrt2};
}
inline float_phases inverse_clarke_power_invariant(float_vector v) {
  const float alpha = v.x * inverse_sqrt6, beta = v.y * inverse_sqrt2;
  return {v.x * sqrt_two_thirds, -alpha + beta, -alpha - beta};
}
inline float_phases svpwm(float_vector v) {
  const float m2 = v.x * v.x + v.y * v.y;
  if (m2 > one_third) {
    const float k = inverse_sqrt3 / sqrtf(m2);
    v.x *= k;
    v.y *= k;
  }
  const float_phases p = inverse_clarke(v);
  const float hi = fmaxf(p.a, fmaxf(p.b, p.c));
  const float lo = fminf(p.a, fminf(p.b, p.c));
  const float offset = 0.5f - 0.5f * (hi + lo);
  return {p.a + offset, p.b + offset, p.c + offset};
}

// Beyond the hexagon (max - min > 1): the duties spread over [0, 1], keeping the angle.
inline float_phases svpwm_hexagon(float_vector v) {
  const float_phases p = inverse_clarke(v);
  const float hi = fmaxf(p.a, fmaxf(p.b, p.c));
  const float lo = fminf(p.a, fminf(p.b, p.c));
  const float middle = 0.5f * (hi + lo);
  const float spread = hi - lo;
  if (spread > 1.0f) {
    const float k = 1.0f / spread;
    return {0.5f + (p.a - middle) * k, 0.5f + (p.b - middle) * k, 0.5f + (p.c - middle) * k};
  }
  return {0.5f + p.a - middle, 0.5f + p.b - middle, 0.5f + p.c - middle};
}
inline float clamp_duty(float d) { return fminf(fmaxf(d, 0.0f), 1.0f); }
inline float_phases sine_pwm(float_vector v) {
  const float_phases p = inverse_clarke(v);
  return {clamp_duty(0.5f + p.a), clamp_duty(0.5f + p.b), clamp_duty(0.5f + p.c)};
}
inline float clamp(float x, float lo, float hi) { return fminf(fmaxf(x, lo), hi); }
inline float_vector limit_d_priority(float_vector v, float m) {
  const float d = clamp(v.x, -m, m);
  const float q_limit = sqrtf(m * m - d * d);
  return {d, clamp(v.y, -q_limit, q_limit)};
}

// The regulator of the fixed-point kernels in float: the same gains and limits, conditional
// integration (the increment, or the part of it that brings the output to the limit, or nothing).
struct float_regulator {
  float kp, ki, lo, hi, integrator;
  float update(float reference, float measured) {
    const float error = reference - measured;
    const float proportional = kp * error;
    const float increment = ki * error;
    float next = integrator;
    if (increment > 0.0f) {
      next = fmaxf(fminf(integrator + increment, hi - proportional), integrator);
    } else if (increment < 0.0f) {
      next = fminf(fmaxf(integrator + increment, lo - proportional), integrator);
    }
    integrator = clamp(next, lo, hi);
    return clamp(proportional + integrator, lo, hi);
  }
};
float_regulator regulator{0.625f, 0.025f, -0.95f, 0.95f, 0.0f};
// Mechanical rpm per electrical turn per tick: 1 MHz timer, 2 pole pairs (as the fixed kernel).
float rpm_per_turn_per_tick = 1e6f * 60.0f / 2.0f;

ROTORQ_CYCLES_KERNEL void sin_cos_float(const void* i, void* o) {
  const float theta = in(i).theta;
  put(o, float_vector{sinf(theta), cosf(theta)});
}
ROTORQ_CYCLES_KERNEL void clarke_float(const void* i, void* o) {
  put(o, clarke(float_phases{in(i).a, in(i).b, in(i).c}));
}
ROTORQ_CYCLES_KERNEL void inverse_clarke_float(const void* i, void* o) {
  put(o, inverse_clarke(float_vector{in(i).alpha, in(i).beta}));
}
ROTORQ_CYCLES_KERNEL void park_float(const void* i, void* o) {
  put(o, park(float_vector{in(i).a, in(i).b}, in(i).sin, in(i).cos));
}
ROTORQ_CYCLES_KERNEL void clarke_balanced_float(const void* i, void* o) {
  put(o, float_vector{in(i).a, (in(i).a + 2.0f * in(i).b) * inverse_sqrt3});
}
ROTORQ_CYCLES_KERNEL void clarke_power_invariant_float(const void* i, void* o) {
  put(o, clarke_power_invariant(float_phases{in(i).a, in(i).b, in(i).c}));
}
ROTORQ_CYCLES_KERNEL void inverse_clarke_power_invariant_float(const void* i, void* o) {
  put(o, inverse_clarke_power_invariant(float_vector{in(i).alpha, in(i).beta}));
}
ROTORQ_CYCLES_KERNEL void inverse_park_float(const void* i, void* o) {
  put(o, inverse_park(float_vector{in(i).d, in(i).q}, in(i).sin, in(i).cos));
}
ROTORQ_CYCLES_KERNEL void svpwm_float(const void* i, void* o) {
  put(o, svpwm(float_vector{in(i).alpha, in(i).beta}));
}
ROTORQ_CYCLES_KERNEL void svpwm_hexagon_float(const void* i, void* o) {
  put(o, svpwm_hexagon(float_vector{in(i).alpha, in(i).beta}));
}
ROTORQ_CYCLES_KERNEL void sine_pwm_float(const void* i, void* o) {
  put(o, sine_pwm(float_vector{in(i).alpha, in(i).beta}));
}
ROTORQ_CYCLES_KERNEL void limit_d_priority_float(const void* i, void* o) {
  put(o, limit_d_priority(float_vector{in(i).d, in(i).q}, in(i).limit));
}
ROTORQ_CYCLES_KERNEL void pi_regulator_float(const void* i, void* o) {
  put(o, regulator.update(in(i).reference, in(i).measured));
}
// Turns per tick.
ROTORQ_CYCLES_KERNEL void speed_float(const void* i, void* o) {
  put(o, static_cast<float>(in(i).steps) * (1.0f / 4294967296.0f) / static_cast<float>(in(i).ticks));
}
ROTORQ_CYCLES_KERNEL void rpm_float(const void* i, void* o) { put(o, in(i).speed * rpm_per_turn_per_tick); }
struct float_chain_result {
  float_vector current;
  float_phases duty;
};
ROTORQ_CYCLES_KERNEL void chain_float(const void* i, void* o) {
  const float_input& x = in(i);
  const float s = sinf(x.theta);
  const float c = cosf(x.theta);
  float_chain_result r;
  r.current = park(clarke(float_phases{x.a, x.b, x.c}), s, c);
  r.duty = svpwm(inverse_park(float_vector{x.d, x.q}, s, c));
  put(o, r);
}

}  // namespace

const kernel_entry float_kernels[] = {
    kernel_entry{"sin_cos", "float", sin_cos_float, float_input_group},
    kernel_entry{"clarke", "float", clarke_float, float_input_group},
    kernel_entry{"inverse_clarke", "float", inverse_clarke_float, float_input_group},
    kernel_entry{"park", "float", park_float, float_input_group},
    kernel_entry{"inverse_park", "float", inverse_park_float, float_input_group},
    kernel_entry{"svpwm_circle", "float", svpwm_float, float_input_group},
    kernel_entry{"chain", "float", chain_float, float_input_group},
    kernel_entry{"clarke_balanced", "float", clarke_balanced_float, float_input_group},
    kernel_entry{"clarke_power_invariant", "float", clarke_power_invariant_float, float_input_group},
    kernel_entry{"inverse_clarke_power_invariant", "float", inverse_clarke_power_invariant_float,
                 float_input_group},
    kernel_entry{"svpwm_hexagon", "float", svpwm_hexagon_float, float_input_group},
    kernel_entry{"sine_pwm", "float", sine_pwm_float, float_input_group},
    kernel_entry{"limit_d_priority", "float", limit_d_priority_float, float_input_group},
    kernel_entry{"pi_regulator", "float", pi_regulator_float, float_input_group},
    kernel_entry{"speed_from_motion", "float", speed_float, float_input_group},
    kernel_entry{"rpm_q8", "float", rpm_float, float_input_group},
};
const unsigned float_kernel_count = sizeof(float_kernels) / sizeof(float_kernels[0]);

}  // namespace rotorq_cycles
