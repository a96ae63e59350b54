// The fixed-point operations (fixed.hpp): saturating add, rounding saturating multiply, mul_add, next
// to float and double a + b, a * b and a * b + c.
#include "bench_support.hpp"
#include "plain_math.hpp"
#include "rotorq/fixed.hpp"

namespace rotorq::bench {

namespace {

template <typename T>
struct operands {
  T a, b, c;
};

// Magnitudes up to full scale, both signs, so that saturation happens now and then.
template <typename T>
const table<operands<T>>& operand_table() {
  static const auto values = make_table<operands<T>>(11, [](std::mt19937_64& rng) {
    return operands<T>{number<T>(uniform(rng, -1, 1)), number<T>(uniform(rng, -1, 1)),
                       number<T>(uniform(rng, -1, 1))};
  });
  return values;
}

}  // namespace

void register_arithmetic() {
  add_function<q31>("loop_overhead", [](auto, benchmark::State& state) {
    time_calls(state, operand_table<q31>(), [](const operands<q31>& x) { return x.a; });
  });
  add_function<q15, q31, float, double>("add", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, operand_table<T>(), [](const operands<T>& x) { return x.a + x.b; });
  });
  add_function<q15, q31, float, double>("multiply", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    time_calls(state, operand_table<T>(), [](const operands<T>& x) { return x.a * x.b; });
  });
  add_function<q15, q31, float, double>("mul_add", [](auto type, benchmark::State& state) {
    using T = typename decltype(type)::type;
    using plain::mul_add;
    using rotorq::mul_add;
    time_calls(state, operand_table<T>(), [](const operands<T>& x) { return mul_add(x.a, x.b, x.c); });
  });
}

}  // namespace rotorq::bench
