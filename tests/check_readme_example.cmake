# Fails unless the code of readme_example.cpp (from its #include line on) appears verbatim in the
# README's cpp block.
#   cmake -DREADME=... -DEXAMPLE=... -P this
file(READ ${README} readme)
file(READ ${EXAMPLE} example)
string(FIND "${example}" "#include <rotorq/rotorq.hpp>" start)
string(SUBSTRING "${example}" ${start} -1 code)
string(FIND "${readme}" "${code}" found)
if(found EQUAL -1)
  message(FATAL_ERROR "README.md's current-loop example differs from tests/readme_example.cpp")
endif()
