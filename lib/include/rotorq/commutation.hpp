// Six-step (block) commutation from a rotor sector, and the hand-over between six-step and
// field-oriented control.
//
// Six-step. Two phases conduct (one high, one low) and the third floats, which gives six voltage
// vectors; vector k (0..5) points at 30 + 60 k degrees from alpha:
//   k  0: a high, c low   1: b high, c low   2: b high, a low
//      3: c high, a low   4: c high, b low   5: a high, b low
// commutation_sector(angle) is the sector k of a rotor (d axis) angle, covering [60 k - 30, 60 k + 30)
// degrees. six_step_commutation(k, torque) picks the vector 90 degrees ahead of the sector centre in
// the direction of the wanted torque (vector k + 1 forward, k + 4 backward), so over the sector the
// vector stays within 90 +- 30 degrees of the rotor flux and the torque between cos 30 = 0.866 and 1
// of its peak (geometry; common practice, no source). rotation::unknown floats all three phases;
// any other value than forward or unknown (a value cast from an integer) counts as backward.
// With Hall sensors whose edges fall at 30 + 60 k degrees of rotor angle (the usual alignment for
// six-step), commutation_sector(sector_centre(calibration, s)) switches exactly at the edges; with
// other alignments, use the tracker's interpolated angle.
// commutation_voltage(state, duty) is the stationary-frame vector of the state, per unit of the DC
// bus, for a high-side duty in [0, 1): |v| = duty / sqrt(3) (the floating phase at the midpoint of
// the other two), within 1 LSB.
//
// Hand-over (foc_handover, a small class the caller owns). Call update() every control period with
// the rotor angle, its speed (pass zero while the angle is only a sector centre) and the torque
// direction. Below foc_above it commands six-step; at |speed| >= foc_above it switches to FOC with
// the commanded current at the angle the six-step vector had (offset = vector - (angle +- 90
// degrees), within +-30 degrees) and turns the offset to zero by at most blend_step per update, so
// the current vector's angle is continuous through the switch. Below six_step_below (hysteresis:
// keep it under foc_above) it turns the offset toward the six-step vector by at most blend_step per
// update and switches back once they are within blend_step: the current angle then steps by at
// most blend_step. This catches the vector within one sector as long as blend_step is larger than
// the rotor's motion per update. In FOC the command is current_direction, a q15 unit vector in the
// rotor frame (d, q) = (cos, sin)(+-90 degrees + offset): scale it by the current magnitude.
#pragma once

#include "rotorq/constants.hpp"
#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"
#include "rotorq/hall.hpp"
#include "rotorq/rotation.hpp"
#include "rotorq/sin_cos.hpp"
#include "rotorq/turn.hpp"

namespace rotorq {

enum class phase_drive : uint8_t { floating, low, high };

struct commutation_state {
  phases<phase_drive> drive{};
  uint8_t vector = 0;     // 0..5, pointing at 30 + 60 vector degrees
  bool active = false;    // false: all phases floating
  turn32 vector_angle{};  // direction of the vector
};

namespace detail {
// (30 + 60 k) degrees in turn32 steps, k = 0..5: (2 k + 1) 2^32 / 12, rounded to nearest
inline constexpr uint32_t vector_angle_raw[6] = {357913941u,  1073741824u, 1789569707u,
                                                 2505397589u, 3221225472u, 3937053355u};
constexpr bool vector_angles_are_rounded() noexcept {  // checked once, by the compiler
  for (uint64_t k = 0; k < 6; ++k) {
    if (vector_angle_raw[k] != (((2 * k + 1) << 32) + 6) / 12) return false;
  }
  return true;
}
static_assert(vector_angles_are_rounded());
// The phase drives of vector k, at namespace scope so that a call copies one entry, not the table.
inline constexpr phase_drive drive_off = phase_drive::floating, drive_high = phase_drive::high,
                             drive_low = phase_drive::low;
inline constexpr phases<phase_drive> vector_drives[6] = {
    {drive_high, drive_off, drive_low}, {drive_off, drive_high, drive_low},
    {drive_low, drive_high, drive_off}, {drive_low, drive_off, drive_high},
    {drive_off, drive_low, drive_high}, {drive_high, drive_low, drive_off}};
}  // namespace detail

// Sector k covers [60 k - 30, 60 k + 30) degrees.
constexpr uint8_t commutation_sector(turn32 rotor_angle) noexcept {
  // 60 k - 30 <= 360 a / 2^32 < 60 k + 30  <=>  k = floor((12 a + 2^32) / 2^33), exactly (12 a + 2^32 < 2^36)
  // (12 a is an exact 32 x 32 -> 64 product: no 64-bit multiply on a core without one)
  const auto k =
      static_cast<uint8_t>((detail::ops::mul_wide_u32(rotor_angle.raw(), 12) + (uint64_t{1} << 32)) >> 33);
  return static_cast<uint8_t>(k == 6 ? 0 : k);
}

constexpr commutation_state six_step_commutation(uint8_t sector, rotation torque) noexcept {
  if (torque == rotation::unknown) return {};
  const uint8_t k =
      detail::modulo6(uint32_t{detail::modulo6(sector)} + (torque == rotation::forward ? 1u : 4u));
  return {detail::vector_drives[k], k, true, turn32::from_raw(detail::vector_angle_raw[k])};
}

static_assert(commutation_sector(turn32::from_raw(0)) == 0 &&
              commutation_sector(turn32::from_raw(0xffffffffu)) == 0);
static_assert(commutation_sector(turn32::from_raw(0x15555555u)) == 0 &&  // just below 30 degrees
              commutation_sector(turn32::from_raw(0x15555556u)) == 1 &&  // just above
              commutation_sector(turn32::from_raw(0x40000000u)) == 2);   // 90 degrees opens sector 2

template <int F>
constexpr stationary<fixed<F>> commutation_voltage(const commutation_state& state, fixed<F> duty) noexcept {
  if (!state.active) return {};
  const int64_t d = duty.raw() > 0 ? duty.raw() : 0;
  const auto k31 = static_cast<int64_t>(constants::inv_sqrt3 >> 31);  // 1/sqrt(3) in Q31
  const int64_t half = detail::round_shift(d, 1);                     // duty / 2
  const int64_t product =
      detail::ops::mul_wide(static_cast<int32_t>(d), static_cast<int32_t>(k31));  // < 2^62
  const int64_t slope = detail::round_shift(product, 32);                         // duty / (2 sqrt 3)
  const int64_t full = detail::round_shift(product, 31);                          // duty / sqrt 3
  // vector k: alpha = {half, 0, -half, -half, 0, half}[k], beta = {slope, full, slope, -slope, -full,
  // -slope}[k], picked without building the two tables on each call
  const uint8_t k = detail::modulo6(state.vector);
  const int64_t alpha = (k == 1 || k == 4) ? 0 : (k == 2 || k == 3 ? -half : half);
  const int64_t beta = k == 1 ? full : (k == 4 ? -full : (k == 0 || k == 2 ? slope : -slope));
  return {fixed<F>::saturate(alpha), fixed<F>::saturate(beta)};
}

enum class drive_mode : uint8_t { six_step, foc };

struct handover_config {
  electrical_speed foc_above{};                      // six-step -> FOC at |speed| >= this
  electrical_speed six_step_below{};                 // FOC -> six-step at |speed| < this
  turn32 blend_step = turn32::from_raw(0x00b60b61);  // per update: 1 degree
};

struct drive_command {
  drive_mode mode = drive_mode::six_step;
  commutation_state six_step{};       // to apply in six-step mode (computed in both)
  turn32 offset{};                    // FOC: current angle from the torque axis (+-90 degrees from d)
  rotating<q15> current_direction{};  // FOC: unit vector (d, q) of the current command
  turn32 current_angle{};             // stationary-frame angle of the commanded current, both modes
};

class foc_handover {
 public:
  constexpr explicit foc_handover(const handover_config& config = handover_config{}) noexcept
      : config_(config) {}

  constexpr drive_command update(turn32 rotor_angle, electrical_speed speed, rotation torque) noexcept {
    drive_command c{};
    c.six_step = six_step_commutation(commutation_sector(rotor_angle), torque);
    if (torque == rotation::unknown) {
      mode_ = drive_mode::six_step;
      offset_ = turn32{};
      c.current_angle = rotor_angle;
      return c;
    }
    constexpr uint32_t quarter = 0x40000000u;
    const turn32 torque_axis = torque == rotation::forward ? rotor_angle + turn32::from_raw(quarter)
                                                           : rotor_angle - turn32::from_raw(quarter);
    // the offset that puts the current on the six-step vector, within +-30 degrees
    const turn32 to_vector = c.six_step.vector_angle - torque_axis;
    const uint64_t magnitude = speed.magnitude();
    if (mode_ == drive_mode::six_step) {
      if (magnitude >= config_.foc_above.magnitude()) {
        mode_ = drive_mode::foc;
        offset_ = to_vector;  // the switch itself moves nothing
      }
    } else if (magnitude < config_.six_step_below.magnitude()) {
      if (distance(offset_, to_vector) <= config_.blend_step.raw()) {
        mode_ = drive_mode::six_step;
      } else {
        offset_ = step_toward(offset_, to_vector);
      }
    } else {
      offset_ = step_toward(offset_, turn32{});
    }
    c.mode = mode_;
    if (mode_ == drive_mode::six_step) {
      offset_ = turn32{};
      c.current_angle = c.six_step.vector_angle;
      return c;
    }
    c.offset = offset_;
    const turn32 from_d = torque == rotation::forward ? offset_ + turn32::from_raw(quarter)
                                                      : offset_ - turn32::from_raw(quarter);
    const sin_cos_pair<q15> direction = sin_cos(to_turn16(from_d));
    c.current_direction = {direction.cos, direction.sin};
    c.current_angle = torque_axis + offset_;
    return c;
  }

  constexpr drive_mode mode() const noexcept { return mode_; }

 private:
  static constexpr uint32_t distance(turn32 a, turn32 b) noexcept {
    const int32_t d = signed_difference(a, b);
    return d < 0 ? 0u - static_cast<uint32_t>(d) : static_cast<uint32_t>(d);
  }
  constexpr turn32 step_toward(turn32 from, turn32 to) const noexcept {
    const uint32_t step = config_.blend_step.raw();
    if (distance(from, to) <= step) return to;
    return signed_difference(to, from) < 0 ? from - turn32::from_raw(step) : from + turn32::from_raw(step);
  }

  handover_config config_;
  drive_mode mode_ = drive_mode::six_step;
  turn32 offset_{};
};

}  // namespace rotorq
