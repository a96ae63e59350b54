// Tests for rotorq/fixed.hpp: q15 and q31 arithmetic checked against exact integer references.
//
// Every expected value is computed here from the contract in fixed.hpp, without rotorq::detail: sums
// and products exactly in int64_t, rounding by floor division with an explicit remainder test (not
// by an arithmetic shift, as the library does), saturation by std::clamp. q15 is swept exhaustively
// in its first operand; q31 gets its edge values against each other plus seeded random pairs.
#include "rotorq/fixed.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <iomanip>
#include <limits>
#include <random>
#include <sstream>
#include <string>
#include <type_traits>
#include <vector>

#include "test_support.hpp"

namespace {

using rotorq::q15;
using rotorq::q31;

static_assert(std::is_same_v<q15::raw_type, int16_t>);
static_assert(std::is_same_v<q31::raw_type, int32_t>);

// Random inputs come from fixed seeds. The output of std::mt19937_64 is fixed by the C++ standard but
// the std distributions are not, so values are cut from the raw bits: the same seed gives the same
// inputs with every standard library.
constexpr uint64_t seed_operands = 0x5eed0001;
constexpr uint64_t seed_q31_pairs = 0x5eed0002;
constexpr uint64_t seed_q31_ties = 0x5eed0003;
constexpr uint64_t seed_q31_unary = 0x5eed0004;
constexpr uint64_t seed_low_halves = 0x5eed0005;
constexpr uint64_t seed_addends = 0x5eed0006;

constexpr int random_q31_pairs = 1'000'000;

using rotorq::test::edge_values;
using rotorq::test::from_wide;
using rotorq::test::max_reported;
using rotorq::test::random_value;
using rotorq::test::raw_hex;
using rotorq::test::raw_hi;
using rotorq::test::raw_lo;
using rotorq::test::saturated;

// floor(n / d) for d > 0: C++ division truncates toward zero, so step down when a negative n leaves
// a remainder.
int64_t floor_div(int64_t n, int64_t d) {
  const int64_t quotient = n / d;
  return (n % d != 0 && n < 0) ? quotient - 1 : quotient;
}

// n / 2^f rounded to nearest, ties toward +infinity. Written as quotient and remainder: with
// q = floor(n / 2^f) and r = n - q 2^f in [0, 2^f), the result is q + 1 exactly when r >= 2^f / 2.
// (Ties toward +infinity is the rule of a rounding multiply-high instruction: common practice, no
// source.)
int64_t round_ties_up(int64_t n, int f) {
  const int64_t step = int64_t{1} << f;
  const int64_t quotient = floor_div(n, step);
  const int64_t remainder = n - quotient * step;
  return 2 * remainder >= step ? quotient + 1 : quotient;
}

// The second operand of the q15 sweeps: every edge value and random ones, 320 distinct values.
const std::vector<q15>& q15_operands() {
  static const std::vector<q15> table = [] {
    std::vector<q15> values = edge_values<q15>();
    std::mt19937_64 rng(seed_operands);
    while (values.size() < 320) {
      const q15 v = random_value<q15>(rng);
      if (std::find(values.begin(), values.end(), v) == values.end()) values.push_back(v);
    }
    return values;
  }();
  return table;
}

q15 q15_at(int32_t raw) { return from_wide<q15>(raw); }

// ---------------------------------------------------------------------------------------------------
// Raw access, constants, saturate

TEST(Fixed, ConstantsAndRawAccess) {
  EXPECT_EQ(q15::fraction_bits, 15);
  EXPECT_EQ(q31::fraction_bits, 31);
  EXPECT_EQ(q15::max().raw(), 32767);
  EXPECT_EQ(q15::min().raw(), -32768);
  EXPECT_EQ(q15::zero().raw(), 0);
  EXPECT_EQ(q15{}.raw(), 0);
  EXPECT_EQ(q31::max().raw(), 2147483647);
  EXPECT_EQ(q31::min().raw(), -2147483647 - 1);
  EXPECT_EQ(q31::zero().raw(), 0);
  EXPECT_EQ(q31{}.raw(), 0);
  for (int32_t raw = -32768; raw <= 32767; ++raw) {
    ASSERT_EQ(int32_t{q15_at(raw).raw()}, raw) << raw_hex(raw, 16);
  }
}

TEST(Fixed, SaturateClampsAnyInt64) {
  const int64_t int64_lo = std::numeric_limits<int64_t>::min();
  const int64_t int64_hi = std::numeric_limits<int64_t>::max();
  const int64_t inputs[] = {int64_lo,
                            int64_lo + 1,
                            -(int64_t{1} << 40),
                            -2147483649,
                            -2147483648,
                            -2147483647,
                            -32769,
                            -32768,
                            -32767,
                            -1,
                            0,
                            1,
                            32766,
                            32767,
                            32768,
                            2147483646,
                            2147483647,
                            2147483648,
                            int64_hi - 1,
                            int64_hi};
  for (const int64_t wide : inputs) {
    EXPECT_EQ(int64_t{q15::saturate(wide).raw()}, saturated<q15>(wide)) << "q15::saturate of " << wide;
    EXPECT_EQ(int64_t{q31::saturate(wide).raw()}, saturated<q31>(wide)) << "q31::saturate of " << wide;
  }
}

TEST(Fixed, ComparisonsFollowRawOrder) {
  int failures = 0;
  for (const q15 b : q15_operands()) {
    for (int32_t a_raw = -32768; a_raw <= 32767; ++a_raw) {
      const q15 a = q15_at(a_raw);
      const int32_t x = a.raw(), y = b.raw();
      const bool ok = (a == b) == (x == y) && (a != b) == (x != y) && (a < b) == (x < y) &&
                      (a <= b) == (x <= y) && (a > b) == (x > y) && (a >= b) == (x >= y);
      if (ok) continue;
      EXPECT_TRUE(ok) << "comparison of a = " << raw_hex(a) << " with b = " << raw_hex(b);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
}

// ---------------------------------------------------------------------------------------------------
// Hand-worked cases from the contract in fixed.hpp (each expected raw value worked out by hand).

struct named_case {
  const char* what;
  int64_t a, b, c;  // raw inputs; c only for mul_add
  int64_t expected;
};

template <typename Q>
void check_named_binary(const named_case& t, char op) {
  const Q a = from_wide<Q>(t.a), b = from_wide<Q>(t.b), c = from_wide<Q>(t.c);
  Q actual;
  switch (op) {
    case '+':
      actual = a + b;
      break;
    case '-':
      actual = a - b;
      break;
    case '*':
      actual = a * b;
      break;
    default:
      actual = rotorq::mul_add(a, b, c);
      break;
  }
  EXPECT_EQ(raw_hex(actual), raw_hex(t.expected, Q::fraction_bits + 1))
      << t.what << ": a = " << raw_hex(a) << ", b = " << raw_hex(b) << ", c = " << raw_hex(c);
}

TEST(Fixed, HandWorkedQ15Cases) {
  const named_case sums[] = {
      {"min + min saturates", -32768, -32768, 0, -32768},
      {"max + max saturates", 32767, 32767, 0, 32767},
      {"max + 1 saturates", 32767, 1, 0, 32767},
      {"min + max", -32768, 32767, 0, -1},
      {"0.5 + 0.5 saturates", 16384, 16384, 0, 32767},
      {"-0.5 + -0.5 is exactly -1", -16384, -16384, 0, -32768},
  };
  for (const named_case& t : sums) check_named_binary<q15>(t, '+');
  const named_case differences[] = {
      {"min - 1 saturates", -32768, 1, 0, -32768},
      {"max - min saturates", 32767, -32768, 0, 32767},
      {"min - max saturates", -32768, 32767, 0, -32768},
      {"0 - min saturates", 0, -32768, 0, 32767},
      {"-1 - 0 stays", -1, 0, 0, -1},
  };
  for (const named_case& t : differences) check_named_binary<q15>(t, '-');
  const named_case products[] = {
      {"-1 * -1 gives max", -32768, -32768, 0, 32767},
      {"0.5 * 0.5 = 0.25", 16384, 16384, 0, 8192},
      {"max * max = 32766.00003 steps", 32767, 32767, 0, 32766},
      {"min * max = -32767 steps exactly", -32768, 32767, 0, -32767},
      {"min * 1 step = -1 step exactly", -32768, 1, 0, -1},
      {"1 step * 0.5 = 0.5 step, tie up", 1, 16384, 0, 1},
      {"-1 step * 0.5 = -0.5 step, tie up to 0", -1, 16384, 0, 0},
      {"3 steps * 0.5 = 1.5 steps, tie up", 3, 16384, 0, 2},
      {"-3 steps * 0.5 = -1.5 steps, tie up", -3, 16384, 0, -1},
      {"1 step * 1 step = 2^-15 step, rounds to 0", 1, 1, 0, 0},
      {"-1 step * 1 step rounds to 0", -1, 1, 0, 0},
      {"-1 step * -1 step rounds to 0", -1, -1, 0, 0},
  };
  for (const named_case& t : products) check_named_binary<q15>(t, '*');
}

TEST(Fixed, HandWorkedQ31Cases) {
  const int64_t lo = -2147483648, hi = 2147483647, half = 1073741824;
  const named_case sums[] = {{"min + min saturates", lo, lo, 0, lo},
                             {"max + max saturates", hi, hi, 0, hi},
                             {"min + max", lo, hi, 0, -1},
                             {"max + 1 step saturates", hi, 1, 0, hi}};
  for (const named_case& t : sums) check_named_binary<q31>(t, '+');
  const named_case differences[] = {{"max - min saturates", hi, lo, 0, hi},
                                    {"min - max saturates", lo, hi, 0, lo},
                                    {"0 - min saturates", 0, lo, 0, hi}};
  for (const named_case& t : differences) check_named_binary<q31>(t, '-');
  const named_case products[] = {
      {"-1 * -1 gives max", lo, lo, 0, hi},
      {"0.5 * 0.5 = 0.25", half, half, 0, half / 2},
      {"max * max = (2^31 - 2) + 2^-31 steps", hi, hi, 0, hi - 1},
      {"min * max = -(2^31 - 1) steps exactly", lo, hi, 0, -hi},
      {"1 step * 0.5 = 0.5 step, tie up", 1, half, 0, 1},
      {"-1 step * 0.5 = -0.5 step, tie up to 0", -1, half, 0, 0},
      {"-3 steps * 0.5 = -1.5 steps, tie up", -3, half, 0, -1},
  };
  for (const named_case& t : products) check_named_binary<q31>(t, '*');
}

// ---------------------------------------------------------------------------------------------------
// mul_add rounds once, at the end.
//
// c lies on the result grid, so rounding a * b first and then adding c gives the same value as
// rounding a * b + c, except where the intermediate a * b saturates: that happens for -1 * -1 alone
// (the exact 1 becomes max). The cases below are chosen so that the two-step evaluation (a * b) + c
// gives a different raw value from the single rounding.

template <typename Q>
void check_mul_add_single_rounding() {
  const int64_t lo = raw_lo<Q>, hi = raw_hi<Q>, half = int64_t{1} << (Q::fraction_bits - 1);
  const named_case cases[] = {
      {"-1 * -1 - 0.5 = 0.5 (two steps: 0.5 - 1 step)", lo, lo, -half, half},
      {"-1 * -1 - 1 = 0 (two steps: -1 step)", lo, lo, lo, 0},
      {"-1 * -1 + (-1 + 1 step) = 1 step (two steps: 0)", lo, lo, lo + 1, 1},
      {"-1 * -1 - 1 step = max (two steps: max - 1 step)", lo, lo, -1, hi},
  };
  for (const named_case& t : cases) {
    check_named_binary<Q>(t, 'm');
    const Q two_steps = from_wide<Q>(t.a) * from_wide<Q>(t.b) + from_wide<Q>(t.c);
    EXPECT_NE(two_steps.raw(), t.expected) << t.what << ": the case no longer tells the orders apart";
  }
  // Ties of the final sum round up once: 0.5 step products plus c.
  const named_case ties[] = {
      {"1 step * 0.5 + 0 = 0.5 step, up", 1, half, 0, 1},
      {"-1 step * 0.5 + 0 = -0.5 step, up", -1, half, 0, 0},
      {"-1 step * 0.5 + 1 step = 0.5 step, up", -1, half, 1, 1},
      {"-1 step * 0.5 + min = min - 0.5 step, up to min", -1, half, lo, lo},
      {"1 step * 0.5 + max = max + 0.5 step, saturates", 1, half, hi, hi},
  };
  for (const named_case& t : ties) check_named_binary<Q>(t, 'm');
}

TEST(MulAdd, RoundsOnceQ15) { check_mul_add_single_rounding<q15>(); }
TEST(MulAdd, RoundsOnceQ31) { check_mul_add_single_rounding<q31>(); }

// ---------------------------------------------------------------------------------------------------
// q15 sweeps: every a against the operand table.

// op(a, b) against saturated(exact(a, b)), where exact gives the result in raw steps before saturation.
template <typename Op, typename Exact>
void sweep_q15_binary(const char* name, Op op, Exact exact) {
  int failures = 0;
  for (const q15 b : q15_operands()) {
    for (int32_t a_raw = -32768; a_raw <= 32767; ++a_raw) {
      const q15 a = q15_at(a_raw);
      const int64_t expected = saturated<q15>(exact(int64_t{a.raw()}, int64_t{b.raw()}));
      const q15 actual = op(a, b);
      if (actual.raw() == expected) continue;
      EXPECT_EQ(raw_hex(actual), raw_hex(expected, 16))
          << name << " with a = " << raw_hex(a) << ", b = " << raw_hex(b);
      ASSERT_LT(++failures, max_reported)
          << "stopping " << name << " after " << max_reported << " mismatches";
    }
  }
}

TEST(Q15Sweep, Add) {
  sweep_q15_binary(
      "a + b", [](q15 a, q15 b) { return a + b; }, [](int64_t a, int64_t b) { return a + b; });
}
TEST(Q15Sweep, Subtract) {
  sweep_q15_binary(
      "a - b", [](q15 a, q15 b) { return a - b; }, [](int64_t a, int64_t b) { return a - b; });
}
TEST(Q15Sweep, Multiply) {
  sweep_q15_binary(
      "a * b", [](q15 a, q15 b) { return a * b; },
      [](int64_t a, int64_t b) { return round_ties_up(a * b, 15); });
}
TEST(Q15Sweep, CompoundAssignment) {
  sweep_q15_binary(
      "a += b", [](q15 a, q15 b) { return a += b; }, [](int64_t a, int64_t b) { return a + b; });
  sweep_q15_binary(
      "a -= b", [](q15 a, q15 b) { return a -= b; }, [](int64_t a, int64_t b) { return a - b; });
  sweep_q15_binary(
      "a *= b", [](q15 a, q15 b) { return a *= b; },
      [](int64_t a, int64_t b) { return round_ties_up(a * b, 15); });
}

// A second, independent rounding reference in floating point: every q15 product p is an integer with
// |p| <= 2^30, so p / 2^15 + 1/2 needs at most 32 significant bits, is exact in double, and std::floor
// of it is the rounded product.
TEST(Q15Sweep, MultiplyAgainstDouble) {
  int failures = 0;
  for (const q15 b : q15_operands()) {
    for (int32_t a_raw = -32768; a_raw <= 32767; ++a_raw) {
      const q15 a = q15_at(a_raw);
      const double p = static_cast<double>(int32_t{a.raw()} * int32_t{b.raw()});
      const int64_t expected = saturated<q15>(static_cast<int64_t>(std::floor(p / 32768.0 + 0.5)));
      const q15 actual = a * b;
      if (actual.raw() == expected) continue;
      EXPECT_EQ(raw_hex(actual), raw_hex(expected, 16))
          << "a * b with a = " << raw_hex(a) << ", b = " << raw_hex(b);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
}

TEST(Q15Sweep, MulAdd) {
  const std::vector<q15>& operands = q15_operands();
  const size_t n = operands.size();
  int failures = 0;
  for (size_t j = 0; j < n; ++j) {
    const q15 b = operands[j];
    for (int32_t a_raw = -32768; a_raw <= 32767; ++a_raw) {
      const q15 a = q15_at(a_raw);
      // c walks through the whole operand table as a and b change.
      const q15 c = operands[(static_cast<size_t>(a_raw + 32768) + 131 * j) % n];
      const int64_t exact = int64_t{a.raw()} * b.raw() + int64_t{c.raw()} * 32768;
      const int64_t expected = saturated<q15>(round_ties_up(exact, 15));
      const q15 actual = rotorq::mul_add(a, b, c);
      if (actual.raw() == expected) continue;
      EXPECT_EQ(raw_hex(actual), raw_hex(expected, 16))
          << "mul_add with a = " << raw_hex(a) << ", b = " << raw_hex(b) << ", c = " << raw_hex(c);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
}

// Unary operations and the widening conversion, for all 65536 values.
TEST(Q15Sweep, UnaryAndWidening) {
  int failures = 0;
  for (int32_t raw = -32768; raw <= 32767; ++raw) {
    const q15 a = q15_at(raw);
    const struct {
      const char* name;
      int64_t actual, expected;
      int bits;
    } results[] = {
        {"-a", (-a).raw(), saturated<q15>(-int64_t{raw}), 16},
        {"abs(a)", rotorq::abs(a).raw(), saturated<q15>(raw < 0 ? -int64_t{raw} : int64_t{raw}), 16},
        {"to_q31(a)", rotorq::to_q31(a).raw(), int64_t{raw} * 65536, 32},
        {"to_q15(to_q31(a))", rotorq::to_q15(rotorq::to_q31(a)).raw(), raw, 16},
    };
    for (const auto& r : results) {
      if (r.actual == r.expected) continue;
      EXPECT_EQ(raw_hex(r.actual, r.bits), raw_hex(r.expected, r.bits))
          << r.name << " with a = " << raw_hex(a);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
  EXPECT_EQ((-q15::min()).raw(), 32767) << "-(-1) gives max";
  EXPECT_EQ(rotorq::abs(q15::min()).raw(), 32767) << "abs(-1) gives max";
}

// ---------------------------------------------------------------------------------------------------
// q31 sweeps: edges against edges, then seeded random pairs, then pairs whose exact product is a
// tie (odd multiples of 2^30) or next to one.

// Calls check(a, b) on every pair; check returns false once it has reported enough mismatches.
template <typename Check>
void for_q31_pairs(Check check) {
  const std::vector<q31> edges = edge_values<q31>();
  for (const q31 a : edges) {
    for (const q31 b : edges) {
      ASSERT_TRUE(check(a, b)) << "stopping after " << max_reported << " mismatches";
    }
  }
  std::mt19937_64 rng(seed_q31_pairs);
  for (int i = 0; i < random_q31_pairs; ++i) {
    const q31 a = random_value<q31>(rng);
    const q31 b = random_value<q31>(rng);
    ASSERT_TRUE(check(a, b)) << "stopping after " << max_reported << " mismatches";
  }
  // x 2^15 times y 2^15 is x y 2^30: a tie whenever x and y are odd; b +- 1 step sits next to it.
  std::mt19937_64 tie_rng(seed_q31_ties);
  for (int i = 0; i < 100'000; ++i) {
    const int64_t x = (static_cast<int64_t>(tie_rng() >> 48) - 32768) | 1;
    const int64_t y = (static_cast<int64_t>(tie_rng() >> 48) - 32768) | 1;
    const q31 a = from_wide<q31>(x * 32768);
    for (const int64_t offset : {-1, 0, 1}) {
      ASSERT_TRUE(check(a, from_wide<q31>(y * 32768 + offset)))
          << "stopping after " << max_reported << " mismatches";
    }
  }
}

template <typename Op, typename Exact>
void sweep_q31_binary(const char* name, Op op, Exact exact) {
  int failures = 0;
  for_q31_pairs([&](q31 a, q31 b) {
    const int64_t expected = saturated<q31>(exact(int64_t{a.raw()}, int64_t{b.raw()}));
    const q31 actual = op(a, b);
    if (actual.raw() == expected) return true;
    EXPECT_EQ(raw_hex(actual), raw_hex(expected, 32))
        << name << " with a = " << raw_hex(a) << ", b = " << raw_hex(b);
    return ++failures < max_reported;
  });
}

TEST(Q31Sweep, Add) {
  sweep_q31_binary(
      "a + b", [](q31 a, q31 b) { return a + b; }, [](int64_t a, int64_t b) { return a + b; });
}
TEST(Q31Sweep, Subtract) {
  sweep_q31_binary(
      "a - b", [](q31 a, q31 b) { return a - b; }, [](int64_t a, int64_t b) { return a - b; });
}
// |a b| <= 2^62, so the exact product fits int64_t.
TEST(Q31Sweep, Multiply) {
  sweep_q31_binary(
      "a * b", [](q31 a, q31 b) { return a * b; },
      [](int64_t a, int64_t b) { return round_ties_up(a * b, 31); });
}
TEST(Q31Sweep, CompoundAssignment) {
  sweep_q31_binary(
      "a += b", [](q31 a, q31 b) { return a += b; }, [](int64_t a, int64_t b) { return a + b; });
  sweep_q31_binary(
      "a -= b", [](q31 a, q31 b) { return a -= b; }, [](int64_t a, int64_t b) { return a - b; });
  sweep_q31_binary(
      "a *= b", [](q31 a, q31 b) { return a *= b; },
      [](int64_t a, int64_t b) { return round_ties_up(a * b, 31); });
}

// a b + c 2^31 lies in [-2^63 + 2^31, 2^63 - 2^31], so the exact value fits int64_t.
int64_t exact_mul_add_q31(q31 a, q31 b, q31 c) {
  return int64_t{a.raw()} * b.raw() + int64_t{c.raw()} * 2147483648;
}

TEST(Q31Sweep, MulAdd) {
  // c runs through the edge values and a few random ones, changing with every pair.
  std::vector<q31> addends = edge_values<q31>();
  std::mt19937_64 rng(seed_addends);
  for (int i = 0; i < 64; ++i) addends.push_back(random_value<q31>(rng));
  size_t next = 0;
  int failures = 0;
  for_q31_pairs([&](q31 a, q31 b) {
    const q31 c = addends[next++ % addends.size()];
    const int64_t expected = saturated<q31>(round_ties_up(exact_mul_add_q31(a, b, c), 31));
    const q31 actual = rotorq::mul_add(a, b, c);
    if (actual.raw() == expected) return true;
    EXPECT_EQ(raw_hex(actual), raw_hex(expected, 32))
        << "mul_add with a = " << raw_hex(a) << ", b = " << raw_hex(b) << ", c = " << raw_hex(c);
    return ++failures < max_reported;
  });
}

// The extreme exact sums of mul_add: a b + c 2^31 at both ends of its range.
TEST(Q31Sweep, MulAddExtremes) {
  const std::vector<q31> edges = edge_values<q31>();
  int failures = 0;
  for (const q31 a : edges) {
    for (const q31 b : edges) {
      for (const q31 c : {q31::min(), q31::max(), q31::zero(), from_wide<q31>(-1), from_wide<q31>(1)}) {
        const int64_t expected = saturated<q31>(round_ties_up(exact_mul_add_q31(a, b, c), 31));
        const q31 actual = rotorq::mul_add(a, b, c);
        if (actual.raw() == expected) continue;
        EXPECT_EQ(raw_hex(actual), raw_hex(expected, 32))
            << "mul_add with a = " << raw_hex(a) << ", b = " << raw_hex(b) << ", c = " << raw_hex(c);
        ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
      }
    }
  }
}

TEST(Q31Sweep, Unary) {
  std::vector<q31> values = edge_values<q31>();
  std::mt19937_64 rng(seed_q31_unary);
  for (int i = 0; i < random_q31_pairs; ++i) values.push_back(random_value<q31>(rng));
  int failures = 0;
  for (const q31 a : values) {
    const int64_t raw = a.raw();
    const int64_t magnitude = raw < 0 ? -raw : raw;
    const int64_t neg = (-a).raw(), absolute = rotorq::abs(a).raw();
    if (neg == saturated<q31>(-raw) && absolute == saturated<q31>(magnitude)) continue;
    EXPECT_EQ(raw_hex(neg, 32), raw_hex(saturated<q31>(-raw), 32)) << "-a with a = " << raw_hex(a);
    EXPECT_EQ(raw_hex(absolute, 32), raw_hex(saturated<q31>(magnitude), 32))
        << "abs(a) with a = " << raw_hex(a);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
  EXPECT_EQ((-q31::min()).raw(), 2147483647) << "-(-1) gives max";
  EXPECT_EQ(rotorq::abs(q31::min()).raw(), 2147483647) << "abs(-1) gives max";
}

// ---------------------------------------------------------------------------------------------------
// Everything is constexpr: spot checks at compile time (values worked by hand).

static_assert((q15::min() * q15::min()) == q15::max());
static_assert((-q31::min()) == q31::max());
static_assert(rotorq::abs(q15::min()) == q15::max());
static_assert((q15::from_raw(1) * q15::from_raw(16384)).raw() == 1);
static_assert((q15::from_raw(-1) * q15::from_raw(16384)).raw() == 0);
static_assert(rotorq::mul_add(q31::min(), q31::min(), q31::from_raw(-1073741824)).raw() == 1073741824);
static_assert(rotorq::to_q31(q15::min()) == q31::min());
static_assert(rotorq::to_q15(q31::from_raw(0x8000)).raw() == 1);
static_assert(rotorq::to_q15(q31::from_raw(-0x8000)).raw() == 0);

// ---------------------------------------------------------------------------------------------------
// q31 -> q15 narrowing. Kept last in the file: should the conversion ever overflow inside, a
// sanitizer build stops at the first bad input, and every other test has run by then.

// Every upper half with low halves at the rounding edges (0, 1, just below, at and above the tie,
// 0xffff) and a few random ones: 65536 x 16 inputs.
TEST(Q31ToQ15, AllUpperHalvesWithEdgeLowHalves) {
  std::vector<int64_t> low_halves = {0, 1, 0x3fff, 0x7ffe, 0x7fff, 0x8000, 0x8001, 0xfffe, 0xffff};
  std::mt19937_64 rng(seed_low_halves);
  while (low_halves.size() < 16) low_halves.push_back(static_cast<int64_t>(rng() >> 48));
  int failures = 0;
  for (int64_t high = -32768; high <= 32767; ++high) {
    for (const int64_t low : low_halves) {
      const int64_t raw = high * 65536 + low;
      const q31 x = from_wide<q31>(raw);
      const int64_t expected = saturated<q15>(round_ties_up(raw, 16));
      const q15 actual = rotorq::to_q15(x);
      if (actual.raw() == expected) continue;
      EXPECT_EQ(raw_hex(actual), raw_hex(expected, 16)) << "to_q15 of " << raw_hex(x);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
}

// The top of the range: 0x7fff7fff rounds down to max, and from the tie 0x7fff8000 up the rounding
// carries past max and saturates to it (worked by hand).
TEST(Q31ToQ15, TopOfRangeSaturatesToMax) {
  for (const int64_t raw : {0x7fff7fff, 0x7fff8000, 0x7fff8001, 0x7ffffffe, 0x7fffffff}) {
    const q31 x = from_wide<q31>(raw);
    EXPECT_EQ(raw_hex(rotorq::to_q15(x)), raw_hex(32767, 16)) << "to_q15 of " << raw_hex(x);
  }
}

}  // namespace
