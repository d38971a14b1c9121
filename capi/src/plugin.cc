// The one symbol a workflow engine needs after dlopen.
#include <cstddef>

#include "nucleate/nucleate.h"

extern "C" const nucleate_plugin_v1* nucleate_plugin_entry(uint32_t requested_abi) {
  static const nucleate_plugin_v1 kTable = {
      sizeof(nucleate_plugin_v1),
      NUCLEATE_ABI_VERSION,
      &nucleate_version,
      &nucleate_call,
      &nucleate_call_observed,
      &nucleate_free,
      &nucleate_status_name,
      &nucleate_reply_doubles,
      &nucleate_call_collective,
  };
  // Fields are only appended and meanings never change, so one table serves every host built
  // against this ABI major; a host from a different major gets NULL rather than a wrong table.
  if (requested_abi != NUCLEATE_ABI_VERSION) return nullptr;
  return &kTable;
}

// Offsets are pinned: a field once shipped never moves.
static_assert(offsetof(nucleate_plugin_v1, struct_size) == 0, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, abi_version) == 4, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, version) == 8, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, call) == 16, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, call_observed) == 24, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, free) == 32, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, status_name) == 40, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, reply_doubles) == 48, "plugin table layout");
static_assert(offsetof(nucleate_plugin_v1, call_collective) == 56, "plugin table layout");
