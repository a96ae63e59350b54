// Everything rotorq offers for the target: include this one header in firmware.
// (Host-only conversions from and to double are in rotorq/host.hpp.)
#pragma once

#include "rotorq/accumulator.hpp"
#include "rotorq/angle_interpolator.hpp"
#include "rotorq/clarke.hpp"
#include "rotorq/commutation.hpp"
#include "rotorq/constants.hpp"
#include "rotorq/dc_bus.hpp"
#include "rotorq/electrical_speed.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"
#include "rotorq/hall.hpp"
#include "rotorq/hall_tracker.hpp"
#include "rotorq/park.hpp"
#include "rotorq/pi_regulator.hpp"
#include "rotorq/pwm_compare.hpp"
#include "rotorq/rotation.hpp"
#include "rotorq/sin_cos.hpp"
#include "rotorq/svpwm.hpp"
#include "rotorq/turn.hpp"
#include "rotorq/version.hpp"
#include "rotorq/voltage_limit.hpp"
