// Example firmware: the field-oriented current loop of a permanent-magnet motor drive, run from the
// PWM timer's period interrupt on a Cortex-M4F. This header is what the rest of the firmware (and
// the test in main.cpp) sees of it.
#pragma once

#include <stdint.h>

#include "rotorq/constants.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

// The peripherals the loop touches, as a board support package would declare them. On a chip they
// are memory-mapped registers at fixed addresses; main.cpp defines them as plain objects and plays
// the inverter and the motor.
struct adc_phase_results {
  volatile uint16_t phase[3];  // 12-bit conversions of the phase currents a, b, c; 2048 = 0 A
};
struct pwm_compare_registers {
  volatile uint32_t compare[3];  // centre-aligned compare values of phases a, b, c, in 0..period
};
extern adc_phase_results board_adc;
extern pwm_compare_registers board_pwm;

namespace current_loop {

// Timer: centre-aligned, counting 0..2500..0 at 100 MHz, so one period is 50 us (20 kHz); every pulse
// shorter than 400 ns is dropped or widened (bootstrap drivers, current sampling window).
inline constexpr uint32_t pwm_period = 2500;
inline constexpr uint32_t min_pulse = 40;

// The largest voltage vector the loop applies, per unit of the bus: 95% of the inscribed circle of
// the modulator's hexagon (1/sqrt(3)), which keeps the output sinusoidal and leaves room for the
// minimum pulse.
inline constexpr rotorq::q15 voltage_limit =
    rotorq::constant<rotorq::q15>(rotorq::constants::inv_sqrt3) * rotorq::q15::from_raw(31130);
static_assert(voltage_limit.raw() == 17973);

// What the loop measured and applied in its last period (per unit: currents of the ADC's full scale,
// voltages of the DC bus).
struct telemetry {
  rotorq::rotating<rotorq::q15> current;   // measured i_d, i_q
  rotorq::rotating<rotorq::q15> voltage;   // applied v_d, v_q, after the magnitude limit
  rotorq::rotating<rotorq::q31> integral;  // the regulators' integral terms
  bool voltage_limited;                    // the regulators asked for more than the limit
};

// Set the current the loop regulates to (from the speed loop or the command interface).
void set_reference(rotorq::rotating<rotorq::q15> current) noexcept;
telemetry last_period() noexcept;

}  // namespace current_loop

// The PWM period interrupt: ADC results in, compare values out.
extern "C" void current_loop_pwm_isr(void);
