// The benchmark kernels of the cycle firmware: each public function, called through a wrapper that
// the compiler may not inline into its caller, reading its arguments from one input record and
// writing its result to a sink. The library function itself inlines into the wrapper, as it does in
// firmware, so a wrapper is the cost of one call with its arguments in memory.
//
// Every kernel has the same signature, so one loop (main.cpp's run_region) calls them all and an
// empty kernel measures that loop's own cost, which the driver subtracts.
#pragma once

#include <stdint.h>

#include "rotorq/angle_interpolator.hpp"
#include "rotorq/commutation.hpp"
#include "rotorq/dc_bus.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"
#include "rotorq/hall.hpp"
#include "rotorq/hall_tracker.hpp"
#include "rotorq/rotation.hpp"
#include "rotorq/turn.hpp"

// A kernel: never inlined, never analysed across the call (GCC's noipa), so that its caller cannot
// use what it knows of the kernel's body.
#define ROTORQ_CYCLES_KERNEL __attribute__((noinline, noipa, used))

namespace rotorq_cycles {

using kernel = void (*)(const void* input, void* output);

template <int F>
struct angle_of;
template <>
struct angle_of<15> {
  using type = rotorq::turn16;
};
template <>
struct angle_of<31> {
  using type = rotorq::turn32;
};

// One input record of a format: every kernel of that format reads the fields it needs.
template <int F>
struct fixed_input {
  using Q = rotorq::fixed<F>;
  rotorq::phases<Q> currents;     // near-balanced phase currents
  rotorq::stationary<Q> voltage;  // |v| up to 0.75: a quarter beyond svpwm's linear circle
  rotorq::rotating<Q> request;    // voltage request in the rotor frame, |v| up to 1
  rotorq::sin_cos_pair<Q> pair;   // from sin_cos of a random angle
  typename angle_of<F>::type angle;
  Q a, b, c;                // full-range operands of the arithmetic
  Q limit;                  // 0.3 .. 1: some requests are clipped
  Q bus;                    // 0.4 .. 1
  rotorq::phases<Q> duty;   // 0 .. max, with some near 0 and 1 (minimum-pulse clipping)
  Q reference, measured;    // of the PI regulator: errors up to 1.3, every fourth 2 or -2 (saturating)
  uint8_t sector;           // 0 .. 7 for six_step_commutation (6 and 7 count modulo 6)
  rotorq::rotation torque;  // forward or backward, every eighth unknown (all phases floating)
};

// One input record of the integer kernels: a motion for speed_from_motion, a speed for rpm_q8, a
// Hall code for decode_hall.
struct motion_input {
  int64_t steps;                   // turn32 steps: 1 .. 6 sixths of a turn either way, or 0
  uint64_t ticks;                  // over this many timer ticks: 200 .. 200000, or 0 or 1
  rotorq::electrical_speed speed;  // up to 2^40 raw either way, or 0 or the largest
  uint8_t code;                    // 0 .. 7, the impossible codes 000 and 111 included
};

// A PWM-rate sample for the Hall tracker, and a time for the angle interpolator.
template <int TimerBits>
struct hall_sample {
  uint8_t code;
  typename rotorq::detail::timer_traits<TimerBits>::time_type time;
};
// A PWM-rate sample for the Hall glitch filter (a decoded sector, with bounces).
template <int TimerBits>
struct sector_sample {
  uint8_t sector;
  typename rotorq::detail::timer_traits<TimerBits>::time_type time;
};
template <int TimerBits>
struct position_sample {
  rotorq::turn32 angle;
  typename rotorq::detail::timer_traits<TimerBits>::time_type time;
};
// A PWM-rate sample for the six-step / FOC hand-over.
struct handover_sample {
  rotorq::turn32 angle;
  rotorq::electrical_speed speed;
  rotorq::rotation torque;
};

// The state the stateful kernels work on (main.cpp prepares it before the regions run).
extern rotorq::bus_normalizer<rotorq::q15> bus_q15;
extern rotorq::bus_normalizer<rotorq::q31> bus_q31;
extern rotorq::hall_tracker<16> hall16;
extern rotorq::hall_tracker<32> hall32;
extern rotorq::angle_interpolator<16> position16;
extern rotorq::angle_interpolator<32> position32;
extern rotorq::hall_glitch_filter<16> glitch16;
extern rotorq::hall_glitch_filter<32> glitch32;

// A kernel and what the driver calls it: "<function>" and "<format>" (q15, q31, t16, t32 for the
// 16- and 32-bit timers, float, "-" for a function of integers only).
struct kernel_entry {
  const char* function;
  const char* format;
  kernel call;
  int group;  // which input table it reads (main.cpp)
};

// Input tables.
enum input_group : int {
  fixed15,
  fixed31,
  hall_t16,
  hall_t32,
  position_t16,
  position_t32,
  time_t16,
  time_t32,
  sector_t16,
  sector_t32,
  motion_group,
  handover_group,
  float_input_group
};

// The float baseline's input record (float_kernels.cpp).
struct float_input {
  float a, b, c;              // phase currents
  float alpha, beta;          // voltage for inverse Clarke and svpwm
  float d, q;                 // voltage request
  float sin, cos;             // of theta
  float theta;                // radians, [0, 2 pi)
  float limit;                // of limit_d_priority
  float reference, measured;  // of the PI regulator
  int64_t steps;              // turn32 steps of a motion (those of motion_input) ...
  uint32_t ticks;             // ... over this many timer ticks (never 0)
  float speed;                // turns per tick, for the rpm conversion
};

extern const kernel_entry fixed_kernels[];
extern const unsigned fixed_kernel_count;
extern const kernel_entry float_kernels[];
extern const unsigned float_kernel_count;

extern "C" void rotorq_cycles_empty(const void* input, void* output);

}  // namespace rotorq_cycles
