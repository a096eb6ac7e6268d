// The store seam: where an index's rows live.
//
// IndexReader and IndexWriter (lode/index.h) do all the index's own work —
// analysis, inversion into blocks with their bounds, forward lists, norms
// chunks, collection counters, caching per commit generation, impact tiers —
// and keep rows and byte strings in a store through these two interfaces.
// The store decides only where rows go: tables in one SQLite file
// (index/sqlite_store.h) or, for an index past one machine, databases on
// servers. Every byte string a store keeps is opaque to it (encoded by
// index/codec.h and index/segment.h) and comes back exactly as given.
//
// Calls are set-based where a query or a flush needs many rows (all terms of
// a query, all segments of their lists, the norms of a whole snapshot, all
// terms of a batch), so a store on the network pays one round trip per call,
// not per row. Every call can fail and says so: a Status naming the index.
//
// Neither interface is thread-safe: one caller at a time, as the reader and
// the writer that own them.
#pragma once

#include <array>
#include <cstdint>
#include <functional>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "lode/index.h"
#include "lode/postings.h"
#include "lode/status.h"

namespace lode::store {

// Counters of an index, exact at every commit and stored with it.
struct Counters {
  std::uint64_t documents = 0;
  std::uint64_t dead_documents = 0;
  std::array<std::uint64_t, kFieldCount> total_length{};
  std::uint64_t files = 0;
  std::uint64_t terms = 0;
  std::uint64_t postings = 0;
  std::uint64_t next_doc_id = 1;  // doc id 0 is never used
  std::uint64_t generation = 0;   // commits so far: caches keyed by it stay valid until it moves
};

// A term as the dictionary knows it by name.
struct TermKey {
  Field field = Field::kBody;
  std::string_view term;
};

// One stored segment (a row of postings blocks) with its positions.
struct SegmentRows {
  PostingList::StoredSegment segment;  // key: the store's segment key
  std::string positions;
};

// One document row to add, with its stored text and metadata.
struct DocumentRow {
  DocId id = 0;
  std::int64_t file_id = 0;
  std::string_view external_id, title, kind;
  std::array<std::uint32_t, kFieldCount> length{};
  std::string_view title_blob, body_blob;  // compressed stored text
  std::string_view author;
  std::int64_t date = 0;                    // seconds since the epoch
  std::uint32_t pages = 0;
  std::string_view page_map;                // encoded; empty: not paged
};

// A document of a file as the writer must undo it.
struct LiveDocument {
  DocId id = 0;
  std::array<std::uint32_t, kFieldCount> length{};
};

// A change to a term's df and cf.
struct TermDelta {
  TermId id = 0;
  std::int64_t df = 0, cf = 0;
};

class ReadStore {
 public:
  virtual ~ReadStore() = default;

  // The index's location as the user gave it, for messages.
  virtual const std::string& location() const = 0;
  // Settings recorded at creation (read when the store was opened).
  virtual const IndexSettings& settings() const = 0;

  // Starts a consistent snapshot: every read until end() sees one commit.
  virtual Status begin() = 0;
  virtual void end() = 0;

  virtual Result<Counters> counters() = 0;
  // Bytes the index takes where it is kept (0 when unknown).
  virtual std::uint64_t bytes_on_disk() = 0;

  // Terms by name, in the order asked (nullopt: never indexed).
  virtual Result<std::vector<std::optional<TermInfo>>> terms(std::span<const TermKey> keys) = 0;
  // NotFound naming the id when a term is missing; Corruption on a bad row.
  virtual Result<TermInfo> term_by_id(TermId id) = 0;

  // Every segment of each term's list, by first document, in the order asked.
  virtual Result<std::vector<std::vector<PostingList::StoredSegment>>> segments(std::span<const TermId> terms) = 0;
  // Positions of a segment; Corruption when it has none.
  virtual Result<std::string> positions(std::int64_t segment_key) = 0;

  // Every norms chunk of the snapshot, in chunk order, to `each`; its error
  // stops the walk and is returned.
  virtual Status norms(const std::function<Status(std::uint64_t chunk, std::string_view bytes)>& each) = 0;

  virtual Result<DocumentInfo> document(DocId doc) = 0;
  // The first live document with this external id (nullopt: none).
  virtual Result<std::optional<DocId>> find_external(std::string_view external_id) = 0;
  // Compressed stored text of title and body; NotFound when none.
  virtual Result<std::array<std::string, kFieldCount>> stored_text(DocId doc) = 0;
  // Encoded forward lists; NotFound when none.
  virtual Result<std::string> forward(DocId doc) = 0;
  // Encoded page map; empty when the document is not paged.
  virtual Result<std::string> page_map(DocId doc) = 0;
  // Live documents meeting every constraint, ascending.
  virtual Result<std::vector<DocId>> filter(const DocFilter& filter) = 0;
  virtual Result<std::vector<RecordedProblem>> problems() = 0;
};

// The writer's side. All changes between begin() and commit() are one
// transaction, invisible to readers until commit() and gone after a crash
// or rollback(). One WriteStore per index at a time, across processes (the
// store holds the lock from open to destruction).
class WriteStore {
 public:
  virtual ~WriteStore() = default;

  virtual const std::string& location() const = 0;
  virtual const IndexSettings& settings() const = 0;
  // Counters as of the last commit (read at open).
  virtual const Counters& committed() const = 0;
  virtual std::uint64_t bytes_on_disk() = 0;

  virtual Status begin() = 0;
  // Stores `counters` with everything since begin() and commits.
  virtual Status commit(const Counters& counters) = 0;
  virtual void rollback() = 0;

  // Files: the id a file's documents refer to, 0 when not in the index.
  virtual Result<std::int64_t> file_id(const std::string& path) = 0;
  virtual Result<std::optional<FileRecord>> file(const std::string& path) = 0;
  virtual Result<std::vector<FileRecord>> files_with_prefix(const std::string& prefix) = 0;
  virtual Result<std::int64_t> insert_file(const FileRecord& file) = 0;
  virtual Status update_file(std::int64_t file_id, const FileRecord& file) = 0;
  // Root, size and mtime only; NotFound when the path is not in the index.
  virtual Status touch_file(const FileRecord& file) = 0;
  virtual Status delete_file(std::int64_t file_id) = 0;
  // Moves the file row at old_path to file.path and gives its live
  // documents whose external id is old_id (or starts with old_id + '#') the
  // prefix new_id. NotFound when old_path is not in the index.
  virtual Status rename_file(const std::string& old_path, const FileRecord& file, const std::string& old_id,
                             const std::string& new_id) = 0;

  // Documents.
  virtual Result<std::vector<LiveDocument>> live_documents(std::int64_t file_id) = 0;
  virtual Status put_documents(std::span<const DocumentRow> docs) = 0;
  // Marks the documents dead and drops their text, forward lists and metadata.
  virtual Status kill_documents(std::span<const DocId> docs) = 0;
  // Encoded forward lists in the order asked ("" where a document has none).
  virtual Result<std::vector<std::string>> forward(std::span<const DocId> docs) = 0;
  virtual Status put_forward(std::span<const std::pair<DocId, std::string>> lists) = 0;

  // The dictionary.
  virtual Result<TermId> max_term_id() = 0;
  // (id, df) of each term by name, in the order asked (nullopt: absent).
  virtual Result<std::vector<std::optional<std::pair<TermId, std::int64_t>>>> find_terms(
      std::span<const TermKey> keys) = 0;
  // Adds new terms with their df and cf; their ids in the order given.
  virtual Result<std::vector<TermId>> add_terms(std::span<const TermKey> keys,
                                                std::span<const std::pair<std::int64_t, std::int64_t>> df_cf) = 0;
  // Adds the deltas; the new df of each in the order given. Corruption
  // naming the id when a term is missing.
  virtual Result<std::vector<std::int64_t>> adjust_terms(std::span<const TermDelta> deltas) = 0;

  // Postings: the term's last segment with its positions (nullopt: none).
  virtual Result<std::optional<SegmentRows>> last_segment(TermId term) = 0;
  virtual Status drop_segment(std::int64_t segment_key) = 0;
  virtual Status put_segment(TermId term, DocId first_doc, DocId last_doc, std::uint32_t count,
                             std::string_view head, std::string_view data, std::string_view positions) = 0;

  // Norms chunks: "" when the chunk was never written.
  virtual Result<std::string> norms_chunk(std::uint32_t chunk) = 0;
  virtual Status put_norms_chunk(std::uint32_t chunk, std::string_view bytes) = 0;

  // Problems recorded for a path replace those recorded before.
  virtual Status replace_problems(const std::string& path, std::span<const RecordedProblem> problems) = 0;
  virtual Result<std::vector<RecordedProblem>> problems() = 0;
};

}  // namespace lode::store
