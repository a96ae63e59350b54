// Every Q62 constant in rotorq/constants.hpp, and its q15/q31 roundings, against MPFR.
#include "rotorq/constants.hpp"

#include <gtest/gtest.h>

#include <cstdio>
#include <functional>
#include <string>

#include "mpfr_oracle.hpp"

namespace {

using rotorq::test::mpfr_value;

struct constant_case {
  const char* name;
  uint64_t q62;
  std::function<void(mpfr_ptr)> exact;  // MPFR evaluation of the definition
};

std::string hex(uint64_t v) {
  char text[24];
  std::snprintf(text, sizeof text, "0x%016llx", static_cast<unsigned long long>(v));
  return text;
}

TEST(Constants, Q62ValuesAreCorrectlyRoundedAccordingToMpfr) {
  namespace k = rotorq::constants;
  const constant_case cases[] = {
      {"pi", k::pi, [](mpfr_ptr x) { mpfr_const_pi(x, MPFR_RNDN); }},
      {"inv_sqrt3", k::inv_sqrt3,
       [](mpfr_ptr x) {
         mpfr_set_ui(x, 3, MPFR_RNDN);
         mpfr_rec_sqrt(x, x, MPFR_RNDN);
       }},
      {"sqrt3_over_2", k::sqrt3_over_2,
       [](mpfr_ptr x) {
         mpfr_sqrt_ui(x, 3, MPFR_RNDN);
         mpfr_div_2ui(x, x, 1, MPFR_RNDN);
       }},
      {"inv_sqrt2", k::inv_sqrt2,
       [](mpfr_ptr x) {
         mpfr_set_ui(x, 2, MPFR_RNDN);
         mpfr_rec_sqrt(x, x, MPFR_RNDN);
       }},
      {"sqrt2_over_3", k::sqrt2_over_3,
       [](mpfr_ptr x) {
         mpfr_set_ui(x, 2, MPFR_RNDN);
         mpfr_div_ui(x, x, 3, MPFR_RNDN);
         mpfr_sqrt(x, x, MPFR_RNDN);
       }},
      {"inv_sqrt6", k::inv_sqrt6,
       [](mpfr_ptr x) {
         mpfr_set_ui(x, 6, MPFR_RNDN);
         mpfr_rec_sqrt(x, x, MPFR_RNDN);
       }},
      {"one_third", k::one_third,
       [](mpfr_ptr x) {
         mpfr_set_ui(x, 1, MPFR_RNDN);
         mpfr_div_ui(x, x, 3, MPFR_RNDN);
       }},
      {"two_thirds", k::two_thirds,
       [](mpfr_ptr x) {
         mpfr_set_ui(x, 2, MPFR_RNDN);
         mpfr_div_ui(x, x, 3, MPFR_RNDN);
       }},
  };
  for (const constant_case& c : cases) {
    mpfr_value exact;
    c.exact(exact.get());
    const uint64_t want = rotorq::test::round_scaled(exact.get(), 62);
    EXPECT_EQ(c.q62, want) << c.name << ": have " << hex(c.q62) << ", MPFR gives " << hex(want);
    if (c.q62 < (uint64_t{1} << 62)) {  // below 1: representable in q15 and q31
      const auto q15_raw = static_cast<int64_t>(rotorq::test::round_scaled(exact.get(), 15));
      const auto q31_raw = static_cast<int64_t>(rotorq::test::round_scaled(exact.get(), 31));
      EXPECT_EQ(rotorq::constant<rotorq::q15>(c.q62).raw(), q15_raw) << c.name;
      EXPECT_EQ(rotorq::constant<rotorq::q31>(c.q62).raw(), q31_raw) << c.name;
    } else {
      EXPECT_EQ(rotorq::constant<rotorq::q15>(c.q62), rotorq::q15::max()) << c.name;
      EXPECT_EQ(rotorq::constant<rotorq::q31>(c.q62), rotorq::q31::max()) << c.name;
    }
  }
}

TEST(Constants, RoundingIntoAFormatIsTiesTowardPlusInfinityAndSaturates) {
  // 0.5 LSB of q15 above 1/4: 2^60 + 2^46 in Q62 rounds up; one below it rounds down.
  const uint64_t quarter = uint64_t{1} << 60;
  EXPECT_EQ(rotorq::constant<rotorq::q15>(quarter + (uint64_t{1} << 46)).raw(), 8193);
  EXPECT_EQ(rotorq::constant<rotorq::q15>(quarter + (uint64_t{1} << 46) - 1).raw(), 8192);
  EXPECT_EQ(rotorq::constant<rotorq::q31>(~uint64_t{0}), rotorq::q31::max());
  EXPECT_EQ(rotorq::constant<rotorq::q15>((uint64_t{1} << 62) - 1), rotorq::q15::max());
}

}  // namespace
