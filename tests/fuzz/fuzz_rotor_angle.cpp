// Fuzz target: the rotor-angle headers on raw input bytes: decode_hall / hall_code (hall.hpp), the
// glitch filter and hall_tracker fed arbitrary code and time streams (16- and 32-bit timers),
// angle_interpolator, speed_from_motion / steps_at / rpm_scale (electrical_speed.hpp),
// commutation_sector / six_step_commutation / commutation_voltage and foc_handover
// (commutation.hpp). Checked: no sanitizer report; sectors 0..5, flags consistent with each other;
// an accepted edge held at least min_dwell ticks; the tracker's angle never steps back more than
// max_backward_jump while interpolating and moves no faster than centre_slew while falling back;
// the hand-over's offset within +-30 degrees and its switches as commutation.hpp states; and the
// documented bounds against the double twins (rotorq::ref, ref/rotor_angle.hpp): speed within
// 2^-28 relative + 0.5 raw, rpm within 2^-29 relative + 1/512 rpm, interpolated angles within
// bound::interpolator = 4 steps (host_sim/accuracy/include/rotorq/accuracy/sweeps.hpp),
// commutation_voltage within 1 LSB.
#include <cmath>
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/accuracy/sweeps.hpp"
#include "rotorq/angle_interpolator.hpp"
#include "rotorq/commutation.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/hall.hpp"
#include "rotorq/hall_tracker.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/rotor_angle.hpp"

namespace {

using namespace rotorq;
using fuzz::check;

constexpr double interpolator_bound = accuracy::bound::interpolator;  // turn32 steps
constexpr double turn32_steps = 4294967296.0;
constexpr uint32_t thirty_degrees = 357913941u;  // 2^32 / 12, rounded

uint32_t distance(turn32 a, turn32 b) {
  const int32_t d = signed_difference(a, b);
  return d < 0 ? 0u - static_cast<uint32_t>(d) : static_cast<uint32_t>(d);
}

void check_decode(fuzz::byte_reader& in) {
  const auto code = in.take<uint8_t>();
  const uint8_t low = code & 7u;
  const hall_reading r120 = decode_hall(code);
  check(r120.valid == (low != 0 && low != 7), "decode_hall(120) invalid exactly for 000 and 111", code);
  const hall_reading r60 = decode_hall(code, hall_placement::spaced_60);
  check(r60.valid == (low != 2 && low != 5), "decode_hall(60) invalid exactly for 010 and 101", code);
  check(r120.sector <= 5 && r60.sector <= 5 && (r120.valid || r120.sector == 0) &&
            (r60.valid || r60.sector == 0),
        "decode_hall sector in 0..5, 0 when invalid", code);
  // the twin's geometry: at the centre of sector s the sensors read hall_code(s)
  const double rising_120[3] = {0.0, 1.0 / 3, 2.0 / 3}, rising_60[3] = {0.0, 1.0 / 6, 1.0 / 3};
  const uint8_t s = detail::modulo6(code);
  const double centre = (s + 0.5) / 6;
  check(hall_code(code) == ref::hall_code_at(centre, rising_120), "hall_code(120) is the twin's", code);
  check(hall_code(code, hall_placement::spaced_60) == ref::hall_code_at(centre, rising_60),
        "hall_code(60) is the twin's", code);
  check(decode_hall(hall_code(code)).sector == s &&
            decode_hall(hall_code(code, hall_placement::spaced_60), hall_placement::spaced_60).sector == s,
        "decode_hall inverts hall_code", code);
}

template <int Bits>
void check_filter(fuzz::byte_reader& in) {
  using time_type = typename hall_glitch_filter<Bits>::time_type;
  hall_glitch_filter<Bits> filter(in.take<uint16_t>());
  const uint32_t dwell = filter.min_dwell();
  check(dwell < (uint32_t{1} << (Bits - 1)), "glitch filter min_dwell capped below half the range", dwell);
  auto now = in.take<time_type>();  // any start: the timer wraps during the stream
  uint8_t accepted = 0xff;
  for (int k = 0; k < 24 && !in.exhausted(); ++k) {
    const auto step = in.take<uint8_t>();
    const auto sector = static_cast<uint8_t>(step % 6);
    now = static_cast<time_type>(now + (step >> 3) * (step & 0x80 ? 64u : 1u));
    const hall_edge<Bits> e = filter.update(sector, now);
    if (e.happened) {
      check(e.sector == sector && e.sector != accepted, "glitch filter accepts a new sector", sector,
            accepted);
      const int32_t held = detail::timer_traits<Bits>::signed_elapsed(now, e.time);
      check(held >= 0 && static_cast<uint32_t>(held) >= dwell, "glitch filter edge held min_dwell ticks",
            held, dwell);
      accepted = e.sector;
    }
    check(filter.sector() == accepted, "glitch filter sector() is the last accepted", filter.sector(),
          accepted);
  }
}

template <int Bits>
void check_tracker(fuzz::byte_reader& in) {
  using timer = detail::timer_traits<Bits>;
  using time_type = typename timer::time_type;
  hall_tracker_config config{};
  const auto options = in.take<uint8_t>();
  config.placement = (options & 1) != 0 ? hall_placement::spaced_60 : hall_placement::spaced_120;
  config.averaging = (options & 2) != 0 ? speed_averaging::last_edge : speed_averaging::full_turn;
  if ((options & 4) != 0)
    config.calibration = uniform_hall_calibration(turn32::from_raw(in.take<uint32_t>()));
  if ((options & 8) != 0) {  // a calibration table with arbitrary (disagreeing) edges
    for (turn32& edge : config.calibration.entry_forward) edge = turn32::from_raw(in.take<uint32_t>());
    for (turn32& edge : config.calibration.entry_backward) edge = turn32::from_raw(in.take<uint32_t>());
  }
  config.min_dwell = in.take<uint8_t>();
  config.stall_timeout = in.take<uint32_t>() >> (options >> 4);
  config.min_speed = electrical_speed::from_raw(int64_t{in.take<int32_t>()} * 256);
  config.max_backward_jump = turn32::from_raw(in.take<uint32_t>());
  if ((options & 0x10) != 0)
    config.centre_slew = electrical_speed::from_raw(int64_t{in.take<uint32_t>()} << 4);
  hall_tracker<Bits> tracker(config);
  const uint32_t max_jump =
      config.max_backward_jump.raw() < 0x80000000u ? config.max_backward_jump.raw() : 0x7fffffffu;
  check(tracker.config().stall_timeout < timer::half_range, "hall_tracker stall_timeout capped",
        tracker.config().stall_timeout);

  auto now = in.take<time_type>();
  uint32_t invalid = 0;
  hall_estimate last = tracker.estimate(now);
  check(last.source == angle_source::none && last.angle.raw() == 0 && last.direction == rotation::unknown,
        "hall_tracker starts with no angle", last.angle.raw());
  for (int k = 0; k < 64 && !in.exhausted(); ++k) {
    const auto step = in.take<uint16_t>();
    const auto code = static_cast<uint8_t>(step & 7u);
    const uint32_t dt = (step >> 3) & 0x1ffu;  // small steps, so the stream stays unambiguous
    now = static_cast<time_type>(now + dt);
    tracker.update(code, now);
    if (!decode_hall(code, config.placement).valid) ++invalid;
    const hall_estimate e = tracker.estimate(now);
    const auto angle = static_cast<int64_t>(e.angle.raw());
    check(e.sector <= 5, "hall_tracker sector in 0..5", e.sector);
    check(e.invalid_code == !decode_hall(code, config.placement).valid, "invalid_code is the last code",
          code);
    check(tracker.invalid_codes() == invalid, "invalid_codes counts them", invalid, tracker.invalid_codes());
    check(!e.stalled || (e.speed.raw() == 0 && e.source == angle_source::sector_centre),
          "stalled gives speed 0 at the sector centre", angle);
    check(e.source != angle_source::none || tracker.edges() == 0, "an edge gives an angle source", code);
    if (e.source == angle_source::interpolated) {
      check(e.direction == rotation::forward ? e.speed.raw() > 0 : e.speed.raw() < 0,
            "interpolated: speed has the sign of the direction", e.speed.raw(),
            static_cast<int64_t>(e.direction));
    }
    if (last.source == angle_source::interpolated && e.source == angle_source::interpolated &&
        last.direction == e.direction) {
      const int64_t moved =
          int64_t{signed_difference(e.angle, last.angle)} * static_cast<int8_t>(e.direction);
      check(moved >= -int64_t{max_jump}, "hall_tracker never steps back beyond max_backward_jump", moved,
            max_jump, angle);
    }
    if (last.source == angle_source::sector_centre && e.source == angle_source::sector_centre &&
        e.sector == last.sector) {
      const uint64_t allowed = detail::steps_in(config.centre_slew.magnitude(), dt) + 1;
      check(distance(e.angle, last.angle) <= allowed, "fall-back moves no faster than centre_slew", angle,
            static_cast<int64_t>(allowed));
    }
    last = e;
  }
}

void check_speed(fuzz::byte_reader& in) {
  const int64_t steps = in.take<int64_t>() >> (in.take<uint8_t>() & 63);
  const auto ticks = in.take<uint64_t>() >> (in.take<uint8_t>() & 63);
  const int64_t bounded = steps >> 2;  // |steps| < 2^62 (electrical_speed.hpp)
  const electrical_speed s = speed_from_motion(bounded, ticks);
  check(s.magnitude() <= static_cast<uint64_t>(electrical_speed::raw_max), "speed within raw_max", s.raw());
  const double exact =
      ticks == 0
          ? 0.0
          : std::ldexp(ref::speed_from_motion(static_cast<double>(bounded), static_cast<double>(ticks)), 16);
  const double target = std::fmax(std::fmin(exact, static_cast<double>(electrical_speed::raw_max)),
                                  -static_cast<double>(electrical_speed::raw_max));
  const double allowed = 0.5 + std::fabs(target) * (std::ldexp(1.0, -28) + std::ldexp(1.0, -50));
  check(std::fabs(static_cast<double>(s.raw()) - target) <= allowed, "speed_from_motion within 2^-28 + 0.5",
        bounded, static_cast<int64_t>(ticks), s.raw());

  const auto t = in.take<uint32_t>();
  const fuzz::wide product = static_cast<fuzz::wide>(s.magnitude()) * t;
  const auto magnitude = static_cast<int64_t>(product >> 16);  // floor: toward zero with the sign
  check(steps_at(s, t) == (s.raw() < 0 ? -magnitude : magnitude), "steps_at exact toward zero", s.raw(), t);

  const auto pairs = in.take<uint32_t>() >> (in.take<uint8_t>() & 31);
  const auto hz = in.take<uint32_t>();
  const int32_t rpm = rpm_scale(pairs, hz).rpm_q8(s);
  const double twin = 256 * ref::rpm(std::ldexp(static_cast<double>(s.raw()), -48), pairs, hz);
  const double twin_clamped = std::fmax(std::fmin(twin, 2147483647.0), -2147483647.0);
  check(std::fabs(rpm - twin_clamped) <= 0.5 + std::fabs(twin_clamped) * std::ldexp(1.0, -29) + 1e-6,
        "rpm_q8 within 2^-29 relative + 1/512 rpm", s.raw(), pairs, hz, rpm);
}

void check_interpolator(fuzz::byte_reader& in) {
  angle_interpolator<32> position(in.take<uint32_t>());
  check(!position.estimate(in.take<uint32_t>()).valid, "angle_interpolator invalid before a sample");
  uint32_t now = in.take<uint32_t>();
  turn32 previous{};
  uint32_t previous_time = 0;
  int samples = 0;
  for (int k = 0; k < 8 && !in.exhausted(); ++k) {
    const turn32 angle = turn32::from_raw(in.take<uint32_t>());
    now += in.take<uint16_t>();
    position.update(angle, now);
    ++samples;
    const auto ask = static_cast<int32_t>(in.take<int16_t>()) * 4;
    const uint32_t when = now + static_cast<uint32_t>(ask);
    const interpolated_angle e = position.estimate(when);
    check(e.valid, "angle_interpolator valid after a sample");
    if (samples >= 2) {
      const uint32_t interval = now - previous_time;
      if (interval != 0 && interval < 0x80000000u) {
        const double exact =
            std::ldexp(signed_difference(angle, previous) / static_cast<double>(interval), 16);
        check(std::fabs(static_cast<double>(e.speed.raw()) - exact) <=
                  0.5 + std::fabs(exact) * std::ldexp(1.0, -28),
              "angle_interpolator speed from the last two samples", e.speed.raw());
      }
      {
        const double speed = std::ldexp(static_cast<double>(e.speed.raw()), -48);
        const double twin =
            ref::interpolate_angle(static_cast<double>(angle.raw()) / turn32_steps, speed, ask, 4294967295.0);
        const double got = static_cast<double>(e.angle.raw()) / turn32_steps;
        const double error = std::fabs(std::remainder(got - twin, 1.0)) * turn32_steps;
        check(e.stale || error <= interpolator_bound, "angle_interpolator within bound::interpolator", ask,
              e.speed.raw(), static_cast<int64_t>(error));
      }
    }
    previous = angle;
    previous_time = now;
  }
}

void check_commutation(fuzz::byte_reader& in) {
  const turn32 angle = turn32::from_raw(in.take<uint32_t>());
  const uint8_t sector = commutation_sector(angle);
  check(sector <= 5, "commutation_sector in 0..5", angle.raw());
  const double turns = static_cast<double>(angle.raw()) / turn32_steps;
  const double to_edge = std::fabs(std::remainder(12 * turns - 1, 2.0)) / 12;  // turns to 60 k +- 30 deg
  if (to_edge * turn32_steps > 2) {
    check(sector == ref::commutation_sector(turns), "commutation_sector is the twin's", angle.raw(), sector);
  }
  const auto raw_sector = in.take<uint8_t>();
  const rotation torques[3] = {rotation::forward, rotation::backward, rotation::unknown};
  const rotation torque = torques[in.take<uint8_t>() % 3];
  const commutation_state c = six_step_commutation(raw_sector, torque);
  check(c.active == (torque != rotation::unknown), "six_step_commutation active unless torque unknown",
        raw_sector);
  int high = -1, low = -1, floating = 0;
  const phase_drive drives[3] = {c.drive.a, c.drive.b, c.drive.c};
  for (int k = 0; k < 3; ++k) {
    if (drives[k] == phase_drive::high) high = k;
    if (drives[k] == phase_drive::low) low = k;
    if (drives[k] == phase_drive::floating) ++floating;
  }
  const auto duty = fuzz::take_fixed<15>(in);
  const stationary<q15> v = commutation_voltage(c, duty);
  if (!c.active) {
    check(floating == 3 && v.alpha.raw() == 0 && v.beta.raw() == 0, "unknown torque floats all phases");
    return;
  }
  check(floating == 1 && high >= 0 && low >= 0, "six-step: one phase high, one low, one floating",
        raw_sector);
  check(c.vector == ref::six_step_vector(raw_sector % 6, torque == rotation::forward),
        "six_step_commutation picks the twin's vector", raw_sector, c.vector);
  check(c.vector_angle.raw() == detail::vector_angle_raw[c.vector], "vector_angle is 30 + 60 k degrees",
        c.vector);
  const stationary<double> twin = ref::commutation_voltage(high, low, std::fmax(to_double(duty), 0.0));
  check(std::fabs(fuzz::lsb_error(v.alpha, twin.alpha)) <= 1.0 &&
            std::fabs(fuzz::lsb_error(v.beta, twin.beta)) <= 1.0,
        "commutation_voltage within 1 LSB of the twin", duty.raw(), c.vector);
}

void check_handover(fuzz::byte_reader& in) {
  handover_config config{};
  config.foc_above = electrical_speed::from_raw(int64_t{in.take<uint16_t>()} << 16);
  config.six_step_below = electrical_speed::from_raw(int64_t{in.take<uint16_t>()} << 16);
  config.blend_step = turn32::from_raw(in.take<uint32_t>() >> (in.take<uint8_t>() & 31));
  foc_handover handover(config);
  const rotation torques[3] = {rotation::forward, rotation::backward, rotation::unknown};
  drive_command last{};
  for (int k = 0; k < 16 && !in.exhausted(); ++k) {
    const turn32 angle = turn32::from_raw(in.take<uint32_t>());
    const electrical_speed speed = electrical_speed::from_raw(int64_t{in.take<int32_t>()} * 256);
    const rotation torque = torques[in.take<uint8_t>() % 3];
    const drive_command c = handover.update(angle, speed, torque);
    const auto a = static_cast<int64_t>(angle.raw());
    check(c.mode == handover.mode(), "drive_command mode is the hand-over's", a);
    if (torque == rotation::unknown) {
      check(c.mode == drive_mode::six_step && !c.six_step.active, "unknown torque: six-step, floating", a);
    } else if (c.mode == drive_mode::six_step) {
      check(c.current_angle == c.six_step.vector_angle, "six-step: current on the vector", a);
    } else {
      check(distance(c.offset, turn32{}) <= thirty_degrees + 1, "FOC offset within +-30 degrees", a,
            c.offset.raw());
      const turn32 axis = torque == rotation::forward ? angle + turn32::from_raw(0x40000000u)
                                                      : angle - turn32::from_raw(0x40000000u);
      check(c.current_angle == axis + c.offset, "FOC current angle is the torque axis plus the offset", a);
      const double direction = std::atan2(to_double(c.current_direction.q), to_double(c.current_direction.d));
      const double expected = 2 * M_PI * static_cast<double>((c.current_angle - angle).raw()) / turn32_steps;
      check(std::fabs(std::remainder(direction - expected, 2 * M_PI)) <= 2e-4,
            "FOC current_direction points at the current angle", a, c.offset.raw());
      if (last.mode == drive_mode::six_step) {
        check(c.current_angle == c.six_step.vector_angle, "the switch to FOC moves nothing", a,
              c.offset.raw());
      }
    }
    if (last.mode == drive_mode::foc && c.mode == drive_mode::six_step && torque != rotation::unknown &&
        speed.magnitude() < config.six_step_below.magnitude()) {
      const turn32 axis = torque == rotation::forward ? angle + turn32::from_raw(0x40000000u)
                                                      : angle - turn32::from_raw(0x40000000u);
      check(distance(last.offset, c.six_step.vector_angle - axis) <= config.blend_step.raw(),
            "the switch back to six-step steps at most blend_step", a, last.offset.raw());
    }
    last = c;
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  check_decode(in);
  check_speed(in);
  check_commutation(in);
  check_filter<16>(in);
  check_filter<32>(in);
  check_interpolator(in);
  check_tracker<16>(in);
  check_tracker<32>(in);
  check_handover(in);
  return 0;
}
