# Cortex-M33 (Armv8-M Mainline with the DSP extension and a single-precision FPv5 unit, hard-float
# ABI), run on QEMU's mps2-an505 (both extensions modelled: ID_ISAR3 0x01111131, MVFR0 0x10110021).
# The core starts in the secure state with its vector table at 0x10000000, so code sits in the
# secure alias of SSRAM1 (0x10000000) and data in that of SSRAM2/3 (0x38000000), 4 MB each
# (ports/targets/mps2-an505.ld). No TrustZone set-up is needed: everything runs secure.
set(CMAKE_SYSTEM_PROCESSOR cortex-m33)
set(ROTORQ_TARGET_CORE_DEFAULT cortex-m33)
set(ROTORQ_PORT_DEFAULT cortex_m_dsp)
set(ROTORQ_TARGET_FLAGS -mcpu=cortex-m33 -mthumb -mfloat-abi=hard -mfpu=fpv5-sp-d16)
set(ROTORQ_TARGET_MEMORY mps2-an505.ld)
set(ROTORQ_QEMU qemu-system-arm -M mps2-an505)
set(ROTORQ_TOOLCHAIN_PREFIX arm-none-eabi-)
include(${CMAKE_CURRENT_LIST_DIR}/bare-metal.cmake)
