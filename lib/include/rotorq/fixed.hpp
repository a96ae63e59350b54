// Fixed-point values q15 and q31.
//
// A fixed<F> holds a two's-complement integer `raw` and stands for raw / 2^F, so q15 covers
// [-1, 1 - 2^-15] and q31 covers [-1, 1 - 2^-31]. The binary point is part of the type: a q15 and a
// q31 never mix without an explicit conversion.
//
// Every operation states its rule:
//   a + b, a - b, -a   exact, then saturated to [min, max]        (-(-1) gives max)
//   a * b              exact product, rounded to nearest with ties toward +infinity (the rule of a
//                      rounding multiply-high instruction), then saturated (-1 * -1 gives max)
//   mul_add(a, b, c)   a * b + c with one rounding at the end
//   to_q15(q31)        rounded as above, saturated; to_q31(q15) is exact
// No operation overflows a signed integer or shifts a negative value left, so none has undefined
// behaviour for any input.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"

namespace rotorq {

template <int FractionBits>
class fixed {
  static_assert(FractionBits == 15 || FractionBits == 31, "rotorq provides q15 and q31");

 public:
  static constexpr int fraction_bits = FractionBits;
  // int16_t for q15, int32_t for q31.
  using raw_type = typename detail::select<FractionBits == 15, int16_t, int32_t>::type;
  // Wide enough for the exact product of two raw values.
  using product_type = typename detail::select<FractionBits == 15, int32_t, int64_t>::type;

  static constexpr int64_t raw_max = detail::pow2(FractionBits) - 1;
  static constexpr int64_t raw_min = -detail::pow2(FractionBits);

  constexpr fixed() noexcept = default;

  static constexpr fixed from_raw(raw_type raw) noexcept { return fixed(raw); }
  constexpr raw_type raw() const noexcept { return raw_; }

  static constexpr fixed max() noexcept { return fixed(static_cast<raw_type>(raw_max)); }
  static constexpr fixed min() noexcept { return fixed(static_cast<raw_type>(raw_min)); }
  static constexpr fixed zero() noexcept { return fixed(0); }

  // Saturate a wide integer into the raw range.
  static constexpr fixed saturate(int64_t wide) noexcept {
    if constexpr (FractionBits == 15) {
      return fixed(detail::ops::sat16_wide(wide));
    } else {
      return fixed(detail::ops::sat32(wide));
    }
  }

  // The arithmetic goes through the port's primitives (rotorq/detail/ops.hpp), which return the same
  // values on every core.
  friend constexpr fixed operator+(fixed a, fixed b) noexcept {
    if constexpr (FractionBits == 15) {
      return fixed(detail::ops::add16(a.raw_, b.raw_));
    } else {
      return fixed(detail::ops::add32(a.raw_, b.raw_));
    }
  }
  friend constexpr fixed operator-(fixed a, fixed b) noexcept {
    if constexpr (FractionBits == 15) {
      return fixed(detail::ops::sub16(a.raw_, b.raw_));
    } else {
      return fixed(detail::ops::sub32(a.raw_, b.raw_));
    }
  }
  friend constexpr fixed operator-(fixed a) noexcept { return zero() - a; }
  friend constexpr fixed operator*(fixed a, fixed b) noexcept {
    if constexpr (FractionBits == 15) {
      return fixed(detail::ops::mul_q15(a.raw_, b.raw_));
    } else {
      return fixed(detail::ops::mul_q31(a.raw_, b.raw_));
    }
  }

  constexpr fixed& operator+=(fixed other) noexcept { return *this = *this + other; }
  constexpr fixed& operator-=(fixed other) noexcept { return *this = *this - other; }
  constexpr fixed& operator*=(fixed other) noexcept { return *this = *this * other; }

  friend constexpr bool operator==(fixed a, fixed b) noexcept { return a.raw_ == b.raw_; }
  friend constexpr bool operator!=(fixed a, fixed b) noexcept { return a.raw_ != b.raw_; }
  friend constexpr bool operator<(fixed a, fixed b) noexcept { return a.raw_ < b.raw_; }
  friend constexpr bool operator<=(fixed a, fixed b) noexcept { return a.raw_ <= b.raw_; }
  friend constexpr bool operator>(fixed a, fixed b) noexcept { return a.raw_ > b.raw_; }
  friend constexpr bool operator>=(fixed a, fixed b) noexcept { return a.raw_ >= b.raw_; }

 private:
  constexpr explicit fixed(raw_type raw) noexcept : raw_(raw) {}
  raw_type raw_ = 0;
};

using q15 = fixed<15>;
using q31 = fixed<31>;

// |a|, saturated: abs(-1) gives max.
template <int F>
constexpr fixed<F> abs(fixed<F> a) noexcept {
  return a.raw() < 0 ? -a : a;
}

// a * b + c, computed exactly and rounded once (ties toward +infinity), then saturated.
template <int F>
constexpr fixed<F> mul_add(fixed<F> a, fixed<F> b, fixed<F> c) noexcept {
  // |a*b| <= 2^(2F) and |c * 2^F| <= 2^(2F), so the sum stays below 2^63 for F = 31.
  const int64_t exact = detail::ops::mul_wide(a.raw(), b.raw()) + int64_t{c.raw()} * detail::pow2(F);
  return fixed<F>::saturate(detail::round_shift(exact, F));
}

// q15 -> q31 is exact (the raw value times 2^16).
constexpr q31 to_q31(q15 x) noexcept { return q31::from_raw(static_cast<int32_t>(x.raw() * 65536)); }

// q31 -> q15 rounds to nearest (ties toward +infinity) and saturates.
// floor((floor(x / 2^15) + 1) / 2) = floor((x + 2^15) / 2^16) without the overflow of x + 2^15.
constexpr q15 to_q15(q31 x) noexcept { return q15::from_raw(detail::ops::sat16(((x.raw() >> 15) + 1) >> 1)); }

}  // namespace rotorq
