// Format readers behind read_file() (private to src/ingest/). Each takes text
// that is already valid UTF-8 with the BOM removed and '\n' line ends, and
// returns documents plus warnings; none fails: bad parts of a file become
// warnings.
#pragma once

#include <cstdint>
#include <functional>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "common/slot_table.h"
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

// The state of reading one JSON Lines file, fed its lines in order in one
// piece (read_jsonl) or in slices (JsonlStream): line numbers, bad lines and
// repeated ids. Memory: 28-44 bytes a record for the repeated-id check, which
// covers the first kMaxCheckedIds distinct ids (at most 56 MiB).
class JsonlRecords {
 public:
  static constexpr std::size_t kMaxCheckedIds = std::size_t{1} << 21;
  // `max_checked_ids`: records whose ids are checked for repeats (a test sets it low).
  JsonlRecords(const std::string& path, const ReadOptions& options, std::size_t max_checked_ids = kMaxCheckedIds);
  // Reads the lines of `text` into `out`. REQUIRES: valid UTF-8 ending at a
  // line end (or at the end of the file).
  void add(std::string_view text, std::vector<Document>& out);
  // Counts one line that was not read (too long, say) as a bad line.
  void skip_line(const std::string& reason);
  std::size_t lines() const { return line_no_; }
  // The file's warnings so far: bad lines, repeated ids, "empty file".
  std::vector<std::string> warnings() const;

 private:
  void bad_line(const std::string& reason);
  void check_id(const std::string& id);

  std::string path_;
  const ReadOptions& options_;
  std::size_t line_no_ = 0;
  std::size_t bad_lines_ = 0;
  std::size_t duplicates_ = 0;
  bool any_record_line_ = false;
  std::string first_duplicate_;
  std::vector<std::string> warnings_;
  // Each checked id's hash and first line, by slot; `ids_` finds the slot.
  SlotTable ids_;
  std::vector<std::uint64_t> id_hashes_;
  std::vector<std::uint32_t> id_lines_;  // line numbers past 2^32 - 1 read as that
  std::size_t max_checked_ids_;
  bool unchecked_ = false;  // records past max_checked_ids_ went unchecked
};

// Readers of the raw file bytes. Unlike the text readers they can fail: the
// status names the file and the reason (see read_file in lode/ingest.h).
Result<Parsed> read_html(std::string_view bytes, const std::string& path, const ReadOptions& options);
Result<Parsed> read_pdf(std::string_view bytes, const std::string& path, const ReadOptions& options);
// DOCX, ODT or EPUB, told apart by the container's entries.
Result<Parsed> read_zip_document(std::string_view bytes, const std::string& path, const ReadOptions& options);
// One message (.eml), or each message of an mbox file with ids "<path>#<n>".
Result<Parsed> read_mail(std::string_view bytes, const std::string& path, const ReadOptions& options, bool mbox);
// The decompressed bytes of a gzip file (all members): Limit when they pass
// `max_unpacked` (0: no limit). With `keep` > 0, unpacking stops after
// `keep` bytes and *cut (REQUIRED then) says whether more followed: the
// text formats need no more than the text limit, and a small file that
// unpacks to gigabytes must not be held whole. Never holds more than the
// smaller bound plus 64 KiB.
Result<std::string> gunzip(std::string_view bytes, const std::string& path, std::int64_t max_unpacked,
                           std::int64_t keep = 0, bool* cut = nullptr);

// gzip data (every member of a multi-member file) unpacked as it is pulled,
// for files too large to hold unpacked. `input` gives the next compressed
// bytes (empty: there are no more); they must stay valid until it is called
// again. Errors name the file: Corruption "damaged gzip data (<zlib's
// reason, or truncated>)", or what `input` returned.
class GzipInflater {
 public:
  using Input = std::function<Result<std::string_view>()>;
  GzipInflater(std::string path, Input input);
  ~GzipInflater();
  GzipInflater(const GzipInflater&) = delete;
  GzipInflater& operator=(const GzipInflater&) = delete;
  // Up to `want` unpacked bytes into `dst`; 0 once the data has ended cleanly.
  Result<std::size_t> read(char* dst, std::size_t want);

 private:
  struct Stream;  // zlib's state, kept out of this header
  Status damaged(const char* why) const;
  std::string path_;
  Input input_;
  std::unique_ptr<Stream> stream_;
  bool ok_ = false;
  bool input_done_ = false;
  bool member_ended_ = false;
  bool done_ = false;
};

}  // namespace lode::ingest
