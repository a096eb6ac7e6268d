// IndexWriter: an in-memory batch of inverted postings (PostingBatch),
// flushed into SQLite blocks in one transaction per batch (see
// docs/index-format.md).
#include <algorithm>
#include <bit>
#include <future>
#include <map>
#include <span>

#ifdef __GLIBC__
#include <malloc.h>
#endif

#include "index/codec.h"
#include "index/lock.h"
#include "index/posting_batch.h"
#include "index/radix_sort.h"
#include "index/schema.h"
#include "index/segment.h"
#include "index/sqlite.h"
#include "lode/index.h"

namespace lode {

struct IndexWriter::Impl {
  sql::Db db;
  std::optional<WriterLock> lock;
  IndexSettings settings;
  WriterOptions options;
  std::unique_ptr<Analyzer> analyzer;
  schema::Counters counters;
  bool in_txn = false;

  codec::TextCompressor compressor;
  PostingBatch batch;
  std::map<std::uint32_t, std::string> dirty_norms;  // chunk -> bytes
  DocId first_pending = 0;  // first doc id of the batch (0: none yet)
  // The file begin_file() opened for add_documents() (id 0: none).
  struct OpenFile {
    std::int64_t id = 0;
    std::string path;
    std::int64_t mtime_ns = 0;
  } open_file;
  // Flush scratch, reused for every term and document.
  codec::SegmentBuilder segment_out;
  std::string pos_blob;
  std::vector<codec::ForwardList> per_field;
  std::vector<std::vector<std::uint64_t>> fwd_words;  // per field: term id << 32 | tf
  std::vector<std::uint64_t> fwd_scratch;

  sql::Stmt q_file, q_insert_file, q_update_file, q_delete_file, q_docs_of_file;
  sql::Stmt q_insert_doc, q_insert_text, q_kill_doc, q_delete_text, q_delete_fwd, q_get_fwd;
  sql::Stmt q_find_term, q_add_term, q_term_df, q_max_term, q_update_term, q_last_segment, q_get_positions;
  sql::Stmt q_drop_segment, q_drop_positions, q_put_segment, q_put_positions, q_put_fwd, q_get_norms, q_put_norms;
  sql::Stmt q_put_meta, q_delete_meta;

  Status prepare_all();
  Status begin();
  Status remove_docs_of(std::int64_t file_id);
  // What a document needs that no index state does: its fields analyzed and
  // its text compressed. add_documents() makes it ready on a second thread
  // while this one inverts and writes the documents before it.
  struct Prepared {
    std::array<Analyzer::Analyzed, kFieldCount> fields;
    std::string title_blob, body_blob;
  };
  // Uses analyzer and compressor: one caller at a time.
  std::vector<Prepared> prepare(std::span<const DocumentInput> docs);
  Status add_document(std::int64_t file_id, const DocumentInput& d, Prepared& p, std::int64_t mtime_ns);
  Status flush();
  Status write_term(const PostingBatch::Runs& runs, std::span<const PostingBatch::Posting> run, Field field, TermId id,
                    bool refill);
  Status take_back_last_segment(TermId id, codec::SegmentBuilder& out);
  Status put_segment(TermId id, const codec::BuiltSegment& seg);
  // The batch's memory, by allocation, with the flush's own (see PostingBatch::bytes).
  std::size_t batch_bytes() const {
    return batch.bytes() + dirty_norms.size() * codec::kNormsPerChunk * codec::kNormEntryBytes;
  }
  Result<std::string*> norms_chunk(std::uint32_t chunk);
};

Status IndexWriter::Impl::prepare_all() {
  return db.prepare_all({
      {&q_file, "SELECT file_id, path, root, size, mtime_ns, hash, kind FROM files WHERE path = ?"},
      {&q_insert_file, "INSERT INTO files(path, root, size, mtime_ns, hash, kind) VALUES(?,?,?,?,?,?)"},
      {&q_update_file, "UPDATE files SET root=?, size=?, mtime_ns=?, hash=?, kind=? WHERE file_id=?"},
      {&q_delete_file, "DELETE FROM files WHERE file_id = ?"},
      {&q_docs_of_file, "SELECT doc_id, len_title, len_body FROM docs WHERE file_id = ? AND live = 1"},
      {&q_insert_doc, "INSERT INTO docs(doc_id, file_id, external_id, title, kind, len_title, len_body, live) VALUES(?,?,?,?,?,?,?,1)"},
      {&q_insert_text, "INSERT INTO doc_text(doc_id, title, body) VALUES(?,?,?)"},
      {&q_kill_doc, "UPDATE docs SET live = 0 WHERE doc_id = ?"},
      {&q_delete_text, "DELETE FROM doc_text WHERE doc_id = ?"},
      {&q_delete_fwd, "DELETE FROM doc_terms WHERE doc_id = ?"},
      {&q_get_fwd, "SELECT data FROM doc_terms WHERE doc_id = ?"},
      // Plain statements, not an upsert with RETURNING: SQLite gathers
      // RETURNING rows in a temporary table, opened and closed per call,
      // which cost more than the lookup itself.
      {&q_find_term, "SELECT term_id, df FROM terms WHERE field = ? AND term = ?"},
      {&q_add_term, "INSERT INTO terms(field, term, df, cf) VALUES(?, ?, ?, ?)"},
      {&q_term_df, "SELECT df FROM terms WHERE term_id = ?"},
      {&q_max_term, "SELECT coalesce(max(term_id), 0) FROM terms"},
      {&q_update_term, "UPDATE terms SET df = df + ?, cf = cf + ? WHERE term_id = ?"},
      {&q_last_segment, "SELECT seg_id, first_doc, last_doc, count, head, data FROM postings WHERE term_id = ? ORDER BY first_doc DESC LIMIT 1"},
      {&q_get_positions, "SELECT data FROM positions WHERE seg_id = ?"},
      {&q_drop_segment, "DELETE FROM postings WHERE seg_id = ?"},
      {&q_drop_positions, "DELETE FROM positions WHERE seg_id = ?"},
      {&q_put_segment, "INSERT INTO postings(term_id, first_doc, last_doc, count, head, data) VALUES(?,?,?,?,?,?)"},
      {&q_put_positions, "INSERT INTO positions(seg_id, data) VALUES(?,?)"},
      {&q_put_fwd, "INSERT INTO doc_terms(doc_id, data) VALUES(?, ?)"},
      {&q_get_norms, "SELECT data FROM norms WHERE chunk = ?"},
      {&q_put_norms, "INSERT OR REPLACE INTO norms(chunk, data) VALUES(?, ?)"},
      {&q_put_meta, "INSERT OR REPLACE INTO doc_meta(doc_id, author, date, pages, page_map) VALUES(?,?,?,?,?)"},
      {&q_delete_meta, "DELETE FROM doc_meta WHERE doc_id = ?"},
  });
}

Status IndexWriter::Impl::begin() {
  if (in_txn) return Status();
  LODE_RETURN_IF_ERROR(db.exec("BEGIN IMMEDIATE"));
  in_txn = true;
  return Status();
}

Result<std::string*> IndexWriter::Impl::norms_chunk(std::uint32_t chunk) {
  auto it = dirty_norms.find(chunk);
  if (it != dirty_norms.end()) return &it->second;
  std::string data;
  q_get_norms.bind(1, std::int64_t{chunk});
  if (q_get_norms.step()) data = std::string(q_get_norms.blob(0));
  Status s = q_get_norms.status();
  q_get_norms.reset();
  LODE_RETURN_IF_ERROR(s);
  data.resize(codec::kNormsPerChunk * codec::kNormEntryBytes, '\0');
  return &dirty_norms.emplace(chunk, std::move(data)).first->second;
}

Status IndexWriter::Impl::remove_docs_of(std::int64_t file_id) {
  struct Dead {
    DocId id;
    std::array<std::uint32_t, kFieldCount> len;
  };
  std::vector<Dead> dead;
  q_docs_of_file.bind(1, file_id);
  while (q_docs_of_file.step())
    dead.push_back({static_cast<DocId>(q_docs_of_file.i64(0)),
                    {static_cast<std::uint32_t>(q_docs_of_file.i64(1)),
                     static_cast<std::uint32_t>(q_docs_of_file.i64(2))}});
  Status s = q_docs_of_file.status();
  q_docs_of_file.reset();
  LODE_RETURN_IF_ERROR(s);
  // Documents still in the in-memory batch have no forward index yet.
  for (auto& d : dead)
    if (first_pending != 0 && d.id >= first_pending) {
      LODE_RETURN_IF_ERROR(flush());
      LODE_RETURN_IF_ERROR(begin());
      break;
    }
  for (auto& d : dead) {
    q_get_fwd.bind(1, std::int64_t{d.id});
    std::string blob;
    if (q_get_fwd.step()) blob = std::string(q_get_fwd.blob(0));
    s = q_get_fwd.status();
    q_get_fwd.reset();
    LODE_RETURN_IF_ERROR(s);
    std::vector<codec::ForwardList> fwd;
    LODE_RETURN_IF_ERROR(codec::decode_forward(blob, fwd));
    for (auto& list : fwd)
      for (auto& [term_id, tf] : list) {
        LODE_RETURN_IF_ERROR(
            q_update_term.bind(1, std::int64_t{-1}).bind(2, -static_cast<std::int64_t>(tf)).bind(3, term_id).run());
        q_term_df.bind(1, term_id);
        const bool found = q_term_df.step();
        const std::int64_t df = found ? q_term_df.i64(0) : -1;
        s = q_term_df.status();
        q_term_df.reset();
        LODE_RETURN_IF_ERROR(s);
        if (!found) return Status::Corruption("forward index names missing term " + std::to_string(term_id));
        if (df == 0) --counters.terms;
        --counters.postings;
      }
    LODE_RETURN_IF_ERROR(q_kill_doc.bind(1, std::int64_t{d.id}).run());
    LODE_RETURN_IF_ERROR(q_delete_text.bind(1, std::int64_t{d.id}).run());
    LODE_RETURN_IF_ERROR(q_delete_fwd.bind(1, std::int64_t{d.id}).run());
    LODE_RETURN_IF_ERROR(q_delete_meta.bind(1, std::int64_t{d.id}).run());
    auto chunk = norms_chunk(d.id / codec::kNormsPerChunk);
    if (!chunk) return chunk.status();
    codec::put_norm(**chunk, d.id % codec::kNormsPerChunk, codec::NormEntry{false, d.len});
    --counters.documents;
    ++counters.dead_documents;
    for (std::size_t f = 0; f < kFieldCount; ++f) counters.total_length[f] -= d.len[f];
  }
  return Status();
}

// The first body word position on each page: the first token starting at
// or after the page's byte offset (a page with no words starts where the
// next word will be).
std::vector<PageStart> page_map(const std::vector<std::uint32_t>& offsets, const std::vector<Token>& tokens) {
  std::vector<PageStart> pages;
  std::size_t t = 0;
  std::uint32_t next_position = tokens.empty() ? 0 : tokens.back().position + 1;
  for (std::uint32_t off : offsets) {
    while (t < tokens.size() && tokens[t].begin < off) ++t;
    const std::uint32_t pos = t < tokens.size() ? tokens[t].position : next_position;
    const std::uint32_t prev_off = pages.empty() ? 0 : pages.back().offset;
    pages.push_back(PageStart{pos, std::max(off, prev_off)});
  }
  return pages;
}

std::vector<IndexWriter::Impl::Prepared> IndexWriter::Impl::prepare(std::span<const DocumentInput> docs) {
  std::vector<Prepared> out(docs.size());
  for (std::size_t i = 0; i < docs.size(); ++i) {
    out[i].fields[static_cast<std::size_t>(Field::kTitle)] = analyzer->analyze(docs[i].title);
    out[i].fields[static_cast<std::size_t>(Field::kBody)] = analyzer->analyze(docs[i].body);
    out[i].title_blob = compressor.compress(docs[i].title);
    out[i].body_blob = compressor.compress(docs[i].body);
  }
  return out;
}

Status IndexWriter::Impl::add_document(std::int64_t file_id, const DocumentInput& d, Prepared& p,
                                       std::int64_t mtime_ns) {
  DocId id = static_cast<DocId>(counters.next_doc_id++);
  if (first_pending == 0) first_pending = id;
  batch.begin_document(id);
  std::array<std::uint32_t, kFieldCount> len{};
  for (Field f : kAllFields) {
    auto fi = static_cast<std::size_t>(f);
    const Analyzer::Analyzed& analyzed = p.fields[fi];
    len[fi] = static_cast<std::uint32_t>(analyzed.tokens.size());
    if (f == Field::kBody) {
      const std::string map =
          d.page_offsets.empty() ? std::string() : codec::encode_page_map(page_map(d.page_offsets, analyzed.tokens));
      q_put_meta.bind(1, std::int64_t{id}).bind(2, d.author)
          .bind(3, d.date != 0 ? d.date : mtime_ns / 1000000000).bind(4, std::int64_t{d.pages});
      q_put_meta.bind_blob(5, map);  // empty: not paged
      LODE_RETURN_IF_ERROR(q_put_meta.run());
    }
    LODE_RETURN_IF_ERROR(batch.add_field(f, analyzed.tokens));
  }

  LODE_RETURN_IF_ERROR(q_insert_doc.bind(1, std::int64_t{id}).bind(2, file_id).bind(3, d.external_id)
                           .bind(4, d.title).bind(5, d.kind).bind(6, std::int64_t{len[0]})
                           .bind(7, std::int64_t{len[1]}).run());
  LODE_RETURN_IF_ERROR(q_insert_text.bind(1, std::int64_t{id}).bind_blob(2, p.title_blob)
                           .bind_blob(3, p.body_blob).run());
  auto chunk = norms_chunk(id / codec::kNormsPerChunk);
  if (!chunk) return chunk.status();
  codec::put_norm(**chunk, id % codec::kNormsPerChunk, codec::NormEntry{true, len});
  ++counters.documents;
  for (std::size_t f = 0; f < kFieldCount; ++f) counters.total_length[f] += len[f];
  return Status();
}

// Writes a term's batch postings as new segments at the table's end. With
// `refill`, the term's last segment, if small, is first taken back and
// extended (its full blocks copied as they are, a partial last block filled
// up), so segments and blocks stay dense across many small commits.
Status IndexWriter::Impl::write_term(const PostingBatch::Runs& runs, std::span<const PostingBatch::Posting> run,
                                     Field field, TermId id, bool refill) {
  codec::SegmentBuilder& out = segment_out;
  if (refill) LODE_RETURN_IF_ERROR(take_back_last_segment(id, out));
  std::string& pos = pos_blob;
  for (const PostingBatch::Posting& p : run) {
    pos.clear();
    batch.append_positions(pos, runs, p);
    out.add(p.doc, runs.tf(p), batch.length(p.doc, field), pos);
    if (out.full()) LODE_RETURN_IF_ERROR(put_segment(id, out.finish()));
  }
  if (!out.empty()) LODE_RETURN_IF_ERROR(put_segment(id, out.finish()));
  counters.postings += run.size();
  return Status();
}

Status IndexWriter::Impl::put_segment(TermId id, const codec::BuiltSegment& seg) {
  LODE_RETURN_IF_ERROR(q_put_segment.bind(1, id).bind(2, std::int64_t{seg.first_doc})
                           .bind(3, std::int64_t{seg.last_doc}).bind(4, std::int64_t{seg.count})
                           .bind_blob(5, seg.head).bind_blob(6, seg.data).run());
  return q_put_positions.bind(1, db.last_insert_rowid()).bind_blob(2, seg.positions).run();
}

// A last segment under kRefillPostings postings is deleted and its blocks
// start `out`: rewriting it costs at most that many postings per term.
Status IndexWriter::Impl::take_back_last_segment(TermId id, codec::SegmentBuilder& out) {
  constexpr std::int64_t kRefillPostings = 4 * kBlockSize;
  q_last_segment.bind(1, id);
  if (!q_last_segment.step() || q_last_segment.i64(3) >= kRefillPostings) {
    Status s = q_last_segment.status();
    q_last_segment.reset();
    return s;
  }
  const std::int64_t key = q_last_segment.i64(0);
  std::vector<PostingList::StoredSegment> stored(1);
  stored[0] = PostingList::StoredSegment{key, static_cast<DocId>(q_last_segment.i64(1)),
                                         static_cast<DocId>(q_last_segment.i64(2)),
                                         static_cast<std::uint32_t>(q_last_segment.i64(3)),
                                         std::string(q_last_segment.blob(4)), std::string(q_last_segment.blob(5))};
  q_last_segment.reset();
  auto list = PostingList::build(std::move(stored), "term " + std::to_string(id));
  if (!list) return list.status();
  std::string positions;
  q_get_positions.bind(1, key);
  if (q_get_positions.step()) positions = std::string(q_get_positions.blob(0));
  Status s = q_get_positions.status();
  q_get_positions.reset();
  LODE_RETURN_IF_ERROR(s);
  LODE_RETURN_IF_ERROR(q_drop_segment.bind(1, key).run());
  LODE_RETURN_IF_ERROR(q_drop_positions.bind(1, key).run());
  const auto blocks = (*list)->blocks();
  for (std::size_t b = 0; b < blocks.size(); ++b) {
    const PostingList::Block& blk = blocks[b];
    if (std::uint64_t{blk.pos_offset} + blk.pos_bytes > positions.size())
      return Status::Corruption("positions of term " + std::to_string(id) + ": shorter than its blocks");
    const std::string_view pos = std::string_view(positions).substr(blk.pos_offset, blk.pos_bytes);
    if (blk.n == kBlockSize) {
      out.add_block(**list, b, pos);
      continue;
    }
    // The partial last block: its documents again, their lengths covered by its points.
    DocId docs[kBlockSize];
    std::uint32_t tfs[kBlockSize];
    LODE_RETURN_IF_ERROR((*list)->decode(b, docs, tfs));
    std::vector<std::uint32_t> starts;
    LODE_RETURN_IF_ERROR(codec::split_positions(pos, std::vector<std::uint32_t>(tfs, tfs + blk.n), starts));
    starts.push_back(static_cast<std::uint32_t>(pos.size()));
    for (std::uint32_t i = 0; i < blk.n; ++i) out.add(docs[i], tfs[i], 0, pos.substr(starts[i], starts[i + 1] - starts[i]));
    out.add_points((*list)->points(blk));
  }
  return Status();
}

Status IndexWriter::Impl::flush() {
  if (!in_txn) return Status();
  // 1. Term ids for every term of the batch, adding its df and cf. Ids
  // above the old maximum are new: they have no blocks.
  TermId max_before = 0;
  {
    // A failed read must stop the flush: taken as 0, every term would look
    // new and its existing blocks would be ignored.
    auto row = sql::one_row(q_max_term, "the largest term id");
    if (!row) return row.status();
    max_before = q_max_term.i64(0);
  }
  std::vector<TermId> id_of(batch.term_count());
  std::vector<std::pair<TermId, std::uint32_t>> order;  // (term id, slot)
  order.reserve(batch.term_count());
  for (std::uint32_t slot : batch.id_order()) {
    const PostingBatch::Term& t = batch.term(slot);
    const auto df = static_cast<std::int64_t>(t.df);
    const auto cf = static_cast<std::int64_t>(t.cf);
    const auto field = static_cast<std::int64_t>(t.field);
    TermId id = 0;
    std::int64_t old_df = 0;
    q_find_term.bind(1, field).bind(2, t.term);
    if (q_find_term.step()) {
      id = q_find_term.i64(0);
      old_df = q_find_term.i64(1);
    }
    Status s = q_find_term.status();
    q_find_term.reset();
    LODE_RETURN_IF_ERROR(s);
    if (id == 0) {
      LODE_RETURN_IF_ERROR(q_add_term.bind(1, field).bind(2, t.term).bind(3, df).bind(4, cf).run());
      id = db.last_insert_rowid();
    } else {
      LODE_RETURN_IF_ERROR(q_update_term.bind(1, df).bind(2, cf).bind(3, id).run());
    }
    if (old_df == 0) ++counters.terms;
    id_of[slot] = id;
    order.emplace_back(id, slot);
  }
  // 2. Postings, in term id order.
  std::sort(order.begin(), order.end());
  std::vector<std::uint32_t> slots(order.size());
  for (std::size_t k = 0; k < order.size(); ++k) slots[k] = order[k].second;
  {
    // A small batch (a watched file saved, a few files changed) refills the
    // partial last blocks of its terms. A large one only appends: refilling
    // rewrites a row on another page for nearly every term, so each commit
    // would rewrite the whole postings table and a run's time would grow with
    // the square of the corpus. Appending leaves one partial block per term
    // per large commit instead.
    const bool refill = order.size() <= options.refill_max_terms;
    const PostingBatch::Runs runs = batch.group(slots);
    for (std::size_t k = 0, begin = 0; k < order.size(); begin = runs.end[k++])
      LODE_RETURN_IF_ERROR(write_term(runs, {runs.postings.get() + begin, runs.end[k] - begin},
                                      batch.term(slots[k]).field, order[k].first,
                                      refill && order[k].first <= max_before));
  }
  // 3. Forward index of the batch's documents. A record becomes one 64-bit
  // word, term id above tf, sorted by the id's bits alone (radix_sort.h).
  static_assert(kFieldCount <= 2, "the field takes one bit of id_field");
  std::vector<std::uint64_t> id_field(batch.term_count());  // term id << 1 | field
  TermId max_id = 0;
  for (std::uint32_t slot = 0; slot < id_field.size(); ++slot) {
    if (id_of[slot] >= (TermId{1} << 32)) return Status::Limit("more than 2^32 distinct terms in one index");
    id_field[slot] = static_cast<std::uint64_t>(id_of[slot]) << 1 | static_cast<std::uint64_t>(batch.term(slot).field);
    max_id = std::max(max_id, id_of[slot]);
  }
  const auto id_bits = static_cast<unsigned>(std::bit_width(static_cast<std::uint64_t>(max_id)));
  per_field.resize(kFieldCount);
  fwd_words.resize(kFieldCount);
  for (std::size_t d = 0; d < batch.documents(); ++d) {
    for (auto& w : fwd_words) w.clear();
    for (std::size_t r = batch.doc(d).first, end = batch.records_end(d); r < end; ++r) {
      const PostingBatch::Record& rec = batch.record(r);
      const std::uint64_t key = id_field[rec.slot()];
      fwd_words[key & 1].push_back((key >> 1) << 32 | rec.tf());
    }
    for (std::size_t f = 0; f < kFieldCount; ++f) {
      radix_sort_by_bits(fwd_words[f], fwd_scratch, 32, 32 + id_bits);
      per_field[f].clear();
      for (const std::uint64_t w : fwd_words[f])
        per_field[f].emplace_back(static_cast<TermId>(w >> 32), static_cast<std::uint32_t>(w));
    }
    LODE_RETURN_IF_ERROR(
        q_put_fwd.bind(1, std::int64_t{batch.doc(d).id}).bind_blob(2, codec::encode_forward(per_field)).run());
  }
  // 4. Norms and counters.
  for (auto& [chunk, data] : dirty_norms)
    LODE_RETURN_IF_ERROR(q_put_norms.bind(1, std::int64_t{chunk}).bind_blob(2, data).run());
  ++counters.generation;
  LODE_RETURN_IF_ERROR(schema::store_counters(db, counters));
  LODE_RETURN_IF_ERROR(db.exec("COMMIT"));
  in_txn = false;
#ifdef __GLIBC__
  // Hand the freed pages of the batch's many small allocations back to the
  // system. Without it the heap kept the holes between allocations that
  // outlive a batch, and peak RSS grew by about 5 MB a commit (bench/).
  malloc_trim(0);
#endif
  batch.clear();
  dirty_norms.clear();
  first_pending = 0;
  return Status();
}

IndexWriter::IndexWriter(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}

IndexWriter::~IndexWriter() {
  if (impl_ && impl_->in_txn) (void)impl_->db.exec("ROLLBACK");
}

Result<std::unique_ptr<IndexWriter>> IndexWriter::open(const std::string& path,
                                                       const std::optional<IndexSettings>& settings,
                                                       const WriterOptions& options) {
  auto impl = std::make_unique<Impl>();
  impl->options = options;
  auto lock = WriterLock::acquire(path);
  if (!lock) return lock.status();
  impl->lock.emplace(std::move(lock.value()));
  auto db = sql::Db::open(path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
  if (!db) return db.status();
  impl->db = std::move(db.value());
  auto have = schema::exists(impl->db);
  if (!have) return have.status();
  if (!*have) {
    LODE_RETURN_IF_ERROR(impl->db.exec("PRAGMA page_size=8192"));
    LODE_RETURN_IF_ERROR(schema::configure(impl->db, true));
    LODE_RETURN_IF_ERROR(impl->db.exec("BEGIN IMMEDIATE"));
    LODE_RETURN_IF_ERROR(schema::create(impl->db, settings.value_or(IndexSettings{})));
    LODE_RETURN_IF_ERROR(impl->db.exec("COMMIT"));
  } else {
    LODE_RETURN_IF_ERROR(schema::configure(impl->db, true));
  }
  auto recorded = schema::load_settings(impl->db);
  if (!recorded) return recorded.status();
  impl->settings = recorded.value();
  if (settings && (settings->analyzer.language != impl->settings.analyzer.language ||
                   settings->analyzer.stopwords != impl->settings.analyzer.stopwords))
    return Status::InvalidArgument(
        path + " was created with language '" + impl->settings.analyzer.language + "' and stopwords " +
        (impl->settings.analyzer.stopwords ? "on" : "off") +
        "; analyzer settings are fixed at creation (make a new index to change them)");
  auto analyzer = Analyzer::create(impl->settings.analyzer);
  if (!analyzer) return analyzer.status();
  impl->analyzer = std::move(analyzer.value());
  auto counters = schema::load_counters(impl->db);
  if (!counters) return counters.status();
  impl->counters = counters.value();
  LODE_RETURN_IF_ERROR(impl->prepare_all());
  return std::unique_ptr<IndexWriter>(new IndexWriter(std::move(impl)));
}

const IndexSettings& IndexWriter::settings() const { return impl_->settings; }

namespace {
FileRecord file_from(sql::Stmt& q) {
  return FileRecord{std::string(q.text(1)), std::string(q.text(2)), q.i64(3), q.i64(4),
                    std::string(q.text(5)), std::string(q.text(6))};
}
}  // namespace

Result<std::optional<FileRecord>> IndexWriter::file(const std::string& path) {
  auto& q = impl_->q_file;
  q.bind(1, path);
  std::optional<FileRecord> out;
  if (q.step()) out = file_from(q);
  Status s = q.status();
  q.reset();
  if (!s.ok()) return s;
  return out;
}

Result<std::vector<FileRecord>> IndexWriter::files_with_prefix(const std::string& prefix) {
  auto q = impl_->db.prepare(
      "SELECT file_id, path, root, size, mtime_ns, hash, kind FROM files "
      "WHERE substr(path, 1, length(?1)) = ?1 ORDER BY path");
  if (!q) return q.status();
  q->bind(1, prefix);
  std::vector<FileRecord> out;
  while (q->step()) out.push_back(file_from(*q));
  if (!q->status().ok()) return q->status();
  return out;
}

Status IndexWriter::put_file(const FileRecord& file, const std::vector<DocumentInput>& documents) {
  LODE_RETURN_IF_ERROR(begin_file(file));
  return add_documents(documents);
}

Status IndexWriter::begin_file(const FileRecord& file) {
  auto& m = *impl_;
  m.open_file = {};
  LODE_RETURN_IF_ERROR(m.begin());
  m.q_file.bind(1, file.path);
  std::int64_t file_id = 0;
  if (m.q_file.step()) file_id = m.q_file.i64(0);
  Status s = m.q_file.status();
  m.q_file.reset();
  LODE_RETURN_IF_ERROR(s);
  if (file_id != 0) {
    LODE_RETURN_IF_ERROR(m.remove_docs_of(file_id));
    LODE_RETURN_IF_ERROR(m.begin());  // remove_docs_of may have flushed
    LODE_RETURN_IF_ERROR(m.q_update_file.bind(1, file.root).bind(2, file.size).bind(3, file.mtime_ns)
                             .bind(4, file.hash).bind(5, file.kind).bind(6, file_id).run());
  } else {
    LODE_RETURN_IF_ERROR(m.q_insert_file.bind(1, file.path).bind(2, file.root).bind(3, file.size)
                             .bind(4, file.mtime_ns).bind(5, file.hash).bind(6, file.kind).run());
    file_id = m.db.last_insert_rowid();
    ++m.counters.files;
  }
  m.open_file = {file_id, file.path, file.mtime_ns};
  return Status();
}

Status IndexWriter::add_documents(const std::vector<DocumentInput>& documents) {
  auto& m = *impl_;
  if (m.open_file.id == 0) return Status::InvalidArgument("add_documents: no file begun");
  LODE_RETURN_IF_ERROR(m.begin());  // the last part may have committed
  // In parts of up to 256 documents or 4 MiB of text: while this thread
  // inverts and writes one part, a second one analyzes and compresses the
  // next (the only work here that needs no index state).
  const std::span<const DocumentInput> docs(documents);
  auto part_end = [&](std::size_t from) {
    std::size_t to = from, text = 0;
    while (to < docs.size() && to - from < 256 && text < (std::size_t{4} << 20))
      text += docs[to].title.size() + docs[to].body.size(), ++to;
    return to;
  };
  std::size_t from = 0, to = part_end(0);
  auto ready = m.prepare(docs.subspan(0, to));
  while (from < docs.size()) {
    const std::size_t next = to, next_to = part_end(to);
    std::future<std::vector<Impl::Prepared>> ahead;
    if (next < docs.size())
      ahead = std::async(std::launch::async, [&m, part = docs.subspan(next, next_to - next)] { return m.prepare(part); });
    for (std::size_t i = from; i < to; ++i) {
      Status s = m.add_document(m.open_file.id, docs[i], ready[i - from], m.open_file.mtime_ns);
      if (!s.ok()) return s;  // `ahead` waits for its thread as it goes
    }
    if (!ahead.valid()) break;
    ready = ahead.get();
    from = next, to = next_to;
  }
  bool by_size = m.batch_bytes() >= m.options.batch_bytes;
  bool by_count = m.options.batch_documents != 0 && m.batch.documents() >= m.options.batch_documents;
  if (by_size || by_count) return m.flush();
  return Status();
}

Status IndexWriter::finish_file(const FileRecord& file) {
  auto& m = *impl_;
  if (m.open_file.id == 0 || m.open_file.path != file.path)
    return Status::InvalidArgument(file.path + ": finish_file without begin_file");
  LODE_RETURN_IF_ERROR(m.begin());
  LODE_RETURN_IF_ERROR(m.q_update_file.bind(1, file.root).bind(2, file.size).bind(3, file.mtime_ns)
                           .bind(4, file.hash).bind(5, file.kind).bind(6, m.open_file.id).run());
  m.open_file = {};
  return Status();
}

Status IndexWriter::touch_file(const FileRecord& file) {
  auto& m = *impl_;
  m.open_file = {};
  LODE_RETURN_IF_ERROR(m.begin());
  auto q = m.db.prepare("UPDATE files SET root=?, size=?, mtime_ns=? WHERE path=?");
  if (!q) return q.status();
  LODE_RETURN_IF_ERROR(q->bind(1, file.root).bind(2, file.size).bind(3, file.mtime_ns).bind(4, file.path).run());
  if (sqlite3_changes(m.db.raw()) == 0) return Status::NotFound(file.path + ": not in the index");
  return Status();
}

Status IndexWriter::remove_file(const std::string& path) {
  auto& m = *impl_;
  m.open_file = {};
  auto rec = file(path);
  if (!rec) return rec.status();
  if (!rec->has_value()) return Status::NotFound(path + ": not in the index");
  LODE_RETURN_IF_ERROR(m.begin());
  m.q_file.bind(1, path);
  std::int64_t file_id = 0;
  {
    // Found a moment ago: no row now is a read error, never "file 0".
    auto row = sql::one_row(m.q_file, path + ": not in the index");
    if (!row) return row.status();
    file_id = m.q_file.i64(0);
  }
  LODE_RETURN_IF_ERROR(m.remove_docs_of(file_id));
  LODE_RETURN_IF_ERROR(m.begin());
  LODE_RETURN_IF_ERROR(m.q_delete_file.bind(1, file_id).run());
  --m.counters.files;
  return Status();
}

Status IndexWriter::rename_file(const std::string& old_path, const FileRecord& file, const std::string& old_id,
                                const std::string& new_id) {
  auto& m = *impl_;
  m.open_file = {};
  auto taken = this->file(file.path);
  if (!taken) return taken.status();
  if (taken->has_value()) return Status::InvalidArgument(file.path + ": already in the index (rename target)");
  LODE_RETURN_IF_ERROR(m.begin());
  auto q = m.db.prepare("UPDATE files SET path=?, root=?, size=?, mtime_ns=? WHERE path=? RETURNING file_id");
  if (!q) return q.status();
  q->bind(1, file.path).bind(2, file.root).bind(3, file.size).bind(4, file.mtime_ns).bind(5, old_path);
  if (!q->step()) return q->status().ok() ? Status::NotFound(old_path + ": not in the index") : q->status();
  const std::int64_t file_id = q->i64(0);
  while (q->step()) {
  }
  LODE_RETURN_IF_ERROR(q->status());
  auto ids = m.db.prepare(
      "UPDATE docs SET external_id = ?1 || substr(external_id, length(?2) + 1) "
      "WHERE file_id = ?3 AND live = 1 AND (external_id = ?2 OR substr(external_id, 1, length(?2) + 1) = ?2 || '#')");
  if (!ids) return ids.status();
  return ids->bind(1, new_id).bind(2, old_id).bind(3, file_id).run();
}

Status IndexWriter::record_problems(const std::string& path, const std::vector<RecordedProblem>& problems) {
  auto& m = *impl_;
  LODE_RETURN_IF_ERROR(m.begin());
  auto del = m.db.prepare("DELETE FROM problems WHERE path = ?");
  if (!del) return del.status();
  LODE_RETURN_IF_ERROR(del->bind(1, path).run());
  auto ins = m.db.prepare("INSERT INTO problems(path, error, message, time_ns) VALUES(?,?,?,?)");
  if (!ins) return ins.status();
  for (const auto& p : problems) {
    LODE_RETURN_IF_ERROR(ins->bind(1, path).bind(2, std::int64_t{p.error ? 1 : 0}).bind(3, p.message)
                             .bind(4, p.time_ns).run());
  }
  return Status();
}

Result<std::vector<RecordedProblem>> IndexWriter::problems() { return schema::load_problems(impl_->db); }

Status IndexWriter::commit() {
  if (!impl_->in_txn) return Status();
  return impl_->flush();
}

CollectionStats IndexWriter::stats() const {
  const auto& c = impl_->counters;
  CollectionStats s;
  s.documents = c.documents;
  s.total_length = c.total_length;
  s.files = c.files;
  s.terms = c.terms;
  s.postings = c.postings;
  s.dead_documents = c.dead_documents;
  s.generation = c.generation;
  s.bytes_on_disk = schema::bytes_on_disk(impl_->db.path());
  return s;
}

}  // namespace lode
