// The float baseline: the straightforward single-precision code a firmware engineer would otherwise
// write, with sinf and cosf from the C library's libm (picolibc), compiled with the same flags as the
// fixed-point kernels. Hardware FPU on the Cortex-M4F, M7 and M33 (hard-float ABI), the compiler's
// soft-float routines on the Cortex-M0+, M3 and RV32IMC.
//
// The formulas are the textbook ones (amplitude-invariant Clarke; Park with d along the rotor
// angle; centred space-vector modulation by min-max injection, limited to the circle of radius
// 1/sqrt(3) with one square root and one division when the request is beyond it). They compute only
// what a float user needs: no saturation, no sector number.
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
ROTORQ_CYCLES_KERNEL void inverse_park_float(const void* i, void* o) {
  put(o, inverse_park(float_vector{in(i).d, in(i).q}, in(i).sin, in(i).cos));
}
ROTORQ_CYCLES_KERNEL void svpwm_float(const void* i, void* o) {
  put(o, svpwm(float_vector{in(i).alpha, in(i).beta}));
}
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
};
const unsigned float_kernel_count = sizeof(float_kernels) / sizeof(float_kernels[0]);

}  // namespace rotorq_cycles
