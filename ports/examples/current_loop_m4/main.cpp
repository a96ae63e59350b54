// The example firmware against a simulated inverter and motor, 1000 PWM periods: the current follows
// its reference, an unreachable reference drives the voltage into its limit without winding the
// regulators up, and every compare value stays inside the timer period. Prints "N passed, M failed"
// and returns non-zero when a check fails.
#include <stdint.h>
#include <stdio.h>

#include "current_loop.hpp"

using rotorq::q15;

adc_phase_results board_adc{};
pwm_compare_registers board_pwm{};

namespace {

// A star-connected, balanced resistive-inductive load on an ideal inverter, advanced one PWM period
// at a time (forward Euler). Per unit (currents of the ADC's full scale, voltages of the bus), each
// phase follows i <- i + (v - i) / 32: one unit of voltage drives one unit of direct current, with a
// time constant of 32 periods. Currents carry 24 fractional bits.
struct motor {
  int32_t current[3] = {0, 0, 0};

  void apply(const pwm_compare_registers& pwm) {
    const uint32_t c[3] = {pwm.compare[0], pwm.compare[1], pwm.compare[2]};
    const int64_t sum = int64_t{c[0]} + int64_t{c[1]} + int64_t{c[2]};
    for (int k = 0; k < 3; ++k) {
      // Phase-to-neutral voltage in units of the bus: (c_k - mean(c)) / period.
      const int64_t v =
          (3 * int64_t{c[k]} - sum) * (int64_t{1} << 24) / (3 * int64_t{current_loop::pwm_period});
      current[k] += static_cast<int32_t>((v - current[k]) / 32);
    }
  }

  // 12-bit conversions, mid-scale at zero current, clamped to the converter's range.
  void sample(adc_phase_results& adc) const {
    for (int k = 0; k < 3; ++k) {
      const int32_t counts = 2048 + current[k] / 8192;
      adc.phase[k] = static_cast<uint16_t>(counts < 0 ? 0 : (counts > 4095 ? 4095 : counts));
    }
  }
};

int passed = 0;
int failed = 0;

void check(bool ok, const char* what, long value) {
  if (ok) {
    ++passed;
    return;
  }
  ++failed;
  printf("FAIL %s (%ld, 0x%08lx)\n", what, value, static_cast<unsigned long>(value));
}

long magnitude(q15 x) { return x.raw() < 0 ? -long{x.raw()} : long{x.raw()}; }
long magnitude(rotorq::q31 x) { return x.raw() < 0 ? -(long{x.raw()} + 1) : long{x.raw()}; }  // fits a long

// What one stretch of periods showed.
struct observed {
  long worst_d_error = 0;  // |i_d - reference|, raw q15, over the last 100 periods
  long worst_q_error = 0;
  int limited_periods = 0;
  long worst_integral = 0;  // |integral|, raw q31, over the whole stretch
  uint32_t compare_min = current_loop::pwm_period;
  uint32_t compare_max = 0;
  int compare_out_of_range = 0;
};

observed run(motor& plant, rotorq::rotating<q15> reference, int periods) {
  observed seen;
  current_loop::set_reference(reference);
  for (int n = 0; n < periods; ++n) {
    plant.sample(board_adc);
    current_loop_pwm_isr();
    const current_loop::telemetry t = current_loop::last_period();
    for (int k = 0; k < 3; ++k) {
      const uint32_t c = board_pwm.compare[k];
      seen.compare_out_of_range += c > current_loop::pwm_period ? 1 : 0;
      seen.compare_min = c < seen.compare_min ? c : seen.compare_min;
      seen.compare_max = c > seen.compare_max ? c : seen.compare_max;
    }
    plant.apply(board_pwm);

    seen.limited_periods += t.voltage_limited ? 1 : 0;
    const long integral =
        magnitude(t.integral.d) > magnitude(t.integral.q) ? magnitude(t.integral.d) : magnitude(t.integral.q);
    seen.worst_integral = integral > seen.worst_integral ? integral : seen.worst_integral;
    if (n >= periods - 100) {
      const long d_error = magnitude(t.current.d - reference.d);
      const long q_error = magnitude(t.current.q - reference.q);
      seen.worst_d_error = d_error > seen.worst_d_error ? d_error : seen.worst_d_error;
      seen.worst_q_error = q_error > seen.worst_q_error ? q_error : seen.worst_q_error;
    }
  }
  return seen;
}

}  // namespace

int main() {
  motor plant;
  const rotorq::rotating<q15> torque{q15::zero(), q15::from_raw(9830)};     // i_q = 0.3
  const rotorq::rotating<q15> overload{q15::zero(), q15::from_raw(26214)};  // 0.8: beyond the voltage
  const long tolerance = 328;                                               // 1% of full scale
  const long integral_limit = magnitude(rotorq::to_q31(current_loop::voltage_limit));

  // 400 periods are one electrical turn at 164 steps of 2^-16 turn per period.
  const observed start = run(plant, torque, 400);
  check(start.worst_d_error <= tolerance, "settled: i_d error", start.worst_d_error);
  check(start.worst_q_error <= tolerance, "settled: i_q error", start.worst_q_error);
  check(start.limited_periods == 0, "settled: voltage never limited", start.limited_periods);
  // About 0.34 of the bus at 0.3 current: the compare values swing about 840 counts either side.
  check(start.compare_max - start.compare_min > 1200, "compare values follow the rotor",
        static_cast<long>(start.compare_max - start.compare_min));

  const observed stalled = run(plant, overload, 200);
  check(stalled.limited_periods > 150, "overload: voltage held at its limit", stalled.limited_periods);
  check(stalled.worst_integral <= integral_limit, "overload: integrals bounded", stalled.worst_integral);
  check(stalled.compare_min >= current_loop::min_pulse, "overload: shortest pulse",
        static_cast<long>(stalled.compare_min));
  check(stalled.compare_max <= current_loop::pwm_period - current_loop::min_pulse, "overload: longest pulse",
        static_cast<long>(stalled.compare_max));

  const observed recovered = run(plant, torque, 400);
  check(recovered.worst_d_error <= tolerance, "recovered: i_d error", recovered.worst_d_error);
  check(recovered.worst_q_error <= tolerance, "recovered: i_q error", recovered.worst_q_error);
  check(recovered.limited_periods < 100, "recovered: voltage limit released", recovered.limited_periods);

  const int out_of_range =
      start.compare_out_of_range + stalled.compare_out_of_range + recovered.compare_out_of_range;
  check(out_of_range == 0, "compare values inside the period", out_of_range);

  printf("current_loop_m4: %d passed, %d failed\n", passed, failed);
  return failed == 0 ? 0 : 1;
}
