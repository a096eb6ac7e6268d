// lode/ingest.h — finding files and reading them into documents.
//
// Two steps, both free of any index knowledge:
//   crawl():     walk folders, apply include/exclude globs, stat each file.
//   read_file(): read one file into one or more Documents (a JSON Lines file
//                gives one per record), with the problems met along the way.
// Formats: plain text (UTF-8 or a legacy encoding found by ICU charset
// detection), Markdown, JSON Lines, HTML, PDF, DOCX, ODT, EPUB, e-mail (.eml
// and mbox), and gzip-compressed files of any of these (docs/formats.md).
// Other binary files are refused with a message, never indexed.
//
// Thread safety: free functions with no shared state; safe from any thread.
#pragma once

#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "lode/status.h"

namespace lode {

// One searchable unit. Field text is valid UTF-8 (from read_file, text and
// Markdown bodies end lines with '\n'; JSON Lines fields are as the record has them).
struct Document {
  std::string external_id;  // JSON Lines: the record's id field; else the file path
  std::string title;        // may be empty; text and Markdown: at most 200 bytes
  std::string body;
  std::string kind;         // "text", "markdown", "jsonl", "html", "pdf", "docx",
                            // "odt", "epub", "email"
  std::string author{};     // from the format's metadata (PDF info, docx core.xml,
                            // mail From:); empty when unknown
  std::int64_t date = 0;    // the document's own date (PDF creation, mail Date:),
                            // seconds since the epoch; 0 when unknown
  std::uint32_t pages = 0;  // PDF: page count; 0 for formats without pages
  // PDF: byte offset in `body` where each page starts (page_starts[0] == 0,
  // ascending, one per page); empty for formats without pages.
  std::vector<std::uint32_t> page_starts{};
};

struct FileInfo {
  std::string path;     // absolute, lexically normal path (links not resolved)
  std::int64_t size = 0;
  std::int64_t mtime_ns = 0;  // modification time, nanoseconds since the epoch
};

struct CrawlOptions {
  // Glob patterns (fnmatch with FNM_PATHNAME semantics, plus "**" for any
  // number of folders), matched against the path relative to the crawl root
  // ("notes/2024/a.md"); for a root that is a single file, against its name.
  //   "*" and "?" never match '/', so "*.md" matches top-level files only and
  //   "**/*.md" matches at any depth; "**" must be a whole path segment
  //   ("a/**/b" matches "a/b" and "a/x/y/b"). "?" is one UTF-8 character.
  //   Classes: [abc], [a-z], [!abc] or [^abc]; '\' escapes the next character.
  //   Not supported: [[:alpha:]]-style classes, [.x.] and [=x=].
  // Empty include list = every file. Exclude wins over include, and an exclude
  // pattern that matches a folder skips the whole folder ("build", "**/.git").
  std::vector<std::string> include;
  std::vector<std::string> exclude;
  // Hidden files and folders (name starts with '.') are skipped unless true.
  // A root named explicitly is taken even when hidden.
  bool hidden = false;
  // Follow symbolic links below the roots, to files and to folders. When
  // false, links are skipped silently. A root that is a link is always
  // followed (the caller named it). When following: files are listed under
  // the link's path; a link back to a folder on the current path is reported
  // as "symlink loop ..." and not entered; a folder reached a second time
  // through another link is walked once and the second path reported; a
  // dangling link is reported as "broken symbolic link".
  bool follow_symlinks = false;
};

struct CrawlProblem {
  std::string path;
  // "permission denied", "vanished" (listed, then gone before it could be
  // examined), "symlink loop (back to <folder>)", "broken symbolic link",
  // "folder already crawled through another path", "not a regular file or
  // folder" (a root that is a pipe or device), or the system's error text.
  std::string reason;
};

struct CrawlResult {
  std::vector<FileInfo> files;  // regular files only, sorted by path (bytewise), no duplicates
  std::vector<CrawlProblem> problems;  // in walk order
};

// Walks each root (a folder or a single file), in order. A root that does not
// exist is an error (NotFound naming it); an empty root string is
// InvalidArgument; a root that cannot be examined is IOError. Problems below a
// root are collected, not fatal. A file reached from several roots (say "docs"
// and "docs/a.md") is listed once; the globs then decide per root, relative
// to that root.
Result<CrawlResult> crawl(const std::vector<std::string>& roots, const CrawlOptions& options);

// True when `relative_path` matches the glob (see CrawlOptions for the syntax).
// A malformed pattern (ending in a lone '\') matches nothing.
bool glob_match(std::string_view pattern, std::string_view relative_path);

struct ReadOptions {
  // JSON Lines field names.
  std::string id_field = "id";
  std::string title_field = "title";
  std::string text_field = "text";
  // Files larger than this are refused (Limit error naming the file, its size
  // and the limit). 0 = no limit. Default 1 GiB: the whole file is held in memory.
  std::int64_t max_file_bytes = std::int64_t{1} << 30;
  // Extracted text kept per file (all documents together); the rest is cut
  // with a warning. 0 = no limit. Default 64 MiB: far above any real book,
  // small enough that one odd file cannot dominate a batch.
  std::int64_t max_text_bytes = std::int64_t{64} << 20;
  // Bytes a compressed file or container (gzip, DOCX/ODT/EPUB entries) may
  // expand to; above it the file is refused (Limit, "... expands past ...").
  // 0 = no limit. Default 512 MiB: stops zip bombs, passes real documents.
  std::int64_t max_unpacked_bytes = std::int64_t{512} << 20;
  // HTML nested deeper than this many elements is refused (Limit). The HTML5
  // tree builder's time grows with depth squared, so a hostile page must be
  // stopped before it is parsed. Default 512: real pages stay under ~60.
  std::uint32_t max_html_depth = 512;
  // JSON Lines files larger than this (gzip-compressed ones: an eighth of
  // it) are read a slice at a time with JsonlStream (the indexer does so), so
  // neither max_file_bytes nor max_text_bytes (nor max_unpacked_bytes) applies
  // to the whole file: a dump of any size is indexed in bounded memory.
  // Default 16 MiB. 0 = never.
  std::int64_t stream_jsonl_bytes = std::int64_t{16} << 20;
  // Messages read from one mbox file; the rest are dropped with a warning.
  // 0 = no limit. Default 1,000,000.
  std::uint32_t max_mbox_messages = 1000000;
};

struct ReadResult {
  std::vector<Document> documents;    // may be empty (see read_file)
  std::string content_hash;           // XXH3-128 of the raw file bytes (BOM and CRs
                                      // included), 32 lowercase hex digits in the
                                      // canonical big-endian order xxhsum prints
  std::int64_t size = 0;              // bytes read
  std::int64_t mtime_ns = 0;          // modification time when read (ns since the epoch)
  // Not empty when the file is binary or media data, recognised and not read
  // for text ("image (.png)", "binary (NUL byte at offset 12)"); documents and
  // warnings are then empty, and content_hash too when the extension alone decided.
  std::string skipped;
  std::vector<std::string> warnings;  // e.g. "invalid UTF-8 at byte 17 (3 sequences replaced)"
                                      // at most one per kind of problem per file,
                                      // except bad JSON Lines lines: the first 10
                                      // one by one ("line N: <reason>"), then a count
};

// Reads one file. The format follows the extension, case-insensitively:
// .jsonl/.ndjson are JSON Lines, .md/.markdown Markdown, anything else
// (.txt, .text, no extension, .log, ...) plain text.
//
// Binary and media files are not errors: a name with a media, archive, font
// or program extension (.png, .mp3, .zip, .ttf, .exe, ...; the file is not
// opened beyond a stat), content with such a signature (PNG, JPEG, MP4, ELF,
// SQLite, ...), and in every text format a NUL byte in the first 8 KiB or more
// than 30% of the characters not valid UTF-8, give a ReadResult with
// `skipped` saying what the file is. Otherwise invalid UTF-8 is replaced by U+FFFD
// with one warning giving the first bad byte's offset in the file and the
// count. A UTF-8 byte order mark is dropped; CRLF and lone CR become '\n'.
// An empty or whitespace-only file gives no document and the warning
// "empty file".
//
// Plain text: one document; title = first non-blank line, trimmed, cut to at
// most 200 bytes at a character boundary; body = the whole text; id = path.
// Markdown: one document from markdown_to_document(), id = path; a file with
// no text once markup is removed gives no document and a warning.
// JSON Lines: one document per valid non-blank line. The text field must be a
// string or an array of strings (joined with '\n'); id may be a string or a
// number (kept as its decimal text: 42, -7, 1.5); a missing, null or empty id
// becomes "<path>#<line number>" (1-based, blank lines counted); title is
// optional and must be a string. A line that does not parse, is not an object
// or breaks these rules is skipped with a warning naming its line number.
// Repeated ids within the file are all kept, with one warning naming the first
// repeat.
//
// Errors name the file: NotFound (missing or vanished), IOError (unreadable or
// a folder; with the system's error text), Limit (too large), Unsupported
// (binary, or not a regular file such as a pipe).
Result<ReadResult> read_file(const std::string& path, const ReadOptions& options);
//
// Formats beyond text (see docs/formats.md for each one's fields):
// by extension, case-insensitively, and by content for PDF ("%PDF-"), zip
// containers (DOCX/ODT/EPUB by their manifest) and gzip (1f 8b):
//   .pdf          PDF: one document; body = the text of each page in order,
//                 pages separated by '\f'; title/author/date from the document
//                 info, else title = first line; pages and page_starts set.
//   .html .htm .xhtml  HTML: <title> (else the first heading), visible text
//                 with headings and paragraphs on their own lines; script,
//                 style, nav, header, footer, aside, template, noscript skipped;
//                 the declared charset (BOM, <meta charset>, http-equiv) honoured.
//   .docx .odt .epub   office / e-book: body text; title and author from
//                 docProps/core.xml, meta.xml, or the OPF package metadata.
//   .eml          one message; .mbox / .mbx: one document per message.
//                 Subject = title; body starts with From:/To:/Date: lines, then
//                 the text parts (HTML parts as text), then "Attachments: ...".
//   .gz           decompressed (within max_unpacked_bytes), then read by the
//                 inner name ("notes.html.gz" is HTML).
// Plain text that is not UTF-8 and holds no valid multi-byte UTF-8 sequence
// is decoded from the charset ICU detects, with the warning
// "not UTF-8: decoded as <charset> (ICU detection, confidence <n>%)".
// Errors beyond those above: Corruption (damaged PDF, zip or mail, naming
// what failed), Unsupported ("encrypted PDF", "password-protected"),
// Limit (expands past max_unpacked_bytes; HTML deeper than max_html_depth),
// IOError "changed while being read" (size or mtime moved during the read).

// Reads a file's bytes only and returns their content hash (as in
// ReadResult::content_hash), for rename detection without extraction.
// Errors as read_file's file access errors.
Result<std::string> hash_file(const std::string& path, const ReadOptions& options);

// True when `path` (of `size` bytes) is a JSON Lines file that the indexer
// reads with JsonlStream: read_file() would read it as JSON Lines, plain and
// larger than options.stream_jsonl_bytes, or gzip-compressed (".jsonl.gz")
// and larger than an eighth of that. False when it cannot be opened
// (read_file then reports why).
bool streams_as_jsonl(const std::string& path, std::int64_t size, const ReadOptions& options);

// Reads a JSON Lines file, plain or gzip-compressed, a slice of lines at a
// time, so memory stays bounded by the slice whatever the file's size. It
// gives the documents, warnings and hash read_file() gives (gzip: neither
// max_unpacked_bytes nor max_file_bytes applies), with these differences: the text must be UTF-8 (invalid
// sequences are replaced, with the same warning; no other charset is
// detected); max_file_bytes does not apply; max_text_bytes bounds each line
// (a longer line is skipped: "line N: longer than ... bytes"), not the file.
// Errors name the file, as read_file's do; next() fails with IOError if the
// file changes (size or mtime) while it is read.
class JsonlStream {
 public:
  static Result<std::unique_ptr<JsonlStream>> open(const std::string& path, const ReadOptions& options);
  ~JsonlStream();
  JsonlStream(const JsonlStream&) = delete;
  JsonlStream& operator=(const JsonlStream&) = delete;

  // The records of the next lines, reading about `slice_bytes` more of the
  // file (more when no whole line fits); empty once the file is read to its end.
  Result<std::vector<Document>> next(std::size_t slice_bytes);
  // File bytes read so far (compressed bytes for a gzip file).
  std::int64_t bytes_read() const;
  // After next() has returned empty: the file's hash, size, mtime and
  // warnings (documents empty). A binary file fails the first next() with
  // Unsupported, as read_file() refuses it.
  ReadResult finish();

 private:
  struct Impl;
  explicit JsonlStream(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

// Markdown to plain text: markup stripped (emphasis, links keep their text,
// images their alt text, code fences keep their content, HTML tags and
// comments removed, common entities decoded, list/quote markers and table
// pipes gone, reference definitions and YAML front matter dropped). Title: the
// front matter's "title:" if any, else the first heading (ATX "#" or setext
// underlined), at most 200 bytes; empty if there is none. The body keeps the
// heading text. kind = "markdown", external_id empty. Never fails; time linear
// in the input, any nesting depth. Not a full CommonMark parser.
// REQUIRES: valid UTF-8.
Document markdown_to_document(std::string_view markdown_utf8);

}  // namespace lode
