#include "ingest/decode.h"

#include <algorithm>
#include <cstring>
#include <utility>

#include "ingest/charset.h"
#include "lode/analysis.h"

namespace lode::ingest {
namespace {

// Characters of valid UTF-8 text: every byte that is not a continuation byte.
std::size_t count_chars(std::string_view s) {
  std::size_t n = 0;
  for (const char c : s) n += (static_cast<unsigned char>(c) & 0xC0) != 0x80;
  return n;
}

// Invalid sequences needed before a legacy charset is considered.
constexpr std::size_t kMinLegacyBytes = 3;

// Characters of valid UTF-8 text that take more than one byte.
std::size_t count_multibyte(std::string_view s) {
  std::size_t n = 0;
  for (const char c : s) n += (static_cast<unsigned char>(c) & 0xC0) == 0xC0;
  return n;
}

// CRLF and lone CR become LF, so every reader sees one line ending.
std::string normalise_newlines(std::string text) {
  if (text.find('\r') == std::string::npos) return text;
  std::string out;
  out.reserve(text.size());
  for (std::size_t i = 0; i < text.size(); ++i) {
    if (text[i] != '\r') {
      out += text[i];
    } else {
      out += '\n';
      if (i + 1 < text.size() && text[i + 1] == '\n') ++i;
    }
  }
  return out;
}

}  // namespace

Status refuse_binary(std::string_view bytes, std::int64_t at, const std::string& path) {
  if (at < 0 || at >= static_cast<std::int64_t>(kBinarySniffBytes)) return Status();
  const std::size_t sniff = std::min(bytes.size(), kBinarySniffBytes - static_cast<std::size_t>(at));
  if (const void* nul = std::memchr(bytes.data(), '\0', sniff); nul != nullptr) {
    const auto offset = at + (static_cast<const char*>(nul) - bytes.data());
    return Status::Unsupported(path + ": binary file (NUL byte at offset " + std::to_string(offset) + ")");
  }
  return Status();
}

bool is_binary_refusal(const Status& s) {
  return s.code() == Code::kUnsupported && s.message().find(": binary file (") != std::string::npos;
}

std::string invalid_utf8_warning(std::int64_t first_bad, std::size_t replaced) {
  return "invalid UTF-8 at byte " + std::to_string(first_bad) + " (" + std::to_string(replaced) +
         (replaced == 1 ? " sequence replaced)" : " sequences replaced)");
}

Result<DecodedText> decode_text(std::string_view bytes, const std::string& path) {
  LODE_RETURN_IF_ERROR(refuse_binary(bytes, 0, path));
  std::size_t bom = 0;
  if (bytes.size() >= 3 && bytes.substr(0, 3) == "\xEF\xBB\xBF") bom = 3;
  const std::string_view body = bytes.substr(bom);

  DecodedText out;
  if (is_valid_utf8(body)) {
    out.text.assign(body);
  } else {
    Utf8Repair fixed = repair_utf8(body);
    // Text with no valid multi-byte UTF-8 at all was written in another
    // encoding; text with some is UTF-8 with damage, repaired below.
    // One or two stray bytes are too little for ICU to tell an encoding
    // from damage (common practice: detection wants some evidence).
    if (fixed.replaced >= kMinLegacyBytes && fixed.replaced == count_multibyte(fixed.text)) {
      if (auto cs = detect_charset(body)) {
        auto text = convert_to_utf8(body, cs->name);
        if (text.ok()) {
          out.text = normalise_newlines(std::move(text).value());
          out.warning = "not UTF-8: decoded as " + cs->name + " (ICU detection, confidence " +
                        std::to_string(cs->confidence) + "%)";
          return out;
        }
      }
    }
    // Rule of thumb (common practice): text in a legacy 8-bit encoding has a
    // minority of non-ASCII characters; binary data has a large share of bytes
    // that are not UTF-8. 30% separates the two comfortably.
    const std::size_t chars = count_chars(fixed.text);
    if (fixed.replaced * 10 > chars * 3) {
      return Status::Unsupported(path + ": binary file (" + std::to_string(fixed.replaced) + " of " +
                                 std::to_string(chars) + " characters are not valid UTF-8)");
    }
    out.warning = invalid_utf8_warning(static_cast<std::int64_t>(fixed.first_bad_offset + bom), fixed.replaced);
    out.text = std::move(fixed.text);
  }
  out.text = normalise_newlines(std::move(out.text));
  return out;
}

}  // namespace lode::ingest
