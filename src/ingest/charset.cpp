#include "ingest/charset.h"

#include <unicode/ucnv.h>
#include <unicode/ucsdet.h>

#include <memory>

namespace lode::ingest {
namespace {

struct DetectorCloser {
  void operator()(UCharsetDetector* d) const { ucsdet_close(d); }
};
struct ConverterCloser {
  void operator()(UConverter* c) const { ucnv_close(c); }
};

}  // namespace

std::optional<DetectedCharset> detect_charset(std::string_view bytes) {
  UErrorCode err = U_ZERO_ERROR;
  std::unique_ptr<UCharsetDetector, DetectorCloser> det(ucsdet_open(&err));
  if (U_FAILURE(err)) return std::nullopt;
  // ICU looks at a prefix anyway; 64 KiB is plenty and keeps int32 lengths safe.
  const auto n = static_cast<int32_t>(std::min<std::size_t>(bytes.size(), 65536));
  ucsdet_setText(det.get(), bytes.data(), n, &err);
  const UCharsetMatch* match = ucsdet_detect(det.get(), &err);
  if (U_FAILURE(err) || match == nullptr) return std::nullopt;
  DetectedCharset out;
  out.name = ucsdet_getName(match, &err);
  out.confidence = static_cast<int>(ucsdet_getConfidence(match, &err));
  if (U_FAILURE(err) || out.confidence < kMinCharsetConfidence) return std::nullopt;
  if (out.name.rfind("UTF-16", 0) == 0 || out.name.rfind("UTF-32", 0) == 0) return std::nullopt;
  return out;
}

Result<std::string> convert_to_utf8(std::string_view bytes, const std::string& charset) {
  UErrorCode err = U_ZERO_ERROR;
  std::unique_ptr<UConverter, ConverterCloser> conv(ucnv_open(charset.c_str(), &err));
  if (U_FAILURE(err)) return Status::InvalidArgument("unknown charset '" + charset + "'");
  std::unique_ptr<UConverter, ConverterCloser> utf8(ucnv_open("UTF-8", &err));
  if (U_FAILURE(err)) return Status::InvalidArgument("ICU has no UTF-8 converter");
  std::string out;
  out.resize(bytes.size() * 3 + 16);  // a byte becomes at most one BMP character
  char* target = out.data();
  const char* source = bytes.data();
  ucnv_convertEx(utf8.get(), conv.get(), &target, out.data() + out.size(), &source,
                 bytes.data() + bytes.size(), nullptr, nullptr, nullptr, nullptr, true, true, &err);
  if (U_FAILURE(err)) return Status::InvalidArgument("cannot convert from '" + charset + "': " + u_errorName(err));
  out.resize(static_cast<std::size_t>(target - out.data()));
  return out;
}

}  // namespace lode::ingest
