// Helpers shared by the test suites: how a failing check prints a value, and the raw range of a
// format taken from its raw type (not from the library's constants, which are under test).
#pragma once

#include <algorithm>
#include <cstdint>
#include <iomanip>
#include <limits>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "rotorq/fixed.hpp"
#include "rotorq/turn.hpp"

namespace rotorq::test {

// A sweep stops after this many mismatches, so one broken rule prints a few lines, not a million.
constexpr int max_reported = 10;

// "raw 0x8000 (-32768)": a raw value as two's-complement hex, `bits` wide, and in decimal.
inline std::string raw_hex(int64_t raw, int bits) {
  const uint64_t mask = bits >= 64 ? ~uint64_t{0} : (uint64_t{1} << bits) - 1;
  std::ostringstream text;
  text << "raw 0x" << std::hex << std::setfill('0') << std::setw(bits / 4)
       << (static_cast<uint64_t>(raw) & mask) << std::dec << " (" << raw << ")";
  return text.str();
}
template <int F>
std::string raw_hex(fixed<F> x) {
  return raw_hex(x.raw(), F + 1);
}
template <int N>
std::string raw_hex(turn<N> t) {
  return raw_hex(int64_t{t.raw()}, N);
}

template <typename Q>
constexpr int64_t raw_lo = std::numeric_limits<typename Q::raw_type>::min();
template <typename Q>
constexpr int64_t raw_hi = std::numeric_limits<typename Q::raw_type>::max();

template <typename Q>
int64_t saturated(int64_t exact) {
  return std::clamp(exact, raw_lo<Q>, raw_hi<Q>);
}

template <typename Q>
Q from_wide(int64_t raw) {
  return Q::from_raw(static_cast<typename Q::raw_type>(raw));
}

// A raw value uniform over the whole range, cut from the generator's bits: std::mt19937_64's output
// is fixed by the C++ standard but the std distributions are not, so the same seed gives the same
// inputs with every standard library.
template <typename Q>
Q random_value(std::mt19937_64& rng) {
  const uint64_t bits = rng();
  if constexpr (Q::fraction_bits == 15) {
    return from_wide<Q>(static_cast<int64_t>(bits >> 48) - 32768);
  } else {
    return from_wide<Q>(static_cast<int64_t>(bits >> 32) - 2147483648);
  }
}

// Edge values of a format: min, min + 1, -1, 0, 1, max - 1, max, and +-2^k, +-2^k +- 1.
template <typename Q>
std::vector<Q> edge_values() {
  // cppcheck reads the variable templates raw_lo<Q>, raw_hi<Q> as comparisons here
  // cppcheck-suppress compareBoolExpressionWithInt
  std::vector<int64_t> raws = {raw_lo<Q>, raw_lo<Q> + 1, -1, 0, 1, raw_hi<Q> - 1, raw_hi<Q>};
  for (int k = 1; k < Q::fraction_bits; ++k) {
    const int64_t p = int64_t{1} << k;
    for (const int64_t v : {p - 1, p, p + 1, -p - 1, -p, -p + 1}) raws.push_back(v);
  }
  std::sort(raws.begin(), raws.end());
  raws.erase(std::unique(raws.begin(), raws.end()), raws.end());
  std::vector<Q> values;
  for (const int64_t raw : raws) values.push_back(from_wide<Q>(raw));
  return values;
}

}  // namespace rotorq::test
