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
#include "rotorq/detail/ops.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

namespace rotorq {

namespace detail {

// (x y + u w) / 2^F and (x y - u w) / 2^F, each exact and rounded once, then saturated.
template <int F>
constexpr fixed<F> sum_of_products(fixed<F> x, fixed<F> y, fixed<F> u, fixed<F> w) noexcept {
  if constexpr (F == 15) {
    return q15::from_raw(ops::sum_of_products_q15(x.raw(), y.raw(), u.raw(), w.raw()));
  } else {
    return q31::from_raw(ops::sum_of_products_q31(x.raw(), y.raw(), u.raw(), w.raw()));
  }
}
template <int F>
constexpr fixed<F> difference_of_products(fixed<F> x, fixed<F> y, fixed<F> u, fixed<F> w) noexcept {
  if constexpr (F == 15) {
    return q15::from_raw(ops::difference_of_products_q15(x.raw(), y.raw(), u.raw(), w.raw()));
  } else {
    return q31::from_raw(ops::difference_of_products_q31(x.raw(), y.raw(), u.raw(), w.raw()));
  }
}

}  // namespace detail

template <int F>
constexpr rotating<fixed<F>> park(stationary<fixed<F>> v, sin_cos_pair<fixed<F>> angle) noexcept {
  return {detail::sum_of_products(v.alpha, angle.cos, v.beta, angle.sin),
          detail::difference_of_products(v.beta, angle.cos, v.alpha, angle.sin)};
}

template <int F>
constexpr stationary<fixed<F>> inverse_park(rotating<fixed<F>> v, sin_cos_pair<fixed<F>> angle) noexcept {
  return {detail::difference_of_products(v.d, angle.cos, v.q, angle.sin),
          detail::sum_of_products(v.d, angle.sin, v.q, angle.cos)};
}

}  // namespace rotorq
