#include "call_context.h"

namespace nucleate::capi {

void CallContext::Log(int32_t level, const std::string& line) const {
  if (log_ != nullptr) log_(level, line.c_str(), user_data_);
}

bool CallContext::ReportProgress(double fraction, const char* stage) const {
  if (progress_ == nullptr) return true;
  if (progress_(fraction, stage, user_data_) != 0) cancelled_ = true;
  return !cancelled_;
}

}  // namespace nucleate::capi
