// Format readers behind read_file() (private to src/ingest/). Each takes text
// that is already valid UTF-8 with the BOM removed and '\n' line ends, and
// returns documents plus warnings; none fails: bad parts of a file become
// warnings.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "lode/ingest.h"
#include "lode/status.h"

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

// Readers of the raw file bytes. Unlike the text readers they can fail: the
// status names the file and the reason (see read_file in lode/ingest.h).
Result<Parsed> read_html(std::string_view bytes, const std::string& path, const ReadOptions& options);
Result<Parsed> read_pdf(std::string_view bytes, const std::string& path, const ReadOptions& options);
// DOCX, ODT or EPUB, told apart by the container's entries.
Result<Parsed> read_zip_document(std::string_view bytes, const std::string& path, const ReadOptions& options);
// One message (.eml), or each message of an mbox file with ids "<path>#<n>".
Result<Parsed> read_mail(std::string_view bytes, const std::string& path, const ReadOptions& options, bool mbox);
// The decompressed bytes of a gzip file (all members).
Result<std::string> gunzip(std::string_view bytes, const std::string& path, std::int64_t max_unpacked);

}  // namespace lode::ingest
