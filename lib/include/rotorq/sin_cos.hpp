// sin_cos: the sine and cosine of a binary angle, in integer arithmetic.
//
//   sin_cos(turn16) -> sin_cos_pair<q15>   |error| <= 0.51 LSB for every one of the 65536 angles
//                                          (correct rounding is 0.5 LSB); where the exact value is
//                                          above (2^15 - 0.5) / 2^15 the result is 32767 (<= 1 LSB)
//   sin_cos(turn32) -> sin_cos_pair<q31>   |error| <= 2 LSB
//
// Both use one table of 256 int32 sines at the centres of equal segments of the first quadrant
// (detail/sine_table.hpp, 1024 bytes of read-only data, shared by the two formats). For an angle
// phi = x0 + delta, with x0 the centre of its segment and |delta| <= pi/1024, the angle-sum identity
//
//   sin(phi) = sin(x0) (1 - (1 - cos delta)) + cos(x0) sin(delta)
//   cos(phi) = cos(x0) (1 - (1 - cos delta)) - sin(x0) sin(delta)
//
// gives both results from the same two table entries, with 1 - cos(delta) ~ delta^2/2 and
// sin(delta) ~ delta (q15: the next terms are below 0.0002 LSB) or delta - delta^3/6 (q31: the next
// term of 1 - cos is below 0.01 LSB). The quadrant is folded in by swapping and negating, and the
// result is rounded once (ties toward +infinity) and saturated.
//
// q15 uses only 32-bit products of operands below 2^17 and 2^16 (a 16x16->32 multiply each);
// q31 uses 32x32->64 products.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/detail/sine_table.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"
#include "rotorq/turn.hpp"

namespace rotorq {

namespace detail {

// Map first-quadrant values (sin, cos of phi in [0, pi/2)) to the quadrant of the full angle:
// sin(phi + k pi/2), cos(phi + k pi/2) for k = 0..3 are (s, c), (c, -s), (-s, -c), (-c, s).
template <typename T>
constexpr sin_cos_pair<T> fold_quadrant(uint32_t quadrant, T s, T c) noexcept {
  const bool swap = (quadrant & 1u) != 0;
  const bool negate_sin = (quadrant & 2u) != 0;
  const bool negate_cos = quadrant == 1u || quadrant == 2u;
  const T sin_first = swap ? c : s;
  const T cos_first = swap ? s : c;
  return {negate_sin ? -sin_first : sin_first, negate_cos ? -cos_first : cos_first};
}

}  // namespace detail

constexpr sin_cos_pair<q15> sin_cos(turn16 angle) noexcept {
  const uint32_t raw = angle.raw();
  const uint32_t segment = (raw >> 6) & 0xffu;
  // steps from the segment centre, [-32, 32); one step is 2 pi / 65536 rad
  const int32_t steps = static_cast<int32_t>(raw & 0x3fu) - 32;

  const int32_t sin31 = detail::sine_table.value[segment];
  const int32_t cos31 = detail::sine_table.value[255 - segment];

  // sin(delta) * 2^23 ~ delta * 2^23; 205887 = round(2 pi 2^15), |result| <= 25736
  const int32_t sin_delta23 = (steps * 205887 + 128) >> 8;
  // (1 - cos(delta)) * 2^33 ~ delta^2 / 2 * 2^33; 10106 = round((2 pi)^2 2^8), result <= 40426
  const int32_t one_minus_cos33 = (steps * steps * 10106 + 128) >> 8;

  // The same values rounded to Q16 (<= 65536) and Q15 (<= 32768); floor(floor(x / 2^(n-1)) + 1) / 2)
  // rounds x / 2^n to nearest without the overflow of x + 2^(n-1).
  const int32_t sin16 = ((sin31 >> 14) + 1) >> 1;
  const int32_t cos16 = ((cos31 >> 14) + 1) >> 1;
  const int32_t sin15 = ((sin31 >> 15) + 1) >> 1;
  const int32_t cos15 = ((cos31 >> 15) + 1) >> 1;

  // First-quadrant results in Q30; each product is below 2^31.
  const int32_t sin30 = (sin31 >> 1) - ((sin15 * one_minus_cos33) >> 18) + ((cos16 * sin_delta23) >> 9);
  const int32_t cos30 = (cos31 >> 1) - ((cos15 * one_minus_cos33) >> 18) - ((sin16 * sin_delta23) >> 9);

  const sin_cos_pair<int32_t> folded = detail::fold_quadrant(raw >> 14, sin30, cos30);
  // |folded| <= 2^30 + 2^10, so the rounding addition cannot overflow.
  return {q15::from_raw(detail::ops::sat16((folded.sin + (1 << 14)) >> 15)),
          q15::from_raw(detail::ops::sat16((folded.cos + (1 << 14)) >> 15))};
}

constexpr sin_cos_pair<q31> sin_cos(turn32 angle) noexcept {
  const uint32_t raw = angle.raw();
  const uint32_t segment = (raw >> 22) & 0xffu;
  // steps from the segment centre, [-2^21, 2^21); one step is 2 pi / 2^32 rad
  const int32_t steps = static_cast<int32_t>(raw & 0x3fffffu) - (1 << 21);

  const int32_t sin31 = detail::sine_table.value[segment];
  const int32_t cos31 = detail::sine_table.value[255 - segment];
  using detail::ops::mul_wide;  // every product below is of two int32 values

  // delta * 2^39, |delta39| < 1.7e9; 843314857 = round(2 pi 2^27)
  const auto delta39 =
      static_cast<int32_t>((detail::ops::mul_wide_by_constant(steps, 843314857) + (int64_t{1} << 19)) >> 20);
  // (1 - cos(delta)) * 2^48 ~ delta^2 / 2 * 2^48 <= 1.33e9
  const auto half_square48 = static_cast<int32_t>(mul_wide(delta39, delta39) >> 31);
  // delta^3 / 6 * 2^39: (delta * delta^2/2) * 2^55 (below 5.3e8 after the shift), times
  // round(2^32 / 3), shifted down
  const auto cube55 = static_cast<int32_t>(mul_wide(delta39, half_square48) >> 32);
  const auto cube_sixth39 = static_cast<int32_t>(detail::ops::mul_wide_by_constant(cube55, 1431655765) >> 48);
  const int32_t sin_delta39 = delta39 - cube_sixth39;

  // First-quadrant results in Q62; every product is below 2^62.
  const int64_t sin62 = int64_t{sin31} * detail::pow2(31) - (mul_wide(sin31, half_square48) >> 17) +
                        (mul_wide(cos31, sin_delta39) >> 8);
  const int64_t cos62 = int64_t{cos31} * detail::pow2(31) - (mul_wide(cos31, half_square48) >> 17) -
                        (mul_wide(sin31, sin_delta39) >> 8);

  const sin_cos_pair<int64_t> folded = detail::fold_quadrant(raw >> 30, sin62, cos62);
  // |folded| <= 2^62 + 2^32, so the rounding addition cannot overflow.
  return {q31::saturate(detail::round_shift(folded.sin, 31)),
          q31::saturate(detail::round_shift(folded.cos, 31))};
}

}  // namespace rotorq
