// Bad input: every row of the contract table in README.md ("## Contracts") at the edges of its input
// range and beyond, as GoogleTest cases BadInput.<row>_... . The rows that hold on a target (F1 ... R8)
// are in bad_input_cases.hpp, shared with the run on the emulated cores (tests/target/bad_input_main.cpp);
// here its check macros map to GoogleTest. The rows of host.hpp (H1 ... H4) need doubles and follow
// below. Each test names its row in its name and in a SCOPED_TRACE, so a failure says which promise
// broke. The expected values are worked by hand from the rules in the table and the header comments
// (common practice, no source, unless a comment says otherwise); this suite runs under the sanitizer
// preset too, so "defined result, no undefined behaviour" is checked by UBSan as well as by the values.
#include <gtest/gtest.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <iomanip>
#include <limits>
#include <sstream>
#include <string>
#include <type_traits>

#include "rotorq/host.hpp"
#include "rotorq/rotorq.hpp"

// ---- the check macros of bad_input_cases.hpp, on GoogleTest ----------------------------------------

namespace rotorq::host_check {

// Any integer, enum or bool, held exactly: comparisons are by value whatever the two types (-1 is
// less than 0xffffffffu), as in tests/target/check.hpp.
struct integer {
  __int128 value;
  int width;  // of its type, in bits
};

template <typename T>
integer integer_of(T x) {
  if constexpr (std::is_enum_v<T>) {
    return integer_of(static_cast<std::underlying_type_t<T>>(x));
  } else {
    static_assert(std::is_integral_v<T>, "check operands are integers, enums or bool");
    return integer{static_cast<__int128>(x), static_cast<int>(sizeof(T) * 8)};
  }
}

// Whether the value has a two's-complement (negative) or plain binary form `width` bits wide.
inline bool fits(integer x, int width) {
  if (width >= 64) return true;
  const __int128 top = __int128{1} << (width - 1);
  return x.value >= -top && x.value < 2 * top;
}

// "-32768 (0x8000)": decimal, and the low `width` bits in hex.
inline std::string shown(integer x, int width) {
  std::ostringstream text;
  if (x.value < 0) {
    text << static_cast<int64_t>(x.value);
  } else {
    text << static_cast<uint64_t>(x.value);
  }
  const uint64_t mask = width >= 64 ? ~uint64_t{0} : (uint64_t{1} << width) - 1;
  text << " (0x" << std::hex << std::setfill('0') << std::setw((width + 3) / 4)
       << (static_cast<uint64_t>(x.value) & mask) << ")";
  return text.str();
}
template <typename T>
std::string shown(T x) {
  const integer value = integer_of(x);
  return shown(value, value.width);
}

enum class relation { eq, lt, le, gt, ge };

// A GoogleTest predicate formatter: both operands in decimal and hex, at the narrower operand's
// width when both values fit it.
template <relation R>
struct holds {
  template <typename A, typename B>
  testing::AssertionResult operator()(const char* a_text, const char* b_text, const A& a, const B& b) const {
    const integer x = integer_of(a);
    const integer y = integer_of(b);
    const char* op = "==";
    bool ok = x.value == y.value;
    if constexpr (R == relation::lt) {
      op = "<";
      ok = x.value < y.value;
    } else if constexpr (R == relation::le) {
      op = "<=";
      ok = x.value <= y.value;
    } else if constexpr (R == relation::gt) {
      op = ">";
      ok = x.value > y.value;
    } else if constexpr (R == relation::ge) {
      op = ">=";
      ok = x.value >= y.value;
    }
    if (ok) return testing::AssertionSuccess();
    const int narrow = std::min(x.width, y.width);
    const bool both_fit = fits(x, narrow) && fits(y, narrow);
    return testing::AssertionFailure() << a_text << " " << op << " " << b_text << " failed\n  " << a_text
                                       << " = " << shown(x, both_fit ? narrow : x.width) << "\n  " << b_text
                                       << " = " << shown(y, both_fit ? narrow : y.width);
  }
};

}  // namespace rotorq::host_check

// The check macros (tests/target/check.hpp says what each does) as GoogleTest assertions; macros,
// because GoogleTest's are.
// NOLINTBEGIN(cppcoreguidelines-macro-usage)
#define ROTORQ_CHECK(cond) EXPECT_TRUE(cond)
#define ROTORQ_CHECK_FALSE(cond) EXPECT_FALSE(cond)
#define ROTORQ_CHECK_EQ(a, b) \
  EXPECT_PRED_FORMAT2(::rotorq::host_check::holds<::rotorq::host_check::relation::eq>{}, a, b)
#define ROTORQ_CHECK_LT(a, b) \
  EXPECT_PRED_FORMAT2(::rotorq::host_check::holds<::rotorq::host_check::relation::lt>{}, a, b)
#define ROTORQ_CHECK_LE(a, b) \
  EXPECT_PRED_FORMAT2(::rotorq::host_check::holds<::rotorq::host_check::relation::le>{}, a, b)
#define ROTORQ_CHECK_GT(a, b) \
  EXPECT_PRED_FORMAT2(::rotorq::host_check::holds<::rotorq::host_check::relation::gt>{}, a, b)
#define ROTORQ_CHECK_GE(a, b) \
  EXPECT_PRED_FORMAT2(::rotorq::host_check::holds<::rotorq::host_check::relation::ge>{}, a, b)
#define ROTORQ_SCOPE(label) SCOPED_TRACE(label)
#define ROTORQ_SCOPE_VALUE(label, value) \
  SCOPED_TRACE(::testing::Message() << (label) << " " << ::rotorq::host_check::shown(value))

// NOLINTEND(cppcoreguidelines-macro-usage)

#include "bad_input_cases.hpp"

// ---- the shared rows: one test each ----------------------------------------------------------------

// NOLINTNEXTLINE(cppcoreguidelines-macro-usage): one TEST per entry of the case list
#define ROTORQ_BAD_INPUT_TEST(name) \
  TEST(BadInput, name) { ::rotorq::bad_input::name(); }
ROTORQ_BAD_INPUT_CASES(ROTORQ_BAD_INPUT_TEST)
#undef ROTORQ_BAD_INPUT_TEST

namespace {

using namespace rotorq;

constexpr double inf = std::numeric_limits<double>::infinity();
constexpr double quiet_nan = std::numeric_limits<double>::quiet_NaN();
constexpr double signalling_nan = std::numeric_limits<double>::signaling_NaN();

// "0x8000 (-32768)": a raw value as two's-complement hex of its format's width and in decimal.
std::string raw_hex(int64_t raw, int bits) {
  const uint64_t mask = bits >= 64 ? ~uint64_t{0} : (uint64_t{1} << bits) - 1;
  std::ostringstream text;
  text << "0x" << std::hex << (static_cast<uint64_t>(raw) & mask) << std::dec << " (" << raw << ")";
  return text.str();
}
template <int N>
std::string raw_hex(turn<N> t) {
  return raw_hex(static_cast<int64_t>(t.raw()), N);
}

// The values the shared cases work out by hand, against the host's double conversions.
TEST(BadInput, SharedCasesHandWorkedValues) {
  EXPECT_EQ(turn32_from_degrees(10.0).raw(), bad_input::turn32_10_degrees);
  EXPECT_EQ(turn32_from_degrees(70.0).raw(), bad_input::turn32_70_degrees);
  EXPECT_EQ(turn32_from_degrees(90.0).raw(), bad_input::turn32_90_degrees);
  EXPECT_EQ(turn32_from_degrees(200.0).raw(), bad_input::turn32_200_degrees);
  EXPECT_EQ(turn32_from_degrees(210.0).raw(), bad_input::turn32_210_degrees);
  EXPECT_EQ(bad_input::max_over_sqrt2<15>, std::llround(bad_input::limits<15>::max * 0.70710678118654752));
  EXPECT_EQ(bad_input::max_over_sqrt2<31>, std::llround(bad_input::limits<31>::max * 0.70710678118654752));
}

// ---- host.hpp --------------------------------------------------------------------------------------

template <typename Q, typename Convert>
void check_from_double(Convert convert) {
  const int F = Q::fraction_bits;
  const int64_t max = Q::raw_max, min = Q::raw_min;
  const auto bits = F + 1;
  const struct {
    double x;
    int64_t raw;
    const char* what;
  } cases[] = {{quiet_nan, 0, "NaN"},
               {-quiet_nan, 0, "-NaN"},
               {signalling_nan, 0, "signalling NaN"},
               {inf, max, "+Inf"},
               {-inf, min, "-Inf"},
               {1.0, max, "1"},
               {-1.0, min, "-1"},
               {std::nextafter(-1.0, -2.0), min, "just below -1"},
               {1e308, max, "1e308"},
               {-1e308, min, "-1e308"},
               {std::numeric_limits<double>::denorm_min(), 0, "smallest subnormal"},
               {-std::numeric_limits<double>::denorm_min(), 0, "negative smallest subnormal"},
               {std::ldexp(0.5, -F), 1, "+1/2 LSB (tie, up)"},
               {std::ldexp(-0.5, -F), 0, "-1/2 LSB (tie, up)"},
               {std::ldexp(static_cast<double>(max) + 0.5, -F), max, "max + 1/2 LSB"}};
  for (const auto& c : cases) {
    EXPECT_EQ(raw_hex(convert(c.x).raw(), bits), raw_hex(c.raw, bits)) << c.what;
  }
}
TEST(BadInput, H1_DoubleToFixedHandlesNanInfAndOutOfRange) {
  SCOPED_TRACE("contract row H1: to_q15(double), to_q31(double)");
  check_from_double<q15>([](double x) { return to_q15(x); });
  check_from_double<q31>([](double x) { return to_q31(x); });
}

TEST(BadInput, H2_ToDoubleIsExactAtTheCorners) {
  SCOPED_TRACE("contract row H2: to_double");
  EXPECT_EQ(to_double(q15::min()), -1.0);
  EXPECT_EQ(to_double(q31::min()), -1.0);
  EXPECT_EQ(to_double(q15::max()), 1.0 - std::ldexp(1.0, -15));
  EXPECT_EQ(to_double(q31::max()), 1.0 - std::ldexp(1.0, -31));
}

TEST(BadInput, H3_AnglesFromNonFiniteOrHugeDoublesAreDefined) {
  SCOPED_TRACE("contract row H3: turn16/32_from_degrees, turn16/32_from_radians");
  for (double x : {quiet_nan, -quiet_nan, inf, -inf}) {
    EXPECT_EQ(raw_hex(turn16_from_degrees(x)), raw_hex(0, 16)) << x;
    EXPECT_EQ(raw_hex(turn32_from_degrees(x)), raw_hex(0, 32)) << x;
    EXPECT_EQ(raw_hex(turn16_from_radians(x)), raw_hex(0, 16)) << x;
    EXPECT_EQ(raw_hex(turn32_from_radians(x)), raw_hex(0, 32)) << x;
  }
  EXPECT_EQ(raw_hex(turn16_from_degrees(360.0)), raw_hex(0, 16));
  EXPECT_EQ(raw_hex(turn16_from_degrees(-90.0)), raw_hex(0xc000, 16));
  // -360 2^40 + 180 is exact in double; fmod keeps the sign: -180 degrees, half a turn
  EXPECT_EQ(raw_hex(turn32_from_degrees(-360.0 * std::ldexp(1.0, 40) + 180.0)), raw_hex(0x80000000, 32));
  // 2^60 degrees: the residue 2^60 mod 360 computed in integers, then its nearest turn32 step
  uint64_t residue = 1;
  for (int k = 0; k < 60; ++k) residue = residue * 2 % 360;
  const auto step = static_cast<int64_t>(std::llround(std::ldexp(static_cast<double>(residue) / 360.0, 32)));
  EXPECT_EQ(raw_hex(turn32_from_degrees(std::ldexp(1.0, 60))), raw_hex(step, 32)) << "residue " << residue;
  // beyond about 1e4 rad, the reduction is by the double nearest 2 pi (documented): defined, and
  // the same as reducing that remainder
  const double huge = 1e300;
  EXPECT_EQ(raw_hex(turn16_from_radians(huge)),
            raw_hex(turn16_from_radians(std::fmod(huge, 6.283185307179586476925286766559))));
}

TEST(BadInput, H4_AngleToDoubleStaysInsideTheHalfOpenRange) {
  SCOPED_TRACE("contract row H4: to_turns, to_degrees, to_radians");
  const turn32 last = turn32::from_raw(0xffffffffu);
  EXPECT_LT(to_turns(last), 1.0);
  EXPECT_LT(to_degrees(last), 360.0);
  EXPECT_LT(to_radians(last), 6.283185307179586476925286766559);
  EXPECT_LT(to_degrees(turn16::from_raw(0xffff)), 360.0);
  EXPECT_EQ(to_degrees(turn16::from_raw(0)), 0.0);
  EXPECT_GT(to_radians(last), 6.28318530);
}

}  // namespace
