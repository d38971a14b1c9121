// Core names fields as its own parameters spell them; a request nests them. This places a core
// error's field inside its enclosing request field ("variance" + "beta_end").
#pragma once

#include "core/common/error.h"

namespace nucleate::capi {

template <class Body>
auto WithinField(const char* parent, Body&& body) -> decltype(body()) {
  try {
    return body();
  } catch (const Error& error) {
    throw error.WithinField(parent);
  }
}

}  // namespace nucleate::capi
