// Binary angles turn16 and turn32.
//
// The whole unsigned range is one electrical turn: raw 0 is 0 degrees, raw 2^(N-2) is 90 degrees,
// raw 2^(N-1) is 180 degrees. Addition and subtraction wrap around by themselves (unsigned
// arithmetic, so wrapping is defined), which is exactly what an angle does.
//
//   turn16: 65536 steps per turn, 0.0055 degrees per step
//   turn32: 2^32 steps per turn, 8.4e-8 degrees per step
#pragma once

#include "rotorq/detail/integer.hpp"

namespace rotorq {

template <int Bits>
class turn {
  static_assert(Bits == 16 || Bits == 32, "rotorq provides turn16 and turn32");

 public:
  static constexpr int bits = Bits;
  using raw_type = typename detail::select<Bits == 16, uint16_t, uint32_t>::type;
  // The signed difference of two angles, in the same steps: [-2^(N-1), 2^(N-1)).
  using difference_type = typename detail::select<Bits == 16, int16_t, int32_t>::type;

  constexpr turn() noexcept = default;
  static constexpr turn from_raw(raw_type raw) noexcept { return turn(raw); }
  constexpr raw_type raw() const noexcept { return raw_; }

  // Modulo one turn.
  friend constexpr turn operator+(turn a, turn b) noexcept {
    return turn(static_cast<raw_type>(a.raw_ + b.raw_));
  }
  friend constexpr turn operator-(turn a, turn b) noexcept {
    return turn(static_cast<raw_type>(a.raw_ - b.raw_));
  }
  friend constexpr turn operator-(turn a) noexcept {
    return turn(static_cast<raw_type>(raw_type{0} - a.raw_));
  }
  constexpr turn& operator+=(turn other) noexcept { return *this = *this + other; }
  constexpr turn& operator-=(turn other) noexcept { return *this = *this - other; }

  friend constexpr bool operator==(turn a, turn b) noexcept { return a.raw_ == b.raw_; }
  friend constexpr bool operator!=(turn a, turn b) noexcept { return a.raw_ != b.raw_; }

 private:
  constexpr explicit turn(raw_type raw) noexcept : raw_(raw) {}
  raw_type raw_ = 0;
};

using turn16 = turn<16>;
using turn32 = turn<32>;

// The shortest signed rotation from `from` to `to`, in steps of the angle type: the result lies in
// [-half turn, half turn); exactly half a turn comes out negative.
template <int Bits>
constexpr typename turn<Bits>::difference_type signed_difference(turn<Bits> to, turn<Bits> from) noexcept {
  return detail::to_signed((to - from).raw());
}

// Advance an angle by a signed number of steps, modulo one turn.
template <int Bits>
constexpr turn<Bits> advance(turn<Bits> angle, typename turn<Bits>::difference_type steps) noexcept {
  using raw_type = typename turn<Bits>::raw_type;
  return angle + turn<Bits>::from_raw(static_cast<raw_type>(steps));
}

// turn32 <-> turn16: widening is exact, narrowing rounds to the nearest step (ties toward +infinity,
// modulo one turn).
constexpr turn32 to_turn32(turn16 a) noexcept {
  return turn32::from_raw(static_cast<uint32_t>(uint32_t{a.raw()} << 16));
}
constexpr turn16 to_turn16(turn32 a) noexcept {
  return turn16::from_raw(static_cast<uint16_t>((a.raw() + 0x8000u) >> 16));
}

}  // namespace rotorq
