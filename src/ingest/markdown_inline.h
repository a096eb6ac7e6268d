// Inline Markdown to plain text (private to src/ingest/). Used by the block
// pass in markdown.cpp on each line's content once block markers are gone.
#pragma once

#include <cstddef>
#include <string>
#include <string_view>

namespace lode::ingest {

struct InlineText {
  std::string text;
  // An HTML comment opened on this line and did not close: the block pass
  // drops the following lines up to the closing "-->".
  bool comment_open = false;
};

// Plain text of one line: emphasis and strike markers, code-span backticks,
// link and image syntax (the text or alt is kept, the destination dropped),
// HTML tags and comments removed; autolinks keep their address; backslash
// escapes and HTML entities decoded. Linear in the line length for any input
// (no backtracking, no recursion), so hostile input cannot blow up.
InlineText strip_inline(std::string_view line);

struct Entity {
  std::size_t length = 0;  // bytes of `s` the entity takes; 0: not an entity
  std::string text;        // its UTF-8 text
};

// The HTML character reference at the start of `s` (which starts with '&'):
// numeric (&#233; &#xE9;) or one of the common named ones (&amp; &copy; ...).
// Reads at most 34 bytes.
Entity match_entity(std::string_view s);

}  // namespace lode::ingest
