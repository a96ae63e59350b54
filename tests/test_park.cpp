// Park transforms: the rotation of R. H. Park, "Two-Reaction Theory of Synchronous Machines", AIEE
// Trans. 48 (1929) -- d along the rotor axis at angle theta, q 90 degrees ahead -- checked as exact
// integer formulas, as a rotation of known vectors, and with the library's own sine and cosine.
#include "rotorq/park.hpp"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <random>
#include <string>

#include "mpfr_oracle.hpp"
#include "rotorq/host.hpp"
#include "rotorq/sin_cos.hpp"

namespace {

using rotorq::q15;
using rotorq::q31;
using rotorq::rotating;
using rotorq::sin_cos_pair;
using rotorq::stationary;

template <typename Q>
std::string hex(Q x) {
  char text[24];
  std::snprintf(text, sizeof text, "0x%llx",
                static_cast<unsigned long long>(static_cast<uint64_t>(x.raw()) &
                                                (Q::fraction_bits == 15 ? 0xffffu : 0xffffffffu)));
  return text;
}

// The specified result, computed with a 128-bit host integer as the exact reference:
// floor((x p + y r + 2^(F-1)) / 2^F), saturated.
template <typename Q>
int64_t exact_dot(Q x, Q p, Q y, Q r, int sign) {
  const __int128 sum =
      static_cast<__int128>(x.raw()) * p.raw() + sign * static_cast<__int128>(y.raw()) * r.raw();
  const __int128 shifted = sum + (static_cast<__int128>(1) << (Q::fraction_bits - 1));
  // floor division by 2^F (the host's >> on __int128 is arithmetic)
  const __int128 floored = shifted >> Q::fraction_bits;
  return static_cast<int64_t>(std::min<__int128>(std::max<__int128>(floored, Q::raw_min), Q::raw_max));
}

template <typename Q>
void expect_exactly_specified(stationary<Q> v, sin_cos_pair<Q> a) {
  const rotating<Q> r = rotorq::park(v, a);
  ASSERT_EQ(r.d.raw(), exact_dot(v.alpha, a.cos, v.beta, a.sin, +1)) << hex(v.alpha) << " " << hex(v.beta);
  ASSERT_EQ(r.q.raw(), exact_dot(v.beta, a.cos, v.alpha, a.sin, -1)) << hex(v.alpha) << " " << hex(v.beta);
  const stationary<Q> s = rotorq::inverse_park(rotating<Q>{v.alpha, v.beta}, a);
  ASSERT_EQ(s.alpha.raw(), exact_dot(v.alpha, a.cos, v.beta, a.sin, -1))
      << hex(v.alpha) << " " << hex(v.beta);
  ASSERT_EQ(s.beta.raw(), exact_dot(v.alpha, a.sin, v.beta, a.cos, +1)) << hex(v.alpha) << " " << hex(v.beta);
}

template <typename Q>
Q random_q(std::mt19937_64& rng) {
  return Q::saturate(static_cast<int64_t>(rng() % static_cast<uint64_t>(Q::raw_max - Q::raw_min + 1)) +
                     Q::raw_min);
}

template <typename Q>
std::vector<Q> corners() {
  return {Q::min(),       Q::saturate(Q::raw_min + 1), Q::saturate(-1), Q::zero(),
          Q::saturate(1), Q::saturate(Q::raw_max - 1), Q::max()};
}

TEST(Park, GivenThePairTheResultIsTheCorrectlyRoundedValue) {
  // every combination of corner values (the -1 raw corners included: products of -1 * -1 sum to 2)
  for (q31 a : corners<q31>()) {
    for (q31 b : corners<q31>()) {
      for (q31 s : corners<q31>()) {
        for (q31 c : corners<q31>()) expect_exactly_specified(stationary<q31>{a, b}, sin_cos_pair<q31>{s, c});
      }
    }
  }
  for (q15 a : corners<q15>()) {
    for (q15 b : corners<q15>()) {
      for (q15 s : corners<q15>()) {
        for (q15 c : corners<q15>()) expect_exactly_specified(stationary<q15>{a, b}, sin_cos_pair<q15>{s, c});
      }
    }
  }
  std::mt19937_64 rng(1929);
  for (int n = 0; n < 1000000; ++n) {
    expect_exactly_specified(stationary<q31>{random_q<q31>(rng), random_q<q31>(rng)},
                             sin_cos_pair<q31>{random_q<q31>(rng), random_q<q31>(rng)});
    expect_exactly_specified(stationary<q15>{random_q<q15>(rng), random_q<q15>(rng)},
                             sin_cos_pair<q15>{random_q<q15>(rng), random_q<q15>(rng)});
  }
  // q15: every alpha against a fixed beta and the library's pairs for a stride of angles
  for (int32_t alpha = -32768; alpha < 32768; ++alpha) {
    for (uint32_t angle = 0; angle < 65536; angle += 4099) {
      expect_exactly_specified(
          stationary<q15>{q15::from_raw(static_cast<int16_t>(alpha)), q15::from_raw(-12345)},
          rotorq::sin_cos(rotorq::turn16::from_raw(static_cast<uint16_t>(angle))));
    }
  }
}

// A vector at angle phi with length m sits at (m cos(phi - theta), m sin(phi - theta)) in the frame
// rotated by theta (Park 1929): with phi = theta it is (m, 0), with phi = theta + 90 degrees (0, m).
TEST(Park, AVectorAlongTheRotorAxisIsPureD) {
  for (int degrees = 0; degrees < 360; degrees += 3) {
    const rotorq::turn32 theta = rotorq::turn32_from_degrees(degrees);
    const auto pair = rotorq::sin_cos(theta);
    const double m = 0.6;
    const double t = degrees * M_PI / 180.0;
    const stationary<q31> on_d{rotorq::to_q31(m * std::cos(t)), rotorq::to_q31(m * std::sin(t))};
    const rotating<q31> r = rotorq::park(on_d, pair);
    // input quantisation (0.5 LSB each) + rounding + sin/cos error (<= 1.5 LSB in length, times m)
    EXPECT_NEAR(rotorq::to_double(r.d), m, 3.0 / 2147483648.0) << degrees;
    EXPECT_NEAR(rotorq::to_double(r.q), 0.0, 3.0 / 2147483648.0) << degrees;
    const stationary<q31> on_q{rotorq::to_q31(-m * std::sin(t)), rotorq::to_q31(m * std::cos(t))};
    const rotating<q31> rq = rotorq::park(on_q, pair);
    EXPECT_NEAR(rotorq::to_double(rq.d), 0.0, 3.0 / 2147483648.0) << degrees;
    EXPECT_NEAR(rotorq::to_double(rq.q), m, 3.0 / 2147483648.0) << degrees;
  }
}

// The sine/cosine error vector: E = max over angles of |(sin, cos) computed - exact| in LSB, against
// MPFR. park.hpp states E <= 1.12 (q15) and E <= 1.5 (q31); the bound of park with the library's
// sin_cos is 0.5 + E |v| (see test_accuracy for the sweeps of that bound).
TEST(Park, SineCosineErrorVectorIsAsStated) {
  double e15 = 0;
  for (uint32_t raw = 0; raw < 65536; ++raw) {
    const auto p = rotorq::sin_cos(rotorq::turn16::from_raw(static_cast<uint16_t>(raw)));
    const double es = rotorq::test::error_sin_cos_turns(p.sin.raw(), raw, 16, 15, false);
    const double ec = rotorq::test::error_sin_cos_turns(p.cos.raw(), raw, 16, 15, true);
    e15 = std::fmax(e15, std::hypot(es, ec));
  }
  EXPECT_LE(e15, 1.12);
  double e31 = 0;
  std::mt19937_64 rng(31);
  for (int n = 0; n < 100000; ++n) {
    const auto raw = static_cast<uint32_t>(n < 1024 ? (static_cast<uint32_t>(n) << 22) : rng());
    const auto p = rotorq::sin_cos(rotorq::turn32::from_raw(raw));
    const double es = rotorq::test::error_sin_cos_turns(p.sin.raw(), raw, 32, 31, false);
    const double ec = rotorq::test::error_sin_cos_turns(p.cos.raw(), raw, 32, 31, true);
    e31 = std::fmax(e31, std::hypot(es, ec));
  }
  EXPECT_LE(e31, 1.5);
  RecordProperty("E_q15", std::to_string(e15));
  RecordProperty("E_q31", std::to_string(e31));
}

TEST(Park, IsUsableInConstantExpressions) {
  constexpr auto pair = rotorq::sin_cos(rotorq::turn16::from_raw(16384));  // 90 degrees
  constexpr rotating<q15> r = rotorq::park(stationary<q15>{q15::zero(), q15::from_raw(20000)}, pair);
  // sin(90 degrees) saturates to 32767/32768, so d = 20000 * 32767/32768 = 19999.39, rounded
  static_assert(r.d.raw() == 19999 && r.q.raw() == 0);
  SUCCEED();
}

}  // namespace
