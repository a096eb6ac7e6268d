// The writer's posting batch (see posting_batch.h).
#include "index/posting_batch.h"

#include <algorithm>
#include <numeric>
#include <utility>

#include "index/codec.h"

namespace lode {
namespace {

// What the flush allocates per term beside the batch: id order, run starts
// and ends, term ids, the (id, slot) order (see IndexWriter::Impl::flush).
constexpr std::size_t kFlushBytesPerTerm = 48;

// Longer terms live on the heap, beside the Term.
const std::size_t kInlineTermBytes = std::string().capacity();

// How many tokens ahead add_field() prefetches a token's dictionary cell,
// and its term entry (common practice: far enough to cover a memory load,
// near enough that the lines are still cached when used).
constexpr std::size_t kCellAhead = 16;
constexpr std::size_t kTermAhead = 8;

}  // namespace

void PostingBatch::begin_document(DocId id) { docs_.push_back(Doc{id, log_.size(), {}}); }

std::uint32_t PostingBatch::slot_for(Field f, std::string_view term, std::uint64_t hash, std::uint32_t unit) {
  std::uint32_t slot = slot_of_.find(hash, [&](std::uint32_t s) {
    const Term& t = terms_[s];
    return t.field == f && t.term == term;
  });
  if (slot != SlotTable::kNone) return slot;
  slot = static_cast<std::uint32_t>(terms_.size());
  slot_of_.insert(hash, slot);
  const Term& t = terms_.push_back(Term{std::string(term), 0, 0, 0, 0, unit, f});
  if (t.term.capacity() > kInlineTermBytes) term_heap_ += t.term.capacity() + 1;
  return slot;
}

Status PostingBatch::add_field(Field f, const std::vector<Token>& tokens) {
  const std::size_t n = tokens.size();
  docs_.back().length[static_cast<std::size_t>(f)] = static_cast<std::uint32_t>(n);
  if (n == 0) return Status();
  if (n > kMaxTerms - terms_.size() || n > kMaxTerms - multi_)
    return Status::Limit("the writer's batch holds too many terms; commit more often (smaller batch)");
  const std::uint32_t unit = ++units_;
  hashes_.resize(n);
  for (std::size_t i = 0; i < n; ++i) hashes_[i] = SlotTable::hash(static_cast<unsigned char>(f), tokens[i].term);
  for (std::size_t i = 0; i < std::min(n, kCellAhead); ++i) slot_of_.prefetch(hashes_[i]);
  // 1. A group per distinct term, in order of first occurrence; count its tokens.
  token_group_.resize(n);
  group_slot_.clear();
  group_end_.clear();
  for (std::size_t i = 0; i < n; ++i) {
    if (i + kCellAhead < n) slot_of_.prefetch(hashes_[i + kCellAhead]);
    if (i + kTermAhead < n) {
      const std::uint32_t guess = slot_of_.guess(hashes_[i + kTermAhead]);
      if (guess != SlotTable::kNone) __builtin_prefetch(&terms_[guess]);
    }
    const std::uint32_t slot = slot_for(f, tokens[i].term, hashes_[i], unit);
    Term& t = terms_[slot];
    if (t.mark != unit) {
      t.mark = unit;
      t.group = static_cast<std::uint32_t>(group_slot_.size());
      ++t.df;
      group_slot_.push_back(slot);
      group_end_.push_back(0);
    }
    ++t.cf;
    token_group_[i] = t.group;
    ++group_end_[t.group];
  }
  // 2. Counting sort of the positions by group: each group's stay ascending.
  std::uint32_t sum = 0;
  for (auto& c : group_end_) sum += std::exchange(c, sum);
  grouped_.resize(n);
  for (std::size_t i = 0; i < n; ++i) grouped_[group_end_[token_group_[i]]++] = tokens[i].position;
  // 3. A record per group; positions of tf > 1 as varint deltas.
  encoded_.resize(5 * n);
  char* p = encoded_.data();
  std::uint32_t begin = 0;
  for (std::size_t g = 0; g < group_slot_.size(); ++g) {
    const std::uint32_t end = group_end_[g];
    if (end - begin == 1 && grouped_[begin] < kSingle) {
      log_.push_back(Record{group_slot_[g] | kSingle, grouped_[begin]});
    } else {
      log_.push_back(Record{group_slot_[g], end - begin});
      ++multi_;
      std::uint32_t prev = 0;
      for (std::uint32_t k = begin; k < end; ++k) {
        p = codec::put_varint(p, grouped_[k] - prev);
        prev = grouped_[k];
      }
    }
    begin = end;
  }
  positions_.append(encoded_.data(), static_cast<std::size_t>(p - encoded_.data()));
  return Status();
}

std::vector<std::uint32_t> PostingBatch::id_order() const {
  std::vector<std::uint32_t> order(terms_.size());
  std::iota(order.begin(), order.end(), 0u);
  for (std::size_t a = 0; a < order.size();) {
    std::size_t b = a + 1;
    while (b < order.size() && terms_[b].born == terms_[a].born) ++b;
    std::sort(order.begin() + static_cast<std::ptrdiff_t>(a), order.begin() + static_cast<std::ptrdiff_t>(b),
              [this](std::uint32_t x, std::uint32_t y) { return terms_[x].term < terms_[y].term; });
    a = b;
  }
  return order;
}

PostingBatch::Runs PostingBatch::group(const std::vector<std::uint32_t>& slots) const {
  Runs runs;
  std::vector<std::size_t> next(terms_.size());
  runs.end.resize(slots.size());
  std::size_t at = 0;
  for (std::size_t k = 0; k < slots.size(); ++k) {
    next[slots[k]] = at;
    at += terms_[slots[k]].df;
    runs.end[k] = at;
  }
  runs.postings = big_array<Posting>(at);
  runs.multi.reserve(multi_);
  Posting* out = runs.postings.get();
  std::uint64_t pos = 0;
  for (std::size_t d = 0; d < docs_.size(); ++d) {
    const DocId id = docs_[d].id;
    for (std::size_t r = docs_[d].first, end = records_end(d); r < end; ++r) {
      const Record rec = log_[r];
      if (rec.key & kSingle) {
        out[next[rec.key & ~kSingle]++] = Posting{id, rec.value};
      } else {
        out[next[rec.key]++] = Posting{id, kMulti | static_cast<std::uint32_t>(runs.multi.size())};
        runs.multi.push_back(Multi{rec.value, pos});
        pos = skip_varints(pos, rec.value);
      }
    }
  }
  return runs;
}

std::uint64_t PostingBatch::skip_varints(std::uint64_t pos, std::uint32_t n) const {
  while (n > 0)
    if (static_cast<unsigned char>(positions_[pos++]) < 0x80) --n;
  return pos;
}

void PostingBatch::append_positions(std::string& out, const Runs& runs, const Posting& p) const {
  if (!(p.value & kMulti)) return codec::put_varint(out, p.value);
  const Multi& m = runs.multi[p.value & ~kMulti];
  positions_.copy_to(out, m.pos, skip_varints(m.pos, m.tf));
}

std::size_t PostingBatch::bytes() const {
  return slot_of_.bytes() + terms_.bytes() + term_heap_ + log_.bytes() + positions_.bytes() +
         docs_.capacity() * sizeof(Doc) + terms_.size() * kFlushBytesPerTerm + log_.size() * sizeof(Posting) +
         multi_ * sizeof(Multi);
}

void PostingBatch::clear() {
  slot_of_.clear();
  terms_.clear();
  log_.clear();
  positions_.clear();
  decltype(docs_)().swap(docs_);
  term_heap_ = 0;
  multi_ = 0;
  units_ = 0;
}

}  // namespace lode
