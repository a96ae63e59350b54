// Tests for rotorq/accumulator.hpp: exact sums of products, rounded once, checked against an exact
// reference sum.
//
// The reference is a plain __int128 sum of the exact terms at 2F fraction bits. __int128 is a
// GCC/Clang extension on 64-bit hosts: it is a host-only reference for these tests, and the library
// itself never uses it. The rounding of the reference is floor division with an explicit remainder
// test, then saturation, both written here without rotorq::detail.
#include "rotorq/accumulator.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cstdint>
#include <iomanip>
#include <limits>
#include <random>
#include <sstream>
#include <string>
#include <type_traits>
#include <utility>
#include <vector>

#include "test_support.hpp"

namespace {

using rotorq::accumulator;
using rotorq::q15;
using rotorq::q31;

static_assert(std::is_same_v<accumulator<q15>::value_type, q15>);
static_assert(std::is_same_v<accumulator<q31>::value_type, q31>);

using wide = __int128;  // host-only exact reference

// Random inputs come from fixed seeds. The output of std::mt19937_64 is fixed by the C++ standard but
// the std distributions and std::shuffle are not, so values are cut from the raw bits and shuffles
// are written out: the same seed gives the same inputs with every standard library.
constexpr uint64_t seed_operands = 0xacc00001;
constexpr uint64_t seed_single_q31 = 0xacc00002;
constexpr uint64_t seed_walk = 0xacc00003;
constexpr uint64_t seed_hover = 0xacc00004;
constexpr uint64_t seed_order = 0xacc00005;

constexpr wide pow2(int n) { return wide{1} << n; }

// An exact sum in decimal, and in units of 2^64 plus a 64-bit two's-complement remainder in hex, which
// is how the accumulator holds it.
std::string wide_text(wide v) {
  const bool negative = v < 0;
  unsigned __int128 magnitude =
      negative ? static_cast<unsigned __int128>(-(v + 1)) + 1 : static_cast<unsigned __int128>(v);
  std::string digits;
  do {
    digits.insert(digits.begin(), static_cast<char>('0' + static_cast<int>(magnitude % 10)));
    magnitude /= 10;
  } while (magnitude != 0);
  const wide low = v % pow2(64) < 0 ? v % pow2(64) + pow2(64) : v % pow2(64);
  const wide turns = (v - low) / pow2(64);
  std::ostringstream text;
  text << (negative ? "-" : "") << digits << " = " << static_cast<int64_t>(turns) << " * 2^64 + 0x"
       << std::hex << static_cast<uint64_t>(low);
  return text.str();
}

using rotorq::test::edge_values;
using rotorq::test::from_wide;
using rotorq::test::max_reported;
using rotorq::test::random_value;
using rotorq::test::raw_hex;
using rotorq::test::raw_hi;
using rotorq::test::raw_lo;

// The expected result for an exact sum at 2F fraction bits: q = floor(sum / 2^F) and r = sum - q 2^F
// in [0, 2^F); round up when r >= 2^F / 2 (ties toward +infinity: common practice, no source), then
// saturate.
template <typename Q>
int64_t expected_result(wide sum) {
  const wide step = pow2(Q::fraction_bits);
  wide quotient = sum / step;  // truncates toward zero
  wide remainder = sum % step;
  if (remainder < 0) {
    quotient -= 1;
    remainder += step;
  }
  if (2 * remainder >= step) quotient += 1;
  if (quotient < raw_lo<Q>) return raw_lo<Q>;
  if (quotient > raw_hi<Q>) return raw_hi<Q>;
  return static_cast<int64_t>(quotient);
}

enum class kind { mac, msc, add };

template <typename Q>
struct term {
  kind what;
  Q a, b;  // b unused for add
};

template <typename Q>
wide exact_value(const term<Q>& t) {
  const wide a = t.a.raw(), b = t.b.raw();
  switch (t.what) {
    case kind::mac:
      return a * b;
    case kind::msc:
      return -(a * b);
    case kind::add:
      return a * pow2(Q::fraction_bits);
  }
  return 0;
}

template <typename Q>
void apply(accumulator<Q>& acc, const term<Q>& t) {
  switch (t.what) {
    case kind::mac:
      acc.mac(t.a, t.b);
      break;
    case kind::msc:
      acc.msc(t.a, t.b);
      break;
    case kind::add:
      acc.add(t.a);
      break;
  }
}

template <typename Q>
std::string describe(const term<Q>& t) {
  switch (t.what) {
    case kind::mac:
      return "mac(" + raw_hex(t.a) + ", " + raw_hex(t.b) + ")";
    case kind::msc:
      return "msc(" + raw_hex(t.a) + ", " + raw_hex(t.b) + ")";
    case kind::add:
      return "add(" + raw_hex(t.a) + ")";
  }
  return "";
}

// The same term with the opposite sign (add(min) has none and stays as it is).
template <typename Q>
term<Q> opposite(const term<Q>& t) {
  switch (t.what) {
    case kind::mac:
      return {kind::msc, t.a, t.b};
    case kind::msc:
      return {kind::mac, t.a, t.b};
    case kind::add:
      return t.a == Q::min() ? t : term<Q>{kind::add, -t.a, t.b};
  }
  return t;
}

// A value whose magnitude is spread over all scales: a random raw value shifted right by 0 .. F.
template <typename Q>
Q random_scaled(std::mt19937_64& rng) {
  const int64_t raw = random_value<Q>(rng).raw();
  return from_wide<Q>(raw >> (rng() % (Q::fraction_bits + 1)));
}

template <typename Q>
term<Q> random_term(std::mt19937_64& rng) {
  const uint64_t pick = rng() % 8;
  const kind what = pick < 3 ? kind::mac : pick < 6 ? kind::msc : kind::add;
  if (rng() % 4 == 0) return {what, random_value<Q>(rng), random_value<Q>(rng)};
  return {what, random_scaled<Q>(rng), random_scaled<Q>(rng)};
}

// Feeds terms into an accumulator and checks its result after every one against the reference sum.
template <typename Q>
class checked_sum {
 public:
  explicit checked_sum(std::string context) : context_(std::move(context)) {}

  // Applies the term and checks the result; false once too many mismatches have been reported.
  bool step(const term<Q>& t) {
    apply(acc_, t);
    exact_ += exact_value(t);
    ++steps_;
    const int64_t expected = expected_result<Q>(exact_);
    const Q actual = acc_.result();
    if (actual.raw() == expected) return true;
    EXPECT_EQ(raw_hex(actual), raw_hex(expected, Q::fraction_bits + 1))
        << context_ << ", step " << steps_ << ", after " << describe(t) << ": exact sum "
        << wide_text(exact_);
    return ++failures_ < max_reported;
  }
  Q result() const { return acc_.result(); }
  wide exact() const { return exact_; }

 private:
  std::string context_;
  accumulator<Q> acc_;
  wide exact_ = 0;
  int64_t steps_ = 0;
  int failures_ = 0;
};

// Terms whose exact sum is `target`: steps of +-2^2F (mac or msc of min, min) until the rest is at
// most 2^(2F-1) in magnitude, then add(high) and mac(low, 1 step) for the rest.
template <typename Q>
std::vector<term<Q>> terms_for(wide target) {
  const int f = Q::fraction_bits;
  const Q one_step = from_wide<Q>(1);
  std::vector<term<Q>> terms;
  wide rest = target;
  while (rest > pow2(2 * f - 1)) {
    terms.push_back({kind::mac, Q::min(), Q::min()});
    rest -= pow2(2 * f);
  }
  while (rest < -pow2(2 * f - 1)) {
    terms.push_back({kind::msc, Q::min(), Q::min()});
    rest += pow2(2 * f);
  }
  const wide high = rest / pow2(f);        // |high| <= 2^(F-1)
  const wide low = rest - high * pow2(f);  // |low| < 2^F
  terms.push_back({kind::add, from_wide<Q>(static_cast<int64_t>(high)), Q::zero()});
  terms.push_back({kind::mac, from_wide<Q>(static_cast<int64_t>(low)), one_step});
  return terms;
}

// ---------------------------------------------------------------------------------------------------

TEST(Accumulator, StartsAndClearsToZero) {
  accumulator<q15> a15;
  accumulator<q31> a31;
  EXPECT_EQ(a15.result().raw(), 0);
  EXPECT_EQ(a31.result().raw(), 0);
  a15.add(q15::max());
  a31.add(q31::max());
  a15.clear();
  a31.clear();
  EXPECT_EQ(a15.result().raw(), 0);
  EXPECT_EQ(a31.result().raw(), 0);
}

// One term: every q15 a against every edge value b and some random b, for mac, msc and add.
TEST(Accumulator, SingleTermQ15) {
  std::vector<q15> operands = edge_values<q15>();
  std::mt19937_64 rng(seed_operands);
  while (operands.size() < 128) operands.push_back(random_value<q15>(rng));
  int failures = 0;
  for (const q15 b : operands) {
    for (int32_t a_raw = -32768; a_raw <= 32767; ++a_raw) {
      const q15 a = from_wide<q15>(a_raw);
      for (const term<q15> t :
           {term<q15>{kind::mac, a, b}, term<q15>{kind::msc, a, b}, term<q15>{kind::add, a, b}}) {
        accumulator<q15> acc;
        apply(acc, t);
        const int64_t expected = expected_result<q15>(exact_value(t));
        if (acc.result().raw() == expected) continue;
        EXPECT_EQ(raw_hex(acc.result()), raw_hex(expected, 16)) << describe(t);
        ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
      }
    }
  }
}

TEST(Accumulator, SingleTermQ31) {
  const std::vector<q31> edges = edge_values<q31>();
  std::vector<term<q31>> terms;
  for (const q31 a : edges) {
    for (const q31 b : edges) {
      for (const kind what : {kind::mac, kind::msc, kind::add}) terms.push_back({what, a, b});
    }
  }
  std::mt19937_64 rng(seed_single_q31);
  for (int i = 0; i < 300'000; ++i) terms.push_back(random_term<q31>(rng));
  int failures = 0;
  for (const term<q31>& t : terms) {
    accumulator<q31> acc;
    apply(acc, t);
    const int64_t expected = expected_result<q31>(exact_value(t));
    if (acc.result().raw() == expected) continue;
    EXPECT_EQ(raw_hex(acc.result()), raw_hex(expected, 32)) << describe(t);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// Rounding happens once, in result(): products of half a step each add up before they are rounded.
// The expected values are worked by hand; beside each, what rounding every term on its own would give.
template <typename Q>
void check_single_rounding() {
  // root_half^2 is 2^(F-1), half a step: 2^7 * 2^7 = 2^14 for Q15, 2^15 * 2^15 = 2^30 for Q31.
  const Q root_half = from_wide<Q>(int64_t{1} << (Q::fraction_bits / 2));
  const Q one_step = from_wide<Q>(1);  // one_step^2 is 2^-F of a step
  const struct {
    const char* what;
    int halves;  // signed count of root_half * root_half
    int tiny;    // signed count of one_step * one_step
    int64_t expected;
  } cases[] = {
      {"one half step rounds up to 1 (per term: 1)", 1, 0, 1},
      {"two half steps are one step (per term: 2)", 2, 0, 1},
      {"three half steps are 1.5, up to 2 (per term: 3)", 3, 0, 2},
      {"minus three half steps are -1.5, up to -1 (per term: 0)", -3, 0, -1},
      {"one half step less a tiny product is below the tie: 0 (per term: 1)", 1, -1, 0},
      {"minus one half step less a tiny product: -1 (per term: 0)", -1, -1, -1},
      {"minus one half step plus a tiny product: 0 (per term: 0)", -1, 1, 0},
      {"1024 tiny products and one half step: 1 (per term: 1)", 1, 1024, 1},
  };
  for (const auto& t : cases) {
    accumulator<Q> acc;
    for (int i = 0; i < (t.halves < 0 ? -t.halves : t.halves); ++i) {
      apply(acc, {t.halves < 0 ? kind::msc : kind::mac, root_half, root_half});
    }
    for (int i = 0; i < (t.tiny < 0 ? -t.tiny : t.tiny); ++i) {
      apply(acc, {t.tiny < 0 ? kind::msc : kind::mac, one_step, one_step});
    }
    EXPECT_EQ(raw_hex(acc.result()), raw_hex(t.expected, Q::fraction_bits + 1)) << t.what;
  }
}

// 2^15 products of 1 step * 1 step are 2^15 * 2^-15 = exactly one q15 step (worked by hand); each
// one on its own rounds to 0.
TEST(Accumulator, TinyProductsAddUpQ15) {
  accumulator<q15> acc;
  for (int i = 0; i < 32768; ++i) acc.mac(q15::from_raw(1), q15::from_raw(1));
  EXPECT_EQ(raw_hex(acc.result()), raw_hex(1, 16));
  for (int i = 0; i < 16384; ++i) acc.msc(q15::from_raw(1), q15::from_raw(1));
  EXPECT_EQ(raw_hex(acc.result()), raw_hex(1, 16)) << "half a step left: the tie rounds up";
  acc.msc(q15::from_raw(1), q15::from_raw(1));
  EXPECT_EQ(raw_hex(acc.result()), raw_hex(0, 16)) << "just below half a step";
}

TEST(Accumulator, RoundsOnceQ15) { check_single_rounding<q15>(); }
TEST(Accumulator, RoundsOnceQ31) { check_single_rounding<q31>(); }

// n times +a b, then x, then n times -a b: the partial sums leave the q range (for q31 they pass
// 2^63 and wrap the 64-bit sum many times) and the final result is exactly x.
template <typename Q>
void check_excursions(const std::vector<int>& counts) {
  const Q lo = Q::min(), hi = Q::max();
  // cppcheck reads the variable template raw_hi<Q> as a comparison here
  // cppcheck-suppress compareBoolExpressionWithInt
  const Q pairs[][2] = {{lo, lo}, {hi, hi}, {lo, hi}, {hi, lo}, {lo, from_wide<Q>(raw_hi<Q> - 1)}};
  const Q finals[] = {Q::zero(), hi, lo, from_wide<Q>(1), from_wide<Q>(-1), from_wide<Q>(raw_hi<Q> / 3)};
  for (const int n : counts) {
    for (const auto& pair : pairs) {
      for (const Q x : finals) {
        for (const bool upward : {true, false}) {
          std::ostringstream context;
          context << n << " x " << (upward ? "mac" : "msc") << "(" << raw_hex(pair[0]) << ", "
                  << raw_hex(pair[1]) << "), add(" << raw_hex(x) << "), then back";
          checked_sum<Q> sum(context.str());
          const term<Q> out{upward ? kind::mac : kind::msc, pair[0], pair[1]};
          for (int i = 0; i < n; ++i) ASSERT_TRUE(sum.step(out)) << "stopping: " << context.str();
          ASSERT_TRUE(sum.step({kind::add, x, Q::zero()}));
          for (int i = 0; i < n; ++i) ASSERT_TRUE(sum.step(opposite(out))) << "stopping: " << context.str();
          EXPECT_EQ(raw_hex(sum.result()), raw_hex(x)) << context.str();
        }
      }
    }
  }
}

// 2, 4 and 8 products of -1 * -1 are exactly 2^63, 2^64 and 2^65: the 64-bit part is 0 or -2^63 there.
TEST(Accumulator, LeavesRangeAndComesBackQ31) {
  check_excursions<q31>({1, 2, 3, 4, 5, 7, 8, 9, 1000, 20'000});
}
TEST(Accumulator, LeavesRangeAndComesBackQ15) { check_excursions<q15>({1, 2, 3, 1000, 20'000}); }

// A sum that first goes to `detour` and from there to `target`; checked after every term.
struct detour_case {
  wide detour, target;
};

template <typename Q>
void check_detours(const std::vector<detour_case>& cases) {
  for (const detour_case& t : cases) {
    checked_sum<Q> sum("detour to " + wide_text(t.detour) + ", then to " + wide_text(t.target));
    for (const term<Q>& step : terms_for<Q>(t.detour)) ASSERT_TRUE(sum.step(step));
    ASSERT_EQ(sum.exact(), t.detour);
    for (const term<Q>& step : terms_for<Q>(t.target - t.detour)) ASSERT_TRUE(sum.step(step));
    ASSERT_EQ(sum.exact(), t.target);
  }
}

TEST(Accumulator, DetoursAcrossTheWrapPointsQ31) {
  const wide q_hi = wide{2147483647} * pow2(31), q_lo = -pow2(62), half = pow2(30);
  const wide detours[] = {0,
                          pow2(63) - 1,
                          pow2(63),
                          pow2(63) + 1,
                          -pow2(63),
                          -pow2(63) - 1,
                          -pow2(63) + 1,
                          pow2(64),
                          pow2(64) - 1,
                          -pow2(64),
                          -pow2(64) + 1,
                          3 * pow2(64) + 12345,
                          -5 * pow2(64) - 12345,
                          pow2(70)};
  // Final sums: inside the range, at the rounding edges of max and min, and outside the range.
  const wide targets[] = {0,
                          1,
                          -1,
                          half,
                          -half,
                          q_hi,
                          q_hi + half - 1,  // just below the tie above max: max
                          q_hi + half,      // rounds to max + 1 step: saturates to max
                          q_lo,
                          q_lo - half,      // tie: rounds up to min, not saturated
                          q_lo - half - 1,  // rounds to min - 1 step: saturates to min
                          pow2(63) - 1,
                          pow2(63),
                          -pow2(63),
                          -pow2(63) - 1,
                          pow2(64),
                          -pow2(64),
                          pow2(64) + 1,
                          -pow2(64) - 1};
  std::vector<detour_case> cases;
  for (const wide d : detours) {
    for (const wide t : targets) cases.push_back({d, t});
  }
  check_detours<q31>(cases);
}

TEST(Accumulator, DetoursQ15) {
  const wide q_hi = wide{32767} * pow2(15), q_lo = -pow2(30), half = pow2(14);
  const wide detours[] = {0, pow2(40), -pow2(40), pow2(31) + 5, -pow2(31) - 5};
  const wide targets[] = {0,
                          1,
                          -1,
                          half,
                          -half,
                          q_hi,
                          q_hi + half - 1,
                          q_hi + half,
                          q_lo,
                          q_lo - half,
                          q_lo - half - 1,
                          pow2(40),
                          -pow2(40)};
  std::vector<detour_case> cases;
  for (const wide d : detours) {
    for (const wide t : targets) cases.push_back({d, t});
  }
  check_detours<q15>(cases);
}

// The expected results at the saturation edges, worked by hand, so that they do not rest on the
// reference rounding alone.
TEST(Accumulator, SaturationEdgesByHand) {
  const wide q_hi = wide{2147483647} * pow2(31), q_lo = -pow2(62), half = pow2(30);
  const struct {
    wide sum;
    int64_t expected;
  } cases[] = {
      {q_hi + half - 1, 2147483647},
      {q_hi + half, 2147483647},
      {pow2(63), 2147483647},
      {pow2(64), 2147483647},
      {q_lo - half, -2147483647 - 1},
      {q_lo - half - 1, -2147483647 - 1},
      {-pow2(63), -2147483647 - 1},
      {-pow2(64), -2147483647 - 1},
      {-half, 0},
      {half, 1},
      {-half - 1, -1},
      {3 * half, 2},
  };
  for (const auto& t : cases) {
    accumulator<q31> acc;
    for (const term<q31>& step : terms_for<q31>(t.sum)) apply(acc, step);
    EXPECT_EQ(raw_hex(acc.result()), raw_hex(t.expected, 32)) << "exact sum " << wide_text(t.sum);
  }
}

// Random terms of every size, the result checked after each one.
template <typename Q>
void check_random_walk(int steps) {
  std::mt19937_64 rng(seed_walk);
  checked_sum<Q> sum("random walk");
  for (int i = 0; i < steps; ++i) {
    ASSERT_TRUE(sum.step(random_term<Q>(rng))) << "stopping after " << max_reported << " mismatches";
  }
}

TEST(Accumulator, RandomWalkQ31) { check_random_walk<q31>(200'000); }
TEST(Accumulator, RandomWalkQ15) { check_random_walk<q15>(200'000); }

// Walks that hover around one point: each random term is turned toward the point, so the exact sum
// crosses it again and again, with steps from one unit up to 2^62. At +-2^63 the 64-bit part wraps; at
// +-2^64 it passes 0 with a wrap count of +-1; at the rounding edges of max and min saturation starts.
TEST(Accumulator, HoversAroundWrapAndSaturationPoints) {
  const wide centres[] = {pow2(63),
                          -pow2(63),
                          pow2(64),
                          -pow2(64),
                          0,
                          wide{2147483647} * pow2(31) + pow2(30),
                          -pow2(62) - pow2(30)};
  std::mt19937_64 rng(seed_hover);
  for (const wide centre : centres) {
    checked_sum<q31> sum("hovering around " + wide_text(centre));
    for (const term<q31>& t : terms_for<q31>(centre)) ASSERT_TRUE(sum.step(t));
    int crossings = 0;
    for (int i = 0; i < 100'000; ++i) {
      term<q31> t = random_term<q31>(rng);
      const wide value = exact_value(t);
      if ((sum.exact() < centre && value < 0) || (sum.exact() >= centre && value > 0)) t = opposite(t);
      const bool below = sum.exact() < centre;
      ASSERT_TRUE(sum.step(t)) << "stopping after " << max_reported << " mismatches";
      if (below != (sum.exact() < centre)) ++crossings;
    }
    // The walk is only a test of the crossing if it crosses.
    EXPECT_GT(crossings, 1000) << "around " << wide_text(centre);
  }
}

// The same terms in many orders give the same result. The big terms (products near 2^62) come in
// cancelling pairs, so in most orders the partial sums wander far outside the range and across the
// wrap points; the small terms leave a final sum inside the range.
TEST(Accumulator, OrderDoesNotChangeTheResult) {
  std::mt19937_64 rng(seed_order);
  for (int set = 0; set < 20; ++set) {
    std::vector<term<q31>> terms;
    for (int i = 0; i < 40; ++i) {
      const term<q31> big{kind::mac, q31::from_raw(-2147483647 - 1 + static_cast<int32_t>(rng() % 16)),
                          q31::from_raw(-2147483647 - 1 + static_cast<int32_t>(rng() % 16))};
      terms.push_back(big);
      terms.push_back(opposite(big));
    }
    for (int i = 0; i < 60; ++i) {
      // |a| < 2^31, |b| < 2^23: 60 products stay below 2^60.
      const q31 a = random_value<q31>(rng);
      const q31 b = q31::from_raw(static_cast<int32_t>(random_value<q31>(rng).raw() / 256));
      terms.push_back({rng() % 2 == 0 ? kind::mac : kind::msc, a, b});
    }
    // On some sets, an unbalanced big term: the final sum is far out of range.
    if (set % 4 == 3) terms.push_back({kind::mac, q31::min(), q31::min()});
    wide exact = 0;
    for (const term<q31>& t : terms) exact += exact_value(t);
    const int64_t expected = expected_result<q31>(exact);
    if (set % 4 != 3) {
      ASSERT_GT(expected, raw_lo<q31>) << "set " << set << ": the final sum should lie inside the range";
      ASSERT_LT(expected, raw_hi<q31>) << "set " << set << ": the final sum should lie inside the range";
    }
    for (int order = 0; order < 50; ++order) {
      for (size_t i = terms.size() - 1; i > 0; --i) {
        std::swap(terms[i], terms[rng() % (i + 1)]);  // Fisher-Yates
      }
      accumulator<q31> acc;
      for (const term<q31>& t : terms) apply(acc, t);
      ASSERT_EQ(raw_hex(acc.result()), raw_hex(expected, 32))
          << "set " << set << ", order " << order << ": exact sum " << wide_text(exact) << ", first term "
          << describe(terms.front());
    }
  }
}

// clear() forgets the wrap count as well as the 64-bit part.
TEST(Accumulator, ClearForgetsWraps) {
  for (const kind direction : {kind::mac, kind::msc}) {
    accumulator<q31> acc;
    for (int i = 0; i < 1000; ++i) apply(acc, {direction, q31::min(), q31::min()});  // +-1000 * 2^62
    EXPECT_EQ(acc.result(), direction == kind::mac ? q31::max() : q31::min());
    acc.clear();
    EXPECT_EQ(acc.result().raw(), 0);
    const q31 x = q31::from_raw(123456789);
    acc.add(x);
    EXPECT_EQ(raw_hex(acc.result()), raw_hex(x));
    // 4 products of -1 * -1 are exactly 2^64: the 64-bit part is 0 and only the wrap count says max;
    // clear() must drop that count too.
    acc.clear();
    for (int i = 0; i < 4; ++i) acc.mac(q31::min(), q31::min());
    EXPECT_EQ(acc.result(), q31::max());
    acc.clear();
    acc.add(x);
    EXPECT_EQ(raw_hex(acc.result()), raw_hex(x));
  }
}

// Everything is constexpr: a compile-time spot check (worked by hand). Four products of -1 * -1 are
// 2^64, the wrapped 64-bit part is 0, and the result is max; four msc take it back to exactly 0.
constexpr int64_t wrapped_and_back() {
  accumulator<q31> acc;
  for (int i = 0; i < 4; ++i) acc.mac(q31::min(), q31::min());
  const bool saturated = acc.result() == q31::max();
  for (int i = 0; i < 4; ++i) acc.msc(q31::min(), q31::min());
  acc.add(q31::from_raw(7));
  return saturated ? acc.result().raw() : -1;
}
static_assert(wrapped_and_back() == 7);

}  // namespace
