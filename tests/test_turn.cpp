// Tests for rotorq/turn.hpp: binary angles checked against modular integer arithmetic.
//
// A turnN holds an angle as raw / 2^N of a turn. Every expected value here is computed in uint64_t
// or int64_t and reduced with % 2^N (or an explicit shift into the signed half-open range), without
// rotorq::detail. turn16 addition and subtraction are swept over all 2^32 pairs.
#include "rotorq/turn.hpp"

#include <gtest/gtest.h>

#include <algorithm>
#include <cstdint>
#include <iomanip>
#include <random>
#include <sstream>
#include <string>
#include <type_traits>
#include <vector>

#include "test_support.hpp"

namespace {

using rotorq::turn16;
using rotorq::turn32;

static_assert(std::is_same_v<turn16::raw_type, uint16_t>);
static_assert(std::is_same_v<turn32::raw_type, uint32_t>);
static_assert(std::is_same_v<turn16::difference_type, int16_t>);
static_assert(std::is_same_v<turn32::difference_type, int32_t>);

using rotorq::test::max_reported;
using rotorq::test::raw_hex;

// Random inputs come from fixed seeds. The output of std::mt19937_64 is fixed by the C++ standard but
// the std distributions are not, so values are cut from the raw bits: the same seed gives the same
// inputs with every standard library.
constexpr uint64_t seed_tables = 0x7a110001;
constexpr uint64_t seed_pairs = 0x7a110002;
constexpr uint64_t seed_low_halves = 0x7a110003;

constexpr int random_turn32_pairs = 1'000'000;

// Under AddressSanitizer the 2^32-pair turn16 sweep keeps only the rows a = 0, 1 and 31 mod 32 (among
// them 0, 1 and 65535), each against every b: instrumented, the whole sweep takes some 15 s. The plain
// build runs every pair.
#if defined(__SANITIZE_ADDRESS__)
constexpr bool sanitized_build = true;
#elif defined(__has_feature)
#if __has_feature(address_sanitizer)
constexpr bool sanitized_build = true;
#else
constexpr bool sanitized_build = false;
#endif
#else
constexpr bool sanitized_build = false;
#endif

constexpr int64_t turn_steps(int bits) { return int64_t{1} << bits; }

template <int N>
rotorq::turn<N> turn_at(int64_t raw) {
  using raw_type = typename rotorq::turn<N>::raw_type;
  return rotorq::turn<N>::from_raw(static_cast<raw_type>(raw));
}

// x mod 2^N in [0, 2^N), for any sign of x.
int64_t modulo_turn(int64_t x, int bits) {
  const int64_t m = turn_steps(bits);
  return ((x % m) + m) % m;
}

// x mod 2^N moved into [-2^(N-1), 2^(N-1)): the upper half of the turn counts as negative, so exactly
// half a turn comes out as -2^(N-1).
int64_t signed_turn(int64_t x, int bits) {
  const int64_t r = modulo_turn(x, bits);
  return r >= turn_steps(bits - 1) ? r - turn_steps(bits) : r;
}

// Angles at the edges: 0, quarter, half and three-quarter turns and their neighbours, the last step,
// and powers of two and their neighbours.
template <int N>
std::vector<int64_t> edge_angles() {
  const int64_t q = turn_steps(N - 2);
  std::vector<int64_t> raws = {0,
                               1,
                               2,
                               q - 1,
                               q,
                               q + 1,
                               2 * q - 1,
                               2 * q,
                               2 * q + 1,
                               3 * q - 1,
                               3 * q,
                               3 * q + 1,
                               turn_steps(N) - 2,
                               turn_steps(N) - 1};
  for (int k = 1; k < N; ++k) {
    for (const int64_t v : {turn_steps(k) - 1, turn_steps(k), turn_steps(k) + 1}) raws.push_back(v);
  }
  std::sort(raws.begin(), raws.end());
  raws.erase(std::unique(raws.begin(), raws.end()), raws.end());
  return raws;
}

// Signed step counts at the edges: -2^(N-1), -2^(N-1) + 1, -1, 0, 1, 2^(N-1) - 1, +-2^k and neighbours.
template <int N>
std::vector<int64_t> edge_steps() {
  const int64_t h = turn_steps(N - 1);
  std::vector<int64_t> steps = {-h, -h + 1, -1, 0, 1, h - 2, h - 1};
  for (int k = 1; k < N - 1; ++k) {
    for (const int64_t v : {turn_steps(k) - 1, turn_steps(k), turn_steps(k) + 1}) {
      steps.push_back(v);
      steps.push_back(-v);
    }
  }
  std::sort(steps.begin(), steps.end());
  steps.erase(std::unique(steps.begin(), steps.end()), steps.end());
  return steps;
}

int64_t random_raw(std::mt19937_64& rng, int bits) { return static_cast<int64_t>(rng() >> (64 - bits)); }

// Edge angles plus random ones, `size` in all.
template <int N>
std::vector<int64_t> angle_table(size_t size) {
  std::vector<int64_t> raws = edge_angles<N>();
  std::mt19937_64 rng(seed_tables);
  while (raws.size() < size) raws.push_back(random_raw(rng, N));
  return raws;
}

// ---------------------------------------------------------------------------------------------------

TEST(Turn, ConstantsAndRawAccess) {
  EXPECT_EQ(turn16::bits, 16);
  EXPECT_EQ(turn32::bits, 32);
  EXPECT_EQ(turn16{}.raw(), 0u);
  EXPECT_EQ(turn32{}.raw(), 0u);
  for (int64_t raw = 0; raw < turn_steps(16); ++raw) ASSERT_EQ(int64_t{turn_at<16>(raw).raw()}, raw);
  for (const int64_t raw : edge_angles<32>()) ASSERT_EQ(int64_t{turn_at<32>(raw).raw()}, raw);
}

TEST(Turn, Equality) {
  for (const int64_t a : angle_table<16>(64)) {
    for (const int64_t b : angle_table<16>(64)) {
      EXPECT_EQ(turn_at<16>(a) == turn_at<16>(b), a == b) << raw_hex(a, 16) << " vs " << raw_hex(b, 16);
      EXPECT_EQ(turn_at<16>(a) != turn_at<16>(b), a != b) << raw_hex(a, 16) << " vs " << raw_hex(b, 16);
    }
  }
  for (const int64_t a : edge_angles<32>()) {
    for (const int64_t b : edge_angles<32>()) {
      EXPECT_EQ(turn_at<32>(a) == turn_at<32>(b), a == b) << raw_hex(a, 32) << " vs " << raw_hex(b, 32);
      EXPECT_EQ(turn_at<32>(a) != turn_at<32>(b), a != b) << raw_hex(a, 32) << " vs " << raw_hex(b, 32);
    }
  }
}

// ---------------------------------------------------------------------------------------------------
// turn16: every pair

// a + b and a - b on every pair (a, b) against (a +- b) mod 65536. The inner loop only collects the
// bits in which results differ, so that it stays fast; a row with a mismatch is scanned again to
// report the inputs.
TEST(Turn16, AddAndSubtractEveryPair) {
  int failures = 0;
  for (uint32_t a = 0; a < 65536; ++a) {
    if (sanitized_build && a % 32 != 0 && a % 32 != 1 && a % 32 != 31) continue;
    const turn16 ta = turn16::from_raw(static_cast<uint16_t>(a));
    uint32_t mismatch_bits = 0;
    for (uint32_t b = 0; b < 65536; ++b) {
      const turn16 tb = turn16::from_raw(static_cast<uint16_t>(b));
      mismatch_bits |= uint32_t{(ta + tb).raw()} ^ ((a + b) % 65536u);
      mismatch_bits |= uint32_t{(ta - tb).raw()} ^ ((a + 65536u - b) % 65536u);
    }
    if (mismatch_bits == 0) continue;
    for (int64_t b = 0; b < 65536; ++b) {
      const turn16 tb = turn_at<16>(b);
      const struct {
        const char* name;
        int64_t actual, expected;
      } results[] = {{"a + b", (ta + tb).raw(), modulo_turn(a + b, 16)},
                     {"a - b", (ta - tb).raw(), modulo_turn(a - b, 16)}};
      for (const auto& r : results) {
        if (r.actual == r.expected) continue;
        EXPECT_EQ(raw_hex(r.actual, 16), raw_hex(r.expected, 16))
            << r.name << " with a = " << raw_hex(a, 16) << ", b = " << raw_hex(b, 16);
        ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
      }
    }
  }
}

// The compound forms, every a against a table of b.
TEST(Turn16, CompoundAssignment) {
  int failures = 0;
  for (const int64_t b : angle_table<16>(300)) {
    for (int64_t a = 0; a < 65536; ++a) {
      turn16 sum = turn_at<16>(a), difference = turn_at<16>(a);
      sum += turn_at<16>(b);
      difference -= turn_at<16>(b);
      if (int64_t{sum.raw()} == modulo_turn(a + b, 16) &&
          int64_t{difference.raw()} == modulo_turn(a - b, 16)) {
        continue;
      }
      EXPECT_EQ(raw_hex(sum), raw_hex(modulo_turn(a + b, 16), 16))
          << "a += b with a = " << raw_hex(a, 16) << ", b = " << raw_hex(b, 16);
      EXPECT_EQ(raw_hex(difference), raw_hex(modulo_turn(a - b, 16), 16))
          << "a -= b with a = " << raw_hex(a, 16) << ", b = " << raw_hex(b, 16);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
}

TEST(Turn16, NegationEveryAngle) {
  int failures = 0;
  for (int64_t a = 0; a < 65536; ++a) {
    const turn16 actual = -turn_at<16>(a);
    const int64_t expected = modulo_turn(-a, 16);
    if (int64_t{actual.raw()} == expected) continue;
    EXPECT_EQ(raw_hex(actual), raw_hex(expected, 16)) << "-a with a = " << raw_hex(a, 16);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// Every `to` against a table of `from`: the value, the range [-2^15, 2^15), and that advancing `from`
// by the difference lands on `to`.
TEST(Turn16, SignedDifference) {
  int failures = 0;
  for (const int64_t from : angle_table<16>(300)) {
    for (int64_t to = 0; to < 65536; ++to) {
      const int16_t actual = rotorq::signed_difference(turn_at<16>(to), turn_at<16>(from));
      const int64_t expected = signed_turn(to - from, 16);
      const turn16 back = rotorq::advance(turn_at<16>(from), actual);
      if (actual == expected && int64_t{back.raw()} == to) continue;
      EXPECT_EQ(raw_hex(actual, 16), raw_hex(expected, 16))
          << "signed_difference(to = " << raw_hex(to, 16) << ", from = " << raw_hex(from, 16) << ")";
      EXPECT_EQ(raw_hex(back), raw_hex(to, 16))
          << "advance(from, signed_difference(to, from)), from = " << raw_hex(from, 16);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
}

// Half a turn either way comes out as -2^(N-1); the values next to it keep their sign.
TEST(Turn, SignedDifferenceAtHalfTurn) {
  const struct {
    int64_t to, from, expected;
  } cases16[] = {{32768, 0, -32768}, {0, 32768, -32768}, {32767, 0, 32767},      {32769, 0, -32767},
                 {0, 32767, -32767}, {0, 32769, 32767},  {49152, 16384, -32768}, {1, 65535, 2},
                 {65535, 1, -2},     {5, 5, 0}};
  for (const auto& t : cases16) {
    EXPECT_EQ(int64_t{rotorq::signed_difference(turn_at<16>(t.to), turn_at<16>(t.from))}, t.expected)
        << "turn16: to = " << raw_hex(t.to, 16) << ", from = " << raw_hex(t.from, 16);
  }
  const int64_t h = turn_steps(31);
  const struct {
    int64_t to, from, expected;
  } cases32[] = {{h, 0, -h},        {0, h, -h},        {h - 1, 0, h - 1}, {h + 1, 0, -h + 1},
                 {0, h + 1, h - 1}, {1, 2 * h - 1, 2}, {2 * h - 1, 1, -2}};
  for (const auto& t : cases32) {
    EXPECT_EQ(int64_t{rotorq::signed_difference(turn_at<32>(t.to), turn_at<32>(t.from))}, t.expected)
        << "turn32: to = " << raw_hex(t.to, 32) << ", from = " << raw_hex(t.from, 32);
  }
}

// Every angle against a table of signed step counts (all edges and random ones).
TEST(Turn16, Advance) {
  std::vector<int64_t> steps = edge_steps<16>();
  std::mt19937_64 rng(seed_tables);
  while (steps.size() < 200) steps.push_back(random_raw(rng, 16) - 32768);
  int failures = 0;
  for (const int64_t step : steps) {
    for (int64_t a = 0; a < 65536; ++a) {
      const turn16 actual = rotorq::advance(turn_at<16>(a), static_cast<int16_t>(step));
      const int64_t expected = modulo_turn(a + step, 16);
      if (int64_t{actual.raw()} == expected) continue;
      EXPECT_EQ(raw_hex(actual), raw_hex(expected, 16))
          << "advance(" << raw_hex(a, 16) << ", " << step << ")";
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
}

// ---------------------------------------------------------------------------------------------------
// turn32: edges against edges, then seeded random pairs

// Calls check(a, b) on every pair of raw values; check returns false once it has reported enough.
template <typename Check>
void for_turn32_pairs(Check check) {
  const std::vector<int64_t> edges = edge_angles<32>();
  for (const int64_t a : edges) {
    for (const int64_t b : edges) {
      ASSERT_TRUE(check(a, b)) << "stopping after " << max_reported << " mismatches";
    }
  }
  std::mt19937_64 rng(seed_pairs);
  for (int i = 0; i < random_turn32_pairs; ++i) {
    const int64_t a = random_raw(rng, 32), b = random_raw(rng, 32);
    ASSERT_TRUE(check(a, b)) << "stopping after " << max_reported << " mismatches";
  }
}

TEST(Turn32, AddSubtractNegate) {
  int failures = 0;
  for_turn32_pairs([&](int64_t a, int64_t b) {
    const turn32 ta = turn_at<32>(a), tb = turn_at<32>(b);
    turn32 compound_sum = ta, compound_difference = ta;
    compound_sum += tb;
    compound_difference -= tb;
    const struct {
      const char* name;
      int64_t actual, expected;
    } results[] = {
        {"a + b", (ta + tb).raw(), modulo_turn(a + b, 32)},
        {"a - b", (ta - tb).raw(), modulo_turn(a - b, 32)},
        {"a += b", compound_sum.raw(), modulo_turn(a + b, 32)},
        {"a -= b", compound_difference.raw(), modulo_turn(a - b, 32)},
        {"-a", (-ta).raw(), modulo_turn(-a, 32)},
    };
    for (const auto& r : results) {
      if (r.actual == r.expected) continue;
      EXPECT_EQ(raw_hex(r.actual, 32), raw_hex(r.expected, 32))
          << r.name << " with a = " << raw_hex(a, 32) << ", b = " << raw_hex(b, 32);
      if (++failures >= max_reported) return false;
    }
    return true;
  });
}

TEST(Turn32, SignedDifferenceAndAdvance) {
  int failures = 0;
  for_turn32_pairs([&](int64_t to, int64_t from) {
    const int32_t actual = rotorq::signed_difference(turn_at<32>(to), turn_at<32>(from));
    const int64_t expected = signed_turn(to - from, 32);
    const turn32 back = rotorq::advance(turn_at<32>(from), actual);
    // `to` read as a signed step count, advanced from `from`.
    const int32_t steps = static_cast<int32_t>(signed_turn(to, 32));
    const turn32 advanced = rotorq::advance(turn_at<32>(from), steps);
    if (actual == expected && int64_t{back.raw()} == to &&
        int64_t{advanced.raw()} == modulo_turn(from + steps, 32)) {
      return true;
    }
    EXPECT_EQ(raw_hex(actual, 32), raw_hex(expected, 32))
        << "signed_difference(to = " << raw_hex(to, 32) << ", from = " << raw_hex(from, 32) << ")";
    EXPECT_EQ(raw_hex(back), raw_hex(to, 32))
        << "advance(from, signed_difference(to, from)), from = " << raw_hex(from, 32);
    EXPECT_EQ(raw_hex(advanced), raw_hex(modulo_turn(from + steps, 32), 32))
        << "advance(" << raw_hex(from, 32) << ", " << steps << ")";
    return ++failures < max_reported;
  });
}

// ---------------------------------------------------------------------------------------------------
// Conversions between turn16 and turn32

TEST(TurnConversion, WideningIsExact) {
  int failures = 0;
  for (int64_t a = 0; a < 65536; ++a) {
    const turn32 actual = rotorq::to_turn32(turn_at<16>(a));
    if (int64_t{actual.raw()} == a * 65536) continue;
    EXPECT_EQ(raw_hex(actual), raw_hex(a * 65536, 32)) << "to_turn32 of " << raw_hex(a, 16);
    ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
  }
}

// Narrowing rounds to the nearest turn16 step, ties toward +infinity, modulo one turn: with
// q = floor(r / 2^16) and rest = r - q 2^16, the result is (q + (rest >= 2^15)) mod 2^16. Every
// upper half with low halves at the rounding edges and random ones: 65536 x 16 inputs.
TEST(TurnConversion, NarrowingRoundsTiesUpModuloATurn) {
  std::vector<int64_t> low_halves = {0, 1, 0x3fff, 0x7ffe, 0x7fff, 0x8000, 0x8001, 0xfffe, 0xffff};
  std::mt19937_64 rng(seed_low_halves);
  while (low_halves.size() < 16) low_halves.push_back(random_raw(rng, 16));
  int failures = 0;
  for (int64_t high = 0; high < 65536; ++high) {
    for (const int64_t low : low_halves) {
      const int64_t raw = high * 65536 + low;
      const int64_t expected = (high + (low >= 32768 ? 1 : 0)) % 65536;
      const turn16 actual = rotorq::to_turn16(turn_at<32>(raw));
      if (int64_t{actual.raw()} == expected) continue;
      EXPECT_EQ(raw_hex(actual), raw_hex(expected, 16)) << "to_turn16 of " << raw_hex(raw, 32);
      ASSERT_LT(++failures, max_reported) << "stopping after " << max_reported << " mismatches";
    }
  }
  // The last half step of the turn rounds up to a full turn, which is 0 (worked by hand).
  EXPECT_EQ(rotorq::to_turn16(turn32::from_raw(0xffff8000u)).raw(), 0u);
  EXPECT_EQ(rotorq::to_turn16(turn32::from_raw(0xffff7fffu)).raw(), 0xffffu);
  EXPECT_EQ(rotorq::to_turn16(turn32::from_raw(0xffffffffu)).raw(), 0u);
  EXPECT_EQ(rotorq::to_turn16(turn32::from_raw(0x00008000u)).raw(), 1u);
  EXPECT_EQ(rotorq::to_turn16(turn32::from_raw(0x00007fffu)).raw(), 0u);
}

// Everything is constexpr: compile-time spot checks (worked by hand).
static_assert((turn16::from_raw(0xffff) + turn16::from_raw(2)).raw() == 1);
static_assert((turn16::from_raw(1) - turn16::from_raw(2)).raw() == 0xffff);
static_assert((-turn32::from_raw(1)).raw() == 0xffffffffu);
static_assert(rotorq::signed_difference(turn16::from_raw(0x8000), turn16::from_raw(0)) == -32768);
static_assert(rotorq::advance(turn16::from_raw(0), int16_t{-1}).raw() == 0xffff);
static_assert(rotorq::to_turn16(turn32::from_raw(0xffff8000u)).raw() == 0);
static_assert(rotorq::to_turn32(turn16::from_raw(0x4000)).raw() == 0x40000000u);

}  // namespace
