// verify_index(): every table of an index read once, in one snapshot, against
// SQLite's page checks and lode's invariants (lode/verify.h). Decoding goes
// through the readers' own decoders (PostingList, PostingCursor, codec::).
#include "lode/verify.h"

#include <algorithm>
#include <filesystem>
#include <unordered_map>
#include <unordered_set>

#include "index/codec.h"
#include "index/schema.h"
#include "index/sqlite.h"
#include "lode/postings.h"

namespace lode {
namespace {

std::string num(std::uint64_t v) { return std::to_string(v); }

class Check final : public PositionSource {
 public:
  Check(sql::Db& db, const VerifyOptions& o, VerifyReport& r) : db_(db), options_(o), report_(r) {}

  void run() {
    sqlite_pages();
    if (!meta()) return;
    files();
    norms();
    documents();
    terms();
    postings();
    forward();
    stored();
    orphans();
  }

  Result<std::string> segment_positions(std::int64_t key) override {
    if (key == pos_key_) return pos_;
    q_positions_.bind(1, key);
    auto row = sql::one_row(q_positions_, "positions of postings segment " + std::to_string(key));
    if (!row) return Status::Corruption(row.status().message());
    pos_ = std::string(q_positions_.blob(0));
    pos_key_ = key;
    return pos_;
  }

 private:
  struct Term {
    int field = 0;
    std::string text;
    std::uint64_t df = 0, cf = 0;          // as stored
    std::uint64_t fwd_df = 0, fwd_cf = 0;  // as the forward index of live documents says
  };

  void found(std::string what) {
    if (report_.findings.size() < options_.max_findings) report_.findings.push_back(std::move(what));
    else ++report_.unlisted;
  }

  // Steps `sql`, calling row() per row; a table that cannot be read is a finding.
  template <typename F>
  void scan(const char* table, const char* sql, F&& row) {
    auto q = db_.prepare(sql);
    if (!q) return found(std::string(table) + ": cannot be read: " + q.status().message());
    while (q->step()) row(*q);
    if (!q->status().ok()) found(std::string(table) + ": cannot be read: " + q->status().message());
  }

  void expect(const char* counter, std::uint64_t stored, std::uint64_t counted, const char* what) {
    if (stored != counted)
      found("meta: counter '" + std::string(counter) + "' is " + num(stored) + " but " + what + " " + num(counted));
  }

  bool live(DocId d) const { return d < limit_ && norm_live_[d]; }
  std::string term_name(TermId id, const Term& t) const {
    return "term " + std::to_string(id) + " (" + std::string(field_name(static_cast<Field>(t.field))) + " '" +
           t.text + "')";
  }

  void sqlite_pages() {
    scan("SQLite", "PRAGMA integrity_check(100)", [&](sql::Stmt& q) {
      if (q.text(0) != "ok") found("SQLite: " + std::string(q.text(0)));
    });
  }

  bool meta() {
    auto settings = schema::load_settings(db_);
    if (!settings) {
      found("meta: " + settings.status().message());
      return false;
    }
    auto counters = schema::load_counters(db_);
    if (!counters) {
      found("meta: " + counters.status().message());
      return false;
    }
    counters_ = *counters;
    if (counters_.next_doc_id == 0 || counters_.next_doc_id > 0xffffffffu) {
      found("meta: next_doc_id " + num(counters_.next_doc_id) + " is out of range");
      return false;
    }
    limit_ = static_cast<DocId>(counters_.next_doc_id);
    auto q = db_.prepare("SELECT data FROM positions WHERE seg_id = ?");
    if (!q) {
      found("positions: cannot be read: " + q.status().message());
      return false;
    }
    q_positions_ = std::move(q).value();
    return true;
  }

  void files() {
    std::uint64_t n = 0;
    scan("files", "SELECT file_id FROM files", [&](sql::Stmt& q) {
      file_ids_.insert(q.i64(0));
      ++n;
    });
    expect("files", counters_.files, n, "the files table holds");
  }

  void norms() {
    norm_live_.assign(limit_, 0);
    for (auto& l : norm_len_) l.assign(limit_, 0);
    scan("norms", "SELECT chunk, data FROM norms ORDER BY chunk", [&](sql::Stmt& q) {
      const std::int64_t chunk = q.i64(0);
      const std::string_view data = q.blob(1);
      if (chunk < 0 || data.size() != codec::kNormsPerChunk * codec::kNormEntryBytes)
        return found("norms: chunk " + std::to_string(chunk) + " is " + num(data.size()) + " bytes, not " +
                     num(codec::kNormsPerChunk * codec::kNormEntryBytes));
      for (std::uint32_t slot = 0; slot < codec::kNormsPerChunk; ++slot) {
        const std::uint64_t d = static_cast<std::uint64_t>(chunk) * codec::kNormsPerChunk + slot;
        const codec::NormEntry e = codec::get_norm(data, slot);
        if (d >= limit_) {
          if (e.live) found("norms: document " + num(d) + " is live but was never assigned");
          continue;
        }
        norm_live_[d] = e.live;
        for (std::size_t f = 0; f < kFieldCount; ++f) norm_len_[f][d] = e.length[f];
      }
    });
  }

  void documents() {
    std::uint64_t live_docs = 0, dead = 0;
    std::array<std::uint64_t, kFieldCount> length{};
    std::vector<std::uint8_t> seen(limit_, 0);
    scan("docs", "SELECT doc_id, file_id, len_title, len_body, live FROM docs", [&](sql::Stmt& q) {
      ++report_.documents;
      const std::int64_t id = q.i64(0);
      const std::string doc = "docs: document " + std::to_string(id);
      if (id <= 0 || static_cast<std::uint64_t>(id) >= limit_) return found(doc + " was never assigned");
      const auto d = static_cast<DocId>(id);
      seen[d] = 1;
      const bool is_live = q.i64(4) == 1;
      if (is_live != live(d)) return found(doc + (is_live ? " is live but its norms say not" : " is dead but its norms say live"));
      const std::array<std::int64_t, kFieldCount> len = {q.i64(2), q.i64(3)};
      for (std::size_t f = 0; f < kFieldCount; ++f)
        if (len[f] != std::int64_t{norm_len_[f][d]})
          found(doc + ": " + std::string(field_name(static_cast<Field>(f))) + " length " + std::to_string(len[f]) +
                " but its norms say " + num(norm_len_[f][d]));
      if (!is_live) return (void)++dead;
      ++live_docs;
      for (std::size_t f = 0; f < kFieldCount; ++f) length[f] += norm_len_[f][d];
      if (!file_ids_.count(q.i64(1))) found(doc + " is live but its file " + std::to_string(q.i64(1)) + " is missing");
    });
    for (DocId d = 1; d < limit_; ++d)
      if (live(d) && !seen[d]) found("norms: document " + num(d) + " is live but has no docs row");
    expect("documents", counters_.documents, live_docs, "the docs table holds live");
    expect("dead_documents", counters_.dead_documents, dead, "the docs table holds dead");
    expect("length_title", counters_.total_length[0], length[0], "live title lengths add up to");
    expect("length_body", counters_.total_length[1], length[1], "live body lengths add up to");
  }

  void terms() {
    std::uint64_t with_df = 0, df_sum = 0;
    scan("terms", "SELECT term_id, field, term, df, cf FROM terms", [&](sql::Stmt& q) {
      ++report_.terms;
      const TermId id = q.i64(0);
      const std::int64_t field = q.i64(1), df = q.i64(3), cf = q.i64(4);
      if (field < 0 || field >= kFieldCount) return found("terms: term " + std::to_string(id) + " has field " + std::to_string(field));
      if (df < 0 || cf < df)  // noted, and checked on against its postings
        found("terms: term " + std::to_string(id) + " has df " + std::to_string(df) + ", cf " + std::to_string(cf));
      terms_.emplace(id, Term{static_cast<int>(field), std::string(q.text(2)), static_cast<std::uint64_t>(std::max<std::int64_t>(df, 0)),
                              static_cast<std::uint64_t>(std::max<std::int64_t>(cf, 0))});
      with_df += df > 0;
      df_sum += static_cast<std::uint64_t>(std::max<std::int64_t>(df, 0));
    });
    expect("terms", counters_.terms, with_df, "terms with df > 0 number");
    expect("postings", counters_.postings, df_sum, "the terms' df add up to");
  }

  // Decodes every segment, block and position of `id` as a query would,
  // counting its postings in live documents.
  void postings_of(TermId id, const Term& t, sql::Stmt& q) {
    const std::string name = term_name(id, t);
    std::vector<PostingList::StoredSegment> segs;
    q.bind(1, id);
    while (q.step())
      segs.push_back(PostingList::StoredSegment{q.i64(0), static_cast<DocId>(q.i64(1)), static_cast<DocId>(q.i64(2)),
                                                static_cast<std::uint32_t>(q.i64(3)), std::string(q.blob(4)),
                                                std::string(q.blob(5))});
    Status s = q.status();
    q.reset();
    if (!s.ok()) return found(name + ": postings cannot be read: " + s.message());
    report_.segments += segs.size();
    auto list = PostingList::build(std::move(segs), name);
    if (!list) return found(list.status().message());
    std::vector<std::uint64_t> pos_bytes((*list)->segments().size(), 0);
    for (const auto& b : (*list)->blocks()) pos_bytes[b.segment] += b.pos_bytes;
    for (std::size_t i = 0; i < pos_bytes.size(); ++i) {
      auto blob = segment_positions((*list)->segments()[i].key);
      if (!blob) return found(name + ": " + blob.status().message());
      if (blob->size() != pos_bytes[i])
        return found(name + ": positions of segment " + std::to_string((*list)->segments()[i].key) + " are " +
                     num(blob->size()) + " bytes, its blocks say " + num(pos_bytes[i]));
    }
    std::uint64_t df = 0, cf = 0;
    PostingCursor c(*list, this);
    for (; c.valid(); c.next()) {
      ++report_.postings;
      const DocId d = c.doc();
      if (d >= limit_) return found(name + ": posting for document " + num(d) + ", never assigned");
      auto pos = c.positions();
      if (!pos) return found(name + ": document " + num(d) + ": " + pos.status().message());
      if (!live(d)) continue;
      ++df;
      cf += c.tf();
      if (c.tf() > norm_len_[static_cast<std::size_t>(t.field)][d])
        return found(name + ": tf " + num(c.tf()) + " in document " + num(d) + " exceeds its field length " +
                     num(norm_len_[static_cast<std::size_t>(t.field)][d]));
    }
    if (!c.status().ok()) return found(c.status().message());
    if (df != t.df || cf != t.cf)
      found(name + ": stored df " + num(t.df) + ", cf " + num(t.cf) + " but live postings give df " + num(df) +
            ", cf " + num(cf));
  }

  void postings() {
    auto q = db_.prepare("SELECT seg_id, first_doc, last_doc, count, head, data FROM postings WHERE term_id = ? "
                         "ORDER BY first_doc");
    if (!q) return found("postings: cannot be read: " + q.status().message());
    for (const auto& [id, t] : terms_) postings_of(id, t, *q);
  }

  void forward() {
    std::vector<std::uint8_t> has(limit_, 0);
    scan("doc_terms", "SELECT doc_id, data FROM doc_terms", [&](sql::Stmt& q) {
      const std::int64_t id = q.i64(0);
      const std::string doc = "doc_terms: document " + std::to_string(id);
      if (id <= 0 || !live(static_cast<DocId>(id))) return found(doc + " is not live");
      const auto d = static_cast<DocId>(id);
      has[d] = 1;
      std::vector<codec::ForwardList> lists;
      if (Status s = codec::decode_forward(q.blob(1), lists); !s.ok()) return found(doc + ": " + s.message());
      for (std::size_t f = 0; f < kFieldCount; ++f) {
        std::uint64_t sum = 0;
        for (const auto& [term, tf] : lists[f]) {
          auto it = terms_.find(term);
          if (it == terms_.end() || it->second.field != static_cast<int>(f))
            return found(doc + " names " + std::string(field_name(static_cast<Field>(f))) + " term " +
                         std::to_string(term) + ", which the terms table does not hold");
          ++it->second.fwd_df;
          it->second.fwd_cf += tf;
          sum += tf;
        }
        if (sum != norm_len_[f][d])
          found(doc + ": " + std::string(field_name(static_cast<Field>(f))) + " tfs add up to " + num(sum) +
                ", its length is " + num(norm_len_[f][d]));
      }
    });
    for (DocId d = 1; d < limit_; ++d)
      if (live(d) && !has[d]) found("doc_terms: live document " + num(d) + " has no forward index");
    for (const auto& [id, t] : terms_)
      if (t.fwd_df != t.df || t.fwd_cf != t.cf)
        found(term_name(id, t) + ": stored df " + num(t.df) + ", cf " + num(t.cf) +
              " but the forward index gives df " + num(t.fwd_df) + ", cf " + num(t.fwd_cf));
  }

  void stored() {
    std::vector<std::uint8_t> text(limit_, 0), meta(limit_, 0);
    scan("doc_text", "SELECT doc_id, title, body FROM doc_text", [&](sql::Stmt& q) {
      const std::int64_t id = q.i64(0);
      const std::string doc = "doc_text: document " + std::to_string(id);
      if (id <= 0 || !live(static_cast<DocId>(id))) return found(doc + " is not live");
      text[static_cast<DocId>(id)] = 1;
      for (int col : {1, 2})
        if (auto t = codec::decompress_text(q.blob(col)); !t)
          found(doc + (col == 1 ? ": title: " : ": body: ") + t.status().message());
    });
    scan("doc_meta", "SELECT doc_id, page_map FROM doc_meta", [&](sql::Stmt& q) {
      const std::int64_t id = q.i64(0);
      const std::string doc = "doc_meta: document " + std::to_string(id);
      if (id <= 0 || !live(static_cast<DocId>(id))) return found(doc + " is not live");
      meta[static_cast<DocId>(id)] = 1;
      std::vector<PageStart> pages;
      if (Status s = codec::decode_page_map(q.blob(1), pages); !s.ok()) found(doc + ": " + s.message());
    });
    for (DocId d = 1; d < limit_; ++d) {
      if (live(d) && !text[d]) found("doc_text: live document " + num(d) + " has no stored text");
      if (live(d) && !meta[d]) found("doc_meta: live document " + num(d) + " has no metadata row");
    }
  }

  void orphans() {
    scan("postings", "SELECT seg_id, term_id FROM postings WHERE term_id NOT IN (SELECT term_id FROM terms)",
         [&](sql::Stmt& q) {
           found("postings: segment " + std::to_string(q.i64(0)) + " belongs to term " + std::to_string(q.i64(1)) +
                 ", which the terms table does not hold");
         });
    scan("positions", "SELECT seg_id FROM positions WHERE seg_id NOT IN (SELECT seg_id FROM postings)",
         [&](sql::Stmt& q) { found("positions: row " + std::to_string(q.i64(0)) + " belongs to no postings segment"); });
  }

  sql::Db& db_;
  const VerifyOptions& options_;
  VerifyReport& report_;
  schema::Counters counters_;
  DocId limit_ = 0;
  std::unordered_set<std::int64_t> file_ids_;
  std::vector<std::uint8_t> norm_live_;
  std::array<std::vector<std::uint32_t>, kFieldCount> norm_len_;
  std::unordered_map<TermId, Term> terms_;
  sql::Stmt q_positions_;
  std::int64_t pos_key_ = -1;
  std::string pos_;
};

}  // namespace

Result<VerifyReport> verify_index(const std::string& path, const VerifyOptions& options) {
  VerifyReport report;
  auto db = schema::open_for_reading(path);
  if (!db && db.status().code() == Code::kCorruption) {  // not a database, or its first pages damaged
    report.findings.push_back("SQLite: " + db.status().message());
    return report;
  }
  if (!db) return db.status();
  // One read transaction: every table is seen as of one commit.
  if (Status s = db->exec("BEGIN"); !s.ok()) {
    report.findings.push_back("SQLite: " + s.message());
    return report;
  }
  Check(*db, options, report).run();
  (void)db->exec("COMMIT");  // a read transaction: ending it cannot lose anything
  return report;
}

}  // namespace lode
