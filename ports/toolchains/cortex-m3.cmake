# Cortex-M3 (Armv7-M, no FPU: soft float), run on QEMU's mps2-an385. Code in SSRAM1 at 0, data in
# SSRAM2/3 at 0x20000000, 4 MB each (ports/targets/mps2.ld).
set(CMAKE_SYSTEM_PROCESSOR cortex-m3)
set(ROTORQ_TARGET_CORE_DEFAULT cortex-m3)
set(ROTORQ_PORT_DEFAULT cortex_m_base)
set(ROTORQ_TARGET_FLAGS -mcpu=cortex-m3 -mthumb -mfloat-abi=soft)
set(ROTORQ_TARGET_MEMORY mps2.ld)
set(ROTORQ_QEMU qemu-system-arm -M mps2-an385)
set(ROTORQ_TOOLCHAIN_PREFIX arm-none-eabi-)
include(${CMAKE_CURRENT_LIST_DIR}/bare-metal.cmake)
