// Bytes to text for the readers (private to src/ingest/): binary refusal,
// BOM removal, UTF-8 repair and line-ending normalisation.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::ingest {

// Only this many leading bytes are searched for a NUL byte.
inline constexpr std::size_t kBinarySniffBytes = 8192;

// Unsupported ("<path>: binary file (NUL byte at offset N)") when `bytes`,
// which start at file offset `at`, hold a NUL within the file's first
// kBinarySniffBytes; ok otherwise. For readers that see a file in pieces.
Status refuse_binary(std::string_view bytes, std::int64_t at, const std::string& path);

// Whether `s` is the refusal of refuse_binary() or decode_text() (a file
// that is binary data, not text), as opposed to a real read failure.
bool is_binary_refusal(const Status& s);

// The one warning for repaired UTF-8: "invalid UTF-8 at byte <first_bad>
// (<n> sequence(s) replaced)".
std::string invalid_utf8_warning(std::int64_t first_bad, std::size_t replaced);

struct DecodedText {
  std::string text;     // valid UTF-8, no BOM, lines end in '\n' only
  std::string warning;  // empty, or the one invalid-UTF-8 / charset warning for the file
};

// Unsupported ("<path>: binary file ...") when the bytes hold a NUL within the
// first kBinarySniffBytes, or when more than 30% of the characters would be
// replacement characters; otherwise the decoded text. Bytes that are not
// UTF-8 and hold no valid multi-byte UTF-8 sequence are converted from the
// charset ICU detects (when it is confident), with a "not UTF-8: decoded as
// ..." warning; otherwise invalid sequences become U+FFFD. `path` only names the
// file in messages.
Result<DecodedText> decode_text(std::string_view bytes, const std::string& path);

}  // namespace lode::ingest
