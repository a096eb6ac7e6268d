#include "index/cursor.h"

#include "index/codec.h"

namespace lode {
namespace {

class BlockCursor final : public PostingCursor {
 public:
  BlockCursor(sql::Db& db, TermId term) : db_(db), term_(term) {
    auto q = db.prepare(
        "SELECT first_doc, last_doc, n, max_tf, min_len, data, block_id FROM postings "
        "WHERE term_id = ? ORDER BY first_doc");
    if (!q) {
      status_ = q.status();
      return;
    }
    blocks_ = std::move(q.value());
    blocks_.bind(1, term_);
    advance_block(0);
  }

  bool valid() const override { return valid_; }
  DocId doc() const override { return block_.docs[i_]; }
  std::uint32_t tf() const override { return block_.tfs[i_]; }
  void next() override {
    if (++i_ < block_.docs.size()) return;
    advance_block(0);
  }
  void seek(DocId target) override {
    if (!valid_ || doc() >= target) return;
    if (target > last_doc_) {
      advance_block(target);
      if (!valid_) return;
    }
    while (i_ < block_.docs.size() && block_.docs[i_] < target) ++i_;
    if (i_ == block_.docs.size()) advance_block(target);
  }
  Result<std::vector<std::uint32_t>> positions() override;
  DocId block_last_doc() const override { return last_doc_; }
  std::uint32_t block_max_tf() const override { return max_tf_; }
  std::uint32_t block_min_length() const override { return min_len_; }
  Status status() const override { return status_; }

 private:
  // Steps to the next block whose last doc is >= target and decodes it.
  void advance_block(DocId target) {
    valid_ = false;
    if (!status_.ok()) return;
    while (blocks_.step()) {
      auto last = static_cast<DocId>(blocks_.i64(1));
      if (last < target) continue;
      first_doc_ = static_cast<DocId>(blocks_.i64(0));
      block_id_ = blocks_.i64(6);
      last_doc_ = last;
      auto n = static_cast<std::uint32_t>(blocks_.i64(2));
      max_tf_ = static_cast<std::uint32_t>(blocks_.i64(3));
      min_len_ = static_cast<std::uint32_t>(blocks_.i64(4));
      status_ = codec::decode_block(blocks_.blob(5), first_doc_, n, block_);
      if (!status_.ok()) return;
      if (block_.docs.back() != last_doc_) {
        status_ = Status::Corruption("postings block of term " + std::to_string(term_) +
                                     " at doc " + std::to_string(first_doc_) + ": last_doc mismatch");
        return;
      }
      positions_loaded_ = false;
      i_ = 0;
      while (block_.docs[i_] < target) ++i_;
      valid_ = true;
      return;
    }
    if (!blocks_.status().ok()) status_ = blocks_.status();
  }

  sql::Db& db_;
  TermId term_;
  sql::Stmt blocks_;
  codec::Block block_;
  std::size_t i_ = 0;
  DocId first_doc_ = 0, last_doc_ = 0;
  std::int64_t block_id_ = 0;
  std::uint32_t max_tf_ = 0, min_len_ = 0;
  bool valid_ = false;
  Status status_;
  bool positions_loaded_ = false;
  std::string pos_blob_;
  std::vector<std::uint32_t> pos_starts_;
};

Result<std::vector<std::uint32_t>> BlockCursor::positions() {
  if (!positions_loaded_) {
    auto q = db_.prepare("SELECT data FROM positions WHERE block_id = ?");
    if (!q) return q.status();
    q->bind(1, block_id_);
    if (!q->step()) {
      if (!q->status().ok()) return q->status();
      return Status::Corruption("positions missing for term " + std::to_string(term_) + " block " +
                                std::to_string(first_doc_));
    }
    pos_blob_ = std::string(q->blob(0));
    LODE_RETURN_IF_ERROR(codec::split_positions(pos_blob_, block_.tfs, pos_starts_));
    positions_loaded_ = true;
  }
  std::vector<std::uint32_t> out;
  LODE_RETURN_IF_ERROR(codec::decode_positions(pos_blob_, pos_starts_[i_], block_.tfs[i_], out));
  return out;
}

}  // namespace

std::unique_ptr<PostingCursor> make_block_cursor(sql::Db& db, TermId term) {
  return std::make_unique<BlockCursor>(db, term);
}

}  // namespace lode
