// Fuzz target: the modulators and what feeds them, in q15 and q31 on raw input bytes:
// svpwm (overmodulation::circle and ::hexagon), sine_pwm, six_step (svpwm.hpp), limit_magnitude and
// limit_d_priority (voltage_limit.hpp), bus_normalizer (dc_bus.hpp) and duty_to_compare
// (pwm_compare.hpp). Every request is accepted, however large or malformed, so the checks are:
//   - duties in [0, max], sectors 1..6, the flags as the headers define them (checked exactly with
//     128-bit integers where the rule is exact, against the double twin away from its edges);
//   - the distance to the double twins (rotorq::ref, ref/svpwm.hpp) within the documented bounds,
//     the figures of namespace bound in host_sim/accuracy/include/rotorq/accuracy/sweeps.hpp:
//     svpwm_linear, overmodulation_q15/_q31, limiter_q15/_q31; the bus within its header's
//     0.5 LSB + |result| 2^-29;
//   - compare values <= period, equal to the exact rounding, and no pulse in (0, min_pulse) or
//     (period - min_pulse, period) after clipping.
#include <cmath>
#include <cstddef>
#include <cstdint>

#include "fuzz_support.hpp"
#include "rotorq/accuracy/sweeps.hpp"
#include "rotorq/constants.hpp"
#include "rotorq/dc_bus.hpp"
#include "rotorq/host.hpp"
#include "rotorq/pwm_compare.hpp"
#include "rotorq/ref/clarke.hpp"
#include "rotorq/ref/svpwm.hpp"
#include "rotorq/svpwm.hpp"
#include "rotorq/voltage_limit.hpp"

namespace {

using namespace rotorq;
using fuzz::check;
using fuzz::lsb_error;
using fuzz::wide;

// The documented bounds (LSB), from their one definition.
constexpr double svpwm_linear = accuracy::bound::svpwm_linear;
template <int F>
constexpr double overmodulation_bound =
    F == 15 ? accuracy::bound::overmodulation_q15 : accuracy::bound::overmodulation_q31;
template <int F>
constexpr double limiter_bound = F == 15 ? accuracy::bound::limiter_q15 : accuracy::bound::limiter_q31;
// Angles closer than this (radians) to a sector boundary, or a phase voltage closer than this to
// zero (per unit), are where the fixed-point and the double answers may differ legitimately.
constexpr double edge_margin = 1e-3;

template <int F>
bool duties_in_range(const modulation<fixed<F>>& m) {
  return m.duty.a.raw() >= 0 && m.duty.b.raw() >= 0 && m.duty.c.raw() >= 0;  // <= max by type
}

// Distance of the angle of (alpha, beta) to the nearest multiple of 60 degrees, in radians.
double distance_to_sector_edge(double alpha, double beta) {
  double theta = std::atan2(beta, alpha);
  if (theta < 0) theta += 2 * M_PI;
  const double within = std::fmod(theta, M_PI / 3);
  return std::fmin(within, M_PI / 3 - within);
}

template <int F>
void check_duties_near(const modulation<fixed<F>>& got, const ref::modulation_result& twin, double bound,
                       const char* what, int64_t x, int64_t y) {
  check(std::fabs(lsb_error(got.duty.a, twin.duty.a)) <= bound, what, x, y, got.duty.a.raw());
  check(std::fabs(lsb_error(got.duty.b, twin.duty.b)) <= bound, what, x, y, got.duty.b.raw());
  check(std::fabs(lsb_error(got.duty.c, twin.duty.c)) <= bound, what, x, y, got.duty.c.raw());
}

template <int F>
void check_svpwm(stationary<fixed<F>> v) {
  const int64_t x = v.alpha.raw(), y = v.beta.raw();
  const stationary<double> vd{to_double(v.alpha), to_double(v.beta)};
  const double length = std::hypot(vd.alpha, vd.beta);

  // circle: limited exactly when |v| > the radius 1/sqrt(3) rounded down (svpwm.hpp)
  const modulation<fixed<F>> circle = svpwm(v, overmodulation::circle);
  check(duties_in_range(circle), "svpwm(circle) duties in [0, max]", x, y);
  check(circle.sector >= 1 && circle.sector <= 6, "svpwm(circle) sector in 1..6", x, y, circle.sector);
  const wide radius = static_cast<wide>(constants::inv_sqrt3 >> (62 - F));
  const bool beyond_circle = static_cast<wide>(x) * x + static_cast<wide>(y) * y > radius * radius;
  check(circle.limited == beyond_circle, "svpwm(circle) limited exactly beyond the circle", x, y,
        circle.limited);
  const ref::modulation_result circle_twin = ref::svpwm_min_max(vd, true);
  check_duties_near(circle, circle_twin, beyond_circle ? overmodulation_bound<F> : svpwm_linear,
                    "svpwm(circle) duties within the documented bound of the twin", x, y);
  const double lsb = std::ldexp(1.0, -F);
  if (length > 8 * lsb && distance_to_sector_edge(vd.alpha, vd.beta) > edge_margin) {
    check(circle.sector == circle_twin.sector, "svpwm(circle) sector is the twin's", x, y, circle.sector);
  }

  // hexagon: unchanged inside the hexagon (spread <= 1), scaled onto its edge beyond it
  const modulation<fixed<F>> hexagon = svpwm(v, overmodulation::hexagon);
  check(duties_in_range(hexagon), "svpwm(hexagon) duties in [0, max]", x, y);
  check(hexagon.sector >= 1 && hexagon.sector <= 6, "svpwm(hexagon) sector in 1..6", x, y, hexagon.sector);
  const phases<double> p = ref::inverse_clarke(vd);
  const double spread = std::fmax(p.a, std::fmax(p.b, p.c)) - std::fmin(p.a, std::fmin(p.b, p.c));
  if (std::fabs(spread - 1.0) > edge_margin) {
    check(hexagon.limited == (spread > 1.0), "svpwm(hexagon) limited exactly beyond the hexagon", x, y,
          hexagon.limited);
  }
  const ref::modulation_result hexagon_twin = ref::svpwm_min_max(vd, false);
  check_duties_near(hexagon, hexagon_twin, hexagon.limited ? overmodulation_bound<F> : svpwm_linear,
                    "svpwm(hexagon) duties within the documented bound of the twin", x, y);
  if (!hexagon.limited) {
    // inside the hexagon the circle mode must agree wherever it did not limit either
    if (!circle.limited) {
      check(hexagon.duty.a == circle.duty.a && hexagon.duty.b == circle.duty.b &&
                hexagon.duty.c == circle.duty.c,
            "svpwm: the modes agree in the linear range", x, y);
    }
  }
  if (length > 8 * lsb && distance_to_sector_edge(vd.alpha, vd.beta) > edge_margin) {
    check(hexagon.sector == hexagon_twin.sector, "svpwm(hexagon) sector is the twin's", x, y, hexagon.sector);
  }
}

template <int F>
void check_sine_and_six_step(stationary<fixed<F>> v) {
  const int64_t x = v.alpha.raw(), y = v.beta.raw();
  const stationary<double> vd{to_double(v.alpha), to_double(v.beta)};
  const phases<double> p = ref::inverse_clarke(vd);

  const modulation<fixed<F>> sine = sine_pwm(v);
  check(duties_in_range(sine), "sine_pwm duties in [0, max]", x, y);
  check(sine.sector >= 1 && sine.sector <= 6, "sine_pwm sector in 1..6", x, y, sine.sector);
  const ref::modulation_result sine_twin = ref::sine_pwm(vd);
  // one rounding of exact wide values, as svpwm's linear range (svpwm.hpp states no separate figure)
  check_duties_near(sine, sine_twin, svpwm_linear, "sine_pwm duties within svpwm_linear of the twin", x, y);
  const double largest = std::fmax(std::fabs(p.a), std::fmax(std::fabs(p.b), std::fabs(p.c)));
  if (std::fabs(largest - 0.5) > edge_margin) {
    check(sine.limited == (largest > 0.5), "sine_pwm limited exactly when a phase leaves [-1/2, 1/2]", x, y,
          sine.limited);
  }

  const modulation<fixed<F>> six = six_step(v);
  check(!six.limited, "six_step never reports limited", x, y);
  check(six.sector >= 1 && six.sector <= 6, "six_step sector in 1..6", x, y, six.sector);
  const auto on_or_off = [](fixed<F> d) { return d == fixed<F>::zero() || d == fixed<F>::max(); };
  check(on_or_off(six.duty.a) && on_or_off(six.duty.b) && on_or_off(six.duty.c),
        "six_step duties are 0 or max", x, y);
  const phases<double> six_twin = ref::six_step(vd);
  const double margin = 2 * std::ldexp(1.0, -F);
  const auto agrees = [&](fixed<F> d, double twin_duty, double phase) {
    return std::fabs(phase) <= margin || (d == fixed<F>::max()) == (twin_duty == 1.0);
  };
  check(agrees(six.duty.a, six_twin.a, p.a) && agrees(six.duty.b, six_twin.b, p.b) &&
            agrees(six.duty.c, six_twin.c, p.c),
        "six_step switches as the twin", x, y);
  // V_k points at (k - 1) 60 degrees; the square wave applies the active vector nearest v
  const double length = std::hypot(vd.alpha, vd.beta);
  if (length > 8 * std::ldexp(1.0, -F)) {
    double theta = std::atan2(vd.beta, vd.alpha);
    if (theta < 0) theta += 2 * M_PI;
    const double from_vector = std::remainder(theta - (six.sector - 1) * M_PI / 3, 2 * M_PI);
    check(std::fabs(from_vector) <= M_PI / 6 + edge_margin, "six_step sector is the nearest active vector", x,
          y, six.sector);
  }
}

template <int F>
void check_limiters(fuzz::byte_reader& in) {
  const fixed<F> a = fuzz::take_fixed<F>(in), b = fuzz::take_fixed<F>(in), m = fuzz::take_fixed<F>(in);
  const int64_t x = a.raw(), y = b.raw(), mr = m.raw();
  const double limit = std::fmax(to_double(m), 0.0);
  const wide limit_raw = mr > 0 ? mr : 0;
  const bool beyond = static_cast<wide>(x) * x + static_cast<wide>(y) * y > limit_raw * limit_raw;
  const double slack = limiter_bound<F>;

  const limited<stationary<fixed<F>>> s = limit_magnitude(stationary<fixed<F>>{a, b}, m);
  check(s.clipped == beyond, "limit_magnitude clipped exactly when |v| > max(m, 0)", x, y, mr, s.clipped);
  if (!beyond)
    check(s.value.alpha == a && s.value.beta == b, "limit_magnitude leaves v inside alone", x, y, mr);
  const stationary<double> st = ref::limit_magnitude({to_double(a), to_double(b)}, to_double(m));
  check(std::fabs(lsb_error(s.value.alpha, st.alpha)) <= slack, "limit_magnitude alpha within limiter bound",
        x, y, mr, s.value.alpha.raw());
  check(std::fabs(lsb_error(s.value.beta, st.beta)) <= slack, "limit_magnitude beta within limiter bound", x,
        y, mr, s.value.beta.raw());
  const double out = std::hypot(to_double(s.value.alpha), to_double(s.value.beta));
  check(!beyond || out <= limit + std::sqrt(2.0) * slack * std::ldexp(1.0, -F),
        "limit_magnitude output no longer than the limit plus its error", x, y, mr);

  const limited<rotating<fixed<F>>> r = limit_magnitude(rotating<fixed<F>>{a, b}, m);
  check(r.clipped == s.clipped && r.value.d == s.value.alpha && r.value.q == s.value.beta,
        "limit_magnitude: the rotating overload equals the stationary one", x, y, mr);

  const limited<rotating<fixed<F>>> p = limit_d_priority(rotating<fixed<F>>{a, b}, m);
  const rotating<double> pt = ref::limit_d_priority({to_double(a), to_double(b)}, to_double(m));
  const int64_t d_clamped = x > limit_raw    ? static_cast<int64_t>(limit_raw)
                            : x < -limit_raw ? -static_cast<int64_t>(limit_raw)
                                             : x;
  check(p.value.d.raw() == d_clamped, "limit_d_priority clamps d exactly to [-m, m]", x, y, mr,
        p.value.d.raw());
  check(std::fabs(lsb_error(p.value.q, pt.q)) <= slack, "limit_d_priority q within limiter bound", x, y, mr,
        p.value.q.raw());
  check(p.clipped == (p.value.d != a || p.value.q != b), "limit_d_priority clipped exactly when changed", x,
        y, mr, p.clipped);
  check(std::llabs(int64_t{p.value.q.raw()}) <= std::llabs(y), "limit_d_priority never lengthens q", x, y,
        mr);
}

template <int F>
void check_bus(fuzz::byte_reader& in) {
  using Q = fixed<F>;
  const Q minimum = fuzz::take_fixed<F>(in), bus = fuzz::take_fixed<F>(in), v = fuzz::take_fixed<F>(in),
          w = fuzz::take_fixed<F>(in);
  const int64_t mr = minimum.raw(), br = bus.raw(), vr = v.raw();
  bus_normalizer<Q> n(minimum);
  check(!n.valid() && n.normalize(v) == Q::zero(), "bus_normalizer is invalid before update", mr, br, vr);
  const bool expected_valid = br > (mr > 0 ? mr : 1);  // a minimum <= 0 counts as one raw step
  const bool valid = n.update(bus);
  check(valid == expected_valid && n.valid() == valid, "bus_normalizer valid exactly above the minimum", mr,
        br, valid);
  const Q got = n.normalize(v);
  if (!valid) {
    check(got == Q::zero(), "bus_normalizer gives zero while invalid", mr, br, vr, got.raw());
  } else {
    const double exact = ref::normalize_to_bus(to_double(v), to_double(bus), to_double(minimum));
    const double clamped = std::fmin(std::fabs(exact), 1.0);
    const double allowed = 0.5 + std::ldexp(clamped, F - 29) + 1e-9;  // dc_bus.hpp
    check(std::fabs(lsb_error(got, exact)) <= allowed, "bus_normalizer within 0.5 LSB + |result| 2^-29", mr,
          br, vr, got.raw());
  }
  const stationary<Q> s = n.normalize(stationary<Q>{v, w});
  const rotating<Q> r = n.normalize(rotating<Q>{v, w});
  check(s.alpha == got && s.beta == n.normalize(w) && r.d == got && r.q == s.beta,
        "bus_normalizer vector overloads equal the scalar one", mr, br, vr);
}

// round(duty period / 2^F), ties up, duty clamped to [0, max]: exact, in 128-bit integers.
template <int F>
wide exact_compare(fixed<F> duty, uint32_t period) {
  const wide d = duty.raw() > 0 ? duty.raw() : 0;
  return fuzz::floor_div_pow2(d * period + (static_cast<wide>(1) << (F - 1)), F);
}

template <int F>
void check_compare(fuzz::byte_reader& in) {
  const phases<fixed<F>> duty{fuzz::take_fixed<F>(in), fuzz::take_fixed<F>(in), fuzz::take_fixed<F>(in)};
  auto period = in.take<uint32_t>();
  auto min_pulse = in.take<uint32_t>();
  // one byte picks small periods and pulses often, where the clipping cases crowd together
  const auto shape = in.take<uint8_t>();
  if ((shape & 1) != 0) period &= 0xffu;
  if ((shape & 2) != 0) min_pulse &= 0xffu;
  const auto p = static_cast<int64_t>(period), mp = static_cast<int64_t>(min_pulse);
  const uint32_t pulse = min_pulse < period / 2 ? min_pulse : period / 2;  // pwm_compare.hpp

  const compare_values plain = duty_to_compare(duty, period);
  const compare_values clipped = duty_to_compare(duty, period, min_pulse);
  check(!plain.clipped, "duty_to_compare without min_pulse never clips", p);
  const uint32_t plain_c[3] = {plain.compare.a, plain.compare.b, plain.compare.c};
  const uint32_t clipped_c[3] = {clipped.compare.a, clipped.compare.b, clipped.compare.c};
  const fixed<F> duties[3] = {duty.a, duty.b, duty.c};
  bool changed = false;
  for (int k = 0; k < 3; ++k) {
    const int64_t c = plain_c[k], r = clipped_c[k], d = duties[k].raw();
    check(c == static_cast<int64_t>(exact_compare(duties[k], period)), "duty_to_compare rounds exactly", d, p,
          c);
    check(c <= p && r <= p, "duty_to_compare compare <= period", d, p, mp, r);
    check(r == 0 || r >= pulse, "no pulse shorter than min_pulse after clipping", d, p, mp, r);
    check(r == p || p - r >= pulse, "no gap shorter than min_pulse after clipping", d, p, mp, r);
    // the nearer of removing and widening: the change is at most half the pulse (rounded up)
    check(2 * std::llabs(r - c) <= static_cast<int64_t>(pulse) + 1, "clipping moves to the nearer end", d, p,
          mp, r);
    if (uint64_t{period} < (uint64_t{1} << (52 - F))) {  // duty * period exact in double: the twin is exact
      const double twin = ref::duty_to_compare(to_double(duties[k]), static_cast<double>(period),
                                               static_cast<double>(min_pulse));
      check(static_cast<double>(r) == twin, "duty_to_compare equals the twin", d, p, mp, r);
    }
    changed = changed || r != c;
  }
  check(clipped.clipped == changed, "duty_to_compare clipped exactly when a value changed", p, mp);
  if (period == 0)
    check(clipped_c[0] == 0 && clipped_c[1] == 0 && clipped_c[2] == 0, "period 0 gives zeros", mp);
}

template <int F>
void check_format(fuzz::byte_reader& in) {
  const stationary<fixed<F>> v{fuzz::take_fixed<F>(in), fuzz::take_fixed<F>(in)};
  check_svpwm(v);
  check_sine_and_six_step(v);
  check_limiters<F>(in);
  check_bus<F>(in);
  check_compare<F>(in);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const uint8_t* data, size_t size) {
  fuzz::byte_reader in(data, size);
  check_format<15>(in);
  check_format<31>(in);
  return 0;
}
