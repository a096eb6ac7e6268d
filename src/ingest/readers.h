// Format readers behind read_file() (private to src/ingest/). Each takes text
// that is already valid UTF-8 with the BOM removed and '\n' line ends, and
// returns documents plus warnings; none fails: bad parts of a file become
// warnings.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "lode/ingest.h"

namespace lode::ingest {

struct Parsed {
  std::vector<Document> documents;
  std::vector<std::string> warnings;
};

// At most this many bad JSON Lines lines are listed one by one; the rest are counted.
inline constexpr std::size_t kMaxLineWarnings = 10;

// Plain text: one document, titled by its first non-blank line.
Parsed read_plain_text(std::string_view text, const std::string& path);

// Markdown: one document through markdown_to_document().
Parsed read_markdown(std::string_view text, const std::string& path);

// JSON Lines: one document per valid non-blank line.
Parsed read_jsonl(std::string_view text, const std::string& path, const ReadOptions& options);

}  // namespace lode::ingest
