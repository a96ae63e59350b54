// accumulator<Q>: a sum of exact products with one rounding at the end.
//
//   rotorq::accumulator<rotorq::q31> acc;
//   acc.mac(a0, b0);   // += a0 * b0, exact
//   acc.mac(a1, b1);
//   rotorq::q31 y = acc.result();   // rounded once (ties toward +infinity), saturated
//
// The sum is held exactly: 64 bits at 2F fraction bits, plus a count of how many times the 64-bit
// part wrapped. Intermediate sums may therefore leave the q range (or even 2^63) and come back, and
// the order of the terms never changes the result. The wrap count saturates after 2^31 wraps, which
// takes more than 2^92 full-scale q31 products; from then on result() is the limit of its sign.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/ops.hpp"
#include "rotorq/fixed.hpp"

namespace rotorq {

template <typename Q>
class accumulator {
 public:
  using value_type = Q;

  constexpr accumulator() noexcept = default;

  // += a * b
  constexpr void mac(Q a, Q b) noexcept { add_wide(detail::ops::mul_wide(a.raw(), b.raw())); }
  // -= a * b
  constexpr void msc(Q a, Q b) noexcept { add_wide(-detail::ops::mul_wide(a.raw(), b.raw())); }
  // += a (exact: a is scaled to the product format)
  constexpr void add(Q a) noexcept { add_wide(int64_t{a.raw()} * detail::pow2(Q::fraction_bits)); }

  // The sum, rounded to nearest with ties toward +infinity, then saturated to [min, max].
  constexpr Q result() const noexcept {
    if (wraps_ > 0) return Q::max();
    if (wraps_ < 0) return Q::min();
    // |sum_| < 2^63: halve first so that adding the rounding constant cannot overflow
    // (floor((floor(x / 2) + 2^(F-2)) / 2^(F-1)) equals floor((x + 2^(F-1)) / 2^F)).
    const int64_t half = sum_ >> 1;
    return Q::saturate((half + detail::pow2(Q::fraction_bits - 2)) >> (Q::fraction_bits - 1));
  }

  constexpr void clear() noexcept { *this = accumulator{}; }

 private:
  constexpr void add_wide(int64_t term) noexcept {
    const int64_t next = detail::to_signed(static_cast<uint64_t>(sum_) + static_cast<uint64_t>(term));
    if (term >= 0 && next < sum_) step_wraps(+1);
    if (term < 0 && next > sum_) step_wraps(-1);
    sum_ = next;
  }
  constexpr void step_wraps(int32_t step) noexcept {
    if (step > 0 && wraps_ < 0x7fffffff) ++wraps_;
    if (step < 0 && wraps_ > -0x7fffffff) --wraps_;
  }

  int64_t sum_ = 0;    // the low 64 bits of the exact sum, at 2F fraction bits
  int32_t wraps_ = 0;  // how many times 2^64 the exact sum differs from sum_
};

}  // namespace rotorq
