// Legacy encodings (private to src/ingest/): ICU charset detection and
// conversion to UTF-8, for plain text and for HTML's declared charsets.
#pragma once

#include <optional>
#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::ingest {

struct DetectedCharset {
  std::string name;    // ICU's name, e.g. "ISO-8859-1", "KOI8-R", "Shift_JIS"
  int confidence = 0;  // ICU's 0-100 score
};

// Below this ICU confidence a guess is not trusted. ICU gives 10 to bytes
// that match nothing (random data) and 20-60 to real text in a legacy
// encoding, even short lines (measured on ICU 72; common practice to treat
// low scores as "unknown").
inline constexpr int kMinCharsetConfidence = 15;

// ICU's best guess for `bytes`, or nullopt when it has none at or above
// kMinCharsetConfidence, or when the guess is a UTF-16/32 form (those hold
// NUL bytes, which the binary check has already refused).
std::optional<DetectedCharset> detect_charset(std::string_view bytes);

// `bytes` in `charset` (any name ICU's converters know: "windows-1252",
// "latin1", "Shift_JIS", ...) as UTF-8; unmappable bytes become U+FFFD.
// InvalidArgument naming the charset when ICU does not know it.
Result<std::string> convert_to_utf8(std::string_view bytes, const std::string& charset);

}  // namespace lode::ingest
