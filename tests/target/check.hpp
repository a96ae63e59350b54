// A small check framework for test programs on bare-metal targets, which have no C++ standard
// library: it needs only <stdint.h> and printf from <stdio.h> (picolibc's, over semihosting), and no
// heap, exceptions or static constructors. It builds with host compilers too.
//
//   ROTORQ_CHECK(condition)           passes when the condition is true
//   ROTORQ_CHECK_FALSE(condition)     passes when it is false
//   ROTORQ_CHECK_EQ(a, b)             a == b; also ROTORQ_CHECK_LT, _LE, _GT and _GE
//   ROTORQ_SCOPE(label)               until the end of the enclosing block, every failure also
//                                     prints the label (a const char* that outlives the block)
//   ROTORQ_SCOPE_VALUE(label, v)      the same, followed by the integer v
//   rotorq::check::finish()           prints "N passed, N failed" (checks, not cases) and returns
//                                     the exit status for main: 0 if no check failed, otherwise 1
//   rotorq::check::passed(), failed() the counts so far
//
// The operands of the comparisons are integers of any width, signed or unsigned, enums or bool. They
// are compared by value whatever their types (-1 is less than 0xffffffffu), and each is evaluated
// once. A failing check prints its file and line, the expression, both operands in decimal and in
// two's-complement hex, and the scopes from the innermost out:
//
//   tests/bad_input_cases.hpp:99: check failed: Q::max().raw() == limits<F>::min
//     Q::max().raw() = 32767 (0x7fff)
//     limits<F>::min = -32768 (0x8000)
//     in q15
//     in contract row F1: from_raw / raw() / saturate(int64)
//
// The hex has the width of the operand's type, or of the narrower operand's type when both values
// fit it (so a q15 raw value compared with an int64_t constant prints four digits). The numbers are
// formatted here and printed with %s: picolibc's integer-only printf prints only the low 32 bits of
// a %lld. There is one tally per program, and no locking (a test program has one thread).
#pragma once

#include <stdint.h>
#include <stdio.h>

namespace rotorq::check {

// An integer of any type: its value as two's complement sign-extended to 64 bits, whether that is
// negative, and the width of its type.
struct integer {
  uint64_t bits;
  bool negative;
  int width;
};

namespace internal {

template <typename A, typename B>
struct same_type {
  static constexpr bool value = false;
};
template <typename A>
struct same_type<A, A> {
  static constexpr bool value = true;
};

}  // namespace internal

template <typename T>
constexpr integer integer_of(T value) {
  if constexpr (__is_enum(T)) {
    return integer_of(static_cast<__underlying_type(T)>(value));
  } else {
    // No <type_traits> here: a floating-point type is told apart by keeping a half.
    static_assert(internal::same_type<T, bool>::value || static_cast<T>(0.5) == static_cast<T>(0),
                  "check operands are integers, enums or bool");
    static_assert(sizeof(T) <= sizeof(uint64_t), "check operands are at most 64 bits wide");
    const bool is_signed = static_cast<T>(-1) < static_cast<T>(0);
    const int width = static_cast<int>(sizeof(T) * 8);
    if (is_signed) {
      // int8_t holds a number here, not a character
      const auto wide = static_cast<int64_t>(value);  // NOLINT(bugprone-signed-char-misuse,cert-str34-c)
      return integer{static_cast<uint64_t>(wide), wide < 0, width};
    }
    return integer{static_cast<uint64_t>(value), false, width};
  }
}

// -1, 0 or 1 as a is below, equal to or above b. Two negative values compare like their 64-bit
// patterns, and so do two non-negative ones.
constexpr int compare(integer a, integer b) {
  if (a.negative != b.negative) return a.negative ? -1 : 1;
  if (a.bits == b.bits) return 0;
  return a.bits < b.bits ? -1 : 1;
}

// Whether the value has a two's-complement (negative) or plain binary (non-negative) form `width`
// bits wide.
constexpr bool fits(integer x, int width) {
  if (width >= 64) return true;
  const uint64_t top = uint64_t{1} << (width - 1);
  return x.negative ? ~x.bits + 1 <= top : x.bits < top * 2;
}

// "-32768 (0x8000)": the value in decimal and its low `width` bits in hex; `text` holds at least 48
// characters.
inline void format(integer x, int width, char* text) {
  char digits[24];
  int n = 0;
  uint64_t magnitude = x.negative ? ~x.bits + 1 : x.bits;  // also for INT64_MIN
  do {
    digits[n++] = static_cast<char>('0' + magnitude % 10);
    magnitude /= 10;
  } while (magnitude != 0);
  int out = 0;
  if (x.negative) text[out++] = '-';
  while (n > 0) text[out++] = digits[--n];
  text[out++] = ' ';
  text[out++] = '(';
  text[out++] = '0';
  text[out++] = 'x';
  for (int shift = (width + 3) / 4 * 4 - 4; shift >= 0; shift -= 4) {
    text[out++] = "0123456789abcdef"[(x.bits >> shift) & 0xf];
  }
  text[out++] = ')';
  text[out] = '\0';
}

class scope;

struct tally {
  unsigned long passed;
  unsigned long failed;
  const scope* innermost;
};
// The program's one tally, which the checks update (there is nothing to guard: one thread).
inline tally state{0, 0, nullptr};  // NOLINT(cppcoreguidelines-avoid-non-const-global-variables)

// A label printed with every failure while the object lives (one per ROTORQ_SCOPE).
class scope {
 public:
  explicit scope(const char* label)
      : label_(label), value_{0, false, 0}, has_value_(false), outer_(state.innermost) {
    state.innermost = this;
  }
  template <typename T>
  scope(const char* label, T value)
      : label_(label), value_(integer_of(value)), has_value_(true), outer_(state.innermost) {
    state.innermost = this;
  }
  ~scope() { state.innermost = outer_; }
  scope(const scope&) = delete;
  scope& operator=(const scope&) = delete;
  scope(scope&&) = delete;
  scope& operator=(scope&&) = delete;

  void print() const {
    if (has_value_) {
      char text[48];
      format(value_, value_.width, text);
      printf("  in %s %s\n", label_, text);
    } else {
      printf("  in %s\n", label_);
    }
  }
  const scope* outer() const { return outer_; }

 private:
  const char* label_;
  integer value_;
  bool has_value_;
  const scope* outer_;
};

inline void print_scopes() {
  for (const scope* s = state.innermost; s != nullptr; s = s->outer()) s->print();
}

inline void truth(bool holds, bool wanted, const char* text, const char* file, int line) {
  if (holds == wanted) {
    ++state.passed;
    return;
  }
  ++state.failed;
  printf("%s:%d: check failed: %s%s%s\n", file, line, wanted ? "" : "!(", text, wanted ? "" : ")");
  print_scopes();
}

enum class relation { eq, lt, le, gt, ge };

template <typename A, typename B>
void relate(const A& a, const B& b, relation r, const char* a_text, const char* b_text, const char* file,
            int line) {
  const integer x = integer_of(a);
  const integer y = integer_of(b);
  const int order = compare(x, y);
  const char* op = "==";
  bool holds = order == 0;
  switch (r) {
    case relation::eq:
      break;
    case relation::lt:
      op = "<";
      holds = order < 0;
      break;
    case relation::le:
      op = "<=";
      holds = order <= 0;
      break;
    case relation::gt:
      op = ">";
      holds = order > 0;
      break;
    case relation::ge:
      op = ">=";
      holds = order >= 0;
      break;
  }
  if (holds) {
    ++state.passed;
    return;
  }
  ++state.failed;
  const int narrow = x.width < y.width ? x.width : y.width;
  const bool both_fit = fits(x, narrow) && fits(y, narrow);
  char x_text[48];
  char y_text[48];
  format(x, both_fit ? narrow : x.width, x_text);
  format(y, both_fit ? narrow : y.width, y_text);
  printf("%s:%d: check failed: %s %s %s\n", file, line, a_text, op, b_text);
  printf("  %s = %s\n", a_text, x_text);
  printf("  %s = %s\n", b_text, y_text);
  print_scopes();
}

inline unsigned long passed() { return state.passed; }
inline unsigned long failed() { return state.failed; }

inline int finish() {
  printf("%lu passed, %lu failed\n", state.passed, state.failed);
  return state.failed == 0 ? 0 : 1;
}

}  // namespace rotorq::check

// Macros, not functions: a check needs its caller's __FILE__ and __LINE__ and the text of its operands.
// NOLINTBEGIN(cppcoreguidelines-macro-usage)
#define ROTORQ_CHECK_JOIN_(a, b) a##b
#define ROTORQ_CHECK_JOIN(a, b) ROTORQ_CHECK_JOIN_(a, b)

#define ROTORQ_CHECK(cond) ::rotorq::check::truth((cond), true, #cond, __FILE__, __LINE__)
#define ROTORQ_CHECK_FALSE(cond) ::rotorq::check::truth((cond), false, #cond, __FILE__, __LINE__)
#define ROTORQ_CHECK_EQ(a, b) \
  ::rotorq::check::relate((a), (b), ::rotorq::check::relation::eq, #a, #b, __FILE__, __LINE__)
#define ROTORQ_CHECK_LT(a, b) \
  ::rotorq::check::relate((a), (b), ::rotorq::check::relation::lt, #a, #b, __FILE__, __LINE__)
#define ROTORQ_CHECK_LE(a, b) \
  ::rotorq::check::relate((a), (b), ::rotorq::check::relation::le, #a, #b, __FILE__, __LINE__)
#define ROTORQ_CHECK_GT(a, b) \
  ::rotorq::check::relate((a), (b), ::rotorq::check::relation::gt, #a, #b, __FILE__, __LINE__)
#define ROTORQ_CHECK_GE(a, b) \
  ::rotorq::check::relate((a), (b), ::rotorq::check::relation::ge, #a, #b, __FILE__, __LINE__)
#define ROTORQ_SCOPE(label) const ::rotorq::check::scope ROTORQ_CHECK_JOIN(rotorq_scope_, __LINE__)(label)
#define ROTORQ_SCOPE_VALUE(label, value) \
  const ::rotorq::check::scope ROTORQ_CHECK_JOIN(rotorq_scope_, __LINE__)((label), (value))
// NOLINTEND(cppcoreguidelines-macro-usage)
