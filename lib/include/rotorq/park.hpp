// Park transforms: the stationary frame <-> the frame rotating with the rotor.
//
// With theta the electrical angle of the d axis measured from alpha, and q 90 degrees ahead of d:
//   park:          d =  alpha cos(theta) + beta sin(theta)
//                  q = -alpha sin(theta) + beta cos(theta)
//   inverse_park:  alpha = d cos(theta) - q sin(theta)
//                  beta  = d sin(theta) + q cos(theta)
//
// The angle comes in as a precomputed sin_cos_pair, so one sin_cos call serves both directions in a
// current-loop step. Each output is the exact sum of two exact products, rounded once (ties toward
// +infinity) and saturated: given the pair, the result is the correctly rounded value (<= 0.5 LSB).
// With the pair from rotorq::sin_cos the sine/cosine errors add at most |v| * E LSB, where |v| is
// the input vector's length in full-scale units and E the largest length of the sine/cosine error
// vector: E <= 1.12 for q15 and E <= 1.5 for q31 (measured over every q15 angle and a q31 sweep by
// tests/test_park.cpp). A malformed pair (|sin, cos| > 1) or |v| > 1 can exceed the range: the
// output saturates.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

namespace rotorq {

namespace detail {

template <int F>
constexpr typename fixed<F>::product_type product(fixed<F> x, fixed<F> y) noexcept {
  using wide = typename fixed<F>::product_type;
  return static_cast<wide>(wide{x.raw()} * wide{y.raw()});
}

// (p + r) / 2^F for two exact products, rounded once (ties toward +infinity) and saturated. Each
// product and its negation lie in [-2^2F, 2^2F], so p + r can reach 2^(2F+1) and overflow the product
// type: halve it exactly first (floor) and round floor((p + r) / 2) from 2^(F-1), which gives the
// same result as rounding p + r from 2^F.
template <int F>
constexpr fixed<F> round_sum(typename fixed<F>::product_type p, typename fixed<F>::product_type r) noexcept {
  return fixed<F>::saturate(round_shift(half_sum(p, r), F - 1));
}

}  // namespace detail

template <int F>
constexpr rotating<fixed<F>> park(stationary<fixed<F>> v, sin_cos_pair<fixed<F>> angle) noexcept {
  using detail::product;
  return {detail::round_sum<F>(product(v.alpha, angle.cos), product(v.beta, angle.sin)),
          detail::round_sum<F>(product(v.beta, angle.cos), -product(v.alpha, angle.sin))};
}

template <int F>
constexpr stationary<fixed<F>> inverse_park(rotating<fixed<F>> v, sin_cos_pair<fixed<F>> angle) noexcept {
  using detail::product;
  return {detail::round_sum<F>(product(v.d, angle.cos), -product(v.q, angle.sin)),
          detail::round_sum<F>(product(v.d, angle.sin), product(v.q, angle.cos))};
}

}  // namespace rotorq
