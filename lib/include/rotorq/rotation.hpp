// The direction of rotation, shared by the angle trackers and the commutation: forward is the
// direction of increasing angle (alpha toward beta).
#pragma once

#include <stdint.h>

namespace rotorq {

enum class rotation : int8_t { backward = -1, unknown = 0, forward = 1 };

}  // namespace rotorq
