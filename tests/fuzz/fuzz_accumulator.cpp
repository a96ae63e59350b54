// Fuzz target: accumulator<q15> and accumulator<q31> (rotorq/accumulator.hpp) driven by a program
// read from the input bytes: each step is an operation byte (mac, msc, add, result, clear, or a run
// of up to 64 repeated full-scale products to drive the 64-bit sum past 2^63 and back) and its
// operands. Checks: no sanitizer report, and every result() equals the exact 128-bit sum rounded
// once (nearest, ties toward +infinity) and saturated, as accumulator.hpp states, also while the
// intermediate sum is far outside the q range. The double twin cannot hold these sums exactly
// (host_sim/reference fixed.hpp says so), so the exact integer sum is the reference here; the
// ordinary sweep against the twin is in host_sim/accuracy.
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/accumulator.hpp"

namespace {

using namespace rotorq;
using fuzz::check;
using fuzz::wide;

template <int F>
void run(fuzz::byte_reader& in, int steps) {
  using Q = fixed<F>;
  accumulator<Q> acc;
  wide exact = 0;  // at 2F fraction bits; at most 4096 steps of 64 products of 2^62: far below 2^127
  const auto check_result = [&](uint8_t op) {
    const Q got = acc.result();
    const int64_t want = fuzz::round_clamp<F>(exact, F);
    check(got.raw() == want, "accumulator result() is the exact sum rounded once and saturated", got.raw(),
          want, static_cast<int64_t>(exact >> 64), op);
  };
  for (int step = 0; step < steps && !in.exhausted(); ++step) {
    const uint8_t op = in.take<uint8_t>();
    const Q a = fuzz::take_fixed<F>(in), b = fuzz::take_fixed<F>(in);
    switch (op % 6) {
      case 0:
        acc.mac(a, b);
        exact += wide{a.raw()} * b.raw();
        break;
      case 1:
        acc.msc(a, b);
        exact -= wide{a.raw()} * b.raw();
        break;
      case 2:
        acc.add(a);
        exact += wide{a.raw()} * (static_cast<wide>(1) << F);
        break;
      case 3:
        check_result(op);
        break;
      case 4: {
        // a run of extreme products: -1 * -1 = +1 or -1 * max, repeated
        const int count = 1 + (op >> 3) % 64;
        const Q x = Q::min(), y = (op & 0x80) ? Q::min() : Q::max();
        for (int k = 0; k < count; ++k) {
          acc.mac(x, y);
          exact += wide{x.raw()} * y.raw();
        }
        break;
      }
      default:
        acc.clear();
        exact = 0;
        break;
    }
  }
  check_result(0xff);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  if (size == 0) return 0;
  // the first byte picks the format; the rest is the program
  fuzz::byte_reader in(data + 1, size - 1);
  if (data[0] & 1) {
    run<31>(in, 4096);
  } else {
    run<15>(in, 4096);
  }
  return 0;
}
