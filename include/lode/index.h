// lode/index.h — the inverted index in one SQLite file.
//
// Layout (documented byte by byte in docs/index-format.md, format version 4):
// documents with per-field lengths and a live flag, a term dictionary with
// exact df/cf per (field, term), postings in blocks of up to 128 documents with
// per-block bound points (lode/postings.h), positions per segment, a forward index
// (document -> term ids and tfs per field) and the stored, compressed text.
//
// Writing: one IndexWriter per index file at a time, across processes (a lock
// file beside the index; a second writer gets Busy with the holder's pid).
// Everything added is invisible to readers until commit(); a crash at any
// instant leaves the index as of the last commit (SQLite WAL transactions).
// Collection statistics (N, lengths, df, cf) are exact for live documents at
// every commit. Document ids only grow: replacing a file marks its old
// documents dead and appends new ones.
//
// Reading: any number of IndexReaders, in any processes, concurrently with the
// writer. All reads between begin() and the end of the returned ReadScope see
// one consistent snapshot.
//
// Thread safety: an IndexWriter or IndexReader is used by one thread at a time.
// Open one reader per thread (opening is cheap).
#pragma once

#include <array>
#include <cstdint>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "lode/analysis.h"
#include "lode/postings.h"
#include "lode/status.h"

namespace lode {

using TermId = std::int64_t;

// Indexed fields. Stored values are fixed forever: never renumber.
enum class Field : std::uint8_t { kTitle = 0, kBody = 1 };
inline constexpr int kFieldCount = 2;
inline constexpr std::array<Field, kFieldCount> kAllFields = {Field::kTitle, Field::kBody};
std::string_view field_name(Field f);                        // "title", "body"
std::optional<Field> parse_field(std::string_view name);     // nullopt if unknown

// 2: doc_meta, problems; 3: postings in append order; 4: bit-packed segments with bound points
inline constexpr int kIndexFormatVersion = 4;

// Settings fixed when an index is created and recorded in it.
struct IndexSettings {
  AnalyzerOptions analyzer;  // language and stopwords; queries use exactly these
};

struct WriterOptions {
  // Approximate memory the in-memory batch may use before it is flushed and
  // committed. Default 256 MiB: large batches write fewer, fuller blocks.
  // Peak RSS of a run is about this plus 130 MiB, whatever the corpus size
  // (bench/README.md: 197 MiB at 64 MiB, 391 MiB at 256 MiB on 1.1 GB, 415
  // MiB at 256 MiB on 2.2 GB), plus about 200 bytes per file crawled.
  std::size_t batch_bytes = std::size_t{256} << 20;
  // Commit at least every this many documents (0 = only by size / on commit()).
  std::size_t batch_documents = 0;
  // A commit of at most this many distinct terms fills up the partial last
  // block of each of its terms (dense blocks under many small commits, as
  // `lode watch` makes); a larger one appends new blocks only, because
  // refilling would rewrite rows all over the postings table and make a
  // run's time grow with the square of the corpus (docs/index-format.md).
  std::size_t refill_max_terms = 4096;
};

// One file as the index remembers it (for change detection).
struct FileRecord {
  std::string path;          // absolute path: the key
  std::string root;          // crawl root it was found under (absolute)
  std::int64_t size = 0;
  std::int64_t mtime_ns = 0;
  std::string hash;          // content hash (hex)
  std::string kind;          // "text", "markdown", "jsonl", ...
};

// A document to add: field text (valid UTF-8) and identity.
struct DocumentInput {
  std::string external_id;   // id shown to users (JSONL record id or relative path)
  std::string title;
  std::string body;
  std::string kind;
  // (Initialisers given so that {id, title, body, kind} stays warning-free.)
  std::string author{};        // "" when unknown
  std::int64_t date = 0;       // seconds since the epoch; 0: the file's mtime is used
  std::uint32_t pages = 0;     // 0: not a paged format
  std::vector<std::uint32_t> page_offsets{};  // byte offset in body where each page starts
};

// A problem met reading one file, kept in the index until the file reads
// cleanly (or leaves the index).
struct RecordedProblem {
  std::string path;
  bool error = true;          // true: the file could not be read; false: a warning
  std::string message;
  std::int64_t time_ns = 0;   // when it was recorded, ns since the epoch
};

// Where a page of a paged document starts.
struct PageStart {
  std::uint32_t position = 0;  // first body word position on the page
  std::uint32_t offset = 0;    // byte offset of the page in the stored body
};

// Metadata constraints on documents (all given ones must hold; empty = any).
struct DocFilter {
  std::vector<std::string> kinds;     // docs.kind is one of these
  std::vector<std::string> prefixes;  // id or absolute path starts with one of these
  std::optional<std::int64_t> date_from, date_to;  // inclusive, seconds since the epoch
  std::string author;                 // case-insensitive (ASCII) substring of the author
  std::optional<std::uint32_t> pages_min, pages_max;
  std::optional<std::int64_t> size_min, size_max;  // file size in bytes
  bool empty() const {
    return kinds.empty() && prefixes.empty() && !date_from && !date_to && author.empty() && !pages_min &&
           !pages_max && !size_min && !size_max;
  }
};

struct CollectionStats {
  std::uint64_t documents = 0;                       // live documents (N)
  std::array<std::uint64_t, kFieldCount> total_length{};  // sum of field lengths, live docs
  std::uint64_t files = 0;
  std::uint64_t terms = 0;      // (field, term) pairs with df > 0
  std::uint64_t postings = 0;   // sum of df over terms (live postings)
  std::uint64_t dead_documents = 0;  // replaced or deleted, not yet compacted
  std::uint64_t bytes_on_disk = 0;   // index file + WAL
  // Commits so far (0 for an index written before the counter existed). Equal
  // generations of one index hold equal contents: a cache of results or of
  // decoded data keyed by it stays valid until it moves.
  std::uint64_t generation = 0;
  // Average field length over live docs (0 when empty).
  double average_length(Field f) const;
};

class IndexWriter {
 public:
  // Opens `path` for writing, creating the index with `settings` if it does not
  // exist. If it exists and `settings` is given, they must equal the recorded
  // ones (InvalidArgument naming the difference). Errors: Busy (another
  // writer, message names its pid), IOError, Corruption (not a lode index or a
  // newer format version).
  static Result<std::unique_ptr<IndexWriter>> open(const std::string& path,
                                                   const std::optional<IndexSettings>& settings,
                                                   const WriterOptions& options = {});
  ~IndexWriter();  // commits nothing: uncommitted work is rolled back
  IndexWriter(const IndexWriter&) = delete;
  IndexWriter& operator=(const IndexWriter&) = delete;

  const IndexSettings& settings() const;

  // The recorded state of a file, or nullopt if the index does not hold it.
  Result<std::optional<FileRecord>> file(const std::string& path);
  // Every file whose path starts with `prefix` ("" = all), sorted by path.
  Result<std::vector<FileRecord>> files_with_prefix(const std::string& prefix);

  // Adds (or replaces) `file` and its documents. Documents with no words are
  // still recorded (they can be listed but never match).
  Status put_file(const FileRecord& file, const std::vector<DocumentInput>& documents);
  // put_file() in parts, for a file too large to hold whole (a JSON Lines
  // dump of millions of records): begin_file() drops the file's old documents
  // and records `file`; add_documents() adds the next part; finish_file()
  // records the file's final size, mtime, hash and kind. A batch may commit
  // between parts, so readers can see part of the file. Call begin_file() with
  // size -1 and an empty hash: if the run stops before finish_file(), the next
  // run sees a size and hash that match nothing and reads the file again.
  // REQUIRES for add_documents/finish_file: a begin_file() or put_file() since
  // the last remove/rename/touch, for the same path (InvalidArgument otherwise).
  Status begin_file(const FileRecord& file);
  Status add_documents(const std::vector<DocumentInput>& documents);
  Status finish_file(const FileRecord& file);
  // Records a new size/mtime/root for a file whose content is unchanged
  // (same hash), without touching its documents. NotFound if not held.
  Status touch_file(const FileRecord& file);
  // Removes a file and its documents. NotFound if the index does not hold it.
  Status remove_file(const std::string& path);
  // Moves a file whose content is unchanged to a new path (a rename): its
  // documents keep their ids and postings; their external ids equal to
  // `old_id`, or starting with `old_id` + "#", get `new_id` in its place.
  // NotFound if `old_path` is not held; InvalidArgument if `file.path` is.
  Status rename_file(const std::string& old_path, const FileRecord& file, const std::string& old_id,
                     const std::string& new_id);

  // Replaces the problems recorded for `path` with `problems` (empty: the
  // file read cleanly). Committed with the next commit().
  Status record_problems(const std::string& path, const std::vector<RecordedProblem>& problems);
  // Every recorded problem, by path, including uncommitted ones.
  Result<std::vector<RecordedProblem>> problems();

  // Flushes the batch and commits. Readers see everything up to here.
  Status commit();
  // Live statistics including uncommitted work.
  CollectionStats stats() const;

 private:
  struct Impl;
  explicit IndexWriter(std::unique_ptr<Impl> impl);
  std::unique_ptr<Impl> impl_;
};

// What a reader knows about one document.
struct DocumentInfo {
  DocId id = 0;
  std::string external_id;
  std::string title;
  std::string kind;
  std::string path;  // file it came from
  std::array<std::uint32_t, kFieldCount> length{};  // field lengths in terms
  bool live = false;
  std::string author;         // "" when unknown
  std::int64_t date = 0;      // document date, else file mtime (seconds since the epoch)
  std::uint32_t pages = 0;    // 0: not paged
  std::int64_t size = 0;      // size of the file it came from, bytes
};

struct TermInfo {
  TermId id = 0;
  Field field = Field::kBody;
  std::string term;
  std::uint64_t df = 0;  // live documents containing it
  std::uint64_t cf = 0;  // total occurrences in live documents
};

// Per-document field lengths and liveness of one snapshot, as flat arrays:
// the query loop reads them per candidate, so no lookup may stand between.
// Loaded once per commit generation and shared by the readers of a
// ReaderCache. Documents at or past limit() read as dead with length 0.
class DocNorms {
 public:
  bool live(DocId d) const { return d < limit_ && (live_[d >> 6] >> (d & 63) & 1) != 0; }
  std::uint32_t length(DocId d, Field f) const { return d < limit_ ? length_[static_cast<std::size_t>(f)][d] : 0; }
  DocId limit() const { return limit_; }
  std::size_t memory() const { return (length_[0].capacity() + length_[1].capacity()) * 4 + live_.capacity() * 8; }

 private:
  friend struct DocNormsLoader;
  DocId limit_ = 0;
  std::array<std::vector<std::uint32_t>, kFieldCount> length_;
  std::vector<std::uint64_t> live_;
};

// What readers of one index may share within a process (a server's worker
// threads): the norms and decoded postings lists of the newest commit
// generation, postings up to a byte budget (least recently used go first).
// Thread-safe. Entries of an older generation are dropped when a newer one
// is first seen.
class ReaderCache {
 public:
  explicit ReaderCache(std::size_t postings_bytes = std::size_t{128} << 20);
  ~ReaderCache();
  ReaderCache(const ReaderCache&) = delete;
  ReaderCache& operator=(const ReaderCache&) = delete;
  struct Counts {
    std::uint64_t hits = 0, misses = 0;
    std::size_t bytes = 0;  // postings lists held
  };
  Counts counts() const;

 private:
  friend class IndexReader;
  struct Impl;
  std::unique_ptr<Impl> impl_;
};

struct ReaderOptions {
  // Shared with other readers of the same index; null: the reader makes its own.
  std::shared_ptr<ReaderCache> cache;
  // impact_tiers(): lists of at least this many postings get a tier holding
  // 1/tier_share of their live postings (readers sharing a cache must agree).
  std::uint64_t tier_min_postings = 8192;
  std::uint32_t tier_share = 32;
};

class IndexReader {
 public:
  // Errors: NotFound (no index at path; message says how to make one),
  // Corruption (not a lode index / newer format), IOError.
  static Result<std::unique_ptr<IndexReader>> open(const std::string& path, const ReaderOptions& options = {});
  ~IndexReader();
  IndexReader(const IndexReader&) = delete;
  IndexReader& operator=(const IndexReader&) = delete;

  // Starts a read snapshot; it lasts until the ReadScope is destroyed. All
  // other methods REQUIRE an active scope. Not reentrant.
  class ReadScope {
   public:
    explicit ReadScope(IndexReader* r) : r_(r) {}
    ReadScope(ReadScope&& o) noexcept : r_(o.r_) { o.r_ = nullptr; }
    ReadScope(const ReadScope&) = delete;
    ~ReadScope();
   private:
    IndexReader* r_;
  };
  Result<ReadScope> begin();

  const IndexSettings& settings() const;
  const std::string& path() const;
  CollectionStats stats() const;

  // nullopt when the term has never been indexed in that field.
  Result<std::optional<TermInfo>> term(Field field, std::string_view term);
  Result<TermInfo> term_by_id(TermId id);
  // A cursor over `term`'s postings; owned by the caller, valid within the
  // scope. A read or decoding error gives a cursor that is not valid() and
  // carries it in status().
  std::unique_ptr<PostingCursor> postings(const TermInfo& term);
  // The postings lists of `terms`, in their order, in one call (the set-based
  // read a query makes); each may be shared with other readers of the cache.
  Result<std::vector<std::shared_ptr<const PostingList>>> postings_lists(const std::vector<TermId>& terms);
  // A cursor over a list from postings_lists(), reading positions through
  // this reader. Valid within the scope.
  std::unique_ptr<PostingCursor> cursor(std::shared_ptr<const PostingList> list);

  // The impact tiers of `terms` (lode/postings.h), in their order; null for
  // a list shorter than ReaderOptions::tier_min_postings. Built from the
  // list and the norms on first use, then cached per commit generation.
  // Errors: those of postings_lists() and norms().
  Result<std::vector<std::shared_ptr<const ImpactTier>>> impact_tiers(const std::vector<TermInfo>& terms);

  // Live documents holding both terms (BM25F's any-field df needs it for a
  // word in two fields). Computed once per commit generation and cached.
  Result<std::uint64_t> live_overlap(TermId a, TermId b);

  // Lengths and liveness of every document of the snapshot. Errors: the
  // norms could not be read (IOError, Corruption).
  Result<const DocNorms*> norms();
  // Shortcuts into norms(); a document whose norms cannot be read reads as
  // dead with length 0 (use norms() to see the error).
  bool live(DocId doc);
  std::uint32_t length(DocId doc, Field field);
  Result<DocumentInfo> document(DocId doc);
  // Live document with this external id (first match), or NotFound.
  Result<DocId> find_external(std::string_view external_id);
  // Stored field text (decompressed).
  Result<std::string> stored_text(DocId doc, Field field);
  // Forward index: (term id, tf) pairs of one field of a document, by term id.
  Result<std::vector<std::pair<TermId, std::uint32_t>>> forward(DocId doc, Field field);
  // Highest document id ever assigned + 1.
  DocId doc_id_limit() const;

  // Page starts of a paged document (PDF), in page order; empty otherwise.
  // Corruption when the stored map is damaged.
  Result<std::vector<PageStart>> pages(DocId doc);
  // Live documents meeting every constraint of `filter`, ascending.
  Result<std::vector<DocId>> filter(const DocFilter& filter);
  // Every recorded problem, by path (see IndexWriter::record_problems).
  Result<std::vector<RecordedProblem>> problems();

 private:
  struct Impl;
  explicit IndexReader(std::unique_ptr<Impl> impl);
  void end_scope();
  std::unique_ptr<Impl> impl_;
};

}  // namespace lode
