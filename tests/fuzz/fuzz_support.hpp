// Shared by the fuzz targets: reading typed values from the fuzzer's raw bytes, the exact reference
// rounding, and failing loudly. A failed check prints what was checked and the inputs as raw hex,
// then aborts, which libFuzzer reports as a crash and saves the input.
#pragma once

#include <array>
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>
#include <cstring>

#include "rotorq/fixed.hpp"

namespace rotorq::fuzz {

// Reads fixed-size values from the input; past its end every byte reads as zero, so short inputs
// still exercise every call (zero is a valid value of every type).
class byte_reader {
 public:
  byte_reader(const uint8_t* data, size_t size) : data_(data), size_(size) {}

  template <typename T>
  T take() {
    std::array<unsigned char, sizeof(T)> bytes{};
    for (unsigned char& byte : bytes) {
      if (offset_ < size_) byte = data_[offset_];
      ++offset_;
    }
    T value{};
    std::memcpy(&value, bytes.data(), sizeof(T));
    return value;
  }
  bool exhausted() const { return offset_ >= size_; }

 private:
  const uint8_t* data_;
  size_t size_;
  size_t offset_ = 0;
};

template <int F>
fixed<F> take_fixed(byte_reader& in) {
  return fixed<F>::from_raw(in.take<typename fixed<F>::raw_type>());
}

[[noreturn]] inline void fail(const char* what) {
  (void)std::fprintf(stderr, "fuzz check failed: %s\n", what);
  std::abort();
}

// Prints the failed check with up to four raw values (hex) that identify the input.
inline void check(bool ok, const char* what, int64_t v0 = 0, int64_t v1 = 0, int64_t v2 = 0, int64_t v3 = 0) {
  if (ok) return;
  (void)std::fprintf(stderr, "inputs: 0x%llx 0x%llx 0x%llx 0x%llx\n", static_cast<unsigned long long>(v0),
                     static_cast<unsigned long long>(v1), static_cast<unsigned long long>(v2),
                     static_cast<unsigned long long>(v3));
  fail(what);
}

using wide = __int128;  // host-only exact reference

// floor(n / 2^shift) for any 128-bit n, written as a division with an explicit floor (not a shift),
// so it does not share the library's code path.
inline wide floor_div_pow2(wide n, int shift) {
  const wide d = static_cast<wide>(1) << shift;
  const wide q = n / d;
  return (n % d != 0 && n < 0) ? q - 1 : q;
}

// The specified rounding of n / 2^shift (nearest, ties toward +infinity), clamped into format F.
template <int F>
int64_t round_clamp(wide n, int shift) {
  const wide rounded = floor_div_pow2(n + (static_cast<wide>(1) << (shift - 1)), shift);
  if (rounded > fixed<F>::raw_max) return fixed<F>::raw_max;
  if (rounded < fixed<F>::raw_min) return fixed<F>::raw_min;
  return static_cast<int64_t>(rounded);
}

// Error of a result against the exact (clamped) real value, in LSB of format F
// (the error convention of host_sim/accuracy/sweeps.hpp).
template <int F>
double lsb_error(fixed<F> got, double exact) {
  const double scaled = std::ldexp(exact, F);
  const double target = std::fmin(std::fmax(scaled, static_cast<double>(fixed<F>::raw_min)),
                                  static_cast<double>(fixed<F>::raw_max));
  return static_cast<double>(got.raw()) - target;
}

}  // namespace rotorq::fuzz
