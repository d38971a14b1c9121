/* Compiled, never run: the public header must build alone, warning-free, as strict C99 and as
   C++17, because hosts include it with their own strict flags (see tests/abi/CMakeLists.txt). */
#include <nucleate/nucleate.h>

/* Uses the typedefs so a broken declaration is an error, not silently unused. */
nucleate_plugin_entry_fn header_pedantic_entry = &nucleate_plugin_entry;
