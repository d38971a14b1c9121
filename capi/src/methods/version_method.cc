#include "methods/version_method.h"

#include "nucleate/v1/service.pb.h"

namespace nucleate::capi {
namespace {

void HandleVersion(const v1::VersionRequest&, v1::VersionReply* reply, const CallContext&) {
  reply->set_version(NUCLEATE_VERSION_STRING);
  reply->set_abi_version(NUCLEATE_ABI_VERSION);
  for (const MethodEntry& entry : Methods()) reply->add_methods(entry.name);
}

}  // namespace

MethodEntry VersionMethod() {
  return MakeMethod<v1::VersionRequest, v1::VersionReply, &HandleVersion>("Version");
}

}  // namespace nucleate::capi
