// YAML-style front matter at the top of a Markdown or plain-text file
// (private to src/ingest/): a "---" first line up to a "---" or "..." line,
// holding `title:`, `date:` and `author:` (others are ignored, and dropped
// from the text with the block).
#pragma once

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace lode::ingest {

struct FrontMatter {
  std::size_t body_start = 0;  // first line after the block (0: no block)
  std::string title;           // "title:", quotes removed; block scalars ("|", ">") joined
  std::string author;          // "author:", quotes removed
  std::int64_t date = 0;       // "date:" YYYY-MM-DD (a time after it is ignored),
                               // midnight UTC in seconds since the epoch; 0 when absent or not a date
};

// The front matter of a file split into `lines`; body_start 0 when the first
// line is not "---" or the block is never closed (then it is ordinary text).
FrontMatter front_matter(const std::vector<std::string_view>& lines);

}  // namespace lode::ingest
