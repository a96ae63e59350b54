// Fuzz target: binary angles turn16 and turn32 (rotorq/turn.hpp) on raw input bytes.
// Checks: no sanitizer report; + - and unary - are arithmetic modulo 2^N (computed here in 64 bits);
// signed_difference lies in [-2^(N-1), 2^(N-1)), is congruent to to - from, and advance() undoes it;
// to_turn32 is exact and to_turn16 rounds to the nearest step (ties toward +infinity) modulo one
// turn; and the double twins (rotorq::ref::add_turns, signed_difference_turns) agree exactly, as
// they must for these dyadic values.
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/host.hpp"
#include "rotorq/ref/turn.hpp"
#include "rotorq/turn.hpp"

namespace {

using namespace rotorq;
using fuzz::check;

template <int N>
void check_format(fuzz::byte_reader& in) {
  using T = turn<N>;
  using raw_type = typename T::raw_type;
  using difference_type = typename T::difference_type;
  const T a = T::from_raw(in.take<raw_type>()), b = T::from_raw(in.take<raw_type>());
  const auto steps = static_cast<difference_type>(in.take<raw_type>());
  const uint64_t one_turn = uint64_t{1} << N;
  const uint64_t ra = a.raw(), rb = b.raw();
  const auto raw64 = [](T t) { return static_cast<int64_t>(t.raw()); };

  check((a + b).raw() == (ra + rb) % one_turn, "a + b wraps modulo one turn", raw64(a), raw64(b));
  check((a - b).raw() == (ra + one_turn - rb) % one_turn, "a - b wraps modulo one turn", raw64(a), raw64(b));
  check((-a).raw() == (one_turn - ra) % one_turn, "-a wraps modulo one turn", raw64(a));
  T compound = a;
  compound += b;
  compound -= b;
  check(compound == a, "(a += b) -= b gives a back", raw64(a), raw64(b));

  const difference_type d = signed_difference(a, b);
  const int64_t half = int64_t{1} << (N - 1);
  check(d >= -half && d < half, "signed_difference in [-half turn, half turn)", raw64(a), raw64(b));
  check((static_cast<uint64_t>(int64_t{d} + static_cast<int64_t>(one_turn)) % one_turn) ==
            (ra + one_turn - rb) % one_turn,
        "signed_difference is congruent to a - b", raw64(a), raw64(b));
  check(advance(b, d) == a, "advance(b, signed_difference(a, b)) == a", raw64(a), raw64(b));
  check(signed_difference(advance(a, steps), a) == steps, "signed_difference(advance(a, s), a) == s",
        raw64(a), steps);

  // the double twins, exact for dyadic fractions of a turn
  const double ta = to_turns(a), tb = to_turns(b);
  check(ta >= 0.0 && ta < 1.0, "to_turns in [0, 1)", raw64(a));
  check(to_turns(a + b) == ref::add_turns(ta, tb), "a + b vs ref::add_turns", raw64(a), raw64(b));
  check(std::ldexp(static_cast<double>(d), -N) == ref::signed_difference_turns(ta, tb),
        "signed_difference vs ref::signed_difference_turns", raw64(a), raw64(b));

  if constexpr (N == 16) {
    check(to_turn16(to_turn32(a)) == a, "to_turn16(to_turn32(a)) == a", raw64(a));
    check(to_turn32(a).raw() == ra * 65536, "to_turn32 is exact", raw64(a));
  } else {
    const uint64_t rounded = ((ra + 0x8000) >> 16) % 65536;  // nearest step, ties up, modulo one turn
    check(to_turn16(a).raw() == rounded, "to_turn16 rounds half up modulo one turn", raw64(a));
  }
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  check_format<16>(in);
  check_format<32>(in);
  return 0;
}
