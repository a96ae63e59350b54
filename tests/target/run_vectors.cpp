// The target test-vector runner: checks this build of the library (its port, its compiler, its
// core) against the golden vectors the host wrote with the generic port, bit for bit.
//
// For every group of vector_cases.hpp it recomputes each explicit case and compares the outputs
// with golden_vectors.inc, then reruns the bulk inputs and compares the hash of their outputs. One
// check per explicit case and one per bulk run; it prints each mismatch, then `N passed, N failed`,
// and returns 0 only if nothing failed. Freestanding: <stdint.h>, <stdio.h> (printf, through
// semihosting on the emulated cores) and the library.
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>

#include "golden_vectors.inc"
#include "vector_cases.hpp"

namespace {

using namespace rotorq::vectors;

bool same_name(const char* a, const char* b) {
  while (*a != '\0' && *a == *b) {
    ++a;
    ++b;
  }
  return *a == *b;
}

void print_words(const char* label, const uint32_t* w, int n) {
  printf(" %s", label);
  for (int i = 0; i < n; ++i) printf(" %08lx", static_cast<unsigned long>(w[i]));
}

constexpr uint32_t entry_count = sizeof(golden::entries) / sizeof(golden::entries[0]);
static_assert(entry_count == group_count, "golden_vectors.inc is out of date: regenerate it");

}  // namespace

int main() {
  uint32_t passed = 0, failed = 0;
  for (uint32_t g = 0; g < group_count; ++g) {
    const group& grp = groups[g];
    const golden::entry& e = golden::entries[g];
    if (!same_name(grp.name, e.name) || e.cases != explicit_count(grp)) {
      printf("FAIL %s: golden_vectors.inc holds %s with %lu cases: regenerate it\n", grp.name, e.name,
             static_cast<unsigned long>(e.cases));
      ++failed;
      continue;
    }
    uint32_t group_failures = 0;
    for (uint32_t j = 0; j < e.cases; ++j) {
      uint32_t in[max_inputs] = {};
      uint32_t out[max_outputs] = {};
      explicit_inputs(g, j, in);
      grp.apply(in, out);
      const uint32_t* expected = golden::words + e.first_word + static_cast<size_t>(j) * grp.output_count;
      bool same = true;
      for (int w = 0; w < grp.output_count; ++w) same = same && out[w] == expected[w];
      if (same) {
        ++passed;
        continue;
      }
      ++failed;
      if (++group_failures <= 3) {
        printf("FAIL %s case %lu:", grp.name, static_cast<unsigned long>(j));
        print_words("inputs", in, grp.input_count);
        print_words("expected", expected, grp.output_count);
        print_words("got", out, grp.output_count);
        printf("\n");
      }
    }
    const uint32_t hash = bulk_hash(g);
    if (hash == e.bulk_hash) {
      ++passed;
    } else {
      ++failed;
      printf("FAIL %s: bulk run of %lu cases hashes to %08lx, expected %08lx\n", grp.name,
             static_cast<unsigned long>(grp.bulk), static_cast<unsigned long>(hash),
             static_cast<unsigned long>(e.bulk_hash));
    }
  }
  printf("rotorq target vectors: %lu groups\n", static_cast<unsigned long>(group_count));
  printf("%lu passed, %lu failed\n", static_cast<unsigned long>(passed), static_cast<unsigned long>(failed));
  return failed == 0 ? 0 : 1;
}
