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
#include "index/posting_batch.h"
#include "index/radix_sort.h"
#include "index/segment.h"
#include "index/sqlite_store.h"
#include "lode/index.h"

namespace lode {

struct IndexWriter::Impl {
  std::unique_ptr<store::WriteStore> store;
  WriterOptions options;
  std::unique_ptr<Analyzer> analyzer;
  store::Counters counters;
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
  std::vector<std::pair<DocId, std::string>> fwd_rows;

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

Status IndexWriter::Impl::begin() {
  if (in_txn) return Status();
  LODE_RETURN_IF_ERROR(store->begin());
  in_txn = true;
  return Status();
}

Result<std::string*> IndexWriter::Impl::norms_chunk(std::uint32_t chunk) {
  auto it = dirty_norms.find(chunk);
  if (it != dirty_norms.end()) return &it->second;
  auto stored = store->norms_chunk(chunk);
  if (!stored) return stored.status();
  std::string data = std::move(stored).value();
  data.resize(codec::kNormsPerChunk * codec::kNormEntryBytes, '\0');
  return &dirty_norms.emplace(chunk, std::move(data)).first->second;
}

// Marks the file's live documents dead and takes their postings out of
// df, cf and the counters, in one read of their forward lists and one
// change per term.
Status IndexWriter::Impl::remove_docs_of(std::int64_t file_id) {
  auto dead = store->live_documents(file_id);
  if (!dead) return dead.status();
  if (dead->empty()) return Status();
  // Documents still in the in-memory batch have no forward index yet.
  for (const auto& d : *dead)
    if (first_pending != 0 && d.id >= first_pending) {
      LODE_RETURN_IF_ERROR(flush());
      LODE_RETURN_IF_ERROR(begin());
      break;
    }
  std::vector<DocId> ids;
  for (const auto& d : *dead) ids.push_back(d.id);
  auto blobs = store->forward(ids);
  if (!blobs) return blobs.status();
  std::map<TermId, store::TermDelta> deltas;
  std::vector<codec::ForwardList> fwd;
  for (const std::string& blob : *blobs) {
    LODE_RETURN_IF_ERROR(codec::decode_forward(blob, fwd));
    for (auto& list : fwd)
      for (auto& [term_id, tf] : list) {
        store::TermDelta& d = deltas[term_id];
        d.id = term_id;
        --d.df;
        d.cf -= static_cast<std::int64_t>(tf);
        --counters.postings;
      }
  }
  std::vector<store::TermDelta> changes;
  changes.reserve(deltas.size());
  for (const auto& [id, d] : deltas) changes.push_back(d);
  auto dfs = store->adjust_terms(changes);
  if (!dfs) return dfs.status();
  for (std::int64_t df : *dfs)
    if (df == 0) --counters.terms;
  LODE_RETURN_IF_ERROR(store->kill_documents(ids));
  for (const auto& d : *dead) {
    auto chunk = norms_chunk(d.id / codec::kNormsPerChunk);
    if (!chunk) return chunk.status();
    codec::put_norm(**chunk, d.id % codec::kNormsPerChunk, codec::NormEntry{false, d.length});
    --counters.documents;
    ++counters.dead_documents;
    for (std::size_t f = 0; f < kFieldCount; ++f) counters.total_length[f] -= d.length[f];
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
    const Analyzer::Analyzed& analyzed = p.fields[static_cast<std::size_t>(f)];
    len[static_cast<std::size_t>(f)] = static_cast<std::uint32_t>(analyzed.tokens.size());
    LODE_RETURN_IF_ERROR(batch.add_field(f, analyzed.tokens));
  }
  const auto& body = p.fields[static_cast<std::size_t>(Field::kBody)].tokens;
  const std::string map = d.page_offsets.empty() ? std::string() : codec::encode_page_map(page_map(d.page_offsets, body));
  const store::DocumentRow row{id,       file_id,      d.external_id, d.title,
                               d.kind,   len,          p.title_blob,  p.body_blob,
                               d.author, d.date != 0 ? d.date : mtime_ns / 1000000000,
                               d.pages,  map};
  LODE_RETURN_IF_ERROR(store->put_documents(std::span<const store::DocumentRow>(&row, 1)));
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
  return store->put_segment(id, seg.first_doc, seg.last_doc, seg.count, seg.head, seg.data, seg.positions);
}

// A last segment under kRefillPostings postings is deleted and its blocks
// start `out`: rewriting it costs at most that many postings per term.
Status IndexWriter::Impl::take_back_last_segment(TermId id, codec::SegmentBuilder& out) {
  constexpr std::uint32_t kRefillPostings = 4 * kBlockSize;
  auto last = store->last_segment(id);
  if (!last) return last.status();
  if (!*last || (*last)->segment.count >= kRefillPostings) return Status();
  const std::int64_t key = (*last)->segment.key;
  const std::string positions = std::move((*last)->positions);
  std::vector<PostingList::StoredSegment> stored;
  stored.push_back(std::move((*last)->segment));
  auto list = PostingList::build(std::move(stored), "term " + std::to_string(id));
  if (!list) return list.status();
  LODE_RETURN_IF_ERROR(store->drop_segment(key));
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
  // A failed read must stop the flush: taken as 0, every term would look
  // new and its existing blocks would be ignored.
  auto max_id_before = store->max_term_id();
  if (!max_id_before) return max_id_before.status();
  const TermId max_before = *max_id_before;
  const std::vector<std::uint32_t>& by_name = batch.id_order();
  std::vector<store::TermKey> keys;
  keys.reserve(by_name.size());
  for (std::uint32_t slot : by_name) keys.push_back({batch.term(slot).field, batch.term(slot).term});
  auto found = store->find_terms(keys);
  if (!found) return found.status();
  std::vector<store::TermKey> new_keys;
  std::vector<std::pair<std::int64_t, std::int64_t>> new_counts;
  std::vector<store::TermDelta> deltas;
  for (std::size_t i = 0; i < by_name.size(); ++i) {
    const PostingBatch::Term& t = batch.term(by_name[i]);
    const auto df = static_cast<std::int64_t>(t.df), cf = static_cast<std::int64_t>(t.cf);
    if ((*found)[i]) {
      deltas.push_back({(*found)[i]->first, df, cf});
      if ((*found)[i]->second == 0) ++counters.terms;  // known, but in no live document until now
    } else {
      new_keys.push_back(keys[i]);
      new_counts.emplace_back(df, cf);
      ++counters.terms;
    }
  }
  auto new_ids = store->add_terms(new_keys, new_counts);
  if (!new_ids) return new_ids.status();
  LODE_RETURN_IF_ERROR(store->adjust_terms(deltas).status());
  std::vector<TermId> id_of(batch.term_count());
  std::vector<std::pair<TermId, std::uint32_t>> order;  // (term id, slot)
  order.reserve(batch.term_count());
  for (std::size_t i = 0, added = 0; i < by_name.size(); ++i) {
    const TermId id = (*found)[i] ? (*found)[i]->first : (*new_ids)[added++];
    id_of[by_name[i]] = id;
    order.emplace_back(id, by_name[i]);
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
    fwd_rows.emplace_back(batch.doc(d).id, codec::encode_forward(per_field));
    // Written in groups: one call per group, not per document, and never
    // the whole batch's lists held at once.
    if (fwd_rows.size() == 1024 || d + 1 == batch.documents()) {
      LODE_RETURN_IF_ERROR(store->put_forward(fwd_rows));
      fwd_rows.clear();
    }
  }
  // 4. Norms and counters.
  for (auto& [chunk, data] : dirty_norms) LODE_RETURN_IF_ERROR(store->put_norms_chunk(chunk, data));
  ++counters.generation;
  LODE_RETURN_IF_ERROR(store->commit(counters));
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

IndexWriter::~IndexWriter() = default;  // the store rolls back what was not committed

Result<std::unique_ptr<IndexWriter>> IndexWriter::open(const std::string& path,
                                                       const std::optional<IndexSettings>& settings,
                                                       const WriterOptions& options) {
  auto impl = std::make_unique<Impl>();
  impl->options = options;
  auto store = store::open_sqlite_writer(path, settings);
  if (!store) return store.status();
  impl->store = std::move(store).value();
  const IndexSettings& recorded = impl->store->settings();
  if (settings && (settings->analyzer.language != recorded.analyzer.language ||
                   settings->analyzer.stopwords != recorded.analyzer.stopwords))
    return Status::InvalidArgument(
        path + " was created with language '" + recorded.analyzer.language + "' and stopwords " +
        (recorded.analyzer.stopwords ? "on" : "off") +
        "; analyzer settings are fixed at creation (make a new index to change them)");
  auto analyzer = Analyzer::create(recorded.analyzer);
  if (!analyzer) return analyzer.status();
  impl->analyzer = std::move(analyzer.value());
  impl->counters = impl->store->committed();
  return std::unique_ptr<IndexWriter>(new IndexWriter(std::move(impl)));
}

const IndexSettings& IndexWriter::settings() const { return impl_->store->settings(); }

Result<std::optional<FileRecord>> IndexWriter::file(const std::string& path) { return impl_->store->file(path); }

Result<std::vector<FileRecord>> IndexWriter::files_with_prefix(const std::string& prefix) {
  return impl_->store->files_with_prefix(prefix);
}

Status IndexWriter::put_file(const FileRecord& file, const std::vector<DocumentInput>& documents) {
  LODE_RETURN_IF_ERROR(begin_file(file));
  return add_documents(documents);
}

Status IndexWriter::begin_file(const FileRecord& file) {
  auto& m = *impl_;
  m.open_file = {};
  LODE_RETURN_IF_ERROR(m.begin());
  auto id = m.store->file_id(file.path);
  if (!id) return id.status();
  std::int64_t file_id = *id;
  if (file_id != 0) {
    LODE_RETURN_IF_ERROR(m.remove_docs_of(file_id));
    LODE_RETURN_IF_ERROR(m.begin());  // remove_docs_of may have flushed
    LODE_RETURN_IF_ERROR(m.store->update_file(file_id, file));
  } else {
    auto added = m.store->insert_file(file);
    if (!added) return added.status();
    file_id = *added;
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
  LODE_RETURN_IF_ERROR(m.store->update_file(m.open_file.id, file));
  m.open_file = {};
  return Status();
}

Status IndexWriter::touch_file(const FileRecord& file) {
  auto& m = *impl_;
  m.open_file = {};
  LODE_RETURN_IF_ERROR(m.begin());
  return m.store->touch_file(file);
}

Status IndexWriter::remove_file(const std::string& path) {
  auto& m = *impl_;
  m.open_file = {};
  auto file_id = m.store->file_id(path);
  if (!file_id) return file_id.status();
  if (*file_id == 0) return Status::NotFound(path + ": not in the index");
  LODE_RETURN_IF_ERROR(m.begin());
  LODE_RETURN_IF_ERROR(m.remove_docs_of(*file_id));
  LODE_RETURN_IF_ERROR(m.begin());
  LODE_RETURN_IF_ERROR(m.store->delete_file(*file_id));
  --m.counters.files;
  return Status();
}

Status IndexWriter::rename_file(const std::string& old_path, const FileRecord& file, const std::string& old_id,
                                const std::string& new_id) {
  auto& m = *impl_;
  m.open_file = {};
  auto taken = m.store->file_id(file.path);
  if (!taken) return taken.status();
  if (*taken != 0) return Status::InvalidArgument(file.path + ": already in the index (rename target)");
  LODE_RETURN_IF_ERROR(m.begin());
  return m.store->rename_file(old_path, file, old_id, new_id);
}

Status IndexWriter::record_problems(const std::string& path, const std::vector<RecordedProblem>& problems) {
  auto& m = *impl_;
  LODE_RETURN_IF_ERROR(m.begin());
  return m.store->replace_problems(path, problems);
}

Result<std::vector<RecordedProblem>> IndexWriter::problems() { return impl_->store->problems(); }

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
  s.bytes_on_disk = impl_->store->bytes_on_disk();
  return s;
}

}  // namespace lode
