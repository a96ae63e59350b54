// The three reference frames of a three-phase machine, as small aggregates passed by value.
//
//   phases<T>      {a, b, c}     the phase quantities
//   stationary<T>  {alpha, beta} alpha along phase a, beta 90 electrical degrees ahead of it
//   rotating<T>    {d, q}        d along the rotor flux, q 90 electrical degrees ahead of d
//   sin_cos_pair<T>{sin, cos}    of the rotor angle, computed once and used by park and inverse_park
#pragma once

namespace rotorq {

template <typename T>
struct phases {
  T a{};
  T b{};
  T c{};
  friend constexpr bool operator==(const phases& x, const phases& y) noexcept {
    return x.a == y.a && x.b == y.b && x.c == y.c;
  }
  friend constexpr bool operator!=(const phases& x, const phases& y) noexcept { return !(x == y); }
};

template <typename T>
struct stationary {
  T alpha{};
  T beta{};
  friend constexpr bool operator==(const stationary& x, const stationary& y) noexcept {
    return x.alpha == y.alpha && x.beta == y.beta;
  }
  friend constexpr bool operator!=(const stationary& x, const stationary& y) noexcept { return !(x == y); }
};

template <typename T>
struct rotating {
  T d{};
  T q{};
  friend constexpr bool operator==(const rotating& x, const rotating& y) noexcept {
    return x.d == y.d && x.q == y.q;
  }
  friend constexpr bool operator!=(const rotating& x, const rotating& y) noexcept { return !(x == y); }
};

template <typename T>
struct sin_cos_pair {
  T sin{};
  T cos{};
  friend constexpr bool operator==(const sin_cos_pair& x, const sin_cos_pair& y) noexcept {
    return x.sin == y.sin && x.cos == y.cos;
  }
  friend constexpr bool operator!=(const sin_cos_pair& x, const sin_cos_pair& y) noexcept {
    return !(x == y);
  }
};

}  // namespace rotorq
