// Fuzz target: park and inverse_park (rotorq/park.hpp) in q15 and q31 on raw input bytes.
// Given an arbitrary sin_cos_pair (malformed pairs with |(sin, cos)| up to sqrt(2) included), every
// output must be exactly the correctly rounded value of the exact sum of products (nearest, ties
// toward +infinity), saturated, as park.hpp states: checked against 128-bit integers, and against
// the double twin (rotorq::ref) within 0.5 LSB (plus 2^-20 LSB for q31, where the twin's products
// round). With the pair from rotorq::sin_cos and the exact rotation of the double twin, the error is
// at most 0.5 + E |v| LSB with E = 1.12 (q15), 1.5 (q31) (park.hpp).
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/host.hpp"
#include "rotorq/park.hpp"
#include "rotorq/ref/park.hpp"
#include "rotorq/ref/ref.hpp"
#include "rotorq/sin_cos.hpp"

namespace {

using namespace rotorq;
using fuzz::check;
using fuzz::lsb_error;
using fuzz::round_clamp;
using fuzz::wide;

template <int F>
void exact_output(fixed<F> got, wide sum_of_products, double twin, const char* what, int64_t x, int64_t y,
                  int64_t s, int64_t c) {
  check(got.raw() == round_clamp<F>(sum_of_products, F), what, x, y, s, c);
  const double slack = F == 15 ? 0.0 : 1.0 / 1048576.0;
  check(std::fabs(lsb_error(got, twin)) <= 0.5 + slack, what, x, y, s, c);
}

template <int N, int F>
void check_format(fuzz::byte_reader& in) {
  using Q = fixed<F>;
  const Q x = fuzz::take_fixed<F>(in), y = fuzz::take_fixed<F>(in);
  const sin_cos_pair<Q> pair{fuzz::take_fixed<F>(in), fuzz::take_fixed<F>(in)};
  const wide rx = x.raw(), ry = y.raw(), rs = pair.sin.raw(), rc = pair.cos.raw();
  const int64_t ix = x.raw(), iy = y.raw(), is = pair.sin.raw(), ic = pair.cos.raw();
  const sin_cos_pair<double> pair_d = ref::to_double(pair);

  const rotating<Q> r = park(stationary<Q>{x, y}, pair);
  const rotating<double> rd = ref::park({to_double(x), to_double(y)}, pair_d);
  exact_output(r.d, rx * rc + ry * rs, rd.d, "park d is correctly rounded", ix, iy, is, ic);
  exact_output(r.q, -rx * rs + ry * rc, rd.q, "park q is correctly rounded", ix, iy, is, ic);

  const stationary<Q> s = inverse_park(rotating<Q>{x, y}, pair);
  const stationary<double> sd = ref::inverse_park({to_double(x), to_double(y)}, pair_d);
  exact_output(s.alpha, rx * rc - ry * rs, sd.alpha, "inverse_park alpha is correctly rounded", ix, iy, is,
               ic);
  exact_output(s.beta, rx * rs + ry * rc, sd.beta, "inverse_park beta is correctly rounded", ix, iy, is, ic);

  // with the library's own sine and cosine of an angle: 0.5 + E |v|
  const turn<N> angle = turn<N>::from_raw(in.take<typename turn<N>::raw_type>());
  const sin_cos_pair<Q> own = sin_cos(angle);
  const sin_cos_pair<double> exact_pair = ref::sin_cos(angle);
  const double e = F == 15 ? 1.12 : 1.5;
  const double length = std::hypot(to_double(x), to_double(y));
  const double allowed = 0.5 + e * length + 1e-6;
  const rotating<Q> r_own = park(stationary<Q>{x, y}, own);
  const rotating<double> r_exact = ref::park({to_double(x), to_double(y)}, exact_pair);
  const auto raw_angle = static_cast<int64_t>(angle.raw());
  check(std::fabs(lsb_error(r_own.d, r_exact.d)) <= allowed, "park(sin_cos) d within 0.5 + E|v|", ix, iy,
        raw_angle);
  check(std::fabs(lsb_error(r_own.q, r_exact.q)) <= allowed, "park(sin_cos) q within 0.5 + E|v|", ix, iy,
        raw_angle);
  const stationary<Q> s_own = inverse_park(rotating<Q>{x, y}, own);
  const stationary<double> s_exact = ref::inverse_park({to_double(x), to_double(y)}, exact_pair);
  check(std::fabs(lsb_error(s_own.alpha, s_exact.alpha)) <= allowed,
        "inverse_park(sin_cos) alpha within 0.5 + E|v|", ix, iy, raw_angle);
  check(std::fabs(lsb_error(s_own.beta, s_exact.beta)) <= allowed,
        "inverse_park(sin_cos) beta within 0.5 + E|v|", ix, iy, raw_angle);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  check_format<16, 15>(in);
  check_format<32, 31>(in);
  return 0;
}
