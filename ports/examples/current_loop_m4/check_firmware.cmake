# The example firmware holds no heap, no exception handling and no floating point. Two checks, each
# a post-build step that deletes what it checked when it fails (so the next build checks again):
#
#   cmake -DNM=<nm> -DOBJDUMP=<objdump> -DARCHIVE=<firmware .a> -P check_firmware.cmake
#     the firmware's objects call no forbidden symbol (nm -u) and contain no floating-point
#     instruction: on the M4F, float arithmetic is inline FPU code, not a helper call, so the symbol
#     check alone would miss it
#   cmake -DNM=<nm> -DELF=<program> -DMAP=<link map> -DFIRMWARE=<firmware .a file name> -P ...
#     the linked program defines or references no forbidden symbol (nm), no archive member was
#     pulled in for one (the link map's "Archive member included" list), and prints the firmware's
#     share of the program: its input sections in the map, after --gc-sections
#
# Forbidden: heap (malloc, free, sbrk, operator new and delete), exception handling (__cxa_*,
# _Unwind_*, __gxx_personality*, the Arm unwinder's personality routines) and floating-point helpers
# (the Arm run-time ABI's __aeabi_f*, __aeabi_d*, __aeabi_*2f, __aeabi_*2d and libgcc's soft-float
# routines such as __addsf3, __muldf3, __fixdfsi, __floatsisf). Integer helpers (__aeabi_uldivmod,
# __aeabi_lmul, ...) are fine.
set(forbidden_heap
    "^(malloc|free|calloc|realloc|reallocarray|memalign|aligned_alloc|posix_memalign|valloc|_?sbrk|_sbrk_r|_malloc_r|_free_r|__malloc_[a-z_]+)$"
    "^_Zn[wa][jmy]"
    "^_Zd[la]Pv")
set(forbidden_exceptions "^__cxa_" "^_Unwind_" "^__gxx_personality" "^__aeabi_unwind_cpp_pr")
set(forbidden_float "^__aeabi_(c?[df][a-z0-9]*|[a-z0-9]*2[df]|h2f|f2h)$" "^__[a-z]+(sf|df)[0-9a-z]*$"
                    "^__gnu_(f2h|h2f)")

# Sets ${out} to the names in ${names} that a forbidden pattern matches, each with its kind.
function(find_forbidden names out)
  set(found)
  foreach(name IN LISTS names)
    foreach(kind IN ITEMS heap exceptions float)
      foreach(pattern IN LISTS forbidden_${kind})
        if(name MATCHES "${pattern}")
          list(APPEND found "${name} (${kind})")
        endif()
      endforeach()
    endforeach()
  endforeach()
  set(${out}
      "${found}"
      PARENT_SCOPE)
endfunction()

# Symbol names (the last field) of nm output lines.
function(nm_names output out)
  string(REGEX REPLACE "\n$" "" output "${output}")
  string(REPLACE "\n" ";" lines "${output}")
  set(names)
  foreach(line IN LISTS lines)
    if(line MATCHES "([^ \t]+)$")
      list(APPEND names "${CMAKE_MATCH_1}")
    endif()
  endforeach()
  set(${out}
      "${names}"
      PARENT_SCOPE)
endfunction()

function(fail checked message)
  file(REMOVE "${checked}")
  message(FATAL_ERROR "${message}\n(${checked} removed)")
endfunction()

function(run)
  execute_process(
    COMMAND ${ARGN}
    OUTPUT_VARIABLE output
    RESULT_VARIABLE result)
  if(NOT result EQUAL 0)
    message(FATAL_ERROR "${ARGN} failed (${result})")
  endif()
  set(output
      "${output}"
      PARENT_SCOPE)
endfunction()

if(ARCHIVE)
  run(${NM} -u ${ARCHIVE})
  nm_names("${output}" undefined)
  find_forbidden("${undefined}" found)
  if(found)
    list(JOIN found "\n  " found)
    fail(${ARCHIVE} "the firmware calls what it must not:\n  ${found}")
  endif()
  # Armv7E-M has no vector (Neon) unit, so every v* mnemonic is a floating-point instruction.
  run(${OBJDUMP} -d ${ARCHIVE})
  string(REGEX MATCHALL "\n[ ]+[0-9a-f]+:\t[0-9a-f ]+\tv[a-z0-9.]+[^\n]*" fpu "${output}")
  if(fpu)
    list(JOIN fpu "" fpu)
    fail(${ARCHIVE} "the firmware contains floating-point instructions:${fpu}")
  endif()
  message(STATUS "firmware: no heap, exception handling or floating point")
  return()
endif()

run(${NM} ${ELF})
nm_names("${output}" symbols)
find_forbidden("${symbols}" found)
if(found)
  list(JOIN found "\n  " found)
  fail(${ELF} "the program links what the firmware must not:\n  ${found}")
endif()

file(READ ${MAP} map)
string(FIND "${map}" "Archive member included to satisfy reference by file (symbol)" members_begin)
string(FIND "${map}" "Memory Configuration" members_end)
string(FIND "${map}" "Discarded input sections" discarded_begin)
if(discarded_begin GREATER members_begin AND discarded_begin LESS members_end)
  set(members_end ${discarded_begin})
endif()
string(FIND "${map}" "Linker script and memory map" layout_begin)
if(members_begin LESS 0
   OR members_end LESS members_begin
   OR layout_begin LESS 0)
  message(FATAL_ERROR "${MAP} is not a GNU ld link map")
endif()
math(EXPR members_length "${members_end} - ${members_begin}")
string(SUBSTRING "${map}" ${members_begin} ${members_length} members)
# Each member is a line "archive(member.o)" followed by an indented line "file (symbol)".
string(REGEX MATCHALL "\\(([^()\n]+)\\)\n" references "${members}")
string(REGEX MATCHALL "\n[^ \n][^\n]*\\(([^()\n]+)\\)" pulled_in "${members}")
set(reference_names)
foreach(reference IN LISTS references)
  string(REGEX REPLACE "^\\(([^()\n]+)\\)\n$" "\\1" reference "${reference}")
  list(APPEND reference_names "${reference}")
endforeach()
find_forbidden("${reference_names}" found)
if(found)
  list(JOIN found "\n  " found)
  fail(${ELF} "the link pulled in library code for:\n  ${found}")
endif()
list(LENGTH pulled_in pulled_in_count)

# The firmware's input sections that survived --gc-sections: " .text.name" then, on the same line or
# the next, address, size and "archive(object)".
string(SUBSTRING "${map}" ${layout_begin} -1 layout)
string(REGEX MATCHALL "\n \\.[a-z]+[^ \n]*[ \n]+0x[0-9a-f]+[ ]+0x[0-9a-f]+ [^\n]*${FIRMWARE}\\([^\n]*"
             sections "${layout}")
foreach(kind IN ITEMS text rodata data bss)
  set(size_${kind} 0)
endforeach()
foreach(section IN LISTS sections)
  if(section MATCHES "^\n \\.([a-z]+)[^ \n]*[ \n]+0x[0-9a-f]+[ ]+(0x[0-9a-f]+) ")
    set(kind ${CMAKE_MATCH_1})
    if(DEFINED size_${kind})
      math(EXPR size_${kind} "${size_${kind}} + ${CMAKE_MATCH_2}")
    endif()
  endif()
endforeach()
math(EXPR size_ram "${size_data} + ${size_bss}")
message(
  STATUS
    "firmware in ${ELF}: .text ${size_text} bytes, .rodata ${size_rodata} bytes, RAM ${size_ram} bytes; "
    "the program has no heap, exception handling or floating-point code (${pulled_in_count} library members)")
