// Status codes: names, and the one mapping from core error kinds.
#pragma once

#include "core/common/error.h"
#include "nucleate/nucleate.h"

namespace nucleate::capi {

nucleate_status StatusForErrorKind(ErrorKind kind);

}  // namespace nucleate::capi
