// Small text helpers shared by the ingest readers (private to src/ingest/).
#pragma once

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace lode::ingest {

// Titles longer than this are cut (at a UTF-8 character boundary).
inline constexpr std::size_t kMaxTitleBytes = 200;

// ASCII space, tab, newline, carriage return, vertical tab, form feed.
bool is_space(char c);

// `s` without leading / trailing ASCII whitespace.
std::string_view trim(std::string_view s);
std::string_view trim_left(std::string_view s);

// The longest prefix of `s` of at most `max_bytes` bytes that does not split a
// UTF-8 sequence.
std::string_view cut_utf8(std::string_view s, std::size_t max_bytes);

// A title from one line: trimmed, cut to kMaxTitleBytes.
std::string make_title(std::string_view line);

// A title from the first non-blank line of `text` (make_title), or "".
std::string first_line_title(std::string_view text);

// Lines of `text` split on '\n'; a '\r' before the '\n' (or a lone '\r' at the
// end) is dropped, so CRLF input needs no prior conversion. A final newline
// does not start an extra empty line.
std::vector<std::string_view> split_lines(std::string_view text);

// UTF-8 encoding of a code point; U+FFFD for surrogates and values above U+10FFFF.
std::string utf8_encode(char32_t cp);

}  // namespace lode::ingest
