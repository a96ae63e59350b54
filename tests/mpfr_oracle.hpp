// MPFR as the outside oracle: correctly rounded sine, cosine and constants, evaluated with 256-bit
// precision (MPFR, the GNU multiple-precision floating-point library with correct rounding).
#pragma once

#include <mpfr.h>
#include <cstdint>

namespace rotorq::test {

class mpfr_value {
 public:
  // mpfr_init2 is what initialises an mpfr_t; it has no value-initialised state to give it before.
  mpfr_value() { mpfr_init2(v_, 256); }  // NOLINT(cppcoreguidelines-pro-type-member-init)
  ~mpfr_value() { mpfr_clear(v_); }
  mpfr_value(const mpfr_value&) = delete;
  mpfr_value& operator=(const mpfr_value&) = delete;
  mpfr_value(mpfr_value&&) = delete;
  mpfr_value& operator=(mpfr_value&&) = delete;
  mpfr_ptr get() { return v_; }

 private:
  mpfr_t v_;
};

// out = sin or cos of (2 pi raw / 2^bits), times 2^scale_bits.
inline void scaled_sin_cos_turns(mpfr_ptr out, uint64_t raw, int bits, int scale_bits, bool cosine) {
  mpfr_value pi;
  mpfr_const_pi(pi.get(), MPFR_RNDN);
  mpfr_set_uj(out, raw, MPFR_RNDN);
  mpfr_mul(out, out, pi.get(), MPFR_RNDN);
  mpfr_mul_2si(out, out, 1 - bits, MPFR_RNDN);
  if (cosine) {
    mpfr_cos(out, out, MPFR_RNDN);
  } else {
    mpfr_sin(out, out, MPFR_RNDN);
  }
  mpfr_mul_2si(out, out, scale_bits, MPFR_RNDN);
}

// The signed error computed_raw - exact * 2^scale_bits, formed in MPFR before rounding to double, so
// it stays exact to far below a step even where the raw values need 31 bits.
inline double error_sin_cos_turns(int64_t computed_raw, uint64_t raw, int bits, int scale_bits, bool cosine) {
  mpfr_value exact, error;
  scaled_sin_cos_turns(exact.get(), raw, bits, scale_bits, cosine);
  mpfr_set_sj(error.get(), computed_raw, MPFR_RNDN);
  mpfr_sub(error.get(), error.get(), exact.get(), MPFR_RNDN);
  return mpfr_get_d(error.get(), MPFR_RNDN);
}

// The exact value times 2^scale_bits as a double (53 leading bits).
inline double scaled_sin_cos_turns(uint64_t raw, int bits, int scale_bits, bool cosine) {
  mpfr_value exact;
  scaled_sin_cos_turns(exact.get(), raw, bits, scale_bits, cosine);
  return mpfr_get_d(exact.get(), MPFR_RNDN);
}

// round(value * 2^scale_bits) to nearest (the constants tested are irrational or non-dyadic, so no
// ties occur).
inline uint64_t round_scaled(mpfr_ptr value, int scale_bits) {
  mpfr_value x;
  mpfr_mul_2si(x.get(), value, scale_bits, MPFR_RNDN);
  mpfr_rint(x.get(), x.get(), MPFR_RNDN);
  return static_cast<uint64_t>(mpfr_get_uj(x.get(), MPFR_RNDN));
}

}  // namespace rotorq::test
