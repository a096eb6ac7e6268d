// SiftBook: sifts saved in the index file (lode/screening.h; tables in
// screening/tables.h, documented in docs/index-format.md): opening, listing,
// starting, dropping, judging and the qrels export. Reading a sift's state and
// proposing batches: book_state.cpp.
#include <algorithm>
#include <cctype>
#include <chrono>
#include <filesystem>

#include "index/schema.h"
#include "screening/book_impl.h"
#include "screening/scope.h"
#include "screening/tables.h"

namespace lode {

std::int64_t screening::now_ns() {
  return std::chrono::duration_cast<std::chrono::nanoseconds>(std::chrono::system_clock::now().time_since_epoch())
      .count();
}

namespace {

Status check_name(const std::string& name) {
  bool ok = !name.empty() && name.size() <= 64;
  for (char c : name)
    ok = ok && (std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '.' || c == '-');
  if (!ok) return Status::InvalidArgument("sift name '" + name + "': use 1 to 64 of A-Z a-z 0-9 _ . -");
  return Status();
}

}  // namespace

SiftBook::SiftBook(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
SiftBook::~SiftBook() = default;

Result<std::unique_ptr<SiftBook>> SiftBook::open(const std::string& index_path, bool writable) {
  std::error_code ec;
  if (!std::filesystem::exists(index_path, ec))
    return Status::NotFound(index_path + ": no index here (lode index FOLDER makes one)");
  auto impl = std::make_unique<Impl>();
  // Read-only: as every reader opens an index, so a folder the user may
  // only read still lists sifts (index/schema.h).
  auto db = writable ? sql::Db::open(index_path, SQLITE_OPEN_READWRITE) : schema::open_for_reading(index_path);
  if (!db) return db.status();
  impl->db = std::move(db.value());
  impl->writable = writable;
  if (writable) {
    LODE_RETURN_IF_ERROR(impl->db.exec(std::string("BEGIN IMMEDIATE;") + screening::kSiftSchema + "COMMIT;"));
    impl->has_tables = true;
  } else {
    LODE_RETURN_IF_ERROR(impl->tables_present());
  }
  return std::unique_ptr<SiftBook>(new SiftBook(std::move(impl)));
}

Result<std::vector<SiftSummary>> SiftBook::list() {
  std::vector<SiftSummary> out;
  if (!impl_->has_tables) return out;
  auto s = impl_->db.prepare(
      "SELECT s.name, s.query, s.created_ns, s.created_by, "
      " (SELECT count(*) FROM sift_batch b WHERE b.sift = s.id) FROM sift s ORDER BY s.name");
  if (!s) return s.status();
  while (s->step()) {
    SiftSummary m;
    m.name = std::string(s->text(0));
    m.query = std::string(s->text(1));
    m.created_ns = s->i64(2);
    m.created_by = std::string(s->text(3));
    m.batches = static_cast<std::size_t>(s->i64(4));
    out.push_back(std::move(m));
  }
  LODE_RETURN_IF_ERROR(s->status());
  for (auto& m : out) {
    auto row = impl_->find(m.name);
    if (!row) return row.status();
    auto js = impl_->judgments(row->id);
    if (!js) return js.status();
    m.judged = js->size();
    for (auto& r : *js) m.relevant += r.j.relevant ? 1 : 0;
  }
  return out;
}

Status SiftBook::start(IndexReader& reader, const SiftStart& start) {
  LODE_RETURN_IF_ERROR(impl_->need_writable());
  LODE_RETURN_IF_ERROR(check_name(start.name));
  LODE_RETURN_IF_ERROR(start.options.check());
  if (auto taken = impl_->find(start.name); taken.ok())
    return Status::InvalidArgument("a sift named '" + start.name + "' exists already");
  auto scope = screening::sift_scope(reader, start.query);
  if (!scope) return scope.status();
  if (scope->words.empty() && start.seeds.empty())
    return Status::InvalidArgument("sift: give query words or documents known to be relevant to start from");
  std::vector<std::pair<std::string, std::string>> seeds;  // doc, content hash
  for (const std::string& doc : start.seeds) {
    auto id = reader.find_external(doc);
    if (!id) return Status::NotFound("starting document '" + doc + "' is not in the index");
    auto h = content_hash(reader, *id);
    if (!h) return h.status();
    seeds.emplace_back(doc, *h);
  }
  sql::Db& db = impl_->db;
  LODE_RETURN_IF_ERROR(db.exec("BEGIN IMMEDIATE"));
  std::int64_t t = screening::now_ns();
  auto s = db.prepare("INSERT INTO sift (name, query, created_ns, created_by, options) VALUES (?, ?, ?, ?, ?)");
  Status st = s.status();
  if (st.ok()) {
    std::string opts = screening::options_to_json(start.options).dump();
    s->bind(1, std::string_view(start.name)).bind(2, std::string_view(start.query)).bind(3, t);
    s->bind(4, std::string_view(start.reviewer)).bind(5, std::string_view(opts));
    st = s->run();
  }
  std::int64_t id = db.last_insert_rowid();
  auto j = db.prepare(
      "INSERT INTO sift_judgment (sift, doc, content, relevant, reviewer, time_ns, batch) VALUES (?, ?, ?, 1, ?, ?, -1)");
  if (st.ok()) st = j.status();
  for (std::size_t i = 0; st.ok() && i < seeds.size(); ++i) {
    j->bind(1, id).bind(2, std::string_view(seeds[i].first)).bind(3, std::string_view(seeds[i].second));
    j->bind(4, std::string_view(start.reviewer)).bind(5, t);
    st = j->run();
  }
  return impl_->finish(st);
}

Status SiftBook::drop(const std::string& name) {
  LODE_RETURN_IF_ERROR(impl_->need_writable());
  auto row = impl_->find(name);
  if (!row) return row.status();
  sql::Db& db = impl_->db;
  LODE_RETURN_IF_ERROR(db.exec("BEGIN IMMEDIATE"));
  Status st;
  for (const char* table : {"sift_judgment", "sift_proposal", "sift_batch"}) {
    auto s = db.prepare(std::string("DELETE FROM ") + table + " WHERE sift = ?");
    st = s.status();
    if (!st.ok()) break;
    st = s->bind(1, row->id).run();
    if (!st.ok()) break;
  }
  if (st.ok()) {
    auto s = db.prepare("DELETE FROM sift WHERE id = ?");
    st = s ? s->bind(1, row->id).run() : s.status();
  }
  return impl_->finish(st);
}

Status SiftBook::mark(IndexReader& reader, const std::string& name,
                      const std::vector<std::pair<std::string, bool>>& judgments, const std::string& reviewer) {
  LODE_RETURN_IF_ERROR(impl_->need_writable());
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto batches = impl_->batches(row->id);
  if (!batches) return batches.status();
  std::map<std::string, std::int64_t> batch_of;  // latest batch proposing each document
  for (const SiftBatch& b : *batches)
    for (const std::string& d : b.docs) batch_of[d] = b.number;
  std::vector<std::string> hashes;
  for (auto& [doc, rel] : judgments) {
    auto id = reader.find_external(doc);
    if (!id) return Status::NotFound("document '" + doc + "' is not in the index");
    auto h = content_hash(reader, *id);
    if (!h) return h.status();
    hashes.push_back(*h);
  }
  sql::Db& db = impl_->db;
  LODE_RETURN_IF_ERROR(db.exec("BEGIN IMMEDIATE"));
  auto s = db.prepare(
      "INSERT INTO sift_judgment (sift, doc, content, relevant, reviewer, time_ns, batch) VALUES (?, ?, ?, ?, ?, ?, ?)");
  Status st = s.status();
  std::int64_t t = screening::now_ns();
  for (std::size_t i = 0; st.ok() && i < judgments.size(); ++i) {
    auto it = batch_of.find(judgments[i].first);
    s->bind(1, row->id).bind(2, std::string_view(judgments[i].first)).bind(3, std::string_view(hashes[i]));
    s->bind(4, std::int64_t{judgments[i].second}).bind(5, std::string_view(reviewer)).bind(6, t);
    s->bind(7, it == batch_of.end() ? std::int64_t{-1} : it->second);
    st = s->run();
  }
  return impl_->finish(st);
}

Result<std::string> SiftBook::qrels(const std::string& name, const std::string& qid) {
  if (qid.empty() || qid.find_first_of(" \t\n") != std::string::npos)
    return Status::InvalidArgument("qrels query id '" + qid + "' must be one word");
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto js = impl_->judgments(row->id);
  if (!js) return js.status();
  auto by_doc = [](const screening::RawJudgment& a, const screening::RawJudgment& b) { return a.j.doc < b.j.doc; };
  std::sort(js->begin(), js->end(), by_doc);
  std::string out;
  for (const screening::RawJudgment& r : *js) {
    if (r.j.doc.find_first_of(" \t\n") != std::string::npos)
      return Status::InvalidArgument("document id '" + r.j.doc + "' has white space: TREC qrels cannot hold it");
    out += qid + " 0 " + r.j.doc + (r.j.relevant ? " 1\n" : " 0\n");
  }
  return out;
}

}  // namespace lode
