// SiftBook: sifts saved in the index file (lode/screening.h; tables in
// screening/tables.h, documented in docs/index-format.md).
#include <sqlite3.h>

#include <algorithm>
#include <cctype>
#include <chrono>
#include <filesystem>
#include <map>
#include <set>

#include "index/sqlite.h"
#include "lode/query.h"
#include "screening/options_json.h"
#include "screening/scope.h"
#include "screening/tables.h"

namespace lode {
namespace {

std::int64_t now_ns() {
  return std::chrono::duration_cast<std::chrono::nanoseconds>(std::chrono::system_clock::now().time_since_epoch())
      .count();
}

Status check_name(const std::string& name) {
  bool ok = !name.empty() && name.size() <= 64;
  for (char c : name)
    ok = ok && (std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '.' || c == '-');
  if (!ok) return Status::InvalidArgument("sift name '" + name + "': use 1 to 64 of A-Z a-z 0-9 _ . -");
  return Status();
}

struct SiftRow {
  std::int64_t id = 0;
  SiftSummary summary;
  SiftOptions options;
};

struct RawJudgment {
  SiftJudgment j;
  std::string content;
};

}  // namespace

struct SiftBook::Impl {
  sql::Db db;
  bool writable = false;
  bool has_tables = false;

  Status tables_present() {
    auto s = db.prepare("SELECT count(*) FROM sqlite_master WHERE type = 'table' AND name = 'sift'");
    if (!s) return s.status();
    has_tables = s->step() && s->i64(0) > 0;
    return s->status();
  }

  Result<SiftRow> find(const std::string& name) {
    if (!has_tables) return Status::NotFound("no sift named '" + name + "' in " + db.path());
    auto s = db.prepare("SELECT id, query, created_ns, created_by, options FROM sift WHERE name = ?");
    if (!s) return s.status();
    s->bind(1, std::string_view(name));
    if (!s->step()) {
      LODE_RETURN_IF_ERROR(s->status());
      return Status::NotFound("no sift named '" + name + "' in " + db.path() + " (lode sift list shows them)");
    }
    SiftRow row;
    row.id = s->i64(0);
    row.summary.name = name;
    row.summary.query = std::string(s->text(1));
    row.summary.created_ns = s->i64(2);
    row.summary.created_by = std::string(s->text(3));
    nlohmann::json opts = nlohmann::json::parse(s->text(4), nullptr, false);
    if (opts.is_discarded()) return Status::Corruption(db.path() + ": sift '" + name + "': options are not JSON");
    auto o = screening::options_from_json(opts);
    if (!o) return o.status();
    row.options = *o;
    return row;
  }

  Result<std::vector<RawJudgment>> judgments(std::int64_t sift) {
    auto s = db.prepare(
        "SELECT doc, content, relevant, reviewer, time_ns, batch FROM sift_judgment WHERE sift = ? ORDER BY seq");
    if (!s) return s.status();
    s->bind(1, sift);
    // Latest per document, ordered by when that latest judgment was made.
    std::map<std::string, std::size_t> at;
    std::vector<RawJudgment> all;
    while (s->step()) {
      RawJudgment r;
      r.j.doc = std::string(s->text(0));
      r.content = std::string(s->text(1));
      r.j.relevant = s->i64(2) != 0;
      r.j.reviewer = std::string(s->text(3));
      r.j.time_ns = s->i64(4);
      r.j.batch = s->i64(5);
      auto it = at.find(r.j.doc);
      if (it != at.end()) all[it->second].j.doc.clear();  // superseded
      at[r.j.doc] = all.size();
      all.push_back(std::move(r));
    }
    LODE_RETURN_IF_ERROR(s->status());
    std::erase_if(all, [](const RawJudgment& r) { return r.j.doc.empty(); });
    return all;
  }

  Result<std::vector<SiftBatch>> batches(std::int64_t sift) {
    auto s = db.prepare(
        "SELECT number, is_check, time_ns, model, trained_on, found_then, remainder FROM sift_batch "
        "WHERE sift = ? ORDER BY number");
    if (!s) return s.status();
    s->bind(1, sift);
    std::vector<SiftBatch> out;
    while (s->step()) {
      SiftBatch b;
      b.number = s->i64(0);
      b.check = s->i64(1) != 0;
      b.time_ns = s->i64(2);
      b.model = std::string(s->text(3));
      b.trained_on = static_cast<std::size_t>(s->i64(4));
      b.found_then = static_cast<std::size_t>(s->i64(5));
      b.remainder = static_cast<std::size_t>(s->i64(6));
      out.push_back(std::move(b));
    }
    LODE_RETURN_IF_ERROR(s->status());
    auto p = db.prepare("SELECT batch, doc, score FROM sift_proposal WHERE sift = ? ORDER BY batch, position");
    if (!p) return p.status();
    p->bind(1, sift);
    while (p->step()) {
      auto n = static_cast<std::size_t>(p->i64(0));
      if (n >= out.size() || out[n].number != p->i64(0))
        return Status::Corruption(db.path() + ": sift_proposal names batch " + std::to_string(n) + ", which is missing");
      out[n].docs.emplace_back(p->text(1));
      out[n].scores.push_back(p->f64(2));
    }
    LODE_RETURN_IF_ERROR(p->status());
    return out;
  }

  Status record_batch(std::int64_t sift, const SiftBatch& b) {
    LODE_RETURN_IF_ERROR(db.exec("BEGIN IMMEDIATE"));
    auto s = db.prepare(
        "INSERT INTO sift_batch (sift, number, is_check, time_ns, model, trained_on, found_then, remainder) "
        "VALUES (?, ?, ?, ?, ?, ?, ?, ?)");
    auto p = db.prepare("INSERT INTO sift_proposal (sift, batch, position, doc, score) VALUES (?, ?, ?, ?, ?)");
    Status st = !s ? s.status() : p.status();
    if (st.ok()) {
      s->bind(1, sift).bind(2, b.number).bind(3, std::int64_t{b.check}).bind(4, b.time_ns);
      s->bind(5, std::string_view(b.model)).bind(6, static_cast<std::int64_t>(b.trained_on));
      s->bind(7, static_cast<std::int64_t>(b.found_then)).bind(8, static_cast<std::int64_t>(b.remainder));
      st = s->run();
    }
    for (std::size_t i = 0; st.ok() && i < b.docs.size(); ++i) {
      p->bind(1, sift).bind(2, b.number).bind(3, static_cast<std::int64_t>(i));
      p->bind(4, std::string_view(b.docs[i])).bind(5, b.scores[i]);
      st = p->run();
    }
    return finish(st);
  }

  // Commits when `st` is ok, else rolls back and returns `st`.
  Status finish(const Status& st) {
    if (!st.ok()) {
      (void)db.exec("ROLLBACK");  // the error being returned says more than a failed rollback
      return st;
    }
    return db.exec("COMMIT");
  }

  Status need_writable() const {
    if (!writable) return Status::InvalidArgument(db.path() + ": sifts were opened read-only");
    return Status();
  }
};

SiftBook::SiftBook(std::unique_ptr<Impl> impl) : impl_(std::move(impl)) {}
SiftBook::~SiftBook() = default;

Result<std::unique_ptr<SiftBook>> SiftBook::open(const std::string& index_path, bool writable) {
  std::error_code ec;
  if (!std::filesystem::exists(index_path, ec))
    return Status::NotFound(index_path + ": no index here (lode index FOLDER makes one)");
  auto impl = std::make_unique<Impl>();
  auto db = sql::Db::open(index_path, writable ? SQLITE_OPEN_READWRITE : SQLITE_OPEN_READONLY);
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
    return Status::InvalidArgument("sift: give query words or seed documents to start from");
  std::vector<std::pair<std::string, std::string>> seeds;  // doc, content hash
  for (const std::string& doc : start.seeds) {
    auto id = reader.find_external(doc);
    if (!id) return Status::NotFound("seed document '" + doc + "' is not in the index");
    auto h = content_hash(reader, *id);
    if (!h) return h.status();
    seeds.emplace_back(doc, *h);
  }
  sql::Db& db = impl_->db;
  LODE_RETURN_IF_ERROR(db.exec("BEGIN IMMEDIATE"));
  std::int64_t t = now_ns();
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

Result<SiftState> SiftBook::state(IndexReader& reader, const std::string& name) {
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto scope = screening::sift_scope(reader, row->summary.query);
  if (!scope) return scope.status();
  std::set<DocId> in_scope(scope->docs.begin(), scope->docs.end());
  auto raw = impl_->judgments(row->id);
  if (!raw) return raw.status();
  auto batches = impl_->batches(row->id);
  if (!batches) return batches.status();

  SiftState st;
  st.summary = row->summary;
  st.summary.batches = batches->size();
  st.scope = in_scope.size();
  std::map<std::string, const SiftJudgment*> current;  // doc -> its judgment, current ones only
  std::size_t judged_in_scope = 0;
  for (RawJudgment& r : *raw) {
    auto id = reader.find_external(r.j.doc);
    if (!id) {
      if (id.status().code() != Code::kNotFound) return id.status();
      r.j.state = "gone";
      ++st.gone;
    } else {
      auto h = content_hash(reader, *id);
      if (!h) return h.status();
      r.j.state = *h == r.content ? "current" : "changed";
      if (r.j.state == "changed") ++st.changed;
      else if (in_scope.count(*id)) ++judged_in_scope;
    }
    st.summary.judged += 1;
    st.summary.relevant += r.j.relevant ? 1 : 0;
    st.judgments.push_back(r.j);
  }
  for (const SiftJudgment& j : st.judgments)
    if (j.state == "current") current[j.doc] = &j;
  st.unjudged = st.scope - judged_in_scope;

  // Review order for the knee rule: judgments answering ranked batches.
  std::set<std::int64_t> checks;
  for (const SiftBatch& b : *batches)
    if (b.check) checks.insert(b.number);
  std::vector<bool> order;
  for (const SiftJudgment& j : st.judgments)
    if (j.state == "current" && j.batch >= 0 && !checks.count(j.batch)) order.push_back(j.relevant);
  st.knee = knee_check(order);

  std::size_t found_now = 0;
  for (auto& [doc, j] : current) found_now += j->relevant ? 1 : 0;
  for (const SiftBatch& b : *batches) {
    std::vector<std::string> pending;
    std::size_t rel = 0;
    for (const std::string& d : b.docs) {
      auto it = current.find(d);
      if (it == current.end()) {
        if (reader.find_external(d).ok()) pending.push_back(d);
      } else {
        rel += it->second->relevant ? 1 : 0;
      }
    }
    if (!pending.empty() && !st.open_batch) {
      st.open_batch = b;
      st.pending = std::move(pending);
    }
    if (b.check && pending.empty())
      st.recall = estimate_recall(b.found_then, found_now, b.remainder, b.docs.size(), rel);
  }
  return st;
}

Result<SiftBatch> SiftBook::next(IndexReader& reader, const std::string& name) {
  auto st = state(reader, name);
  if (!st) return st.status();
  if (st->open_batch) return *st->open_batch;
  LODE_RETURN_IF_ERROR(impl_->need_writable());
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto engine = screening::sift_engine(reader, row->summary.query, row->options, st->judgments);
  if (!engine) return engine.status();
  auto batches = impl_->batches(row->id);
  if (!batches) return batches.status();
  std::size_t ranked = 0;
  for (const SiftBatch& b : *batches) ranked += b.check ? 0 : 1;
  SiftBatch b;
  b.number = static_cast<std::int64_t>(batches->size());
  auto docs = (*engine)->rank(row->options.batch_size(ranked), static_cast<std::uint64_t>(b.number));
  if (!docs) return docs.status();
  if (docs->empty()) return Status::NotFound("sift '" + name + "': every document in scope is judged");
  b.time_ns = now_ns();
  b.model = kSiftModelName;
  b.trained_on = (*engine)->trained_on();
  for (const RankedDoc& r : *docs) {
    auto info = reader.document(r.doc);
    if (!info) return info.status();
    b.docs.push_back(info->external_id);
    b.scores.push_back(r.score);
  }
  LODE_RETURN_IF_ERROR(impl_->record_batch(row->id, b));
  return b;
}

Result<SiftBatch> SiftBook::check_sample(IndexReader& reader, const std::string& name, std::size_t size) {
  LODE_RETURN_IF_ERROR(impl_->need_writable());
  if (size == 0 || size > 10000) return Status::InvalidArgument("check sample size must be 1 to 10000");
  auto st = state(reader, name);
  if (!st) return st.status();
  if (st->open_batch)
    return Status::InvalidArgument("sift '" + name + "': judge batch " + std::to_string(st->open_batch->number) +
                                   " first (" + std::to_string(st->pending.size()) + " left)");
  auto row = impl_->find(name);
  if (!row) return row.status();
  auto engine = screening::sift_engine(reader, row->summary.query, row->options, st->judgments);
  if (!engine) return engine.status();
  SiftBatch b;
  b.number = static_cast<std::int64_t>(st->summary.batches);
  b.check = true;
  b.time_ns = now_ns();
  b.model = kSiftModelName;
  b.remainder = (*engine)->unjudged();
  for (const SiftJudgment& j : st->judgments) b.found_then += j.state == "current" && j.relevant ? 1 : 0;
  for (DocId d : (*engine)->sample(size, 1000000u + static_cast<std::uint64_t>(b.number))) {
    auto info = reader.document(d);
    if (!info) return info.status();
    b.docs.push_back(info->external_id);
    b.scores.push_back(0);
  }
  if (b.docs.empty()) return Status::NotFound("sift '" + name + "': nothing left unjudged to sample");
  LODE_RETURN_IF_ERROR(impl_->record_batch(row->id, b));
  return b;
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
  std::int64_t t = now_ns();
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
  std::sort(js->begin(), js->end(), [](const RawJudgment& a, const RawJudgment& b) { return a.j.doc < b.j.doc; });
  std::string out;
  for (const RawJudgment& r : *js) {
    if (r.j.doc.find_first_of(" \t\n") != std::string::npos)
      return Status::InvalidArgument("document id '" + r.j.doc + "' has white space: TREC qrels cannot hold it");
    out += qid + " 0 " + r.j.doc + (r.j.relevant ? " 1\n" : " 0\n");
  }
  return out;
}

}  // namespace lode
