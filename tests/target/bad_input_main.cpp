// The bad-input cases of the contract table (tests/bad_input_cases.hpp, the same cases the host suite
// runs under GoogleTest) on an emulated core: each failure prints its check, values and case, and
// the program ends with "N passed, N failed" and a non-zero status on any failure.
#include "check.hpp"

#include "bad_input_cases.hpp"

namespace {

struct bad_input_case {
  const char* name;
  void (*run)();
};

// NOLINTNEXTLINE(cppcoreguidelines-macro-usage): one table entry per entry of the case list
#define ROTORQ_BAD_INPUT_ENTRY(name) {"BadInput." #name, &::rotorq::bad_input::name},
const bad_input_case cases[] = {ROTORQ_BAD_INPUT_CASES(ROTORQ_BAD_INPUT_ENTRY)};
#undef ROTORQ_BAD_INPUT_ENTRY

}  // namespace

int main() {
  for (const bad_input_case& c : cases) {
    ROTORQ_SCOPE(c.name);
    c.run();
  }
  return rotorq::check::finish();
}
