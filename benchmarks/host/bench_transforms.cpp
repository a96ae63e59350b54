// Time per call of each rotorq function and of one current-loop chain, next to the straightforward
// double and float code a firmware engineer would otherwise write. Inputs cycle through a table of
// 1024 precomputed values so the compiler cannot fold the calls away.
#include <benchmark/benchmark.h>

#include <array>
#include <cmath>
#include <cstdint>
#include <random>

#include "rotorq/rotorq.hpp"

namespace {

constexpr size_t input_count = 1024;

template <typename T>
std::array<T, input_count> random_raw(uint64_t seed) {
  std::mt19937_64 rng(seed);
  std::array<T, input_count> values{};
  for (T& v : values) v = static_cast<T>(rng());
  return values;
}

template <int F>
void bm_sin_cos(benchmark::State& state) {
  using angle_type = typename rotorq::detail::select<F == 15, rotorq::turn16, rotorq::turn32>::type;
  const auto raws = random_raw<typename angle_type::raw_type>(1);
  size_t i = 0;
  for (auto _ : state) {
    benchmark::DoNotOptimize(rotorq::sin_cos(angle_type::from_raw(raws[i++ % input_count])));
  }
}

template <typename Real>
void bm_sin_cos_libm(benchmark::State& state) {
  const auto raws = random_raw<uint32_t>(1);
  size_t i = 0;
  for (auto _ : state) {
    const Real x = static_cast<Real>(raws[i++ % input_count]) * static_cast<Real>(1.4629180792671596e-9);
    benchmark::DoNotOptimize(std::sin(x));
    benchmark::DoNotOptimize(std::cos(x));
  }
}

template <int F>
rotorq::phases<rotorq::fixed<F>> balanced(uint64_t seed_value) {
  using Q = rotorq::fixed<F>;
  using raw_type = typename Q::raw_type;
  const auto a = static_cast<raw_type>(static_cast<int64_t>(seed_value % 20000) - 10000);
  const auto b = static_cast<raw_type>(static_cast<int64_t>((seed_value / 20000) % 20000) - 10000);
  const Q qa = Q::from_raw(a), qb = Q::from_raw(b);
  return {qa, qb, -(qa + qb)};
}

// One current-loop step: Clarke -> sin_cos -> Park -> (regulator stand-in) -> inverse Park.
template <int F>
void bm_chain(benchmark::State& state) {
  using Q = rotorq::fixed<F>;
  using angle_type = typename rotorq::detail::select<F == 15, rotorq::turn16, rotorq::turn32>::type;
  const auto raws = random_raw<typename angle_type::raw_type>(2);
  const auto seeds = random_raw<uint32_t>(3);
  size_t i = 0;
  for (auto _ : state) {
    const size_t k = i++ % input_count;
    const auto pair = rotorq::sin_cos(angle_type::from_raw(raws[k]));
    const rotorq::rotating<Q> dq = rotorq::park(rotorq::clarke(balanced<F>(seeds[k])), pair);
    benchmark::DoNotOptimize(rotorq::inverse_clarke(rotorq::inverse_park(dq, pair)));
  }
}

template <typename Real>
void bm_chain_libm(benchmark::State& state) {
  const auto raws = random_raw<uint32_t>(2);
  const auto seeds = random_raw<uint32_t>(3);
  const Real k3 = static_cast<Real>(0.57735026918962576), h = static_cast<Real>(0.86602540378443865);
  size_t i = 0;
  for (auto _ : state) {
    const size_t k = i++ % input_count;
    const Real theta = static_cast<Real>(raws[k]) * static_cast<Real>(1.4629180792671596e-9);
    const Real a = static_cast<Real>(seeds[k] % 20000) * Real(1e-4) - Real(1);
    const Real b = static_cast<Real>((seeds[k] / 20000) % 20000) * Real(1e-4) - Real(1);
    const Real c = -a - b;
    const Real alpha = (2 * a - b - c) / 3, beta = (b - c) * k3;
    const Real s = std::sin(theta), co = std::cos(theta);
    const Real d = alpha * co + beta * s, q = -alpha * s + beta * co;
    const Real al = d * co - q * s, be = d * s + q * co;
    benchmark::DoNotOptimize(al);
    benchmark::DoNotOptimize(-al / 2 + h * be);
    benchmark::DoNotOptimize(-al / 2 - h * be);
  }
}

BENCHMARK(bm_sin_cos<15>)->Name("sin_cos/q15");
BENCHMARK(bm_sin_cos<31>)->Name("sin_cos/q31");
BENCHMARK(bm_sin_cos_libm<float>)->Name("sin_cos/float libm");
BENCHMARK(bm_sin_cos_libm<double>)->Name("sin_cos/double libm");
BENCHMARK(bm_chain<15>)->Name("chain/q15");
BENCHMARK(bm_chain<31>)->Name("chain/q31");
BENCHMARK(bm_chain_libm<float>)->Name("chain/float libm");
BENCHMARK(bm_chain_libm<double>)->Name("chain/double libm");

}  // namespace

BENCHMARK_MAIN();
