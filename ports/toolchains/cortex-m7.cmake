# Cortex-M7 (Armv7E-M with the DSP extension and a double-precision FPU, hard-float ABI), run on
# QEMU's mps2-an500, which models the FPv5 double-precision unit (MVFR0 0x10110221). Code in SSRAM1
# at 0, data in SSRAM2/3 at 0x20000000, 4 MB each (ports/targets/mps2.ld).
set(CMAKE_SYSTEM_PROCESSOR cortex-m7)
set(ROTORQ_TARGET_CORE_DEFAULT cortex-m7)
set(ROTORQ_PORT_DEFAULT cortex_m_dsp)
set(ROTORQ_TARGET_FLAGS -mcpu=cortex-m7 -mthumb -mfloat-abi=hard -mfpu=fpv5-d16)
set(ROTORQ_TARGET_MEMORY mps2.ld)
set(ROTORQ_QEMU qemu-system-arm -M mps2-an500)
set(ROTORQ_TOOLCHAIN_PREFIX arm-none-eabi-)
include(${CMAKE_CURRENT_LIST_DIR}/bare-metal.cmake)
