// IndexReader: snapshot reads over the SQLite index.
#include <filesystem>
#include <unordered_map>
#include <variant>

#include "index/codec.h"
#include "index/cursor.h"
#include "index/schema.h"
#include "index/sqlite.h"
#include "lode/index.h"

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

struct IndexReader::Impl {
  sql::Db db;
  IndexSettings settings;
  schema::Counters counters;
  bool in_scope = false;
  std::int64_t data_version = -1;
  std::unordered_map<std::uint32_t, std::string> norms;  // chunk -> bytes, this snapshot
  sql::Stmt q_term, q_term_by_id, q_doc, q_external, q_text, q_fwd, q_norms, q_version, q_pages;

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
        {&q_norms, "SELECT data FROM norms WHERE chunk = ?"},
        {&q_version, "PRAGMA data_version"},
    });
  }

  // The last chunk used, remembered: a posting walk asks for neighbouring
  // documents, mostly of one chunk. (Map nodes do not move on insert.)
  static constexpr std::uint32_t kNoChunk = ~std::uint32_t{0};
  std::uint32_t last_chunk = kNoChunk;
  const std::string* last_data = nullptr;

  const std::string& chunk(std::uint32_t c) {
    if (c == last_chunk) return *last_data;
    auto it = norms.find(c);
    if (it == norms.end()) {
      std::string data;
      q_norms.bind(1, std::int64_t{c});
      if (q_norms.step()) data = std::string(q_norms.blob(0));
      q_norms.reset();
      it = norms.emplace(c, std::move(data)).first;
    }
    last_chunk = c;
    last_data = &it->second;
    return it->second;
  }
};

IndexReader::IndexReader(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
IndexReader::~IndexReader() {
  if (impl_ && impl_->in_scope) end_scope();
}

Result<std::unique_ptr<IndexReader>> IndexReader::open(const std::string& path) {
  std::error_code ec;
  if (!std::filesystem::exists(path, ec))
    return Status::NotFound("no index at " + path + " (create one with: lode index --index " + path + " FOLDER)");
  auto impl = std::make_unique<Impl>();
  auto db = sql::Db::open(path, SQLITE_OPEN_READWRITE);  // read-write so WAL files can be opened; we never write
  if (!db) {
    db = sql::Db::open(path, SQLITE_OPEN_READONLY);
    if (!db) return db.status();
  }
  impl->db = std::move(db.value());
  LODE_RETURN_IF_ERROR(schema::configure(impl->db, false));
  LODE_RETURN_IF_ERROR(impl->db.exec("PRAGMA query_only=1"));
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
  // The first read fixes the snapshot; data_version tells whether caches still hold.
  auto counters = schema::load_counters(m.db);
  if (!counters) return counters.status();
  m.counters = counters.value();
  std::int64_t version = -1;
  if (m.q_version.step()) version = m.q_version.i64(0);
  m.q_version.reset();
  if (version != m.data_version) {
    m.norms.clear();
    m.last_chunk = Impl::kNoChunk;
    m.last_data = nullptr;
    m.data_version = version;
  }
  return scope;
}

void IndexReader::end_scope() {
  (void)impl_->db.exec("COMMIT");
  impl_->in_scope = false;
  // Another connection may commit before our next scope; norms are revalidated
  // by data_version there, so they can stay.
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
  return make_block_cursor(impl_->db, term.id);
}

bool IndexReader::live(DocId doc) {
  return codec::get_norm(impl_->chunk(doc / codec::kNormsPerChunk), doc % codec::kNormsPerChunk).live;
}

std::uint32_t IndexReader::length(DocId doc, Field field) {
  return codec::get_norm(impl_->chunk(doc / codec::kNormsPerChunk), doc % codec::kNormsPerChunk)
      .length[static_cast<std::size_t>(field)];
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
  q.bind(1, external_id);
  auto row = sql::one_row(q, "no document with id '" + std::string(external_id) + "'");
  if (!row) return row.status();
  return static_cast<DocId>(q.i64(0));
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
