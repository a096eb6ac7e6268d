#include "lode/status.h"

namespace lode {

std::string Status::to_string() const {
  const char* name = "ok";
  switch (code_) {
    case Code::kOk: return "ok";
    case Code::kInvalidArgument: name = "invalid argument"; break;
    case Code::kNotFound: name = "not found"; break;
    case Code::kCorruption: name = "corruption"; break;
    case Code::kIOError: name = "I/O error"; break;
    case Code::kBusy: name = "busy"; break;
    case Code::kUnsupported: name = "unsupported"; break;
    case Code::kLimit: name = "limit exceeded"; break;
  }
  return std::string(name) + ": " + message_;
}

}  // namespace lode
