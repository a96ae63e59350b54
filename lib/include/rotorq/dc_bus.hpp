// DC-bus compensation: a voltage request in volts to one normalised to the measured bus voltage,
// the input of svpwm.
//
//   rotorq::bus_normalizer<rotorq::q15> bus(rotorq::q15::from_raw(1638));  // lowest usable bus
//   bus.update(v_bus_measured);            // once per sample: one reciprocal
//   stationary<q15> v = bus.normalize(v_volts);  // v_volts / v_bus, per component
//
// The request and the bus voltage are in the same q format and the same scaling (for example
// 1.0 = 100 V). update() forms 1 / v_bus once without dividing (table start and Newton steps,
// detail/newton.hpp), so each sample costs one reciprocal and then one multiply per component
// rather than a divide per phase. The reciprocal is within 2^-29 (relative) of exact, so a normalised
// value is within 0.5 LSB + |result| 2^-29: below 0.51 LSB for q15, a few LSB at full scale for q31.
//
// A bus at or below the minimum given at construction (zero, negative or too low to trust) makes the
// normalizer invalid: update() returns false, valid() is false and normalize() returns zero, so the
// inverter is commanded to zero voltage until the bus recovers. A minimum at or below zero counts as
// one raw step. Results beyond the range (a request above the bus voltage) saturate.
#pragma once

#include "rotorq/detail/integer.hpp"
#include "rotorq/detail/newton.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"

namespace rotorq {

template <typename Q>
class bus_normalizer {
 public:
  constexpr explicit bus_normalizer(Q minimum_bus) noexcept
      : minimum_(minimum_bus.raw() > 0 ? minimum_bus.raw() : 1) {}

  // Takes a new bus measurement; returns valid().
  constexpr bool update(Q bus) noexcept {
    valid_ = bus.raw() > minimum_;
    if (!valid_) return false;
    // bus = m 2^-n / 2^32 * 2^(32 - F) with m = bus_raw << n in [2^31, 2^32):
    // 1 / bus = (1 / M) 2^(n + F - 32), so v / bus in raw steps is v_raw R >> (62 - n - F).
    const auto raw = static_cast<uint32_t>(bus.raw());
    const int n = detail::leading_zeros(raw);
    inverse_mantissa_ = detail::reciprocal_q30(raw << n);
    shift_ = 62 - n - Q::fraction_bits;  // bus_raw >= 2, so n <= 30: 17..30 for q15, 1..30 for q31
    return true;
  }

  constexpr bool valid() const noexcept { return valid_; }

  // v / bus, rounded (ties toward +infinity) and saturated; zero while invalid.
  constexpr Q normalize(Q v) const noexcept {
    if (!valid_) return Q::zero();
    const int64_t product = int64_t{v.raw()} * int64_t{inverse_mantissa_};  // |product| <= 2^62
    return Q::saturate(detail::round_shift(product, shift_));
  }
  constexpr stationary<Q> normalize(stationary<Q> v) const noexcept {
    return {normalize(v.alpha), normalize(v.beta)};
  }
  constexpr rotating<Q> normalize(rotating<Q> v) const noexcept { return {normalize(v.d), normalize(v.q)}; }

 private:
  int32_t minimum_;
  uint32_t inverse_mantissa_ = 0;
  int shift_ = 0;
  bool valid_ = false;
};

}  // namespace rotorq
