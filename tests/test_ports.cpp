// Every port's primitive operations return exactly the generic port's values.
//
// The ports' arithmetic is checked here on the host: the portable parts directly (the 32-bit-half
// saturation, the 16 x 16 multiply decomposition of Armv6-M), the Cortex-M DSP port with its three
// instructions modelled (ROTORQ_PORT_ISA_MODEL; SSAT, QADD and QSUB as the Arm Architecture
// Reference Manual for Armv7-M defines them). The same functions run with the real instructions on
// the emulated cores through the target test vectors (tests/target).
//
// The generic definitions are themselves checked against exact arithmetic in __int128 here, so a
// port is compared with a specification, not with itself.
// NOLINTNEXTLINE(cppcoreguidelines-macro-usage): the configuration macro the port headers read
#define ROTORQ_PORT_ISA_MODEL 1

#include <gtest/gtest.h>

#include <cstdint>
#include <random>
#include <vector>

#include "rotorq/detail/ops_generic.hpp"
#include "rotorq/detail/ops_narrow.hpp"
#include "rotorq/ports/cortex_m_base.hpp"
#include "rotorq/ports/cortex_m_dsp.hpp"
#include "rotorq/ports/rv32.hpp"

namespace {

namespace generic = rotorq::detail::generic;
namespace narrow = rotorq::detail::narrow;
namespace dsp = rotorq::ports::cortex_m_dsp;
namespace base = rotorq::ports::cortex_m_base;
namespace rv32 = rotorq::ports::rv32;

using wide_int = __int128;

// Exact rules, written from the library's definition (round to nearest, ties toward +infinity, then
// saturate), in 128-bit arithmetic.
wide_int floor_div_pow2(wide_int v, int shift) { return v >> shift; }  // arithmetic shift is floor
wide_int round_pow2(wide_int v, int shift) { return floor_div_pow2(v + (wide_int{1} << (shift - 1)), shift); }
int64_t clamp_to(wide_int v, int bits) {
  const wide_int hi = (wide_int{1} << (bits - 1)) - 1;
  const wide_int lo = -(wide_int{1} << (bits - 1));
  return static_cast<int64_t>(v < lo ? lo : (v > hi ? hi : v));
}

std::vector<int32_t> edges32() {
  std::vector<int32_t> v = {INT32_MIN, INT32_MIN + 1, -1, 0, 1, INT32_MAX - 1, INT32_MAX};
  for (int k = 1; k < 31; ++k) {
    const int64_t p = int64_t{1} << k;
    for (const int64_t x : {p - 1, p, p + 1, -p - 1, -p, -p + 1}) v.push_back(static_cast<int32_t>(x));
  }
  return v;
}
std::vector<int16_t> edges16() {
  std::vector<int16_t> v = {INT16_MIN, INT16_MIN + 1, -1, 0, 1, INT16_MAX - 1, INT16_MAX};
  for (int k = 1; k < 15; ++k) {
    const int p = 1 << k;
    for (const int x : {p - 1, p, p + 1, -p - 1, -p, -p + 1}) v.push_back(static_cast<int16_t>(x));
  }
  return v;
}
// 64-bit values around the int32 and int16 limits, and around 0.
std::vector<int64_t> edges64() {
  std::vector<int64_t> v;
  for (const int64_t centre : {int64_t{0}, int64_t{INT16_MIN}, int64_t{INT16_MAX}, int64_t{INT32_MIN},
                               int64_t{INT32_MAX}, INT64_MIN + 2, INT64_MAX - 2, int64_t{1} << 32,
                               -(int64_t{1} << 32), int64_t{1} << 48, -(int64_t{1} << 48)}) {
    for (int64_t d = -2; d <= 2; ++d) v.push_back(centre + d);
  }
  return v;
}

int32_t random32(std::mt19937_64& rng) {
  return static_cast<int32_t>(static_cast<int64_t>(rng() >> 32) - 2147483648);
}
int16_t random16(std::mt19937_64& rng) {
  return static_cast<int16_t>(static_cast<int64_t>(rng() >> 48) - 32768);
}
// Values of every magnitude: a random value shifted right by 0..62 bits.
int64_t random64(std::mt19937_64& rng) {
  const auto bits = static_cast<int64_t>(rng() >> 1) - (int64_t{1} << 62);
  return bits >> (rng() % 63);
}

constexpr int random_count = 2'000'000;

TEST(GenericOps, MatchExactArithmetic) {
  // The specification itself, against exact 128-bit arithmetic: the rules in ops_generic.hpp
  // (common practice, no source: saturating and rounding fixed-point arithmetic).
  std::mt19937_64 rng(11);
  for (int i = 0; i < random_count; ++i) {
    const int32_t a = random32(rng), b = random32(rng), c = random32(rng), d = random32(rng);
    const wide_int ab = wide_int{a} * b, cd = wide_int{c} * d;
    ASSERT_EQ(generic::mul_wide(a, b), static_cast<int64_t>(ab));
    ASSERT_EQ(generic::mul_wide_u32(static_cast<uint32_t>(a), static_cast<uint32_t>(b)),
              static_cast<uint64_t>(static_cast<unsigned __int128>(static_cast<uint32_t>(a)) *
                                    static_cast<uint32_t>(b)));
    ASSERT_EQ(generic::mul_q31(a, b), clamp_to(round_pow2(ab, 31), 32));
    ASSERT_EQ(generic::sum_of_products_q31(a, b, c, d), clamp_to(round_pow2(ab + cd, 31), 32));
    ASSERT_EQ(generic::difference_of_products_q31(a, b, c, d), clamp_to(round_pow2(ab - cd, 31), 32));
    ASSERT_EQ(generic::add32(a, b), clamp_to(wide_int{a} + b, 32));
    ASSERT_EQ(generic::sub32(a, b), clamp_to(wide_int{a} - b, 32));
    const int16_t p = random16(rng), q = random16(rng), r = random16(rng), s = random16(rng);
    const wide_int pq = wide_int{p} * q, rs = wide_int{r} * s;
    ASSERT_EQ(generic::mul_q15(p, q), clamp_to(round_pow2(pq, 15), 16));
    ASSERT_EQ(generic::sum_of_products_q15(p, q, r, s), clamp_to(round_pow2(pq + rs, 15), 16));
    ASSERT_EQ(generic::difference_of_products_q15(p, q, r, s), clamp_to(round_pow2(pq - rs, 15), 16));
    const int64_t w = random64(rng);
    ASSERT_EQ(generic::sat32(w), clamp_to(w, 32));
    ASSERT_EQ(generic::sat16_wide(w), clamp_to(w, 16));
  }
  // The corners that overflow a naive sum: all operands -1.
  EXPECT_EQ(generic::sum_of_products_q31(INT32_MIN, INT32_MIN, INT32_MIN, INT32_MIN), INT32_MAX);
  EXPECT_EQ(generic::sum_of_products_q15(INT16_MIN, INT16_MIN, INT16_MIN, INT16_MIN), INT16_MAX);
}

// Compares the primitives of one port with the generic ones on edge values (every combination) and
// on random values.
template <typename Port>
void expect_port_matches_generic() {
  const std::vector<int32_t> e32 = edges32();
  const std::vector<int16_t> e16 = edges16();
  int failures = 0;
  const auto check = [&failures](bool ok, const char* what, int64_t x, int64_t y) {
    if (!ok && ++failures <= 10) ADD_FAILURE() << what << " differs for " << x << ", " << y;
  };
  for (const int32_t a : e32) {
    for (const int32_t b : e32) {
      check(Port::mul_wide(a, b) == generic::mul_wide(a, b), "mul_wide", a, b);
      check(Port::mul_wide_by_constant(a, b) == generic::mul_wide(a, b), "mul_wide_by_constant", a, b);
      check(Port::mul_wide_u32(static_cast<uint32_t>(a), static_cast<uint32_t>(b)) ==
                generic::mul_wide_u32(static_cast<uint32_t>(a), static_cast<uint32_t>(b)),
            "mul_wide_u32", a, b);
      check(Port::mul_q31(a, b) == generic::mul_q31(a, b), "mul_q31", a, b);
      check(Port::add32(a, b) == generic::add32(a, b), "add32", a, b);
      check(Port::sub32(a, b) == generic::sub32(a, b), "sub32", a, b);
      for (const int32_t c : {INT32_MIN, -1, 0, 1, INT32_MAX, a, b}) {
        for (const int32_t d : {INT32_MIN, INT32_MIN + 1, 0, INT32_MAX, a, b}) {
          check(Port::sum_of_products_q31(a, b, c, d) == generic::sum_of_products_q31(a, b, c, d),
                "sum_of_products_q31", a, b);
          check(
              Port::difference_of_products_q31(a, b, c, d) == generic::difference_of_products_q31(a, b, c, d),
              "difference_of_products_q31", a, b);
        }
      }
    }
  }
  for (const int16_t a : e16) {
    for (const int16_t b : e16) {
      for (const int16_t c : e16) {
        for (const int16_t d : std::vector<int16_t>{INT16_MIN, INT16_MIN + 1, 0, INT16_MAX, a, b}) {
          check(Port::sum_of_products_q15(a, b, c, d) == generic::sum_of_products_q15(a, b, c, d),
                "sum_of_products_q15", a, b);
          check(
              Port::difference_of_products_q15(a, b, c, d) == generic::difference_of_products_q15(a, b, c, d),
              "difference_of_products_q15", a, b);
        }
      }
    }
  }
  // q15 two-operand operations: every a against edge and random b.
  std::mt19937_64 rng(5);
  std::vector<int16_t> others = e16;
  for (int i = 0; i < 200; ++i) others.push_back(random16(rng));
  for (int a = INT16_MIN; a <= INT16_MAX; ++a) {
    const auto x = static_cast<int16_t>(a);
    for (const int16_t y : others) {
      check(Port::mul_q15(x, y) == generic::mul_q15(x, y), "mul_q15", x, y);
      check(Port::add16(x, y) == generic::add16(x, y), "add16", x, y);
      check(Port::sub16(x, y) == generic::sub16(x, y), "sub16", x, y);
    }
  }
  // Saturation: every int32 near the int16 limits, and wide values of every magnitude.
  for (int32_t v = -70000; v <= 70000; ++v) check(Port::sat16(v) == generic::sat16(v), "sat16", v, 0);
  for (const int32_t v : e32) check(Port::sat16(v) == generic::sat16(v), "sat16", v, 0);
  for (const int64_t v : edges64()) {
    check(Port::sat32(v) == generic::sat32(v), "sat32", v, 0);
    check(Port::sat16_wide(v) == generic::sat16_wide(v), "sat16_wide", v, 0);
  }
  for (int i = 0; i < random_count; ++i) {
    const int32_t a = random32(rng), b = random32(rng), c = random32(rng), d = random32(rng);
    check(Port::mul_wide(a, b) == generic::mul_wide(a, b), "mul_wide", a, b);
    check(Port::mul_wide_u32(static_cast<uint32_t>(c), static_cast<uint32_t>(d)) ==
              generic::mul_wide_u32(static_cast<uint32_t>(c), static_cast<uint32_t>(d)),
          "mul_wide_u32", c, d);
    check(Port::mul_q31(a, b) == generic::mul_q31(a, b), "mul_q31", a, b);
    check(Port::add32(a, b) == generic::add32(a, b), "add32", a, b);
    check(Port::sub32(a, b) == generic::sub32(a, b), "sub32", a, b);
    check(Port::sum_of_products_q31(a, b, c, d) == generic::sum_of_products_q31(a, b, c, d),
          "sum_of_products_q31", a, b);
    check(Port::difference_of_products_q31(a, b, c, d) == generic::difference_of_products_q31(a, b, c, d),
          "difference_of_products_q31", a, b);
    const int16_t p = random16(rng), q = random16(rng), r = random16(rng), s = random16(rng);
    check(Port::sum_of_products_q15(p, q, r, s) == generic::sum_of_products_q15(p, q, r, s),
          "sum_of_products_q15", p, q);
    check(Port::difference_of_products_q15(p, q, r, s) == generic::difference_of_products_q15(p, q, r, s),
          "difference_of_products_q15", p, q);
    const int64_t w = random64(rng);
    check(Port::sat32(w) == generic::sat32(w), "sat32", w, 0);
    check(Port::sat16_wide(w) == generic::sat16_wide(w), "sat16_wide", w, 0);
    check(Port::sat16(a) == generic::sat16(a), "sat16", a, 0);
  }
  EXPECT_EQ(failures, 0);
}

// Adapters: a port namespace as a type, so one template checks them all.
// NOLINTNEXTLINE(cppcoreguidelines-macro-usage): a namespace cannot be a template argument
#define ROTORQ_PORT_ADAPTER(name, ns)                                                                    \
  struct name {                                                                                          \
    static int16_t sat16(int32_t v) { return ns::sat16(v); }                                             \
    static int16_t sat16_wide(int64_t v) { return ns::sat16_wide(v); }                                   \
    static int32_t sat32(int64_t v) { return ns::sat32(v); }                                             \
    static int16_t add16(int16_t a, int16_t b) { return ns::add16(a, b); }                               \
    static int16_t sub16(int16_t a, int16_t b) { return ns::sub16(a, b); }                               \
    static int32_t add32(int32_t a, int32_t b) { return ns::add32(a, b); }                               \
    static int32_t sub32(int32_t a, int32_t b) { return ns::sub32(a, b); }                               \
    static int64_t mul_wide(int32_t a, int32_t b) { return ns::mul_wide(a, b); }                         \
    static int64_t mul_wide_by_constant(int32_t a, int32_t b) { return ns::mul_wide_by_constant(a, b); } \
    static uint64_t mul_wide_u32(uint32_t a, uint32_t b) { return ns::mul_wide_u32(a, b); }              \
    static int16_t mul_q15(int16_t a, int16_t b) { return ns::mul_q15(a, b); }                           \
    static int32_t mul_q31(int32_t a, int32_t b) { return ns::mul_q31(a, b); }                           \
    static int16_t sum_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) {                     \
      return ns::sum_of_products_q15(a, b, c, d);                                                        \
    }                                                                                                    \
    static int16_t difference_of_products_q15(int16_t a, int16_t b, int16_t c, int16_t d) {              \
      return ns::difference_of_products_q15(a, b, c, d);                                                 \
    }                                                                                                    \
    static int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) {                     \
      return ns::sum_of_products_q31(a, b, c, d);                                                        \
    }                                                                                                    \
    static int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) {              \
      return ns::difference_of_products_q31(a, b, c, d);                                                 \
    }                                                                                                    \
  }

ROTORQ_PORT_ADAPTER(dsp_port, dsp);
ROTORQ_PORT_ADAPTER(base_port, base);
ROTORQ_PORT_ADAPTER(rv32_port, rv32);

// The Armv6-M build of cortex_m_base: its 32 x 32 -> 64 product is the 16 x 16 decomposition.
struct armv6m_port : base_port {
  static int64_t mul_wide(int32_t a, int32_t b) { return narrow::mul_wide_16x16(a, b); }
  static uint64_t mul_wide_u32(uint32_t a, uint32_t b) { return narrow::mul_wide_u32_16x16(a, b); }
  static int32_t mul_q31(int32_t a, int32_t b) { return narrow::mul_q31<narrow::mul_wide_16x16>(a, b); }
  static int32_t sum_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) {
    return narrow::sum_of_products_q31<narrow::mul_wide_16x16>(a, b, c, d);
  }
  static int32_t difference_of_products_q31(int32_t a, int32_t b, int32_t c, int32_t d) {
    return narrow::difference_of_products_q31<narrow::mul_wide_16x16>(a, b, c, d);
  }
};

TEST(Ports, CortexMDspMatchesGeneric) { expect_port_matches_generic<dsp_port>(); }
TEST(Ports, CortexMBaseMatchesGeneric) { expect_port_matches_generic<base_port>(); }
TEST(Ports, CortexMBaseArmv6mMatchesGeneric) { expect_port_matches_generic<armv6m_port>(); }
TEST(Ports, Rv32MatchesGeneric) { expect_port_matches_generic<rv32_port>(); }

TEST(Ports, Armv6mProductIsExactForEveryEdgePair) {
  // The decomposition against 128-bit arithmetic, including the corners where a partial product is
  // largest (ah = -2^15 with bl = 2^16 - 1).
  for (const int32_t a : edges32()) {
    for (const int32_t b : edges32()) {
      ASSERT_EQ(narrow::mul_wide_16x16(a, b), static_cast<int64_t>(wide_int{a} * b)) << a << " * " << b;
    }
  }
  for (const int32_t a : edges32()) {
    for (const int32_t b : edges32()) {
      const auto ua = static_cast<uint32_t>(a), ub = static_cast<uint32_t>(b);
      ASSERT_EQ(narrow::mul_wide_u32_16x16(ua, ub),
                static_cast<uint64_t>(static_cast<unsigned __int128>(ua) * ub))
          << ua << " * " << ub;
    }
  }
  ASSERT_EQ(narrow::mul_wide_16x16(INT32_MIN, 0x0000ffff),
            static_cast<int64_t>(wide_int{INT32_MIN} * 0xffff));
}

}  // namespace
