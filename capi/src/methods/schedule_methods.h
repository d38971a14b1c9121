// Schedule, DesignSchedule and WrappedNormal: the only code that converts schedule messages to
// core/schedule types and back.
#pragma once

#include "dispatch.h"

namespace nucleate::capi {

MethodEntry ScheduleMethod();
MethodEntry DesignScheduleMethod();
MethodEntry WrappedNormalMethod();

}  // namespace nucleate::capi
