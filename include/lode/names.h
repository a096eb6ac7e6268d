// lode/names.h — file names as text: a reversible escape for JSON, a safe
// form for terminals.
//
// A file name on Linux is any bytes but '/' and NUL; JSON text must be
// UTF-8, and a terminal obeys the control characters it is sent. lode keeps
// names as the bytes they are (the index, change detection, opening files)
// and turns them into text only where it prints them.
//
// The byte escape (docs/json-output.md, "Names that are not UTF-8"): every
// byte that is not part of a well-formed UTF-8 sequence is written as the
// private-use character U+F700 + byte (U+F780 … U+F7FF: such bytes are
// always 0x80 or above). So that the escape is reversible, a character
// U+F780 … U+F7FF already in the text is escaped too, byte by byte. Text
// that is UTF-8 without those characters — nearly every name — is unchanged.
// Unescaping turns each U+F780 … U+F7FF back into its byte.
//
// Thread safety: pure functions.
#pragma once

#include <string>
#include <string_view>

namespace lode {

// `bytes` with the byte escape applied: always well-formed UTF-8, and
// unescape_name(escape_name(b)) == b for any bytes b.
std::string escape_name(std::string_view bytes);
// True when escape_name(bytes) differs from bytes.
bool name_needs_escape(std::string_view bytes);
// True when `text` holds an escaped byte (U+F780 … U+F7FF).
bool holds_escaped_byte(std::string_view text);
// The bytes escape_name() was given.
std::string unescape_name(std::string_view text);

// `bytes` safe to print on a terminal: control characters (U+0000–U+001F,
// U+007F, U+0080–U+009F), backslashes, bytes that are not UTF-8 and the
// escape's own characters U+F780–U+F7FF are written as \xHH byte by byte
// (a backslash as \x5c), so the name cannot move the cursor,
// recolour or retitle the terminal, and reads back with printf '%b'.
std::string terminal_name(std::string_view bytes);

}  // namespace lode
