// PostingBatch: the writer's in-memory batch of inverted postings.
//
// Adding a document field looks each token's term up in a slot dictionary
// ((field, term) -> slot), groups the field's tokens by slot, and appends one
// 8-byte record per distinct term to a posting log, in document order: a
// term seen once holds its position in the record (most postings: bench/'s
// generated corpus makes 9.0 M postings of 10.7 M tokens); otherwise the
// record holds tf and the positions go, as varint deltas (the stored
// form), to one shared byte buffer. Memory is written front to back; per
// term there is only a small fixed entry. At flush, group() counting-sorts
// the log by slot into per-term runs, each already in doc order because
// doc ids ascend.
//
// (It replaced a set of growing vectors per term: scattered appends and
// their reallocations made the batch memory-bound.)
//
// Thread safety: none (one writer owns it).
#pragma once

#include <array>
#include <cstdint>
#include <memory>
#include <string>
#include <vector>

#include "index/chunked_vector.h"
#include "common/slot_table.h"
#include "lode/analysis.h"
#include "lode/index.h"
#include "lode/status.h"

namespace lode {

class PostingBatch {
 public:
  struct alignas(64) Term {  // one cache line: a lookup touches one
    std::string term;
    std::uint64_t cf = 0;     // occurrences in the batch
    std::uint32_t df = 0;     // documents of the batch holding it
    std::uint32_t mark = 0;   // last field unit (document field) that used it
    std::uint32_t group = 0;  // its token group within that unit
    std::uint32_t born = 0;   // the unit that used it first
    Field field = Field::kBody;
  };
  struct Record {
    std::uint32_t key;    // slot, | kSingle when tf is 1 (and the position < kSingle)
    std::uint32_t value;  // that position, else tf
    std::uint32_t slot() const { return key & ~kSingle; }
    std::uint32_t tf() const { return key & kSingle ? 1 : value; }
  };
  static constexpr std::uint32_t kSingle = 0x80000000u;
  static constexpr std::uint32_t kMaxTerms = kSingle - 1;
  static constexpr std::uint32_t kMulti = 0x80000000u;  // in Posting::value: an index in Runs::multi
  struct Doc {
    DocId id;
    std::size_t first;  // its first record in the log
    std::array<std::uint32_t, kFieldCount> length;
  };
  // One posting of a term's run, as group() sorts them: 8 bytes, since
  // there is one per posting of the batch.
  struct Posting {
    DocId doc;
    std::uint32_t value;  // the position if tf is 1, else kMulti | its index in Runs::multi
  };
  struct Multi {
    std::uint32_t tf;
    std::uint64_t pos;  // offset of its positions in the batch's buffer
  };
  // group()'s output (postings not value-initialised: they are written in full).
  struct Runs {
    BigArray<Posting> postings;
    std::vector<std::size_t> end;  // where each run ends
    std::vector<Multi> multi;      // postings with tf > 1, in log order
    std::uint32_t tf(const Posting& p) const { return p.value & kMulti ? multi[p.value & ~kMulti].tf : 1; }
  };

  // Starts a document. REQUIRES: ids ascend by one within a batch.
  void begin_document(DocId id);
  // Adds one field of the current document: its tokens in position order.
  // Limit if the batch would hold more than kMaxTerms terms.
  Status add_field(Field f, const std::vector<Token>& tokens);

  std::size_t documents() const { return docs_.size(); }
  const Doc& doc(std::size_t i) const { return docs_[i]; }
  // Records of document i are [doc(i).first, records_end(i)).
  std::size_t records_end(std::size_t i) const { return i + 1 < docs_.size() ? docs_[i + 1].first : log_.size(); }
  const Record& record(std::size_t r) const { return log_[r]; }
  std::size_t term_count() const { return terms_.size(); }
  const Term& term(std::uint32_t slot) const { return terms_[slot]; }
  // Length of field f of batch document `doc`.
  std::uint32_t length(DocId doc, Field f) const {
    return docs_[doc - docs_.front().id].length[static_cast<std::size_t>(f)];
  }

  // Slots in the order new terms receive ids: by first use, then by term
  // within one document field. Ids then do not depend on where batches end.
  std::vector<std::uint32_t> id_order() const;
  // Every posting of the batch grouped by slot: runs in the order of
  // `slots` (REQUIRES: each slot exactly once), each run by ascending doc;
  // end[k] is where the run of slots[k] ends.
  Runs group(const std::vector<std::uint32_t>& slots) const;
  // Appends a posting's positions (its tf varints) to `out`.
  void append_positions(std::string& out, const Runs& runs, const Posting& p) const;

  // Memory held, by allocation, plus what group() and the flush will add
  // (so the writer's batch bound covers the flush as well).
  std::size_t bytes() const;
  // Frees everything.
  void clear();

 private:
  std::uint32_t slot_for(Field f, std::string_view term, std::uint64_t hash, std::uint32_t unit);
  std::uint64_t skip_varints(std::uint64_t pos, std::uint32_t n) const;

  SlotTable slot_of_;
  ChunkedVector<Term, 12> terms_;
  ChunkedVector<Record, 18> log_;       // 2 MiB chunks (huge pages)
  ChunkedVector<char, 21> positions_;
  std::vector<Doc> docs_;
  std::size_t term_heap_ = 0;  // bytes of terms longer than the inline buffer
  std::size_t multi_ = 0;      // records with tf > 1
  std::uint32_t units_ = 0;
  // Scratch for one field, reused.
  std::vector<std::uint64_t> hashes_;
  std::vector<std::uint32_t> token_group_, group_slot_, group_end_, grouped_;
  std::string encoded_;
};

}  // namespace lode
