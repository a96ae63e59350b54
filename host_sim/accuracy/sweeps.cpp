#include "rotorq/accuracy/sweeps.hpp"

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cinttypes>
#include <cmath>
#include <cstdio>
#include <random>
#include <thread>

#include "rotorq/ref/ref.hpp"
#include "rotorq/rotorq.hpp"

namespace rotorq::accuracy {

double error_stats::rms() const {
  return samples ? std::sqrt(sum_squares / static_cast<double>(samples)) : 0.0;
}

void histogram::merge(const histogram& other) {
  for (size_t i = 0; i < counts.size(); ++i) counts[i] += other.counts[i];
  below += other.below;
  above += other.above;
}

void error_stats::merge(const error_stats& other) {
  if (other.samples == 0) return;
  if (samples == 0 || other.max_abs > max_abs) {
    max_abs = other.max_abs;
    worst_input = other.worst_input;
  }
  samples += other.samples;
  sum += other.sum;
  sum_squares += other.sum_squares;
  errors.merge(other.errors);
}

namespace {

// The angle type that goes with each value format.
template <typename Q>
struct angle_for;
template <>
struct angle_for<q15> {
  using type = turn16;
};
template <>
struct angle_for<q31> {
  using type = turn32;
};

template <typename Q>
const char* format_name() {
  return Q::fraction_bits == 15 ? "q15" : "q31";
}

template <typename Q>
double lsb_error(Q computed, double exact) {
  const double scaled = std::ldexp(exact, Q::fraction_bits);
  const double target = std::clamp(scaled, static_cast<double>(Q::raw_min), static_cast<double>(Q::raw_max));
  return static_cast<double>(computed.raw()) - target;
}

template <typename Raw>
std::string hex(Raw raw) {
  char text[24];
  if constexpr (sizeof(Raw) == 2) {
    std::snprintf(text, sizeof text, "0x%04x", static_cast<unsigned>(static_cast<uint16_t>(raw)));
  } else {
    std::snprintf(text, sizeof text, "0x%08" PRIx32, static_cast<uint32_t>(raw));
  }
  return text;
}
template <int F>
std::string hex(fixed<F> x) {
  return hex(x.raw());
}
template <int F>
std::string describe(phases<fixed<F>> x) {
  return "a=" + hex(x.a) + " b=" + hex(x.b) + " c=" + hex(x.c);
}
template <int F>
std::string describe(stationary<fixed<F>> x) {
  return "alpha=" + hex(x.alpha) + " beta=" + hex(x.beta);
}
template <int F>
std::string describe(rotating<fixed<F>> x) {
  return "d=" + hex(x.d) + " q=" + hex(x.q);
}
template <int F>
std::string describe(sin_cos_pair<fixed<F>> x) {
  return "sin=" + hex(x.sin) + " cos=" + hex(x.cos);
}

template <typename Q>
Q random_value(std::mt19937_64& rng) {
  using raw_type = typename Q::raw_type;
  return Q::from_raw(
      static_cast<raw_type>(static_cast<int64_t>(rng() >> (64 - 8 * sizeof(raw_type))) + Q::raw_min));
}

// Full-scale corners, their neighbours and the values where the transforms change behaviour.
template <typename Q>
std::vector<Q> edge_values() {
  std::vector<Q> values;
  for (double x : {-1.0, -0.8660254037844386, -0.5773502691896258, -0.5, 0.0, 0.5, 0.5773502691896258,
                   0.8660254037844386, 1.0}) {
    values.push_back(detail::from_double<Q>(x));
  }
  for (int64_t raw : {Q::raw_min + 1, int64_t{-1}, int64_t{1}, Q::raw_max - 1}) {
    values.push_back(Q::saturate(raw));
  }
  return values;
}

// Random phase currents: half uniform over the whole range (mostly unbalanced, many saturate), half
// near-balanced (a + b + c small), the case a drive sees.
template <typename Q>
phases<Q> random_phases(std::mt19937_64& rng, uint64_t i) {
  const Q a = random_value<Q>(rng), b = random_value<Q>(rng);
  if (i % 2 == 0) return {a, b, random_value<Q>(rng)};
  const Q half_a = Q::from_raw(static_cast<typename Q::raw_type>(a.raw() / 2));
  const Q half_b = Q::from_raw(static_cast<typename Q::raw_type>(b.raw() / 2));
  const Q noise = Q::from_raw(static_cast<typename Q::raw_type>(static_cast<int64_t>(rng() % 64) - 32));
  return {half_a, half_b, -(half_a + half_b) + noise};
}

// A random stationary vector with |v| <= 1.
template <typename Q>
stationary<Q> random_unit_disc(std::mt19937_64& rng) {
  for (;;) {
    const stationary<Q> v{random_value<Q>(rng), random_value<Q>(rng)};
    const double a = to_double(v.alpha), b = to_double(v.beta);
    if (a * a + b * b <= 1.0) return v;
  }
}

// Rows whose functions are documented as correctly rounded (see the headers).
bool is_correctly_rounded(const std::string& function) {
  for (const char* name : {"operator*", "mul_add", "accumulator (4 products)", "clarke", "clarke_balanced",
                           "inverse_clarke", "clarke_power_invariant", "inverse_clarke_power_invariant",
                           "park", "inverse_park", "svpwm (linear range)", "sine_pwm (linear range)"}) {
    if (function == name) return true;
  }
  return false;
}

// What each function's output usually stands for: sine/cosine an angle, the forward transforms
// measured currents, the inverse transforms, limiters and bus scaling voltage commands (per unit of
// the bus), the modulators duty cycles.
quantity kind_of(const std::string& function) {
  if (function == "sin_cos") return quantity::angle;
  if (function.rfind("svpwm", 0) == 0 || function.rfind("sine_pwm", 0) == 0) return quantity::duty;
  if (function.rfind("inverse_", 0) == 0 || function.rfind("limit_", 0) == 0 ||
      function == "bus_normalizer") {
    return quantity::voltage;
  }
  if (function.find("clarke") != std::string::npos || function.find("park") != std::string::npos) {
    return quantity::current;
  }
  return quantity::value;
}

template <typename Q>
error_stats make_stats(const char* function, std::string inputs, double bound) {
  error_stats s;
  s.fraction_bits = Q::fraction_bits;
  s.kind = kind_of(function);
  s.correctly_rounded = is_correctly_rounded(function);
  s.function = function;
  s.format = format_name<Q>();
  s.inputs = std::move(inputs);
  s.bound = bound;
  return s;
}

template <typename T, typename Describe>
void add_outputs(error_stats& s, phases<T> got, phases<double> want, Describe&& d) {
  s.add(lsb_error(got.a, want.a), d);
  s.add(lsb_error(got.b, want.b), d);
  s.add(lsb_error(got.c, want.c), d);
}
template <typename T, typename Describe>
void add_outputs(error_stats& s, stationary<T> got, stationary<double> want, Describe&& d) {
  s.add(lsb_error(got.alpha, want.alpha), d);
  s.add(lsb_error(got.beta, want.beta), d);
}
template <typename T, typename Describe>
void add_outputs(error_stats& s, rotating<T> got, rotating<double> want, Describe&& d) {
  s.add(lsb_error(got.d, want.d), d);
  s.add(lsb_error(got.q, want.q), d);
}
template <typename T, typename Describe>
void add_outputs(error_stats& s, sin_cos_pair<T> got, sin_cos_pair<double> want, Describe&& d) {
  s.add(lsb_error(got.sin, want.sin), d);
  s.add(lsb_error(got.cos, want.cos), d);
}

// ---- arithmetic ----

template <typename Q>
void arithmetic_rows(const sweep_options& options, std::vector<error_stats>& rows) {
  const std::string inputs = "edge grid + " + std::to_string(options.random_inputs) + " random";
  error_stats product = make_stats<Q>("operator*", inputs, bound::multiply);
  error_stats fused = make_stats<Q>("mul_add", inputs, bound::multiply);
  error_stats sum = make_stats<Q>("accumulator (4 products)", inputs, bound::multiply);
  const auto check = [&](Q a, Q b, Q c, Q d) {
    const double x = to_double(a), y = to_double(b), z = to_double(c), w = to_double(d);
    const auto dab = [&] { return "a=" + hex(a) + " b=" + hex(b); };
    product.add(lsb_error(a * b, ref::multiply(x, y)), dab);
    fused.add(lsb_error(mul_add(a, b, c), ref::mul_add(x, y, z)), [&] { return dab() + " c=" + hex(c); });
    accumulator<Q> acc;
    acc.mac(a, b);
    acc.mac(c, d);
    acc.msc(a, d);
    acc.mac(b, c);
    sum.add(lsb_error(acc.result(), x * y + z * w - x * w + y * z),
            [&] { return dab() + " c=" + hex(c) + " d=" + hex(d); });
  };
  const std::vector<Q> edges = edge_values<Q>();
  for (Q a : edges) {
    for (Q b : edges) check(a, b, edges[static_cast<size_t>(a.raw() & 7) % edges.size()], b);
  }
  std::mt19937_64 rng(options.seed + 300 + Q::fraction_bits);
  for (uint64_t i = 0; i < options.random_inputs; ++i) {
    // one draw per statement: the order of function arguments is unspecified, and the published
    // figures must not depend on the compiler
    const Q a = random_value<Q>(rng);
    const Q b = random_value<Q>(rng);
    const Q c = random_value<Q>(rng);
    const Q d = random_value<Q>(rng);
    check(a, b, c, d);
  }
  for (error_stats* s : {&product, &fused, &sum}) rows.push_back(*s);
}

// ---- sin_cos ----

error_stats sin_cos_q15() {
  error_stats s = make_stats<q15>("sin_cos", "all 65536 angles", bound::sin_cos_q15);
  for (uint32_t raw = 0; raw < 65536; ++raw) {
    const turn16 angle = turn16::from_raw(static_cast<uint16_t>(raw));
    add_outputs(s, sin_cos(angle), ref::sin_cos(angle), [&] { return "angle=" + hex(angle.raw()); });
  }
  return s;
}

error_stats sin_cos_q31(const sweep_options& options) {
  error_stats s = make_stats<q31>(
      "sin_cos", std::to_string(options.sin_cos_q31_angles) + " random angles + 7168 segment edges",
      bound::sin_cos_q31);
  const auto check = [&](uint32_t raw) {
    const turn32 angle = turn32::from_raw(raw);
    add_outputs(s, sin_cos(angle), ref::sin_cos(angle), [&] { return "angle=" + hex(angle.raw()); });
  };
  // Both ends and the centre of every one of the 1024 table segments of the turn.
  for (uint32_t segment = 0; segment < 1024; ++segment) {
    for (uint32_t offset : {0u, 1u, 0x1fffffu, 0x200000u, 0x200001u, 0x3ffffeu, 0x3fffffu}) {
      check((segment << 22) | offset);
    }
  }
  std::mt19937_64 rng(options.seed);
  for (uint64_t i = 0; i < options.sin_cos_q31_angles; ++i) check(static_cast<uint32_t>(rng()));
  return s;
}

// All 2^32 angles, split into 65536 blocks of 65536 consecutive angles shared out among threads. The
// exact values come from the double twin at the start of every 4096 angles, advanced angle by angle
// by the rotation through one step: over 4096 steps in double the recurrence drifts by less than
// 2^-40, a thousandth of a q31 step.
error_stats sin_cos_q31_exhaustive(const sweep_options& options, plot_data* plots) {
  error_stats total = make_stats<q31>("sin_cos", "all 2^32 angles", bound::sin_cos_q31);
  constexpr uint32_t blocks = 65536;
  const unsigned thread_count =
      options.threads ? options.threads : std::max(1u, std::thread::hardware_concurrency());
  std::vector<error_stats> partial(thread_count, total);
  std::vector<double> low(blocks), high(blocks);
  std::atomic<uint32_t> next{0}, done{0};
  const double step = 6.283185307179586476925286766559 / 4294967296.0;
  const double step_cos = 1.0 - step * step / 2, step_sin = step - step * step * step / 6;
  constexpr double scale = 2147483648.0, top = 2147483647.0;  // 2^31 and the largest raw value
  const auto work = [&](unsigned t) {
    error_stats& s = partial[t];
    for (uint32_t block = next++; block < blocks; block = next++) {
      double lowest = 0, highest = 0;
      for (uint32_t run = 0; run < 16; ++run) {
        const uint32_t first = (block << 16) | (run << 12);
        const sin_cos_pair<double> start = ref::sin_cos(turn32::from_raw(first));
        double exact_sin = start.sin, exact_cos = start.cos;
        for (uint32_t k = 0; k < 4096; ++k) {
          const uint32_t raw = first + k;
          const sin_cos_pair<q31> got = sin_cos(turn32::from_raw(raw));
          const double es = static_cast<double>(got.sin.raw()) - std::min(exact_sin * scale, top);
          const double ec = static_cast<double>(got.cos.raw()) - std::min(exact_cos * scale, top);
          const auto describe_angle = [&] { return "angle=" + hex(raw); };
          s.add(es, describe_angle);
          s.add(ec, describe_angle);
          lowest = std::min({lowest, es, ec});
          highest = std::max({highest, es, ec});
          const double next_sin = exact_sin * step_cos + exact_cos * step_sin;
          exact_cos = exact_cos * step_cos - exact_sin * step_sin;
          exact_sin = next_sin;
        }
      }
      low[block] = lowest;
      high[block] = highest;
      ++done;
    }
  };
  std::vector<std::thread> pool;
  for (unsigned t = 1; t < thread_count; ++t) pool.emplace_back(work, t);
  if (options.progress) {
    std::thread watcher([&] {
      while (done.load() < blocks) {
        options.progress(static_cast<double>(done.load()) / blocks);
        std::this_thread::sleep_for(std::chrono::milliseconds(200));
      }
      options.progress(1.0);
    });
    work(0);
    for (std::thread& t : pool) t.join();
    watcher.join();
  } else {
    work(0);
    for (std::thread& t : pool) t.join();
  }
  for (const error_stats& p : partial) total.merge(p);
  if (plots) {
    plots->q31_angle.resize(blocks);
    for (uint32_t b = 0; b < blocks; ++b) plots->q31_angle[b] = (b + 0.5) / blocks;
    plots->q31_low = std::move(low);
    plots->q31_high = std::move(high);
  }
  return total;
}

void sin_cos_q15_curve(plot_data& plots) {
  for (uint32_t raw = 0; raw < 65536; ++raw) {
    const turn16 angle = turn16::from_raw(static_cast<uint16_t>(raw));
    const sin_cos_pair<q15> got = sin_cos(angle);
    const sin_cos_pair<double> exact = ref::sin_cos(angle);
    plots.q15_angle.push_back(raw / 65536.0);
    plots.q15_sin.push_back(lsb_error(got.sin, exact.sin));
    plots.q15_cos.push_back(lsb_error(got.cos, exact.cos));
  }
}

void park_map(plot_data& plots) {
  plots.map_size = 101;
  for (int row = 0; row < plots.map_size; ++row) {
    for (int column = 0; column < plots.map_size; ++column) {
      const stationary<q15> v{to_q15(-1.0 + 2.0 * column / (plots.map_size - 1)),
                              to_q15(-1.0 + 2.0 * row / (plots.map_size - 1))};
      double worst = 0;
      for (uint32_t k = 0; k < 64; ++k) {
        const turn16 angle = turn16::from_raw(static_cast<uint16_t>(k * 1024 + 17 * k));
        const rotating<q15> got = park(v, sin_cos(angle));
        const rotating<double> exact = ref::park(ref::to_double(v), ref::sin_cos(angle));
        worst = std::max({worst, std::fabs(lsb_error(got.d, exact.d)), std::fabs(lsb_error(got.q, exact.q))});
      }
      plots.park_map.push_back(worst);
    }
  }
}

// ---- Clarke family ----

template <typename Q>
void clarke_rows(const sweep_options& options, std::vector<error_stats>& rows) {
  const std::string inputs = "edge grid + " + std::to_string(options.random_inputs) + " random";
  error_stats forward = make_stats<Q>("clarke", inputs, bound::transform);
  error_stats balanced = make_stats<Q>("clarke_balanced", inputs, bound::transform);
  error_stats inverse = make_stats<Q>("inverse_clarke", inputs, bound::transform);
  error_stats forward_pi = make_stats<Q>("clarke_power_invariant", inputs, bound::transform);
  error_stats inverse_pi = make_stats<Q>("inverse_clarke_power_invariant", inputs, bound::transform);

  const auto check = [&](phases<Q> i) {
    const auto d3 = [&] { return describe(i); };
    add_outputs(forward, clarke(i), ref::clarke(ref::to_double(i)), d3);
    add_outputs(forward_pi, clarke_power_invariant(i), ref::clarke_power_invariant(ref::to_double(i)), d3);
    const stationary<Q> v{i.a, i.b};
    const auto d2 = [&] { return describe(v); };
    add_outputs(balanced, clarke_balanced(i.a, i.b), ref::clarke_balanced(to_double(i.a), to_double(i.b)),
                [&] { return "a=" + hex(i.a) + " b=" + hex(i.b); });
    add_outputs(inverse, inverse_clarke(v), ref::inverse_clarke(ref::to_double(v)), d2);
    add_outputs(inverse_pi, inverse_clarke_power_invariant(v),
                ref::inverse_clarke_power_invariant(ref::to_double(v)), d2);
  };
  const std::vector<Q> edges = edge_values<Q>();
  for (Q a : edges) {
    for (Q b : edges) {
      for (Q c : edges) check({a, b, c});
    }
  }
  std::mt19937_64 rng(options.seed + Q::fraction_bits);
  for (uint64_t i = 0; i < options.random_inputs; ++i) check(random_phases<Q>(rng, i));
  for (error_stats* s : {&forward, &balanced, &inverse, &forward_pi, &inverse_pi}) rows.push_back(*s);
}

// ---- Park ----

template <typename Q>
void park_rows(const sweep_options& options, std::vector<error_stats>& rows) {
  using angle_type = typename angle_for<Q>::type;
  const std::string inputs = std::to_string(options.random_inputs) + " random";
  error_stats forward = make_stats<Q>("park", inputs + " (vector, pair)", bound::park_given_pair);
  error_stats inverse = make_stats<Q>("inverse_park", inputs + " (vector, pair)", bound::park_given_pair);
  const double with_sin_cos_bound =
      Q::fraction_bits == 15 ? bound::park_with_sin_cos_q15 : bound::park_with_sin_cos_q31;
  error_stats forward_angle =
      make_stats<Q>("park(sin_cos(angle))", inputs + " |v| <= 1, angle", with_sin_cos_bound);
  error_stats inverse_angle =
      make_stats<Q>("inverse_park(sin_cos(angle))", inputs + " |v| <= 1, angle", with_sin_cos_bound);

  std::mt19937_64 rng(options.seed + 100 + Q::fraction_bits);
  for (uint64_t i = 0; i < options.random_inputs; ++i) {
    const angle_type angle = angle_type::from_raw(static_cast<typename angle_type::raw_type>(rng()));
    // Given the pair: any pair at all, mostly the library's own, sometimes arbitrary values.
    const sin_cos_pair<Q> pair =
        (i % 8 == 0) ? sin_cos_pair<Q>{random_value<Q>(rng), random_value<Q>(rng)} : sin_cos(angle);
    const stationary<Q> v{random_value<Q>(rng), random_value<Q>(rng)};
    const rotating<Q> r{v.alpha, v.beta};
    const auto dv = [&] { return describe(v) + " " + describe(pair); };
    add_outputs(forward, park(v, pair), ref::park(ref::to_double(v), ref::to_double(pair)), dv);
    add_outputs(inverse, inverse_park(r, pair), ref::inverse_park(ref::to_double(r), ref::to_double(pair)),
                [&] { return describe(r) + " " + describe(pair); });

    // With the library's sine and cosine, against the exact angle.
    const stationary<Q> u = random_unit_disc<Q>(rng);
    const rotating<Q> w{u.alpha, u.beta};
    const sin_cos_pair<double> exact = ref::sin_cos(angle);
    const auto du = [&] { return describe(u) + " angle=" + hex(angle.raw()); };
    add_outputs(forward_angle, park(u, sin_cos(angle)), ref::park(ref::to_double(u), exact), du);
    add_outputs(inverse_angle, inverse_park(w, sin_cos(angle)), ref::inverse_park(ref::to_double(w), exact),
                [&] { return describe(w) + " angle=" + hex(angle.raw()); });
  }
  for (error_stats* s : {&forward, &inverse, &forward_angle, &inverse_angle}) rows.push_back(*s);
}

// ---- modulation ----

template <typename Q>
void modulation_rows(const sweep_options& options, std::vector<error_stats>& rows) {
  const std::string inputs = std::to_string(options.random_inputs) + " random";
  error_stats linear =
      make_stats<Q>("svpwm (linear range)", inputs + " |v| <= 1/sqrt(3)", bound::svpwm_linear);
  error_stats sine = make_stats<Q>("sine_pwm (linear range)", inputs + " |v| <= 1/2", bound::svpwm_linear);
  error_stats square = make_stats<Q>("six_step", inputs + " away from switching", bound::exact);
  error_stats compare =
      make_stats<Q>("duty_to_compare (counts)", inputs + " (duty, period, min pulse)", bound::exact);
  compare.kind = quantity::value;
  error_stats circle =
      make_stats<Q>("svpwm (circle limit)", inputs + " |v| <= sqrt(2)",
                    Q::fraction_bits == 15 ? bound::overmodulation_q15 : bound::overmodulation_q31);
  error_stats hexagon =
      make_stats<Q>("svpwm (hexagon limit)", inputs + " |v| <= sqrt(2)",
                    Q::fraction_bits == 15 ? bound::overmodulation_q15 : bound::overmodulation_q31);
  error_stats magnitude = make_stats<Q>("limit_magnitude", inputs + " (vector, limit)",
                                        Q::fraction_bits == 15 ? bound::limiter_q15 : bound::limiter_q31);
  error_stats d_priority = make_stats<Q>("limit_d_priority", inputs + " (vector, limit)",
                                         Q::fraction_bits == 15 ? bound::limiter_q15 : bound::limiter_q31);
  error_stats bus = make_stats<Q>("bus_normalizer", inputs + " (v, bus > 1/64)",
                                  Q::fraction_bits == 15 ? bound::limiter_q15 : bound::limiter_q31);
  const double inscribed = 1.0 / std::sqrt(3.0);
  std::mt19937_64 rng(options.seed + 400 + Q::fraction_bits);
  for (uint64_t i = 0; i < options.random_inputs; ++i) {
    const stationary<Q> v{random_value<Q>(rng), random_value<Q>(rng)};
    const stationary<double> x = ref::to_double(v);
    const double length = std::hypot(x.alpha, x.beta);
    const auto dv = [&] { return describe(v); };
    // The linear range: a point of the circle, the dwell-time construction as the yardstick.
    const stationary<Q> u{
        Q::saturate(static_cast<int64_t>(static_cast<double>(v.alpha.raw()) * inscribed / 1.4143)),
        Q::saturate(static_cast<int64_t>(static_cast<double>(v.beta.raw()) * inscribed / 1.4143))};
    const modulation<Q> lin = svpwm(u, overmodulation::hexagon);
    add_outputs(linear, lin.duty, ref::svpwm_dwell_time(ref::to_double(u)), [&] { return describe(u); });
    // sine PWM's linear range is the circle of radius 1/2
    const stationary<Q> h{
        Q::saturate(static_cast<int64_t>(static_cast<double>(v.alpha.raw()) * 0.5 / 1.4143)),
        Q::saturate(static_cast<int64_t>(static_cast<double>(v.beta.raw()) * 0.5 / 1.4143))};
    add_outputs(sine, sine_pwm(h).duty, ref::sine_pwm(ref::to_double(h)).duty, [&] { return describe(h); });
    // six-step switches where a phase voltage crosses zero; a double can put a point on the wrong
    // side of it, so the sweep keeps clear of the switching instants
    const phases<double> p = ref::inverse_clarke(x);
    if (std::fabs(p.a) > 1e-9 && std::fabs(p.b) > 1e-9 && std::fabs(p.c) > 1e-9) {
      add_outputs(square, six_step(v).duty, ref::six_step(x), dv);
    }
    const uint32_t period = 1 + static_cast<uint32_t>(rng() % 65535);
    const uint32_t pulse = static_cast<uint32_t>(rng() % (period / 4 + 1));
    const phases<Q> duty{Q::saturate(std::llabs(v.alpha.raw())), Q::saturate(std::llabs(v.beta.raw())),
                         v.alpha};
    const compare_values counts = duty_to_compare(duty, period, pulse);
    for (auto [got, d] : {std::pair{counts.compare.a, duty.a}, std::pair{counts.compare.b, duty.b},
                          std::pair{counts.compare.c, duty.c}}) {
      compare.add(static_cast<double>(got) - ref::duty_to_compare(to_double(d), period, pulse), [&, d = d] {
        return "duty=" + hex(d) + " period=" + std::to_string(period) + " min_pulse=" + std::to_string(pulse);
      });
    }
    if (length > inscribed) {
      add_outputs(circle, svpwm(v, overmodulation::circle).duty, ref::svpwm_min_max(x, true).duty, dv);
      add_outputs(hexagon, svpwm(v, overmodulation::hexagon).duty, ref::svpwm_min_max(x, false).duty, dv);
    }
    const Q m = Q::saturate(std::llabs(random_value<Q>(rng).raw()));
    const rotating<Q> r{v.alpha, v.beta};
    const auto dr = [&] { return describe(r) + " m=" + hex(m); };
    const stationary<double> limited_ref = ref::limit_magnitude(x, to_double(m));
    add_outputs(magnitude, limit_magnitude(r, m).value, rotating<double>{limited_ref.alpha, limited_ref.beta},
                dr);
    add_outputs(d_priority, limit_d_priority(r, m).value,
                ref::limit_d_priority({x.alpha, x.beta}, to_double(m)), dr);
    // a bus between 1/64 of full scale and full scale, above the normalizer's minimum of 1/128
    const Q bus_voltage = Q::saturate(std::llabs(random_value<Q>(rng).raw()) | (Q::raw_max >> 6));
    bus_normalizer<Q> normalizer(Q::saturate(Q::raw_max >> 7));
    normalizer.update(bus_voltage);
    bus.add(lsb_error(normalizer.normalize(v.alpha), x.alpha / to_double(bus_voltage)),
            [&] { return "v=" + hex(v.alpha) + " bus=" + hex(bus_voltage); });
  }
  for (error_stats* s : {&linear, &sine, &square, &compare, &circle, &hexagon, &magnitude, &d_priority, &bus})
    rows.push_back(*s);
}

// ---- rotor angle ----

// Two samples of a rotor turning at a random speed (up to a quarter turn per 1000 ticks), then the
// angle extrapolated from the second sample up to 4096 ticks ahead or behind, against the twin.
template <int TimerBits>
error_stats interpolator_row(const sweep_options& options) {
  error_stats s;
  s.function = TimerBits == 16 ? "angle_interpolator (16-bit timer)" : "angle_interpolator (32-bit timer)";
  s.format = "t32";
  s.inputs = std::to_string(options.random_inputs) + " random (samples, time)";
  s.bound = bound::interpolator;
  s.fraction_bits = 32;
  s.kind = quantity::rotor_angle;
  using time_type = typename angle_interpolator<TimerBits>::time_type;
  std::mt19937_64 rng(options.seed + 500 + TimerBits);
  for (uint64_t i = 0; i < options.random_inputs; ++i) {
    const auto first = static_cast<uint32_t>(rng());
    const auto start = static_cast<time_type>(rng());
    const auto interval = static_cast<uint32_t>(1 + rng() % 20000);
    const int64_t motion = static_cast<int64_t>(rng() % (uint64_t{1} << 31)) - (int64_t{1} << 30);
    const int64_t distance = motion * interval / 1000 / 4;  // |motion| < 2^30 per 1000 ticks / 4
    const auto second = static_cast<uint32_t>(first + static_cast<uint32_t>(distance));
    const int32_t ahead = static_cast<int32_t>(rng() % 8193) - 4096;
    angle_interpolator<TimerBits> interpolator;
    interpolator.update(turn32::from_raw(first), start);
    interpolator.update(turn32::from_raw(second), static_cast<time_type>(start + interval));
    const auto now = static_cast<time_type>(start + interval + static_cast<time_type>(ahead));
    const turn32 got = interpolator.angle(now);
    const double speed =
        static_cast<double>(signed_difference(turn32::from_raw(second), turn32::from_raw(first))) /
        4294967296.0 / interval;
    const double want = ref::interpolate_angle(second / 4294967296.0, speed, ahead, 4294967296.0);
    const double error = std::remainder(got.raw() / 4294967296.0 - want, 1.0) * 4294967296.0;
    s.add(error, [&] {
      return "samples " + hex(first) + ", " + hex(second) + " " + std::to_string(interval) +
             " ticks apart, then " + std::to_string(ahead);
    });
  }
  return s;
}

// ---- round trips ----

template <typename Q>
void round_trip_rows(const sweep_options& options, std::vector<error_stats>& rows) {
  using angle_type = typename angle_for<Q>::type;
  const std::string inputs = std::to_string(options.random_inputs) + " random";
  error_stats clarke_trip =
      make_stats<Q>("inverse_clarke(clarke(i))", inputs + " balanced i", bound::round_trip_clarke);
  error_stats clarke_pi_trip = make_stats<Q>("inverse_clarke_power_invariant(...)", inputs + " balanced i",
                                             bound::round_trip_clarke_power_invariant);
  error_stats park_trip =
      make_stats<Q>("inverse_park(park(v))", inputs + " |v| <= 1, angle",
                    Q::fraction_bits == 15 ? bound::round_trip_park_q15 : bound::round_trip_park_q31);

  std::mt19937_64 rng(options.seed + 200 + Q::fraction_bits);
  for (uint64_t i = 0; i < options.random_inputs; ++i) {
    // A balanced set small enough that no forward output saturates: a and b within +-1/3, c = -a - b.
    const Q a = Q::from_raw(static_cast<typename Q::raw_type>(random_value<Q>(rng).raw() / 3));
    const Q b = Q::from_raw(static_cast<typename Q::raw_type>(random_value<Q>(rng).raw() / 3));
    const phases<Q> balanced{a, b, -(a + b)};
    const phases<double> want = ref::to_double(balanced);
    const auto di = [&] { return describe(balanced); };
    add_outputs(clarke_trip, inverse_clarke(clarke(balanced)), want, di);
    add_outputs(clarke_pi_trip, inverse_clarke_power_invariant(clarke_power_invariant(balanced)), want, di);

    const stationary<Q> v = random_unit_disc<Q>(rng);
    const angle_type angle = angle_type::from_raw(static_cast<typename angle_type::raw_type>(rng()));
    const sin_cos_pair<Q> pair = sin_cos(angle);
    add_outputs(park_trip, inverse_park(park(v, pair), pair), ref::to_double(v),
                [&] { return describe(v) + " angle=" + hex(angle.raw()); });
  }
  for (error_stats* s : {&clarke_trip, &clarke_pi_trip, &park_trip}) rows.push_back(*s);
}

}  // namespace

std::vector<error_stats> sweep_arithmetic(const sweep_options& options) {
  std::vector<error_stats> rows;
  arithmetic_rows<q15>(options, rows);
  arithmetic_rows<q31>(options, rows);
  return rows;
}

std::vector<error_stats> sweep_sin_cos(const sweep_options& options, plot_data* plots) {
  return {sin_cos_q15(),
          options.exhaustive_sin_cos_q31 ? sin_cos_q31_exhaustive(options, plots) : sin_cos_q31(options)};
}

std::vector<error_stats> sweep_clarke(const sweep_options& options) {
  std::vector<error_stats> rows;
  clarke_rows<q15>(options, rows);
  clarke_rows<q31>(options, rows);
  return rows;
}

std::vector<error_stats> sweep_park(const sweep_options& options) {
  std::vector<error_stats> rows;
  park_rows<q15>(options, rows);
  park_rows<q31>(options, rows);
  return rows;
}

std::vector<error_stats> sweep_modulation(const sweep_options& options) {
  std::vector<error_stats> rows;
  modulation_rows<q15>(options, rows);
  modulation_rows<q31>(options, rows);
  return rows;
}

// A rotor turning at a constant speed, 20 to 400 Hz electrical against a 1 MHz timer, with ideal
// 120-degree sensors (edges every 60 degrees from 0, the uniform calibration). Every edge is fed
// with its capture time (the first tick at or after it); after two turns the angle is asked at
// random times up to the next edge and compared with the exact rotor angle then. The error is the
// rotor's motion within one capture tick plus the speed estimate's error (hall_tracker.hpp), below
// 0.5 degrees at f_t >= 1000 f_e.
error_stats hall_tracker_row(const sweep_options& options) {
  error_stats s;
  s.function = "hall_tracker (constant speed)";
  s.format = "t32";
  s.inputs = std::to_string(options.random_inputs / 100) + " runs, 20-400 Hz at 1 MHz, 10 polls each";
  s.bound = bound::hall_tracker_constant_speed;
  s.fraction_bits = 32;
  s.kind = quantity::rotor_angle;
  std::mt19937_64 rng(options.seed + 600);
  for (uint64_t run = 0; run < options.random_inputs / 100; ++run) {
    const double frequency = (20.0 + static_cast<double>(rng() % 38001) / 100.0) / 1e6;  // turns per tick
    const double start_angle = static_cast<double>(rng() >> 11) / 9007199254740992.0;    // [0, 1) turn
    const auto start_time = static_cast<uint32_t>(rng());
    hall_tracker<32> tracker;
    const auto sector_at = [](double turns) {
      return static_cast<int>(std::floor(6 * (turns - std::floor(turns)))) % 6;
    };
    const auto angle_at = [&](double ticks) { return start_angle + frequency * ticks; };
    tracker.update(hall_code(static_cast<uint8_t>(sector_at(start_angle))), start_time);
    const double first_edge = std::ceil(6 * start_angle) / 6;
    double edge_ticks = 0;
    for (int k = 0; k <= 12; ++k) {
      edge_ticks = (first_edge + k / 6.0 - start_angle) / frequency;
      const double capture = std::ceil(edge_ticks);
      if (k == 12) break;
      const int sector = sector_at(angle_at(capture) + 1e-12);
      tracker.update(hall_code(static_cast<uint8_t>(sector)), start_time + static_cast<uint32_t>(capture));
    }
    // polls between the 12th edge (already fed) and the 13th
    const double last_edge = (first_edge + 11 / 6.0 - start_angle) / frequency;
    for (int poll = 0; poll < 10; ++poll) {
      const double now =
          std::ceil(last_edge) + static_cast<double>(rng() % 1000) / 1000.0 * (edge_ticks - last_edge - 1);
      const auto now_ticks = static_cast<uint32_t>(now);
      const turn32 got = tracker.estimate(start_time + now_ticks).angle;
      const double exact = angle_at(static_cast<double>(now_ticks));
      const double error = std::remainder(got.raw() / 4294967296.0 - exact, 1.0) * 4294967296.0;
      s.add(error, [&] {
        return "f_e " + std::to_string(frequency * 1e6) + " Hz, start " + std::to_string(start_angle) +
               " turn";
      });
    }
  }
  return s;
}

std::vector<error_stats> sweep_rotor_angle(const sweep_options& options) {
  return {interpolator_row<16>(options), interpolator_row<32>(options), hall_tracker_row(options)};
}

std::vector<error_stats> sweep_round_trips(const sweep_options& options) {
  std::vector<error_stats> rows;
  round_trip_rows<q15>(options, rows);
  round_trip_rows<q31>(options, rows);
  return rows;
}

std::vector<error_stats> sweep_report(const sweep_options& options, plot_data* plots) {
  std::vector<error_stats> rows;
  const auto append = [&rows](std::vector<error_stats> more) {
    for (error_stats& s : more) rows.push_back(std::move(s));
  };
  append(sweep_arithmetic(options));
  append(sweep_sin_cos(options, plots));
  for (auto* sweep :
       {&sweep_clarke, &sweep_park, &sweep_modulation, &sweep_rotor_angle, &sweep_round_trips}) {
    append(sweep(options));
  }
  if (plots) {
    sin_cos_q15_curve(*plots);
    park_map(*plots);
  }
  return rows;
}

std::vector<error_stats> sweep_all(const sweep_options& options) { return sweep_report(options, nullptr); }

}  // namespace rotorq::accuracy
