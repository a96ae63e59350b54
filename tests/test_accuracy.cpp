// The published accuracy figures: the same sweeps that rotorq-accuracy prints into the README, held
// to their documented bounds, plus the tighter statements of the headers.
#include "rotorq/accuracy/sweeps.hpp"

#include <gtest/gtest.h>

#include <string>

namespace {

using rotorq::accuracy::error_stats;

const std::vector<error_stats>& rows() {
  static const std::vector<error_stats> all = rotorq::accuracy::sweep_all({});
  return all;
}

TEST(Accuracy, EveryFunctionIsWithinItsDocumentedBound) {
  ASSERT_FALSE(rows().empty());
  for (const error_stats& r : rows()) {
    EXPECT_GT(r.samples, 0u) << r.function;
    EXPECT_LE(r.max_abs, r.bound) << r.function << " " << r.format << " worst at " << r.worst_input;
  }
}

TEST(Accuracy, FunctionsDocumentedAsCorrectlyRoundedAre) {
  // fixed.hpp, accumulator.hpp, clarke.hpp, park.hpp, svpwm.hpp (svpwm, sine_pwm): 0.5 LSB plus at most 2^-15
  // LSB for the constants.
  int rows_checked = 0;
  for (const error_stats& r : rows()) {
    if (!r.correctly_rounded) continue;
    ++rows_checked;
    EXPECT_LE(r.max_abs, 0.5 + 1.0 / 32768.0) << r.function << " " << r.format << " at " << r.worst_input;
  }
  EXPECT_EQ(rows_checked, 2 * 12);
}

TEST(Accuracy, SweepsCoverWhatTheReadmeSays) {
  for (const error_stats& r : rows()) {
    if (r.function != "sin_cos") continue;
    const uint64_t angles = r.format == "q15" ? 65536u : 10'000'000u + 7168u;
    EXPECT_EQ(r.samples, 2 * angles) << r.format;
  }
}

}  // namespace
