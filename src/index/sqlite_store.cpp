// The SQLite store: every statement the index runs against its file.
#include "index/sqlite_store.h"

#include <variant>

#include "index/lock.h"
#include "index/schema.h"
#include "index/sqlite.h"
#include "lode/names.h"

namespace lode::store {
namespace {

// A statement's steps, with the error of the walk returned and the
// statement reset whatever happens.
template <typename Row>
Status each_row(sql::Stmt& q, Row&& row) {
  Status s;
  while (s.ok() && q.step()) s = row();
  if (s.ok()) s = q.status();
  q.reset();
  return s;
}

PostingList::StoredSegment segment_from(const sql::Stmt& q) {
  return PostingList::StoredSegment{q.i64(0), static_cast<DocId>(q.i64(1)), static_cast<DocId>(q.i64(2)),
                                    static_cast<std::uint32_t>(q.i64(3)), std::string(q.blob(4)),
                                    std::string(q.blob(5))};
}

FileRecord file_from(const sql::Stmt& q) {
  return FileRecord{std::string(q.text(1)), std::string(q.text(2)), q.i64(3), q.i64(4),
                    std::string(q.text(5)), std::string(q.text(6))};
}

constexpr const char* kSegmentColumns = "seg_id, first_doc, last_doc, count, head, data";

class SqliteReader final : public ReadStore {
 public:
  static Result<std::unique_ptr<ReadStore>> open(const std::string& path) {
    auto db = schema::open_for_reading(path);
    if (!db) return db.status();
    auto r = std::unique_ptr<SqliteReader>(new SqliteReader(std::move(db).value()));
    auto have = schema::exists(r->db_);
    if (!have) return have.status();
    if (!*have) return Status::Corruption(path + ": not a lode index");
    auto settings = schema::load_settings(r->db_);
    if (!settings) return settings.status();
    r->settings_ = settings.value();
    LODE_RETURN_IF_ERROR(r->prepare_all());
    return std::unique_ptr<ReadStore>(std::move(r));
  }

  const std::string& location() const override { return db_.path(); }
  const IndexSettings& settings() const override { return settings_; }
  Status begin() override { return db_.exec("BEGIN"); }
  void end() override { (void)db_.exec("COMMIT"); }
  Result<Counters> counters() override { return schema::load_counters(db_); }
  std::uint64_t bytes_on_disk() override { return schema::bytes_on_disk(db_.path()); }

  Result<std::vector<std::optional<TermInfo>>> terms(std::span<const TermKey> keys) override {
    std::vector<std::optional<TermInfo>> out(keys.size());
    for (std::size_t i = 0; i < keys.size(); ++i) {
      q_term_.bind(1, static_cast<std::int64_t>(keys[i].field)).bind(2, keys[i].term);
      LODE_RETURN_IF_ERROR(each_row(q_term_, [&] {
        out[i] = TermInfo{q_term_.i64(0), keys[i].field, std::string(keys[i].term),
                          static_cast<std::uint64_t>(q_term_.i64(1)), static_cast<std::uint64_t>(q_term_.i64(2))};
        return Status();
      }));
    }
    return out;
  }

  Result<TermInfo> term_by_id(TermId id) override {
    q_term_by_id_.bind(1, id);
    auto row = sql::one_row(q_term_by_id_, "term id " + std::to_string(id));
    if (!row) return row.status();
    const auto f = q_term_by_id_.i64(0);
    if (f < 0 || f >= kFieldCount)
      return Status::Corruption("term " + std::to_string(id) + ": bad field " + std::to_string(f));
    return TermInfo{id, static_cast<Field>(f), std::string(q_term_by_id_.text(1)),
                    static_cast<std::uint64_t>(q_term_by_id_.i64(2)), static_cast<std::uint64_t>(q_term_by_id_.i64(3))};
  }

  Result<std::vector<std::vector<PostingList::StoredSegment>>> segments(std::span<const TermId> terms) override {
    std::vector<std::vector<PostingList::StoredSegment>> out(terms.size());
    for (std::size_t i = 0; i < terms.size(); ++i) {
      q_segments_.bind(1, terms[i]);
      LODE_RETURN_IF_ERROR(each_row(q_segments_, [&] {
        out[i].push_back(segment_from(q_segments_));
        return Status();
      }));
    }
    return out;
  }

  Result<std::string> positions(std::int64_t key) override {
    q_positions_.bind(1, key);
    auto row = sql::one_row(q_positions_, "positions of postings segment " + std::to_string(key));
    if (!row) return Status::Corruption(row.status().message());
    return std::string(q_positions_.blob(0));
  }

  Status norms(const std::function<Status(std::uint64_t, std::string_view)>& each) override {
    return each_row(q_norms_, [&] { return each(static_cast<std::uint64_t>(q_norms_.i64(0)), q_norms_.blob(1)); });
  }

  Result<DocumentInfo> document(DocId doc) override {
    auto& q = q_doc_;
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

  Result<std::optional<DocId>> find_external(std::string_view external_id) override {
    std::optional<DocId> out;
    q_external_.bind(1, external_id);
    LODE_RETURN_IF_ERROR(each_row(q_external_, [&] {
      out = static_cast<DocId>(q_external_.i64(0));
      return Status();
    }));
    return out;
  }

  Result<std::array<std::string, kFieldCount>> stored_text(DocId doc) override {
    q_text_.bind(1, std::int64_t{doc});
    auto row = sql::one_row(q_text_, "no stored text for document " + std::to_string(doc));
    if (!row) return row.status();
    return std::array<std::string, kFieldCount>{std::string(q_text_.blob(0)), std::string(q_text_.blob(1))};
  }

  Result<std::string> forward(DocId doc) override {
    q_fwd_.bind(1, std::int64_t{doc});
    auto row = sql::one_row(q_fwd_, "no forward index for document " + std::to_string(doc));
    if (!row) return row.status();
    return std::string(q_fwd_.blob(0));
  }

  Result<std::string> page_map(DocId doc) override {
    std::string out;
    q_pages_.bind(1, std::int64_t{doc});
    LODE_RETURN_IF_ERROR(each_row(q_pages_, [&] {
      out = std::string(q_pages_.blob(0));
      return Status();
    }));
    return out;
  }

  Result<std::vector<DocId>> filter(const DocFilter& f) override {
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
    auto q = db_.prepare(sql);
    if (!q) return q.status();
    for (std::size_t i = 0; i < binds.size(); ++i) {
      const int at = static_cast<int>(i + 1);
      if (auto* t = std::get_if<std::string>(&binds[i])) q->bind(at, std::string_view(*t));
      else q->bind(at, std::get<std::int64_t>(binds[i]));
    }
    std::vector<DocId> out;
    LODE_RETURN_IF_ERROR(each_row(*q, [&] {
      out.push_back(static_cast<DocId>(q->i64(0)));
      return Status();
    }));
    return out;
  }

  Result<std::vector<RecordedProblem>> problems() override { return schema::load_problems(db_); }

 private:
  explicit SqliteReader(sql::Db db) : db_(std::move(db)) {}
  Status prepare_all() {
    return db_.prepare_all({
        {&q_term_, "SELECT term_id, df, cf FROM terms WHERE field = ? AND term = ?"},
        {&q_term_by_id_, "SELECT field, term, df, cf FROM terms WHERE term_id = ?"},
        {&q_doc_, "SELECT d.external_id, d.title, d.kind, coalesce(f.path, ''), d.len_title, d.len_body, d.live, "
                  "coalesce(m.author, ''), coalesce(m.date, 0), coalesce(m.pages, 0), coalesce(f.size, 0) "
                  "FROM docs d LEFT JOIN files f ON f.file_id = d.file_id "
                  "LEFT JOIN doc_meta m ON m.doc_id = d.doc_id WHERE d.doc_id = ?"},
        {&q_pages_, "SELECT page_map FROM doc_meta WHERE doc_id = ?"},
        {&q_external_, "SELECT doc_id FROM docs WHERE external_id = ? AND live = 1 ORDER BY doc_id LIMIT 1"},
        {&q_text_, "SELECT title, body FROM doc_text WHERE doc_id = ?"},
        {&q_fwd_, "SELECT data FROM doc_terms WHERE doc_id = ?"},
        {&q_norms_, "SELECT chunk, data FROM norms ORDER BY chunk"},
        {&q_segments_, "SELECT seg_id, first_doc, last_doc, count, head, data FROM postings WHERE term_id = ? "
                       "ORDER BY first_doc"},
        {&q_positions_, "SELECT data FROM positions WHERE seg_id = ?"},
    });
  }

  sql::Db db_;
  IndexSettings settings_;
  sql::Stmt q_term_, q_term_by_id_, q_doc_, q_external_, q_text_, q_fwd_, q_norms_, q_pages_, q_segments_,
      q_positions_;
};

class SqliteWriter final : public WriteStore {
 public:
  static Result<std::unique_ptr<WriteStore>> open(const std::string& path,
                                                  const std::optional<IndexSettings>& settings) {
    auto lock = WriterLock::acquire(path);
    if (!lock) return lock.status();
    auto db = sql::Db::open(path, SQLITE_OPEN_READWRITE | SQLITE_OPEN_CREATE);
    if (!db) return db.status();
    auto w = std::unique_ptr<SqliteWriter>(new SqliteWriter(std::move(lock).value(), std::move(db).value()));
    sql::Db& d = w->db_;
    auto have = schema::exists(d);
    if (!have) return have.status();
    if (!*have) {
      LODE_RETURN_IF_ERROR(d.exec("PRAGMA page_size=8192"));
      LODE_RETURN_IF_ERROR(schema::configure(d, true));
      LODE_RETURN_IF_ERROR(d.exec("BEGIN IMMEDIATE"));
      LODE_RETURN_IF_ERROR(schema::create(d, settings.value_or(IndexSettings{})));
      LODE_RETURN_IF_ERROR(d.exec("COMMIT"));
    } else {
      LODE_RETURN_IF_ERROR(schema::configure(d, true));
    }
    auto recorded = schema::load_settings(d);
    if (!recorded) return recorded.status();
    w->settings_ = recorded.value();
    auto counters = schema::load_counters(d);
    if (!counters) return counters.status();
    w->committed_ = counters.value();
    LODE_RETURN_IF_ERROR(w->prepare_all());
    return std::unique_ptr<WriteStore>(std::move(w));
  }

  ~SqliteWriter() override {
    if (in_txn_) rollback();
  }

  const std::string& location() const override { return db_.path(); }
  const IndexSettings& settings() const override { return settings_; }
  const Counters& committed() const override { return committed_; }
  std::uint64_t bytes_on_disk() override { return schema::bytes_on_disk(db_.path()); }

  Status begin() override {
    if (in_txn_) return Status();
    LODE_RETURN_IF_ERROR(db_.exec("BEGIN IMMEDIATE"));
    in_txn_ = true;
    return Status();
  }
  Status commit(const Counters& counters) override {
    LODE_RETURN_IF_ERROR(schema::store_counters(db_, counters));
    LODE_RETURN_IF_ERROR(db_.exec("COMMIT"));
    in_txn_ = false;
    committed_ = counters;
    return Status();
  }
  void rollback() override {
    (void)db_.exec("ROLLBACK");
    in_txn_ = false;
  }

  Result<std::int64_t> file_id(const std::string& path) override {
    std::int64_t id = 0;
    q_file_.bind(1, path);
    LODE_RETURN_IF_ERROR(each_row(q_file_, [&] {
      id = q_file_.i64(0);
      return Status();
    }));
    return id;
  }
  Result<std::optional<FileRecord>> file(const std::string& path) override {
    std::optional<FileRecord> out;
    q_file_.bind(1, path);
    LODE_RETURN_IF_ERROR(each_row(q_file_, [&] {
      out = file_from(q_file_);
      return Status();
    }));
    return out;
  }
  Result<std::vector<FileRecord>> files_with_prefix(const std::string& prefix) override {
    auto q = db_.prepare(
        "SELECT file_id, path, root, size, mtime_ns, hash, kind FROM files "
        "WHERE substr(path, 1, length(?1)) = ?1 ORDER BY path");
    if (!q) return q.status();
    q->bind(1, prefix);
    std::vector<FileRecord> out;
    LODE_RETURN_IF_ERROR(each_row(*q, [&] {
      out.push_back(file_from(*q));
      return Status();
    }));
    return out;
  }
  Result<std::int64_t> insert_file(const FileRecord& f) override {
    LODE_RETURN_IF_ERROR(q_insert_file_.bind(1, f.path).bind(2, f.root).bind(3, f.size).bind(4, f.mtime_ns)
                             .bind(5, f.hash).bind(6, f.kind).run());
    return db_.last_insert_rowid();
  }
  Status update_file(std::int64_t id, const FileRecord& f) override {
    return q_update_file_.bind(1, f.root).bind(2, f.size).bind(3, f.mtime_ns).bind(4, f.hash).bind(5, f.kind)
        .bind(6, id).run();
  }
  Status touch_file(const FileRecord& f) override {
    auto q = db_.prepare("UPDATE files SET root=?, size=?, mtime_ns=? WHERE path=?");
    if (!q) return q.status();
    LODE_RETURN_IF_ERROR(q->bind(1, f.root).bind(2, f.size).bind(3, f.mtime_ns).bind(4, f.path).run());
    if (sqlite3_changes(db_.raw()) == 0) return Status::NotFound(f.path + ": not in the index");
    return Status();
  }
  Status delete_file(std::int64_t id) override { return q_delete_file_.bind(1, id).run(); }
  Status rename_file(const std::string& old_path, const FileRecord& f, const std::string& old_id,
                     const std::string& new_id) override {
    auto q = db_.prepare("UPDATE files SET path=?, root=?, size=?, mtime_ns=? WHERE path=? RETURNING file_id");
    if (!q) return q.status();
    q->bind(1, f.path).bind(2, f.root).bind(3, f.size).bind(4, f.mtime_ns).bind(5, old_path);
    if (!q->step()) return q->status().ok() ? Status::NotFound(old_path + ": not in the index") : q->status();
    const std::int64_t id = q->i64(0);
    while (q->step()) {
    }
    LODE_RETURN_IF_ERROR(q->status());
    auto ids = db_.prepare(
        "UPDATE docs SET external_id = ?1 || substr(external_id, length(?2) + 1) "
        "WHERE file_id = ?3 AND live = 1 AND (external_id = ?2 OR substr(external_id, 1, length(?2) + 1) = ?2 || '#')");
    if (!ids) return ids.status();
    return ids->bind(1, new_id).bind(2, old_id).bind(3, id).run();
  }

  Result<std::vector<LiveDocument>> live_documents(std::int64_t file_id) override {
    std::vector<LiveDocument> out;
    q_docs_of_file_.bind(1, file_id);
    LODE_RETURN_IF_ERROR(each_row(q_docs_of_file_, [&] {
      out.push_back({static_cast<DocId>(q_docs_of_file_.i64(0)),
                     {static_cast<std::uint32_t>(q_docs_of_file_.i64(1)),
                      static_cast<std::uint32_t>(q_docs_of_file_.i64(2))}});
      return Status();
    }));
    return out;
  }
  Status put_documents(std::span<const DocumentRow> docs) override {
    for (const DocumentRow& d : docs) {
      LODE_RETURN_IF_ERROR(q_put_meta_.bind(1, std::int64_t{d.id}).bind(2, d.author).bind(3, d.date)
                               .bind(4, std::int64_t{d.pages}).bind_blob(5, d.page_map).run());
      LODE_RETURN_IF_ERROR(q_insert_doc_.bind(1, std::int64_t{d.id}).bind(2, d.file_id).bind(3, d.external_id)
                               .bind(4, d.title).bind(5, d.kind).bind(6, std::int64_t{d.length[0]})
                               .bind(7, std::int64_t{d.length[1]}).run());
      LODE_RETURN_IF_ERROR(
          q_insert_text_.bind(1, std::int64_t{d.id}).bind_blob(2, d.title_blob).bind_blob(3, d.body_blob).run());
    }
    return Status();
  }
  Status kill_documents(std::span<const DocId> docs) override {
    for (DocId d : docs) {
      LODE_RETURN_IF_ERROR(q_kill_doc_.bind(1, std::int64_t{d}).run());
      LODE_RETURN_IF_ERROR(q_delete_text_.bind(1, std::int64_t{d}).run());
      LODE_RETURN_IF_ERROR(q_delete_fwd_.bind(1, std::int64_t{d}).run());
      LODE_RETURN_IF_ERROR(q_delete_meta_.bind(1, std::int64_t{d}).run());
    }
    return Status();
  }
  Result<std::vector<std::string>> forward(std::span<const DocId> docs) override {
    std::vector<std::string> out(docs.size());
    for (std::size_t i = 0; i < docs.size(); ++i) {
      q_get_fwd_.bind(1, std::int64_t{docs[i]});
      LODE_RETURN_IF_ERROR(each_row(q_get_fwd_, [&] {
        out[i] = std::string(q_get_fwd_.blob(0));
        return Status();
      }));
    }
    return out;
  }
  Status put_forward(std::span<const std::pair<DocId, std::string>> lists) override {
    for (const auto& [doc, blob] : lists)
      LODE_RETURN_IF_ERROR(q_put_fwd_.bind(1, std::int64_t{doc}).bind_blob(2, blob).run());
    return Status();
  }

  Result<TermId> max_term_id() override {
    auto row = sql::one_row(q_max_term_, "the largest term id");
    if (!row) return row.status();
    return q_max_term_.i64(0);
  }
  Result<std::vector<std::optional<std::pair<TermId, std::int64_t>>>> find_terms(
      std::span<const TermKey> keys) override {
    std::vector<std::optional<std::pair<TermId, std::int64_t>>> out(keys.size());
    for (std::size_t i = 0; i < keys.size(); ++i) {
      q_find_term_.bind(1, static_cast<std::int64_t>(keys[i].field)).bind(2, keys[i].term);
      LODE_RETURN_IF_ERROR(each_row(q_find_term_, [&] {
        out[i].emplace(q_find_term_.i64(0), q_find_term_.i64(1));
        return Status();
      }));
    }
    return out;
  }
  Result<std::vector<TermId>> add_terms(std::span<const TermKey> keys,
                                        std::span<const std::pair<std::int64_t, std::int64_t>> df_cf) override {
    std::vector<TermId> out(keys.size());
    for (std::size_t i = 0; i < keys.size(); ++i) {
      LODE_RETURN_IF_ERROR(q_add_term_.bind(1, static_cast<std::int64_t>(keys[i].field)).bind(2, keys[i].term)
                               .bind(3, df_cf[i].first).bind(4, df_cf[i].second).run());
      out[i] = db_.last_insert_rowid();
    }
    return out;
  }
  Result<std::vector<std::int64_t>> adjust_terms(std::span<const TermDelta> deltas) override {
    std::vector<std::int64_t> out(deltas.size());
    for (std::size_t i = 0; i < deltas.size(); ++i) {
      const TermDelta& d = deltas[i];
      LODE_RETURN_IF_ERROR(q_update_term_.bind(1, d.df).bind(2, d.cf).bind(3, d.id).run());
      q_term_df_.bind(1, d.id);
      auto row = sql::one_row(q_term_df_, "term " + std::to_string(d.id));
      if (row.status().code() == Code::kNotFound)
        return Status::Corruption("forward index names missing term " + std::to_string(d.id));
      if (!row) return row.status();
      out[i] = q_term_df_.i64(0);
    }
    return out;
  }

  Result<std::optional<SegmentRows>> last_segment(TermId term) override {
    std::optional<SegmentRows> out;
    q_last_segment_.bind(1, term);
    LODE_RETURN_IF_ERROR(each_row(q_last_segment_, [&] {
      out.emplace(SegmentRows{segment_from(q_last_segment_), {}});
      return Status();
    }));
    if (!out) return out;
    q_get_positions_.bind(1, out->segment.key);
    LODE_RETURN_IF_ERROR(each_row(q_get_positions_, [&] {
      out->positions = std::string(q_get_positions_.blob(0));
      return Status();
    }));
    return out;
  }
  Status drop_segment(std::int64_t key) override {
    LODE_RETURN_IF_ERROR(q_drop_segment_.bind(1, key).run());
    return q_drop_positions_.bind(1, key).run();
  }
  Status put_segment(TermId term, DocId first_doc, DocId last_doc, std::uint32_t count, std::string_view head,
                     std::string_view data, std::string_view positions) override {
    LODE_RETURN_IF_ERROR(q_put_segment_.bind(1, term).bind(2, std::int64_t{first_doc}).bind(3, std::int64_t{last_doc})
                             .bind(4, std::int64_t{count}).bind_blob(5, head).bind_blob(6, data).run());
    return q_put_positions_.bind(1, db_.last_insert_rowid()).bind_blob(2, positions).run();
  }

  Result<std::string> norms_chunk(std::uint32_t chunk) override {
    std::string out;
    q_get_norms_.bind(1, std::int64_t{chunk});
    LODE_RETURN_IF_ERROR(each_row(q_get_norms_, [&] {
      out = std::string(q_get_norms_.blob(0));
      return Status();
    }));
    return out;
  }
  Status put_norms_chunk(std::uint32_t chunk, std::string_view bytes) override {
    return q_put_norms_.bind(1, std::int64_t{chunk}).bind_blob(2, bytes).run();
  }

  Status replace_problems(const std::string& path, std::span<const RecordedProblem> problems) override {
    auto del = db_.prepare("DELETE FROM problems WHERE path = ?");
    if (!del) return del.status();
    LODE_RETURN_IF_ERROR(del->bind(1, path).run());
    auto ins = db_.prepare("INSERT INTO problems(path, error, message, time_ns) VALUES(?,?,?,?)");
    if (!ins) return ins.status();
    for (const auto& p : problems)
      LODE_RETURN_IF_ERROR(ins->bind(1, path).bind(2, std::int64_t{p.error ? 1 : 0}).bind(3, p.message)
                               .bind(4, p.time_ns).run());
    return Status();
  }
  Result<std::vector<RecordedProblem>> problems() override { return schema::load_problems(db_); }

 private:
  SqliteWriter(WriterLock lock, sql::Db db) : lock_(std::move(lock)), db_(std::move(db)) {}
  Status prepare_all() {
    return db_.prepare_all({
        {&q_file_, "SELECT file_id, path, root, size, mtime_ns, hash, kind FROM files WHERE path = ?"},
        {&q_insert_file_, "INSERT INTO files(path, root, size, mtime_ns, hash, kind) VALUES(?,?,?,?,?,?)"},
        {&q_update_file_, "UPDATE files SET root=?, size=?, mtime_ns=?, hash=?, kind=? WHERE file_id=?"},
        {&q_delete_file_, "DELETE FROM files WHERE file_id = ?"},
        {&q_docs_of_file_, "SELECT doc_id, len_title, len_body FROM docs WHERE file_id = ? AND live = 1"},
        {&q_insert_doc_, "INSERT INTO docs(doc_id, file_id, external_id, title, kind, len_title, len_body, live) VALUES(?,?,?,?,?,?,?,1)"},
        {&q_insert_text_, "INSERT INTO doc_text(doc_id, title, body) VALUES(?,?,?)"},
        {&q_kill_doc_, "UPDATE docs SET live = 0 WHERE doc_id = ?"},
        {&q_delete_text_, "DELETE FROM doc_text WHERE doc_id = ?"},
        {&q_delete_fwd_, "DELETE FROM doc_terms WHERE doc_id = ?"},
        {&q_get_fwd_, "SELECT data FROM doc_terms WHERE doc_id = ?"},
        // Plain statements, not an upsert with RETURNING: SQLite gathers
        // RETURNING rows in a temporary table, opened and closed per call,
        // which cost more than the lookup itself.
        {&q_find_term_, "SELECT term_id, df FROM terms WHERE field = ? AND term = ?"},
        {&q_add_term_, "INSERT INTO terms(field, term, df, cf) VALUES(?, ?, ?, ?)"},
        {&q_term_df_, "SELECT df FROM terms WHERE term_id = ?"},
        {&q_max_term_, "SELECT coalesce(max(term_id), 0) FROM terms"},
        {&q_update_term_, "UPDATE terms SET df = df + ?, cf = cf + ? WHERE term_id = ?"},
        {&q_last_segment_, "SELECT seg_id, first_doc, last_doc, count, head, data FROM postings WHERE term_id = ? ORDER BY first_doc DESC LIMIT 1"},
        {&q_get_positions_, "SELECT data FROM positions WHERE seg_id = ?"},
        {&q_drop_segment_, "DELETE FROM postings WHERE seg_id = ?"},
        {&q_drop_positions_, "DELETE FROM positions WHERE seg_id = ?"},
        {&q_put_segment_, "INSERT INTO postings(term_id, first_doc, last_doc, count, head, data) VALUES(?,?,?,?,?,?)"},
        {&q_put_positions_, "INSERT INTO positions(seg_id, data) VALUES(?,?)"},
        {&q_put_fwd_, "INSERT INTO doc_terms(doc_id, data) VALUES(?, ?)"},
        {&q_get_norms_, "SELECT data FROM norms WHERE chunk = ?"},
        {&q_put_norms_, "INSERT OR REPLACE INTO norms(chunk, data) VALUES(?, ?)"},
        {&q_put_meta_, "INSERT OR REPLACE INTO doc_meta(doc_id, author, date, pages, page_map) VALUES(?,?,?,?,?)"},
        {&q_delete_meta_, "DELETE FROM doc_meta WHERE doc_id = ?"},
    });
  }

  WriterLock lock_;  // first in, last out: held while the connection lives
  sql::Db db_;
  IndexSettings settings_;
  Counters committed_;
  bool in_txn_ = false;
  sql::Stmt q_file_, q_insert_file_, q_update_file_, q_delete_file_, q_docs_of_file_;
  sql::Stmt q_insert_doc_, q_insert_text_, q_kill_doc_, q_delete_text_, q_delete_fwd_, q_get_fwd_;
  sql::Stmt q_find_term_, q_add_term_, q_term_df_, q_max_term_, q_update_term_, q_last_segment_, q_get_positions_;
  sql::Stmt q_drop_segment_, q_drop_positions_, q_put_segment_, q_put_positions_, q_put_fwd_, q_get_norms_,
      q_put_norms_;
  sql::Stmt q_put_meta_, q_delete_meta_;
};

}  // namespace

Result<std::unique_ptr<ReadStore>> open_sqlite_reader(const std::string& path) { return SqliteReader::open(path); }

Result<std::unique_ptr<WriteStore>> open_sqlite_writer(const std::string& path,
                                                       const std::optional<IndexSettings>& settings) {
  return SqliteWriter::open(path, settings);
}

}  // namespace lode::store
