// IndexReader: snapshot reads over the SQLite index.
#include <filesystem>
#include <list>
#include <map>
#include <mutex>
#include <unordered_map>

#include "index/codec.h"
#include "index/sqlite_store.h"
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

// Fills a DocNorms from the store's norms chunks (a friend of DocNorms).
struct DocNormsLoader {
  static Result<std::shared_ptr<const DocNorms>> load(store::ReadStore& store, DocId limit) {
    auto n = std::make_shared<DocNorms>();
    n->limit_ = limit;
    for (auto& l : n->length_) l.assign(limit, 0);
    n->live_.assign((std::size_t{limit} + 63) / 64, 0);
    LODE_RETURN_IF_ERROR(store.norms([&](std::uint64_t chunk, std::string_view data) {
      const std::uint64_t first = chunk * codec::kNormsPerChunk;
      // The writer stores whole chunks: a short one is damage, never "not live, length 0".
      if (data.size() != codec::kNormsPerChunk * codec::kNormEntryBytes)
        return Status::Corruption("norms chunk " + std::to_string(chunk) + ": " + std::to_string(data.size()) +
                                  " bytes, not " + std::to_string(codec::kNormsPerChunk * codec::kNormEntryBytes) +
                                  " (lode verify checks the whole index)");
      for (std::uint32_t slot = 0; slot < codec::kNormsPerChunk && first + slot < limit; ++slot) {
        const codec::NormEntry e = codec::get_norm(data, slot);
        const auto d = static_cast<DocId>(first + slot);
        for (std::size_t f = 0; f < kFieldCount; ++f) n->length_[f][d] = e.length[f];
        if (e.live) n->live_[d >> 6] |= std::uint64_t{1} << (d & 63);
      }
      return Status();
    }));
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
  std::unique_ptr<store::ReadStore> store;
  store::Counters counters;
  bool in_scope = false;
  std::shared_ptr<ReaderCache> cache;
  std::shared_ptr<const DocNorms> norms;  // this snapshot's, once loaded
  TierOptions tier_options;

  Result<std::string> segment_positions(std::int64_t key) override { return store->positions(key); }

  // The lists of `ids`, from the cache or in one read from the store.
  Result<std::vector<std::shared_ptr<const PostingList>>> load_lists(std::span<const TermId> ids) {
    const std::uint64_t g = counters.generation;
    std::vector<std::shared_ptr<const PostingList>> out(ids.size());
    std::vector<TermId> missing;
    for (std::size_t i = 0; i < ids.size(); ++i)
      if (!(out[i] = cache->impl_->find(g, ids[i]))) missing.push_back(ids[i]);
    if (missing.empty()) return out;
    auto segs = store->segments(missing);
    if (!segs) return segs.status();
    for (std::size_t i = 0, m = 0; i < ids.size(); ++i) {
      if (out[i]) continue;
      auto list = PostingList::build(std::move((*segs)[m++]), "term " + std::to_string(ids[i]));
      if (!list) return list.status();
      cache->impl_->put(g, ids[i], *list);
      out[i] = std::move(list).value();
    }
    return out;
  }
  Result<std::shared_ptr<const PostingList>> load_list(TermId id) {
    auto lists = load_lists(std::span<const TermId>(&id, 1));
    if (!lists) return lists.status();
    return std::move((*lists)[0]);
  }
};

IndexReader::IndexReader(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
IndexReader::~IndexReader() {
  if (impl_ && impl_->in_scope) end_scope();
}

Result<std::unique_ptr<IndexReader>> IndexReader::open(const std::string& path, const ReaderOptions& options) {
  auto store = store::open_sqlite_reader(path);
  if (!store) return store.status();
  auto impl = std::make_unique<Impl>();
  impl->store = std::move(store).value();
  impl->cache = options.cache ? options.cache : std::make_shared<ReaderCache>();
  impl->tier_options = TierOptions{options.tier_min_postings, options.tier_share};
  return std::unique_ptr<IndexReader>(new IndexReader(std::move(impl)));
}

IndexReader::ReadScope::~ReadScope() {
  if (r_) r_->end_scope();
}

Result<IndexReader::ReadScope> IndexReader::begin() {
  auto& m = *impl_;
  if (m.in_scope) return Status::InvalidArgument("read scope already active on this reader");
  LODE_RETURN_IF_ERROR(m.store->begin());
  m.in_scope = true;
  ReadScope scope(this);
  // The first read fixes the snapshot, and its generation which caches are valid.
  auto counters = m.store->counters();
  if (!counters) return counters.status();
  m.counters = counters.value();
  m.norms.reset();  // loaded again (or found in the cache) when first asked for
  return scope;
}

void IndexReader::end_scope() {
  impl_->store->end();
  impl_->in_scope = false;
  impl_->norms.reset();
}

const IndexSettings& IndexReader::settings() const { return impl_->store->settings(); }
const std::string& IndexReader::path() const { return impl_->store->location(); }

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
  s.bytes_on_disk = impl_->store->bytes_on_disk();
  return s;
}

Result<std::optional<TermInfo>> IndexReader::term(Field field, std::string_view term) {
  const store::TermKey key{field, term};
  auto found = impl_->store->terms(std::span<const store::TermKey>(&key, 1));
  if (!found) return found.status();
  return std::move((*found)[0]);
}

Result<TermInfo> IndexReader::term_by_id(TermId id) { return impl_->store->term_by_id(id); }

std::unique_ptr<PostingCursor> IndexReader::postings(const TermInfo& term) {
  auto list = impl_->load_list(term.id);
  if (!list) return std::make_unique<PostingCursor>(list.status());
  return cursor(std::move(list).value());
}

Result<std::vector<std::shared_ptr<const PostingList>>> IndexReader::postings_lists(const std::vector<TermId>& terms) {
  return impl_->load_lists(terms);
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
    auto loaded = DocNormsLoader::load(*m.store, static_cast<DocId>(m.counters.next_doc_id));
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

Result<DocumentInfo> IndexReader::document(DocId doc) { return impl_->store->document(doc); }

Result<DocId> IndexReader::find_external(std::string_view external_id) {
  auto lookup = [&](std::string_view id) -> Result<DocId> {
    auto found = impl_->store->find_external(id);
    if (!found) return found.status();
    if (!*found) return Status::NotFound("no document with id '" + escape_name(external_id) + "'");
    return **found;
  };
  auto found = lookup(external_id);
  // An id printed as JSON holds the byte escape of lode/names.h where its
  // file name is not UTF-8: given back, it names the file's real bytes.
  if (found.status().code() == Code::kNotFound && holds_escaped_byte(external_id))
    return lookup(unescape_name(external_id));
  return found;
}

Result<std::string> IndexReader::stored_text(DocId doc, Field field) {
  auto blobs = impl_->store->stored_text(doc);
  if (!blobs) return blobs.status();
  return codec::decompress_text((*blobs)[static_cast<std::size_t>(field)]);
}

Result<std::vector<std::pair<TermId, std::uint32_t>>> IndexReader::forward(DocId doc, Field field) {
  auto blob = impl_->store->forward(doc);
  if (!blob) return blob.status();
  std::vector<codec::ForwardList> lists;
  LODE_RETURN_IF_ERROR(codec::decode_forward(*blob, lists));
  return std::move(lists[static_cast<std::size_t>(field)]);
}

DocId IndexReader::doc_id_limit() const { return static_cast<DocId>(impl_->counters.next_doc_id); }

Result<std::vector<PageStart>> IndexReader::pages(DocId doc) {
  auto map = impl_->store->page_map(doc);
  if (!map) return map.status();
  std::vector<PageStart> out;
  if (map->empty()) return out;
  Status s = codec::decode_page_map(*map, out);
  if (!s.ok()) return Status::Corruption("document " + std::to_string(doc) + ": " + s.message());
  return out;
}

Result<std::vector<DocId>> IndexReader::filter(const DocFilter& f) { return impl_->store->filter(f); }

Result<std::vector<RecordedProblem>> IndexReader::problems() { return impl_->store->problems(); }

}  // namespace lode
