# Cortex-M0+ (Armv6-M, no FPU: soft float), run on QEMU's micro:bit: an nRF51 whose Cortex-M0 runs
# the same Armv6-M code. Flash 256 KB at 0, RAM 16 KB at 0x20000000 (ports/targets/microbit.ld).
set(CMAKE_SYSTEM_PROCESSOR cortex-m0plus)
set(ROTORQ_TARGET_CORE_DEFAULT cortex-m0plus)
set(ROTORQ_PORT_DEFAULT cortex_m_base)
set(ROTORQ_TARGET_FLAGS -mcpu=cortex-m0plus -mthumb -mfloat-abi=soft)
set(ROTORQ_TARGET_MEMORY microbit.ld)
set(ROTORQ_QEMU qemu-system-arm -M microbit)
set(ROTORQ_TOOLCHAIN_PREFIX arm-none-eabi-)
include(${CMAKE_CURRENT_LIST_DIR}/bare-metal.cmake)
