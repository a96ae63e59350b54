# What every rotorq cross toolchain file shares: a bare-metal program built by a Debian GCC and
# linked with picolibc, whose start-up code (crt0) sets up the stack, data and bss, enables the FPU
# where the multilib has one, and whose semihosting library hands printf output and main's return
# value to the emulator. The core's file sets, before including this one:
#   ROTORQ_TOOLCHAIN_PREFIX  arm-none-eabi- or riscv64-unknown-elf-
#   ROTORQ_TARGET_CORE_DEFAULT, ROTORQ_PORT_DEFAULT   cache defaults of ROTORQ_TARGET_CORE, ROTORQ_PORT
#   ROTORQ_TARGET_FLAGS      compiler flags that select the core and its float ABI (a list)
#   ROTORQ_TARGET_MEMORY     the machine's memory layout, a linker script in ports/targets/
#   ROTORQ_QEMU              the QEMU system emulator and the options that pick the machine (a list)
set(CMAKE_SYSTEM_NAME Generic)
set(CMAKE_TRY_COMPILE_TARGET_TYPE STATIC_LIBRARY)

set(CMAKE_C_COMPILER ${ROTORQ_TOOLCHAIN_PREFIX}gcc)
set(CMAKE_CXX_COMPILER ${ROTORQ_TOOLCHAIN_PREFIX}g++)
set(CMAKE_ASM_COMPILER ${ROTORQ_TOOLCHAIN_PREFIX}gcc)
# Programs link through the gcc driver: the g++ driver would add -lstdc++, which neither Debian
# toolchain has for picolibc (the RISC-V one ships no C++ library at all). rotorq needs nothing of
# the C++ library, so a program that asks for it (operator new, exceptions) fails to link.
find_program(ROTORQ_TARGET_GCC ${ROTORQ_TOOLCHAIN_PREFIX}gcc REQUIRED)
set(CMAKE_CXX_LINK_EXECUTABLE
    "${ROTORQ_TARGET_GCC} <FLAGS> <CMAKE_CXX_LINK_FLAGS> <LINK_FLAGS> <OBJECTS> -o <TARGET> <LINK_LIBRARIES>")

set(ROTORQ_TARGET_CORE
    ${ROTORQ_TARGET_CORE_DEFAULT}
    CACHE STRING "The core the cross toolchain builds for")
set(ROTORQ_PORT
    ${ROTORQ_PORT_DEFAULT}
    CACHE STRING "The port (ports/<name>) for the core")

get_filename_component(ROTORQ_PORTS_DIR ${CMAKE_CURRENT_LIST_DIR} DIRECTORY)
list(JOIN ROTORQ_TARGET_FLAGS " " rotorq_target_flags)
# picolibc.specs puts picolibc's headers on the include path and its start-up code and libraries on
# the link; CMake passes the compile flags to the link too, so it appears here only.
set(rotorq_common_flags "${rotorq_target_flags} --specs=picolibc.specs -ffunction-sections -fdata-sections")
set(CMAKE_C_FLAGS_INIT "${rotorq_common_flags}")
set(CMAKE_CXX_FLAGS_INIT "${rotorq_common_flags} -fno-exceptions -fno-rtti")
set(CMAKE_ASM_FLAGS_INIT "${rotorq_target_flags}")
# The machine's script defines the memory regions and includes picolibc.ld, which places the
# start-up code (and on Cortex-M picolibc's vector table) at the start of the code region.
set(CMAKE_EXE_LINKER_FLAGS_INIT
    "--oslib=semihost --crt0=semihost -Wl,--gc-sections -T${ROTORQ_PORTS_DIR}/targets/${ROTORQ_TARGET_MEMORY}"
)

# CTest appends the program's path. Semihosting carries the program's output and its exit status
# to the host (a non-zero return from main makes QEMU exit non-zero); the console is a chardev on
# stdio so that the output arrives on stdout, QEMU's own messages on stderr. -no-reboot turns a
# reset request into an exit; a program that hangs is stopped by the test's TIMEOUT
# (cmake/RotorqTarget.cmake).
set(CMAKE_CROSSCOMPILING_EMULATOR
    ${ROTORQ_QEMU}
    -nographic
    -monitor
    none
    -serial
    none
    -chardev
    stdio,id=rotorq_console
    -semihosting-config
    enable=on,target=native,chardev=rotorq_console
    -no-reboot
    -kernel)

# Programs (QEMU, binutils) come from the host; libraries and packages found on the host are not for
# the target, so none is found.
set(CMAKE_FIND_ROOT_PATH_MODE_PROGRAM NEVER)
set(CMAKE_FIND_ROOT_PATH_MODE_LIBRARY ONLY)
set(CMAKE_FIND_ROOT_PATH_MODE_INCLUDE ONLY)
set(CMAKE_FIND_ROOT_PATH_MODE_PACKAGE ONLY)
