// The cycle-benchmark firmware: runs every kernel (kernels.cpp, float_kernels.cpp) over its input
// table as one region between two marker functions, which the instruction-count plugin
// (benchmarks/target/host/insn_plugin.c) recognises by address. QEMU 7.2 gives a plugin no register
// access, so the regions carry no names of their own: before each region this program prints
//   rotorq-cycles region <index> <function> <format> <calls> <kernel address>
// and the driver (rotorq-cycles) pairs the n-th such line with the plugin's n-th region. Region 0
// runs the empty kernel: the cost of the loop and the markers, which the driver subtracts.
//
// Built with ROTORQ_CYCLES_HW_COUNTER, the program also reads the core's cycle counter around each
// region (the DWT cycle counter on Armv7-M and Armv8-M Mainline, SysTick on Armv6-M, which has no
// DWT counter, mcycle on RISC-V), prints
//   rotorq-cycles counter <index> <function> <format> <cycles>
// and keeps the counts in rotorq_cycles_counts[] for a debugger to read; see DEVELOPERS.md for a
// real board. Emulators do not count cycles: QEMU's readings are not cycle counts.
#include <stdint.h>
#include <stdio.h>

#include "kernels.hpp"
#include "rotorq/rotorq.hpp"

using namespace rotorq;
using namespace rotorq_cycles;

namespace {

constexpr uint32_t calls = 32;  // inputs per table, calls per region

// ---- the cycle counter (only with ROTORQ_CYCLES_HW_COUNTER) ----------------------------------------
#if defined(ROTORQ_CYCLES_HW_COUNTER) && defined(__arm__) && defined(__ARM_ARCH_6M__)
// SysTick (Armv6-M Architecture Reference Manual, B3.3): a 24-bit down-counter clocked by the core
// when CLKSOURCE is set.
volatile uint32_t& reg(uintptr_t address) { return *reinterpret_cast<volatile uint32_t*>(address); }
void counter_start() {
  reg(0xE000E014) = 0x00ffffffu;  // SYST_RVR: the largest reload
  reg(0xE000E018) = 0;            // SYST_CVR: any write clears it
  reg(0xE000E010) = 5;            // SYST_CSR: ENABLE, CLKSOURCE = processor clock, no interrupt
}
uint32_t counter_read() { return reg(0xE000E018); }
uint32_t counter_elapsed(uint32_t start, uint32_t stop) { return (start - stop) & 0x00ffffffu; }
#elif defined(ROTORQ_CYCLES_HW_COUNTER) && defined(__arm__)
// The DWT cycle counter (Armv7-M Architecture Reference Manual, C1.8): DEMCR.TRCENA powers the
// DWT, DWT_CTRL.CYCCNTENA starts DWT_CYCCNT. The lock access register exists on some Cortex-M7
// parts and is ignored elsewhere.
volatile uint32_t& reg(uintptr_t address) { return *reinterpret_cast<volatile uint32_t*>(address); }
void counter_start() {
  reg(0xE000EDFC) |= 1u << 24;    // DEMCR.TRCENA
  reg(0xE0001FB0) = 0xC5ACCE55u;  // DWT_LAR: unlock
  reg(0xE0001004) = 0;            // DWT_CYCCNT
  reg(0xE0001000) |= 1u;          // DWT_CTRL.CYCCNTENA
}
uint32_t counter_read() { return reg(0xE0001004); }
uint32_t counter_elapsed(uint32_t start, uint32_t stop) { return stop - start; }
#elif defined(ROTORQ_CYCLES_HW_COUNTER) && defined(__riscv)
// mcycle, the machine-mode cycle counter (RISC-V privileged specification, 3.1.11).
void counter_start() {}
uint32_t counter_read() {
  uint32_t c;
  // Zicsr is an extension of its own to the assembler; the counter needs only this instruction of it.
  __asm__ volatile(".option push\n.option arch, +zicsr\ncsrr %0, mcycle\n.option pop" : "=r"(c));
  return c;
}
uint32_t counter_elapsed(uint32_t start, uint32_t stop) { return stop - start; }
#elif defined(ROTORQ_CYCLES_HW_COUNTER)
#error "ROTORQ_CYCLES_HW_COUNTER: no cycle counter known for this core"
#else
void counter_start() {}
uint32_t counter_read() { return 0; }
uint32_t counter_elapsed(uint32_t, uint32_t) { return 0; }
#endif

// ---- inputs ----------------------------------------------------------------------------------------
struct random_words {  // xorshift32 (Marsaglia 2003)
  uint32_t state;
  uint32_t next() {
    state ^= state << 13;
    state ^= state >> 17;
    state ^= state << 5;
    return state;
  }
  // uniform in [lo, hi] (raw units), hi - lo < 2^32
  int32_t in(int32_t lo, int32_t hi) {
    const uint32_t span = static_cast<uint32_t>(hi) - static_cast<uint32_t>(lo) + 1u;
    const uint32_t offset = span == 0 ? next() : next() % span;
    return detail::to_signed(static_cast<uint32_t>(lo) + offset);
  }
};

template <int F>
fixed<F> value(random_words& rng, double lo, double hi) {
  const double scale = F == 15 ? 32768.0 : 2147483648.0;
  const auto raw = rng.in(static_cast<int32_t>(lo * scale), static_cast<int32_t>(hi * scale - 1.0));
  if constexpr (F == 15) {
    return q15::from_raw(static_cast<int16_t>(raw));
  } else {
    return q31::from_raw(raw);
  }
}

fixed_input<15> inputs15[calls];
fixed_input<31> inputs31[calls];
hall_sample<16> hall_samples16[calls];
hall_sample<32> hall_samples32[calls];
position_sample<16> position_samples16[calls];
position_sample<32> position_samples32[calls];
uint16_t times16[calls];
uint32_t times32[calls];
sector_sample<16> sector_samples16[calls];
sector_sample<32> sector_samples32[calls];
motion_input motions[calls];
handover_sample handover_samples[calls];
float_input float_inputs[calls];

template <int F>
void make_inputs(fixed_input<F>* table, uint32_t seed) {
  using Q = fixed<F>;
  using angle_type = typename angle_of<F>::type;
  random_words rng{seed};
  for (uint32_t k = 0; k < calls; ++k) {
    fixed_input<F>& x = table[k];
    const Q a = value<F>(rng, -0.6, 0.6), b = value<F>(rng, -0.6, 0.6);
    x.currents = {a, b, -(a + b) + value<F>(rng, -0.01, 0.01)};
    const auto direction =
        sin_cos(angle_type::from_raw(static_cast<typename angle_type::raw_type>(rng.next())));
    const Q length = value<F>(rng, 0.0, 0.75);
    x.voltage = {direction.cos * length, direction.sin * length};
    x.request = {value<F>(rng, -0.7, 0.7), value<F>(rng, -0.7, 0.7)};
    x.angle = angle_type::from_raw(static_cast<typename angle_type::raw_type>(rng.next()));
    x.pair = sin_cos(x.angle);
    x.a = value<F>(rng, -1.0, 1.0);
    x.b = value<F>(rng, -1.0, 1.0);
    x.c = value<F>(rng, -1.0, 1.0);
    x.limit = value<F>(rng, 0.3, 1.0);
    x.bus = value<F>(rng, 0.4, 1.0);
    // every fourth duty near an end, where the minimum pulse clips it
    const bool edge = (k & 3u) == 0;
    x.duty = {edge ? value<F>(rng, 0.0, 0.01) : value<F>(rng, 0.0, 1.0), value<F>(rng, 0.0, 1.0),
              edge ? value<F>(rng, 0.99, 1.0) : value<F>(rng, 0.0, 1.0)};
  }
  // The later fields from a generator of their own, so that the earlier ones stay as they were.
  random_words more{seed ^ 0x5bd1e995u};
  for (uint32_t k = 0; k < calls; ++k) {
    fixed_input<F>& x = table[k];
    // a reference and a measured current; every fourth pair at full scale, which saturates the output
    x.reference = value<F>(more, -0.7, 0.7);
    x.measured = value<F>(more, -0.6, 0.6);
    if ((k & 3u) == 3) {
      x.reference = (k & 4u) == 0 ? Q::max() : Q::min();
      x.measured = (k & 4u) == 0 ? Q::min() : Q::max();
    }
    x.sector = static_cast<uint8_t>(more.next() & 7u);
    x.torque = (k & 7u) == 5 ? rotation::unknown
                             : ((more.next() & 1u) != 0 ? rotation::forward : rotation::backward);
  }
}

void make_float_inputs() {
  constexpr float two_pi = 6.28318531f;
  for (uint32_t k = 0; k < calls; ++k) {
    const fixed_input<31>& x = inputs31[k];
    float_input& f = float_inputs[k];
    const auto real = [](q31 v) { return static_cast<float>(v.raw()) * (1.0f / 2147483648.0f); };
    f.a = real(x.currents.a);
    f.b = real(x.currents.b);
    f.c = real(x.currents.c);
    f.alpha = real(x.voltage.alpha);
    f.beta = real(x.voltage.beta);
    f.d = real(x.request.d);
    f.q = real(x.request.q);
    f.sin = real(x.pair.sin);
    f.cos = real(x.pair.cos);
    f.theta = static_cast<float>(x.angle.raw()) * (two_pi / 4294967296.0f);
    f.limit = real(x.limit);
    f.reference = real(x.reference);
    f.measured = real(x.measured);
    const motion_input& m = motions[k];
    f.steps = m.steps;
    f.ticks = m.ticks == 0 ? 1u : static_cast<uint32_t>(m.ticks);
    f.speed = static_cast<float>(m.speed.raw()) * (1.0f / 281474976710656.0f);  // 2^-48 turn per tick
  }
}

// Motions of a sector up to a turn (the intervals a Hall tracker measures) over 200 .. 200000 ticks
// of a 1 MHz timer, speeds up to 2^40 raw (about 120000 rpm at 2 pole pairs), and every Hall code.
// Every eighth motion takes no time (speed 0) and comes with a speed of 0; every eighth other one is a
// huge motion in one tick and comes with the largest speed (both saturate).
void make_motions() {
  random_words rng{0x13579bdfu};
  for (uint32_t k = 0; k < calls; ++k) {
    motion_input& m = motions[k];
    const bool backward = (rng.next() & 1u) != 0;
    const int64_t steps = int64_t{715827883} * (1 + rng.next() % 6u);  // 1 .. 6 sixths of a turn
    m.steps = backward ? -steps : steps;
    m.ticks = 200u + rng.next() % 199801u;
    const int64_t magnitude = rng.next();
    const int64_t speed = magnitude << (rng.next() % 9u);
    m.speed = electrical_speed::from_raw(backward ? -speed : speed);
    if ((k & 7u) == 0) {
      m.ticks = 0;
      m.speed = electrical_speed::zero();
    } else if ((k & 7u) == 4) {
      m.steps = int64_t{1} << 40;
      m.ticks = 1;
      m.speed = electrical_speed::from_raw(electrical_speed::raw_max);
    }
    m.code = static_cast<uint8_t>(k & 7u);
  }
}

// The decoded sectors of a rotor at constant speed read at the PWM rate (50 ticks per period), a
// sector every eighth period, with a one-period bounce back to the previous sector every sixteenth
// period; the filter asks for 100 ticks (two periods), so it drops the bounces and accepts each edge
// at its third reading. It runs 240 samples before the region.
template <int TimerBits>
void make_sector_samples(sector_sample<TimerBits>* table, hall_glitch_filter<TimerBits>& filter) {
  using time_type = typename detail::timer_traits<TimerBits>::time_type;
  const uint32_t step = 0x05555555u;  // a sixth of a turn per 8 periods
  uint32_t angle = 0x01000000u, time = 0xfff00000u;
  for (int k = -240; k < static_cast<int>(calls); ++k) {
    angle += step;
    time += 50u;
    auto sector = static_cast<uint8_t>((uint64_t{angle} * 6u) >> 32);
    if ((k & 15) == 9) sector = sector == 0 ? 5 : static_cast<uint8_t>(sector - 1);
    const sector_sample<TimerBits> s{sector, static_cast<time_type>(time)};
    if (k < 0) {
      filter.update(s.sector, s.time);
    } else {
      table[k] = s;
    }
  }
}

// A rotor that speeds up from 5/8 of the hand-over's FOC speed to 4/3 of it over 16 PWM
// periods and slows down again: six-step, the switch to FOC and the blend of the offset, the turn
// back toward the six-step vector below the lower speed. Torque forward, once backward, and unknown
// in the last period (all phases floating).
void make_handover_samples() {
  uint32_t angle = 0x0d000000u;
  for (uint32_t k = 0; k < calls; ++k) {
    const uint32_t ramp = k < calls / 2 ? k : calls - 1 - k;  // 0 .. 15 .. 0
    const uint32_t step = 0x00280000u + 0x00030000u * ramp;   // turn32 steps per period of 50 ticks
    angle += step;
    handover_samples[k] = {
        turn32::from_raw(angle), electrical_speed::from_raw(int64_t{step} * 65536 / 50),
        k == 20 ? rotation::backward : (k == calls - 1 ? rotation::unknown : rotation::forward)};
  }
}

// A rotor at constant speed read at the PWM rate: 50 timer ticks per period (a 1 MHz timer at
// 20 kHz) and a Hall edge about every eighth period. The trackers run 240 samples before the region
// so that they are in their steady state (turn-averaged speed).
template <int TimerBits>
void make_hall_samples(hall_sample<TimerBits>* table, hall_tracker<TimerBits>& tracker) {
  using time_type = typename detail::timer_traits<TimerBits>::time_type;
  const uint32_t step = 0x05555555u;  // 1/48 turn per period: a sixth of a turn (a Hall edge) per 8 periods
  uint32_t angle = 0x01000000u, time = 0xfff00000u;
  for (int k = -240; k < static_cast<int>(calls); ++k) {
    angle += step;
    time += 50u;
    const auto sector = static_cast<uint8_t>((uint64_t{angle} * 6u) >> 32);
    const hall_sample<TimerBits> s{hall_code(sector), static_cast<time_type>(time)};
    if (k < 0) {
      tracker.update(s.code, s.time);
    } else {
      table[k] = s;
    }
  }
}

// Position samples every 4 PWM periods (200 ticks) of a rotor at a slightly varying speed, and
// estimates at 0 .. 199 ticks after the latest of them (the update region runs first).
template <int TimerBits>
void make_position_samples(position_sample<TimerBits>* samples,
                           typename detail::timer_traits<TimerBits>::time_type* times,
                           angle_interpolator<TimerBits>& position) {
  using time_type = typename detail::timer_traits<TimerBits>::time_type;
  uint32_t angle = 0x12345678u, time = 0xffff0000u;
  random_words rng{0x2468aceu};
  position.update(turn32::from_raw(angle), static_cast<time_type>(time));
  for (uint32_t k = 0; k < calls; ++k) {
    angle += 0x00a00000u + (rng.next() & 0xffffu);
    time += 200u;
    samples[k] = {turn32::from_raw(angle), static_cast<time_type>(time)};
  }
  for (uint32_t k = 0; k < calls; ++k) times[k] = static_cast<time_type>(time + rng.next() % 200u);
}

// ---- regions ---------------------------------------------------------------------------------------
alignas(8) unsigned char sink[64];

struct table_view {
  const unsigned char* data;
  uint32_t stride;
};
table_view table_of(int group) {
  const auto view = [](const auto* table) {
    return table_view{reinterpret_cast<const unsigned char*>(table), static_cast<uint32_t>(sizeof(table[0]))};
  };
  switch (group) {
    case fixed15:
      return view(inputs15);
    case fixed31:
      return view(inputs31);
    case hall_t16:
      return view(hall_samples16);
    case hall_t32:
      return view(hall_samples32);
    case position_t16:
      return view(position_samples16);
    case position_t32:
      return view(position_samples32);
    case time_t16:
      return view(times16);
    case time_t32:
      return view(times32);
    case sector_t16:
      return view(sector_samples16);
    case sector_t32:
      return view(sector_samples32);
    case motion_group:
      return view(motions);
    case handover_group:
      return view(handover_samples);
    default:
      return view(float_inputs);
  }
}

}  // namespace

// The markers: the plugin starts counting at the first instruction of rotorq_cycles_begin and
// stops at the first of rotorq_cycles_end.
extern "C" __attribute__((noinline, noipa, used)) void rotorq_cycles_begin() {
  __asm__ volatile("" ::: "memory");
}
extern "C" __attribute__((noinline, noipa, used)) void rotorq_cycles_end() {
  __asm__ volatile("" ::: "memory");
}

// Cycle counts per region (ROTORQ_CYCLES_HW_COUNTER), for a debugger; index as printed.
extern "C" {
__attribute__((used)) uint32_t rotorq_cycles_counts[128];
__attribute__((used)) volatile uint32_t rotorq_cycles_regions = 0;
// A place for a breakpoint: every region has run.
__attribute__((noinline, noipa, used)) void rotorq_cycles_done() { __asm__ volatile("" ::: "memory"); }
}

namespace {

// The one loop every region runs; the same code for every kernel.
__attribute__((noinline, noipa)) uint32_t run_region(kernel k, const unsigned char* input, uint32_t stride,
                                                     uint32_t n, void* output) {
  const uint32_t start = counter_read();
  rotorq_cycles_begin();
  for (uint32_t i = 0; i < n; ++i) k(input + i * stride, output);
  rotorq_cycles_end();
  return counter_elapsed(start, counter_read());
}

uint32_t region_index = 0;

void region(const char* function, const char* format, kernel k, int group) {
  const table_view t = table_of(group);
  printf("rotorq-cycles region %lu %s %s %lu %lx\n", static_cast<unsigned long>(region_index), function,
         format, static_cast<unsigned long>(calls),
         static_cast<unsigned long>(reinterpret_cast<uintptr_t>(k)));
  const uint32_t cycles = run_region(k, t.data, t.stride, calls, sink);
#if defined(ROTORQ_CYCLES_HW_COUNTER)
  printf("rotorq-cycles counter %lu %s %s %lu\n", static_cast<unsigned long>(region_index), function, format,
         static_cast<unsigned long>(cycles));
#endif
  if (region_index < sizeof(rotorq_cycles_counts) / sizeof(rotorq_cycles_counts[0]))
    rotorq_cycles_counts[region_index] = cycles;
  ++region_index;
  rotorq_cycles_regions = region_index;
}

}  // namespace

int main() {
  make_inputs<15>(inputs15, 0x9e3779b9u);
  make_inputs<31>(inputs31, 0x85ebca6bu);
  make_motions();
  make_float_inputs();
  make_hall_samples<16>(hall_samples16, hall16);
  make_hall_samples<32>(hall_samples32, hall32);
  make_position_samples<16>(position_samples16, times16, position16);
  make_position_samples<32>(position_samples32, times32, position32);
  make_sector_samples<16>(sector_samples16, glitch16);
  make_sector_samples<32>(sector_samples32, glitch32);
  make_handover_samples();
  bus_q15.update(q15::from_raw(26214));  // 0.8
  bus_q31.update(q31::from_raw(1717986918));
  counter_start();

  region("empty", "-", rotorq_cycles_empty, fixed31);
  for (unsigned k = 0; k < fixed_kernel_count; ++k) {
    region(fixed_kernels[k].function, fixed_kernels[k].format, fixed_kernels[k].call, fixed_kernels[k].group);
  }
  for (unsigned k = 0; k < float_kernel_count; ++k) {
    region(float_kernels[k].function, float_kernels[k].format, float_kernels[k].call, float_kernels[k].group);
  }
  rotorq_cycles_done();
  printf("rotorq-cycles done %lu\n", static_cast<unsigned long>(region_index));
  return 0;
}
