// Hall sensors: the 3-bit code to a 60-degree sector, the calibration table of the edge angles, and a
// glitch filter (minimum dwell time).
//
// Code. Bit 0 is sensor A, bit 1 sensor B, bit 2 sensor C (bits above are ignored). Each sensor is
// high for half an electrical turn. Sector s (0..5) is the s-th 60-degree span of the sensor frame:
//   hall_placement::spaced_120   sensors 120 degrees apart (the usual): A high over [0, 180),
//                                B over [120, 300), C over [240, 60) degrees of the sensor frame;
//                                sectors 0..5 read 0b101 0b001 0b011 0b010 0b110 0b100, and 0b000
//                                and 0b111 cannot occur (a broken wire, a missing supply)
//   hall_placement::spaced_60    sensors 60 degrees apart: A over [0, 180), B over [60, 240), C over
//                                [120, 300); sectors read 0b001 0b011 0b111 0b110 0b100 0b000, and
//                                0b010 and 0b101 cannot occur
// decode_hall reports an impossible code as valid = false (sector 0); the tracker holds its last
// sector and says so.
//
// Calibration. Where the sensor frame sits on the rotor, and where each edge really falls (sensor
// placement tolerance, magnet hysteresis), is a property of the motor: hall_calibration holds the six
// rotor angles at which a sector is entered turning forward (entry_forward[s], the edge between
// s - 1 and s) and turning backward (entry_backward[s], the edge between s + 1 and s), as measured on
// the motor. uniform_hall_calibration(first_edge) is the ideal table: the edge into sector 0 at
// first_edge, the others 60 degrees apart, no hysteresis. The six sectors together always span
// exactly one turn, whatever the table says, which is why a speed averaged over a full turn is free
// of placement error.
//
// Glitch filter. A new sector counts only after it has been read for min_dwell ticks without a
// break; the accepted edge carries the time the new sector was first read (not the time it was
// confirmed), so filtering adds no delay to the angle. Feed it from the edge interrupt (with the
// captured time) and from the control loop (with the current time): a pure edge-driven feed can
// confirm an edge only at the next call.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/timer.hpp"
#include "rotorq/turn.hpp"

namespace rotorq {

enum class hall_placement : uint8_t { spaced_120, spaced_60 };

struct hall_reading {
  uint8_t sector = 0;  // 0..5 (0 when invalid)
  bool valid = false;
};

namespace detail {
inline constexpr uint8_t hall_invalid = 0xff;
// sector of each code (index), 0xff for the two impossible codes
inline constexpr uint8_t hall_sector_120[8] = {hall_invalid, 1, 3, 2, 5, 0, 4, hall_invalid};
inline constexpr uint8_t hall_sector_60[8] = {5, 0, hall_invalid, 1, 4, hall_invalid, 3, 2};
inline constexpr uint8_t hall_code_120[6] = {0b101, 0b001, 0b011, 0b010, 0b110, 0b100};
inline constexpr uint8_t hall_code_60[6] = {0b001, 0b011, 0b111, 0b110, 0b100, 0b000};

// s * 60 degrees in turn32 steps (s = 0..5, or 6 for a whole turn, which wraps to 0), rounded to
// nearest: s * 2^32 / 6 is not an integer.
inline constexpr uint32_t sixth_turns_table[7] = {0u,          715827883u,  1431655765u, 2147483648u,
                                                  2863311531u, 3579139413u, 0u};
constexpr uint32_t sixth_turns(uint32_t s) noexcept { return sixth_turns_table[s < 6 ? s : 6]; }
constexpr bool sixth_turns_are_rounded() noexcept {  // checked once, by the compiler
  for (uint64_t s = 0; s < 6; ++s) {
    if (sixth_turns_table[s] != ((s << 32) + 3) / 6) return false;
  }
  return true;
}
static_assert(sixth_turns_are_rounded());
// x modulo 6 for the low byte of x without a divide: floor(x * 171 / 1024) is floor(x / 6) for x <= 255.
constexpr uint8_t modulo6(uint32_t x) noexcept {
  const uint32_t small = x & 0xffu;
  return static_cast<uint8_t>(small - 6 * ((small * 171) >> 10));
}
constexpr bool modulo6_is_exact() noexcept {
  for (uint32_t x = 0; x < 256; ++x) {
    if (modulo6(x) != x % 6) return false;  // constant-evaluated: no divide emitted
  }
  return true;
}
static_assert(modulo6_is_exact());
constexpr uint8_t next_sector(uint8_t s) noexcept { return static_cast<uint8_t>(s == 5 ? 0 : s + 1); }
constexpr uint8_t previous_sector(uint8_t s) noexcept { return static_cast<uint8_t>(s == 0 ? 5 : s - 1); }
// a + (b - a) / 2 along the shorter way, rounded toward a.
constexpr turn32 midpoint(turn32 a, turn32 b) noexcept { return advance(a, signed_difference(b, a) / 2); }
}  // namespace detail

constexpr hall_reading decode_hall(uint8_t code,
                                   hall_placement placement = hall_placement::spaced_120) noexcept {
  const uint8_t s =
      (placement == hall_placement::spaced_120 ? detail::hall_sector_120 : detail::hall_sector_60)[code & 7u];
  return s == detail::hall_invalid ? hall_reading{0, false} : hall_reading{s, true};
}

// The code that sector s (taken modulo 6) reads.
constexpr uint8_t hall_code(uint8_t sector, hall_placement placement = hall_placement::spaced_120) noexcept {
  return (placement == hall_placement::spaced_120 ? detail::hall_code_120
                                                  : detail::hall_code_60)[detail::modulo6(sector)];
}

static_assert(decode_hall(0b101).sector == 0 && decode_hall(0b100).sector == 5 && !decode_hall(0).valid &&
              !decode_hall(7).valid);
static_assert(decode_hall(0b000, hall_placement::spaced_60).sector == 5 &&
              !decode_hall(0b101, hall_placement::spaced_60).valid);

struct hall_calibration {
  turn32 entry_forward[6];   // rotor angle of the edge from sector s - 1 into s
  turn32 entry_backward[6];  // rotor angle of the edge from sector s + 1 into s
};

constexpr hall_calibration uniform_hall_calibration(turn32 first_edge = turn32{}) noexcept {
  hall_calibration c{};
  for (uint32_t s = 0; s < 6; ++s) {
    c.entry_forward[s] = first_edge + turn32::from_raw(detail::sixth_turns(s));
    c.entry_backward[s] = first_edge + turn32::from_raw(detail::sixth_turns(s + 1));
  }
  return c;
}

// The rotor angle at which sector s (0..5) is entered turning in the given direction.
constexpr turn32 entry_angle(const hall_calibration& c, uint8_t sector, bool forward) noexcept {
  return forward ? c.entry_forward[detail::modulo6(sector)] : c.entry_backward[detail::modulo6(sector)];
}

// The centre of sector s: halfway between its lower boundary (the mean of the two edges between
// s - 1 and s) and its upper boundary (the mean of the two edges between s and s + 1).
constexpr turn32 sector_centre(const hall_calibration& c, uint8_t sector) noexcept {
  const uint8_t s = detail::modulo6(sector);
  const turn32 lower = detail::midpoint(c.entry_forward[s], c.entry_backward[detail::previous_sector(s)]);
  const turn32 upper = detail::midpoint(c.entry_backward[s], c.entry_forward[detail::next_sector(s)]);
  return detail::midpoint(lower, upper);
}

static_assert(uniform_hall_calibration().entry_forward[1].raw() == 715827883u);   // 2^32 / 6, rounded
static_assert(sector_centre(uniform_hall_calibration(), 0).raw() == 357913941u);  // 30 degrees

// An accepted edge: the filter's sector changed to `sector` at `time`.
template <int TimerBits>
struct hall_edge {
  using time_type = typename detail::timer_traits<TimerBits>::time_type;
  bool happened = false;
  uint8_t sector = 0;
  time_type time = 0;
};

template <int TimerBits>
class hall_glitch_filter {
  using timer = detail::timer_traits<TimerBits>;

 public:
  using time_type = typename timer::time_type;

  // min_dwell in ticks, capped below half the timer range; 0 accepts every change at once.
  constexpr explicit hall_glitch_filter(uint32_t min_dwell = 0) noexcept
      : min_dwell_(min_dwell < timer::half_range ? min_dwell : timer::half_range - 1) {}

  // Feed one valid reading. Returns the accepted edge, if this reading completes one. The first
  // sector ever accepted is reported as an edge too (the caller sees a sector appear).
  constexpr hall_edge<TimerBits> update(uint8_t sector, time_type time) noexcept {
    if (sector == accepted_) {
      candidate_ = detail::hall_invalid;  // a bounce that came back: forget it
      return {};
    }
    if (sector != candidate_) {
      candidate_ = sector;
      candidate_time_ = time;
    } else if (timer::signed_elapsed(time, candidate_time_) < 0) {
      candidate_time_ = time;  // a captured edge time earlier than the poll that saw it first
    }
    const int32_t held = timer::signed_elapsed(time, candidate_time_);
    if (held < 0 || static_cast<uint32_t>(held) < min_dwell_) return {};
    accepted_ = sector;
    candidate_ = detail::hall_invalid;
    return {true, sector, candidate_time_};
  }

  // The accepted sector, or 0xff before the first one.
  constexpr uint8_t sector() const noexcept { return accepted_; }
  constexpr uint32_t min_dwell() const noexcept { return min_dwell_; }

 private:
  uint32_t min_dwell_ = 0;
  uint8_t accepted_ = detail::hall_invalid;
  uint8_t candidate_ = detail::hall_invalid;
  time_type candidate_time_ = 0;
};

}  // namespace rotorq
