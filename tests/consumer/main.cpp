#include <rotorq/rotorq.hpp>

// One current-loop step's transforms; the exit status is 0 when the d-axis current comes out as the
// magnitude of a balanced set aligned with the d axis at 0 degrees.
int main() {
  using namespace rotorq;
  const phases<q15> i{q15::from_raw(16384), q15::from_raw(-8192), q15::from_raw(-8192)};
  const rotating<q15> dq = park(clarke(i), sin_cos(turn16{}));
  return (dq.d.raw() >= 16383 && dq.d.raw() <= 16385 && dq.q.raw() == 0) ? 0 : 1;
}
