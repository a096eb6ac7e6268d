// IndexReader: snapshot reads over the SQLite index.
#include <filesystem>
#include <list>
#include <map>
#include <mutex>
#include <unordered_map>
#include <variant>

#include "index/codec.h"
#include "index/schema.h"
#include "index/sqlite.h"
#include "index/tier.h"
#include "lode/index.h"
#include "lode/names.h"

namespace lode {

std::string_view field_name(Field f) { return f == Field::kTitle ? "title" : "body"; }

std::optional<Field> parse_field(std::string_view name) {
  if (name == "title") return Field::kTitle;
  if (name == "body") return Field::kBody;
  return std::nullopt;
}

double CollectionStats::average_length(Field f) const {
  return documents == 0 ? 0.0
                        : static_cast<double>(total_length[static_cast<std::size_t>(f)]) /
                              static_cast<double>(documents);
}

// Fills a DocNorms from the norms rows (a friend of DocNorms).
struct DocNormsLoader {
  static Result<std::shared_ptr<const DocNorms>> load(sql::Stmt& q, DocId limit) {
    auto n = std::make_shared<DocNorms>();
    n->limit_ = limit;
    for (auto& l : n->length_) l.assign(limit, 0);
    n->live_.assign((std::size_t{limit} + 63) / 64, 0);
    while (q.step()) {
      const auto chunk = static_cast<std::uint64_t>(q.i64(0));
      const std::string_view data = q.blob(1);
      const std::uint64_t first = chunk * codec::kNormsPerChunk;
      // The writer stores whole chunks: a short one is damage, never "not live, length 0".
      if (data.size() != codec::kNormsPerChunk * codec::kNormEntryBytes) {
        q.reset();
        return Status::Corruption("norms chunk " + std::to_string(chunk) + ": " + std::to_string(data.size()) +
                                  " bytes, not " + std::to_string(codec::kNormsPerChunk * codec::kNormEntryBytes) +
                                  " (lode verify checks the whole index)");
      }
      for (std::uint32_t slot = 0; slot < codec::kNormsPerChunk && first + slot < limit; ++slot) {
        const codec::NormEntry e = codec::get_norm(data, slot);
        const auto d = static_cast<DocId>(first + slot);
        for (std::size_t f = 0; f < kFieldCount; ++f) n->length_[f][d] = e.length[f];
        if (e.live) n->live_[d >> 6] |= std::uint64_t{1} << (d & 63);
      }
    }
    Status s = q.status();
    q.reset();
    if (!s.ok()) return s;
    return std::shared_ptr<const DocNorms>(std::move(n));
  }
};

struct ReaderCache::Impl {
  struct Entry {
    std::shared_ptr<const PostingList> list;
    std::list<TermId>::iterator lru;
  };
  std::mutex mu;
  const std::size_t budget;
  std::uint64_t generation = ~std::uint64_t{0};  // of everything held
  std::shared_ptr<const DocNorms> norms;
  std::unordered_map<TermId, Entry> lists;
  std::map<std::pair<TermId, TermId>, std::uint64_t> overlaps;  // live_overlap() results
  std::unordered_map<TermId, std::shared_ptr<const ImpactTier>> tiers;  // impact_tiers() results (null: none)
  std::size_t tier_bytes = 0;
  std::list<TermId> lru;  // most recently used first
  std::size_t bytes = 0;
  Counts counts;

  explicit Impl(std::size_t b) : budget(b) {}
  // REQUIRES: mu held. Drops everything of another generation.
  void at_generation(std::uint64_t g) {
    if (g == generation) return;
    generation = g;
    norms.reset();
    overlaps.clear();
    tiers.clear();
    tier_bytes = 0;
    lists.clear();
    lru.clear();
    bytes = 0;
  }
  std::shared_ptr<const PostingList> find(std::uint64_t g, TermId id) {
    std::lock_guard lock(mu);
    at_generation(g);
    auto it = lists.find(id);
    if (it == lists.end()) {
      ++counts.misses;
      return nullptr;
    }
    ++counts.hits;
    lru.splice(lru.begin(), lru, it->second.lru);
    return it->second.list;
  }
  void put(std::uint64_t g, TermId id, const std::shared_ptr<const PostingList>& list) {
    std::lock_guard lock(mu);
    at_generation(g);
    const std::size_t size = list->memory();
    if (size > budget / 4 || lists.count(id)) return;  // one list may not push out everything
    while (bytes + size > budget && !lru.empty()) {
      auto victim = lists.find(lru.back());
      bytes -= victim->second.list->memory();
      lists.erase(victim);
      lru.pop_back();
    }
    lru.push_front(id);
    lists.emplace(id, Entry{list, lru.begin()});
    bytes += size;
  }
};

ReaderCache::ReaderCache(std::size_t postings_bytes) : impl_(std::make_unique<Impl>(postings_bytes)) {}
ReaderCache::~ReaderCache() = default;

ReaderCache::Counts ReaderCache::counts() const {
  std::lock_guard lock(impl_->mu);
  Counts c = impl_->counts;
  c.bytes = impl_->bytes;
  return c;
}

struct IndexReader::Impl final : PositionSource {
  sql::Db db;
  IndexSettings settings;
  schema::Counters counters;
  bool in_scope = false;
  std::shared_ptr<ReaderCache> cache;
  std::shared_ptr<const DocNorms> norms;  // this snapshot's, once loaded
  TierOptions tier_options;
  sql::Stmt q_term, q_term_by_id, q_doc, q_external, q_text, q_fwd, q_norms, q_pages, q_segments, q_positions;

  Status prepare_all() {
    return db.prepare_all({
        {&q_term, "SELECT term_id, df, cf FROM terms WHERE field = ? AND term = ?"},
        {&q_term_by_id, "SELECT field, term, df, cf FROM terms WHERE term_id = ?"},
        {&q_doc, "SELECT d.external_id, d.title, d.kind, coalesce(f.path, ''), d.len_title, d.len_body, d.live, "
                 "coalesce(m.author, ''), coalesce(m.date, 0), coalesce(m.pages, 0), coalesce(f.size, 0) "
                 "FROM docs d LEFT JOIN files f ON f.file_id = d.file_id "
                 "LEFT JOIN doc_meta m ON m.doc_id = d.doc_id WHERE d.doc_id = ?"},
        {&q_pages, "SELECT page_map FROM doc_meta WHERE doc_id = ?"},
        {&q_external, "SELECT doc_id FROM docs WHERE external_id = ? AND live = 1 ORDER BY doc_id LIMIT 1"},
        {&q_text, "SELECT title, body FROM doc_text WHERE doc_id = ?"},
        {&q_fwd, "SELECT data FROM doc_terms WHERE doc_id = ?"},
        {&q_norms, "SELECT chunk, data FROM norms ORDER BY chunk"},
        {&q_segments, "SELECT seg_id, first_doc, last_doc, count, head, data FROM postings WHERE term_id = ? "
                      "ORDER BY first_doc"},
        {&q_positions, "SELECT data FROM positions WHERE seg_id = ?"},
    });
  }

  Result<std::string> segment_positions(std::int64_t key) override {
    q_positions.bind(1, key);
    auto row = sql::one_row(q_positions, "positions of postings segment " + std::to_string(key));
    if (!row) return Status::Corruption(row.status().message());
    return std::string(q_positions.blob(0));
  }

  Result<std::shared_ptr<const PostingList>> load_list(TermId id) {
    const std::uint64_t g = counters.generation;
    if (auto hit = cache->impl_->find(g, id)) return hit;
    std::vector<PostingList::StoredSegment> segs;
    q_segments.bind(1, id);
    while (q_segments.step())
      segs.push_back(PostingList::StoredSegment{q_segments.i64(0), static_cast<DocId>(q_segments.i64(1)),
                                                static_cast<DocId>(q_segments.i64(2)),
                                                static_cast<std::uint32_t>(q_segments.i64(3)),
                                                std::string(q_segments.blob(4)), std::string(q_segments.blob(5))});
    Status s = q_segments.status();
    q_segments.reset();
    if (!s.ok()) return s;
    auto list = PostingList::build(std::move(segs), "term " + std::to_string(id));
    if (!list) return list.status();
    cache->impl_->put(g, id, *list);
    return list;
  }
};

IndexReader::IndexReader(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
IndexReader::~IndexReader() {
  if (impl_ && impl_->in_scope) end_scope();
}

Result<std::unique_ptr<IndexReader>> IndexReader::open(const std::string& path, const ReaderOptions& options) {
  auto db = schema::open_for_reading(path);
  if (!db) return db.status();
  auto impl = std::make_unique<Impl>();
  impl->cache = options.cache ? options.cache : std::make_shared<ReaderCache>();
  impl->tier_options = TierOptions{options.tier_min_postings, options.tier_share};
  impl->db = std::move(db.value());
  auto have = schema::exists(impl->db);
  if (!have) return have.status();
  if (!*have) return Status::Corruption(path + ": not a lode index");
  auto settings = schema::load_settings(impl->db);
  if (!settings) return settings.status();
  impl->settings = settings.value();
  LODE_RETURN_IF_ERROR(impl->prepare_all());
  return std::unique_ptr<IndexReader>(new IndexReader(std::move(impl)));
}

IndexReader::ReadScope::~ReadScope() {
  if (r_) r_->end_scope();
}

Result<IndexReader::ReadScope> IndexReader::begin() {
  auto& m = *impl_;
  if (m.in_scope) return Status::InvalidArgument("read scope already active on this reader");
  LODE_RETURN_IF_ERROR(m.db.exec("BEGIN"));
  m.in_scope = true;
  ReadScope scope(this);
  // The first read fixes the snapshot, and its generation which caches are valid.
  auto counters = schema::load_counters(m.db);
  if (!counters) return counters.status();
  m.counters = counters.value();
  m.norms.reset();  // loaded again (or found in the cache) when first asked for
  return scope;
}

void IndexReader::end_scope() {
  (void)impl_->db.exec("COMMIT");
  impl_->in_scope = false;
  impl_->norms.reset();
}

const IndexSettings& IndexReader::settings() const { return impl_->settings; }
const std::string& IndexReader::path() const { return impl_->db.path(); }

CollectionStats IndexReader::stats() const {
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

Result<std::optional<TermInfo>> IndexReader::term(Field field, std::string_view term) {
  auto& q = impl_->q_term;
  q.bind(1, static_cast<std::int64_t>(field)).bind(2, term);
  std::optional<TermInfo> out;
  if (q.step())
    out = TermInfo{q.i64(0), field, std::string(term), static_cast<std::uint64_t>(q.i64(1)),
                   static_cast<std::uint64_t>(q.i64(2))};
  Status s = q.status();
  q.reset();
  if (!s.ok()) return s;
  return out;
}

Result<TermInfo> IndexReader::term_by_id(TermId id) {
  auto& q = impl_->q_term_by_id;
  q.bind(1, id);
  auto row = sql::one_row(q, "term id " + std::to_string(id));
  if (!row) return row.status();
  auto f = q.i64(0);
  if (f < 0 || f >= kFieldCount)
    return Status::Corruption("term " + std::to_string(id) + ": bad field " + std::to_string(f));
  return TermInfo{id, static_cast<Field>(f), std::string(q.text(1)), static_cast<std::uint64_t>(q.i64(2)),
                  static_cast<std::uint64_t>(q.i64(3))};
}

std::unique_ptr<PostingCursor> IndexReader::postings(const TermInfo& term) {
  auto list = impl_->load_list(term.id);
  if (!list) return std::make_unique<PostingCursor>(list.status());
  return cursor(std::move(list).value());
}

Result<std::vector<std::shared_ptr<const PostingList>>> IndexReader::postings_lists(const std::vector<TermId>& terms) {
  std::vector<std::shared_ptr<const PostingList>> out;
  out.reserve(terms.size());
  for (TermId id : terms) {
    auto list = impl_->load_list(id);
    if (!list) return list.status();
    out.push_back(std::move(list).value());
  }
  return out;
}

std::unique_ptr<PostingCursor> IndexReader::cursor(std::shared_ptr<const PostingList> list) {
  return std::make_unique<PostingCursor>(std::move(list), impl_.get());
}

Result<std::vector<std::shared_ptr<const ImpactTier>>> IndexReader::impact_tiers(const std::vector<TermInfo>& terms) {
  ReaderCache::Impl& c = *impl_->cache->impl_;
  const std::uint64_t g = impl_->counters.generation;
  std::vector<std::shared_ptr<const ImpactTier>> out(terms.size());
  for (std::size_t i = 0; i < terms.size(); ++i) {
    {
      std::lock_guard lock(c.mu);
      c.at_generation(g);
      if (auto it = c.tiers.find(terms[i].id); it != c.tiers.end()) {
        out[i] = it->second;
        continue;
      }
    }
    auto n = norms();
    if (!n) return n.status();
    auto list = impl_->load_list(terms[i].id);
    if (!list) return list.status();
    auto tier = build_impact_tier(**list, **n, terms[i].field, stats().average_length(terms[i].field),
                                  impl_->tier_options);
    if (!tier) return tier.status();
    out[i] = *tier;
    std::lock_guard lock(c.mu);
    c.at_generation(g);
    const std::size_t size = out[i] ? out[i]->top->memory() : 0;
    if (c.tier_bytes + size > c.budget / 4) c.tiers.clear(), c.tier_bytes = 0;  // bounded: a quarter of the budget
    if (c.tiers.emplace(terms[i].id, out[i]).second) c.tier_bytes += size;
  }
  return out;
}

Result<std::uint64_t> IndexReader::live_overlap(TermId a, TermId b) {
  if (a > b) std::swap(a, b);
  ReaderCache::Impl& c = *impl_->cache->impl_;
  const std::uint64_t g = impl_->counters.generation;
  {
    std::lock_guard lock(c.mu);
    c.at_generation(g);
    if (auto it = c.overlaps.find({a, b}); it != c.overlaps.end()) return it->second;
  }
  auto n = norms();
  if (!n) return n.status();
  auto lists = postings_lists({a, b});
  if (!lists) return lists.status();
  auto& ls = *lists;
  if (ls[0]->postings() > ls[1]->postings()) std::swap(ls[0], ls[1]);
  PostingCursor shorter(ls[0], nullptr), longer(ls[1], nullptr);
  std::uint64_t both = 0;
  for (; shorter.valid() && longer.valid(); shorter.next()) {
    longer.seek(shorter.doc());
    if (longer.valid() && longer.doc() == shorter.doc() && (*n)->live(shorter.doc())) ++both;
  }
  LODE_RETURN_IF_ERROR(shorter.status());
  LODE_RETURN_IF_ERROR(longer.status());
  std::lock_guard lock(c.mu);
  c.at_generation(g);
  if (c.overlaps.size() < 65536) c.overlaps.emplace(std::make_pair(a, b), both);  // bounded: 64k pairs
  return both;
}

Result<const DocNorms*> IndexReader::norms() {
  auto& m = *impl_;
  if (m.norms) return m.norms.get();
  ReaderCache::Impl& c = *m.cache->impl_;
  {
    std::lock_guard lock(c.mu);
    c.at_generation(m.counters.generation);
    m.norms = c.norms;
  }
  if (!m.norms) {
    auto loaded = DocNormsLoader::load(m.q_norms, static_cast<DocId>(m.counters.next_doc_id));
    if (!loaded) return loaded.status();
    m.norms = std::move(loaded).value();
    std::lock_guard lock(c.mu);
    c.at_generation(m.counters.generation);
    if (!c.norms) c.norms = m.norms;
  }
  return m.norms.get();
}

bool IndexReader::live(DocId doc) {
  auto n = norms();
  return n.ok() && (*n)->live(doc);
}

std::uint32_t IndexReader::length(DocId doc, Field field) {
  auto n = norms();
  return n.ok() ? (*n)->length(doc, field) : 0;
}

Result<DocumentInfo> IndexReader::document(DocId doc) {
  auto& q = impl_->q_doc;
  q.bind(1, std::int64_t{doc});
  auto row = sql::one_row(q, "document " + std::to_string(doc));
  if (!row) return row.status();
  DocumentInfo d;
  d.id = doc;
  d.external_id = std::string(q.text(0));
  d.title = std::string(q.text(1));
  d.kind = std::string(q.text(2));
  d.path = std::string(q.text(3));
  d.length = {static_cast<std::uint32_t>(q.i64(4)), static_cast<std::uint32_t>(q.i64(5))};
  d.live = q.i64(6) != 0;
  d.author = std::string(q.text(7));
  d.date = q.i64(8);
  d.pages = static_cast<std::uint32_t>(q.i64(9));
  d.size = q.i64(10);
  return d;
}

Result<DocId> IndexReader::find_external(std::string_view external_id) {
  auto& q = impl_->q_external;
  auto lookup = [&](std::string_view id) -> Result<DocId> {
    q.bind(1, id);
    auto row = sql::one_row(q, "no document with id '" + escape_name(external_id) + "'");
    if (!row) return row.status();
    return static_cast<DocId>(q.i64(0));
  };
  auto found = lookup(external_id);
  // An id printed as JSON holds the byte escape of lode/names.h where its
  // file name is not UTF-8: given back, it names the file's real bytes.
  if (found.status().code() == Code::kNotFound && holds_escaped_byte(external_id))
    return lookup(unescape_name(external_id));
  return found;
}

Result<std::string> IndexReader::stored_text(DocId doc, Field field) {
  auto& q = impl_->q_text;
  q.bind(1, std::int64_t{doc});
  auto row = sql::one_row(q, "no stored text for document " + std::to_string(doc));
  if (!row) return row.status();
  return codec::decompress_text(q.blob(field == Field::kTitle ? 0 : 1));
}

Result<std::vector<std::pair<TermId, std::uint32_t>>> IndexReader::forward(DocId doc, Field field) {
  auto& q = impl_->q_fwd;
  q.bind(1, std::int64_t{doc});
  auto row = sql::one_row(q, "no forward index for document " + std::to_string(doc));
  if (!row) return row.status();
  std::vector<codec::ForwardList> lists;
  LODE_RETURN_IF_ERROR(codec::decode_forward(q.blob(0), lists));
  return std::move(lists[static_cast<std::size_t>(field)]);
}

DocId IndexReader::doc_id_limit() const { return static_cast<DocId>(impl_->counters.next_doc_id); }

Result<std::vector<PageStart>> IndexReader::pages(DocId doc) {
  auto& q = impl_->q_pages;
  q.bind(1, std::int64_t{doc});
  std::vector<PageStart> out;
  if (q.step()) {
    Status s = codec::decode_page_map(q.blob(0), out);
    q.reset();
    if (!s.ok()) return Status::Corruption("document " + std::to_string(doc) + ": " + s.message());
    return out;
  }
  Status s = q.status();
  q.reset();
  if (!s.ok()) return s;
  return out;
}

Result<std::vector<DocId>> IndexReader::filter(const DocFilter& f) {
  // Fixed SQL pieces with bound values only: no user text in the SQL.
  std::string sql =
      "SELECT d.doc_id FROM docs d LEFT JOIN files fl ON fl.file_id = d.file_id "
      "LEFT JOIN doc_meta m ON m.doc_id = d.doc_id WHERE d.live = 1";
  std::vector<std::variant<std::string, std::int64_t>> binds;
  auto any_of = [&](const std::vector<std::string>& values, const char* test, int uses) {
    if (values.empty()) return;
    sql += " AND (";
    for (std::size_t i = 0; i < values.size(); ++i) {
      sql += std::string(i ? " OR " : "") + "(" + test + ")";
      for (int k = 0; k < uses; ++k) binds.emplace_back(values[i]);
    }
    sql += ")";
  };
  any_of(f.kinds, "d.kind = ?", 1);
  any_of(f.prefixes,
         "substr(d.external_id, 1, length(?)) = ? OR substr(coalesce(fl.path, ''), 1, length(?)) = ?", 4);
  auto number = [&](std::optional<std::int64_t> v, const char* test) {
    if (!v) return;
    sql += std::string(" AND ") + test;
    binds.emplace_back(*v);
  };
  number(f.date_from, "coalesce(m.date, 0) >= ?");
  number(f.date_to, "coalesce(m.date, 0) <= ?");
  if (f.pages_min) number(std::int64_t{*f.pages_min}, "coalesce(m.pages, 0) >= ?");
  if (f.pages_max) number(std::int64_t{*f.pages_max}, "coalesce(m.pages, 0) <= ?");
  number(f.size_min, "coalesce(fl.size, 0) >= ?");
  number(f.size_max, "coalesce(fl.size, 0) <= ?");
  if (!f.author.empty()) any_of({f.author}, "instr(lower(coalesce(m.author, '')), lower(?)) > 0", 1);
  sql += " ORDER BY d.doc_id";
  auto q = impl_->db.prepare(sql);
  if (!q) return q.status();
  for (std::size_t i = 0; i < binds.size(); ++i) {
    const int at = static_cast<int>(i + 1);
    if (auto* t = std::get_if<std::string>(&binds[i])) q->bind(at, std::string_view(*t));
    else q->bind(at, std::get<std::int64_t>(binds[i]));
  }
  std::vector<DocId> out;
  while (q->step()) out.push_back(static_cast<DocId>(q->i64(0)));
  LODE_RETURN_IF_ERROR(q->status());
  return out;
}

Result<std::vector<RecordedProblem>> IndexReader::problems() { return schema::load_problems(impl_->db); }

}  // namespace lode
