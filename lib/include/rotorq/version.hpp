// The library version, kept equal to the project version in CMakeLists.txt (configuring checks it).
#pragma once

// Macros on purpose: code tests them in #if, and CMakeLists.txt reads them from this file.
// NOLINTBEGIN(cppcoreguidelines-macro-usage)
#define ROTORQ_VERSION_MAJOR 0
#define ROTORQ_VERSION_MINOR 1
#define ROTORQ_VERSION_PATCH 0
// NOLINTEND(cppcoreguidelines-macro-usage)

namespace rotorq {
inline constexpr int version_major = ROTORQ_VERSION_MAJOR;
inline constexpr int version_minor = ROTORQ_VERSION_MINOR;
inline constexpr int version_patch = ROTORQ_VERSION_PATCH;
}  // namespace rotorq
