// HTML to text (private to src/ingest/), shared by the HTML reader, EPUB
// chapters and HTML mail parts. The tree comes from gumbo, an HTML5 parser.
#pragma once

#include <cstdint>
#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::ingest {

struct HtmlText {
  std::string title;  // <title>, else the first h1-h6; trimmed, at most kMaxTitleBytes
  std::string body;   // visible text; block elements end lines; runs of spaces collapsed
};

// Nesting depth of `html` as its tags suggest, counting elements that need an
// end tag (void elements and those whose end tag may be left out, such as
// <p> and <li>, do not count). Linear, no parsing; an upper bound in spirit,
// used only to refuse hostile input before the quadratic tree builder runs.
std::uint32_t rough_html_depth(std::string_view html);

// Parses UTF-8 HTML. Limit error naming `path` when rough_html_depth()
// passes `max_depth`. Never fails otherwise: HTML5 parsing accepts anything.
Result<HtmlText> html_to_text(std::string_view utf8, const std::string& path, std::uint32_t max_depth);

// The charset an HTML document declares: a byte order mark, else a
// <meta charset=...> or <meta http-equiv content="...charset=..."> in the
// first 1024 bytes (the HTML standard's prescan window). Empty when none.
std::string declared_html_charset(std::string_view bytes);

}  // namespace lode::ingest
