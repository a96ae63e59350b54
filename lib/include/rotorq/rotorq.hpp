// Everything rotorq offers for the target: include this one header in firmware.
// (Host-only conversions from and to double are in rotorq/host.hpp.)
#pragma once

#include "rotorq/accumulator.hpp"
#include "rotorq/clarke.hpp"
#include "rotorq/constants.hpp"
#include "rotorq/dc_bus.hpp"
#include "rotorq/fixed.hpp"
#include "rotorq/frames.hpp"
#include "rotorq/park.hpp"
#include "rotorq/pwm_compare.hpp"
#include "rotorq/sin_cos.hpp"
#include "rotorq/svpwm.hpp"
#include "rotorq/turn.hpp"
#include "rotorq/version.hpp"
#include "rotorq/voltage_limit.hpp"
