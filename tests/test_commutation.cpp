// Six-step commutation against the geometry of the six two-phase vectors (ref::commutation_voltage:
// the floating phase at the midpoint; common practice, no source), its torque ripple, and the
// hand-over to FOC on a simulated rotor (made up).
#include "rotorq/commutation.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>

#include "rotorq/host.hpp"
#include "rotorq/ref/ref.hpp"

namespace {

using rotorq::phase_drive;
using rotorq::rotation;
using rotorq::turn32;

double angle_of(rotorq::stationary<double> v) {
  const double t = std::atan2(v.beta, v.alpha) / (2 * M_PI);
  return t < 0 ? t + 1 : t;
}

// Each state drives one phase high, one low, one floating, and its vector_angle and
// commutation_voltage are the direction and size of the vector those drives make.
TEST(Commutation, StatesMatchTheirVoltageVectors) {
  for (uint8_t sector = 0; sector < 6; ++sector) {
    for (rotation torque : {rotation::forward, rotation::backward}) {
      const rotorq::commutation_state s = rotorq::six_step_commutation(sector, torque);
      ASSERT_TRUE(s.active);
      const phase_drive d[3] = {s.drive.a, s.drive.b, s.drive.c};
      int high = -1, low = -1, floating = 0;
      for (int p = 0; p < 3; ++p) {
        if (d[p] == phase_drive::high) high = p;
        if (d[p] == phase_drive::low) low = p;
        if (d[p] == phase_drive::floating) ++floating;
      }
      ASSERT_TRUE(high >= 0 && low >= 0 && floating == 1) << int{sector};
      EXPECT_EQ(s.vector, rotorq::ref::six_step_vector(sector, torque == rotation::forward)) << int{sector};
      for (double duty : {1.0 - std::ldexp(1.0, -15), 0.5, 0.1}) {
        const rotorq::stationary<double> want = rotorq::ref::commutation_voltage(high, low, duty);
        EXPECT_NEAR(rotorq::ref::signed_difference_turns(rotorq::to_turns(s.vector_angle), angle_of(want)), 0,
                    1e-9);
        EXPECT_NEAR(std::hypot(want.alpha, want.beta), duty / std::sqrt(3.0), 1e-12);  // |v| = duty / sqrt 3
        const auto v15 = rotorq::commutation_voltage(s, rotorq::to_q15(duty));
        const auto v31 = rotorq::commutation_voltage(s, rotorq::to_q31(duty));
        EXPECT_LE(std::fabs(rotorq::to_double(v15.alpha) - want.alpha) * 32768, 1.0)
            << int{sector} << " " << duty;
        EXPECT_LE(std::fabs(rotorq::to_double(v15.beta) - want.beta) * 32768, 1.0)
            << int{sector} << " " << duty;
        EXPECT_LE(std::fabs(rotorq::to_double(v31.alpha) - want.alpha) * 2147483648.0, 1.0) << int{sector};
        EXPECT_LE(std::fabs(rotorq::to_double(v31.beta) - want.beta) * 2147483648.0, 1.0) << int{sector};
      }
    }
  }
  const rotorq::commutation_state coast = rotorq::six_step_commutation(3, rotation::unknown);
  EXPECT_FALSE(coast.active);
  EXPECT_EQ(coast.drive.a, phase_drive::floating);
  EXPECT_EQ(coast.drive.b, phase_drive::floating);
  EXPECT_EQ(coast.drive.c, phase_drive::floating);
  EXPECT_EQ(rotorq::commutation_voltage(coast, rotorq::q15::max()), rotorq::stationary<rotorq::q15>{});
}

// Over every rotor angle (2^16 steps of a turn) the vector stays within 90 +- 30 degrees of the
// rotor flux in the torque's direction, so the torque, proportional to the sine of that angle, lies
// between cos 30 = 0.866 and 1 of its peak (geometry, common practice, no source); both ends are
// reached.
TEST(Commutation, TorqueRippleOfSixStepIsCos30) {
  for (rotation torque : {rotation::forward, rotation::backward}) {
    double lowest = 2, highest = -2;
    for (uint32_t k = 0; k < 65536; ++k) {
      const turn32 theta = turn32::from_raw(k << 16);
      const uint8_t sector = rotorq::commutation_sector(theta);
      ASSERT_EQ(sector, rotorq::ref::commutation_sector(rotorq::to_turns(theta))) << "raw " << theta.raw();
      const rotorq::commutation_state s = rotorq::six_step_commutation(sector, torque);
      const double lead =
          2 * M_PI *
          rotorq::ref::signed_difference_turns(rotorq::to_turns(s.vector_angle), rotorq::to_turns(theta));
      const double relative = (torque == rotation::forward ? 1 : -1) * std::sin(lead);
      ASSERT_GE(relative, std::cos(M_PI / 6) - 1e-9) << "angle raw " << theta.raw();
      lowest = std::fmin(lowest, relative);
      highest = std::fmax(highest, relative);
    }
    EXPECT_NEAR(lowest, std::cos(M_PI / 6), 1e-4);
    EXPECT_NEAR(highest, 1.0, 1e-9);
  }
}

// The hand-over on a rotor that spins up through the threshold and back down: at every control
// step the commanded current's angle moves with the rotor, changing by at most the rotor's own
// motion plus blend_step, except where six-step itself commutates (a 60 degree step by design);
// both switches happen; the torque share never drops below cos 30.
TEST(Commutation, HandOverKeepsTheCurrentAngleContinuous) {
  const double blend = 1.0;  // degrees per update
  for (rotation torque : {rotation::forward, rotation::backward}) {
    rotorq::handover_config config;
    const double per_tick = std::ldexp(1.0, 48) / 360.0;  // degrees per tick -> raw speed
    config.foc_above = rotorq::electrical_speed::from_raw(static_cast<int64_t>(0.20 * per_tick));
    config.six_step_below = rotorq::electrical_speed::from_raw(static_cast<int64_t>(0.15 * per_tick));
    config.blend_step = rotorq::turn32_from_degrees(blend);
    rotorq::foc_handover handover(config);
    const double sign = torque == rotation::forward ? 1 : -1;
    double angle = 12.0, previous_current = 0, previous_angle = 0;
    rotorq::drive_mode previous_mode = rotorq::drive_mode::six_step;
    int switches = 0, checked = 0;
    uint8_t previous_vector = 255;
    double worst = 0;
    for (int k = 0; k < 40000; ++k) {
      // degrees per tick: up to 0.3 and back to 0, over 40000 updates of 10 ticks
      const double speed = 0.3 * std::sin(M_PI * k / 40000.0);
      angle += sign * speed * 10;
      const auto raw_speed = static_cast<int64_t>(sign * speed * per_tick);
      const rotorq::drive_command c = handover.update(rotorq::turn32_from_degrees(angle),
                                                      rotorq::electrical_speed::from_raw(raw_speed), torque);
      const double current = rotorq::to_degrees(c.current_angle);
      const double share =
          sign * std::sin(2 * M_PI * rotorq::ref::signed_difference_turns(current / 360, angle / 360));
      ASSERT_GE(share, std::cos(M_PI / 6) - 1e-6) << "update " << k;
      if (c.mode == rotorq::drive_mode::foc) {
        // the dq command is the unit vector at +-90 deg + offset from d
        const double from_d = 2 * M_PI * rotorq::ref::signed_difference_turns(current / 360, angle / 360);
        EXPECT_NEAR(rotorq::to_double(c.current_direction.d), std::cos(from_d), 2e-4) << k;
        EXPECT_NEAR(rotorq::to_double(c.current_direction.q), std::sin(from_d), 2e-4) << k;
      }
      const bool commutated = c.mode == rotorq::drive_mode::six_step &&
                              previous_mode == rotorq::drive_mode::six_step &&
                              c.six_step.vector != previous_vector;
      if (k > 0 && !commutated) {
        const double step = 360 * rotorq::ref::signed_difference_turns(current / 360, previous_current / 360);
        const double rotor = 360 * rotorq::ref::signed_difference_turns(angle / 360, previous_angle / 360);
        if (c.mode != previous_mode) worst = std::fmax(worst, std::fabs(step));
        ASSERT_LE(std::fabs(step), std::fabs(rotor) + blend + 1e-6)
            << "update " << k << " mode " << int(c.mode);
        ++checked;
      }
      if (k > 0 && c.mode != previous_mode) ++switches;
      previous_mode = c.mode;
      previous_vector = c.six_step.vector;
      previous_current = current;
      previous_angle = angle;
    }
    EXPECT_EQ(switches, 2) << "up once, down once";
    EXPECT_GT(checked, 30000);
    std::printf("hand-over, torque %d: the current angle stepped by at most %.3f deg at the switches\n",
                static_cast<int>(torque), worst);
  }
}

}  // namespace
