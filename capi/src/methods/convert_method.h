// Convert: structures from any input written as CIF, extended XYZ or Structure messages.
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry ConvertMethod();

}  // namespace nucleate::capi
