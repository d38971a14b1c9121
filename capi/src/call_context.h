// The per-call callbacks a caller passed to nucleate_call_observed (and the processes of
// nucleate_call_collective). Handlers log and report progress through this; nothing of it
// outlives the call.
#pragma once

#include <string>

#include "nucleate/nucleate.h"

namespace nucleate::capi {

class CallContext {
 public:
  CallContext(nucleate_log_fn log, nucleate_progress_fn progress, void* user_data,
              const nucleate_collective_v1* collective = nullptr)
      : log_(log), progress_(progress), user_data_(user_data), collective_(collective) {}

  void Log(int32_t level, const std::string& line) const;
  // False when the caller asked to cancel; the handler then stops, keeps what it finished in the
  // reply, and returns. The dispatcher turns that into NUCLEATE_ERROR_CANCELLED.
  bool ReportProgress(double fraction, const char* stage) const;
  bool cancelled() const { return cancelled_; }
  // The processes sharing this call; null for one process (checked by Dispatch).
  const nucleate_collective_v1* collective() const { return collective_; }

 private:
  nucleate_log_fn log_;
  nucleate_progress_fn progress_;
  void* user_data_;
  const nucleate_collective_v1* collective_;
  mutable bool cancelled_ = false;  // one call, one thread: no synchronisation needed
};

}  // namespace nucleate::capi
