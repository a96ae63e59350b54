# RV32IMC (ilp32, no FPU), with Debian's riscv64-unknown-elf GCC and picolibc, run on QEMU's
# riscv32 virt machine without firmware: the reset vector jumps to 0x80000000, where picolibc's
# start-up code sits. Code at 0x80000000, data at 0x80200000, 2 MB each, in the machine's RAM
# (ports/targets/riscv-virt.ld). picolibc's rv32im multilib serves rv32imc.
set(CMAKE_SYSTEM_PROCESSOR riscv32)
set(ROTORQ_TARGET_CORE_DEFAULT rv32imc)
set(ROTORQ_PORT_DEFAULT rv32)
set(ROTORQ_TARGET_FLAGS -march=rv32imc -mabi=ilp32)
set(ROTORQ_TARGET_MEMORY riscv-virt.ld)
set(ROTORQ_QEMU qemu-system-riscv32 -M virt -bios none)
set(ROTORQ_TOOLCHAIN_PREFIX riscv64-unknown-elf-)
include(${CMAKE_CURRENT_LIST_DIR}/bare-metal.cmake)
