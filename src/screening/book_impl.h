// SiftBook's state, shared by book.cpp (writes, listing, export) and
// book_state.cpp (reading a sift's state, proposing batches).
#pragma once

#include <sqlite3.h>

#include <map>
#include <string>
#include <vector>

#include "index/sqlite.h"
#include "lode/screening.h"
#include "screening/options_json.h"

namespace lode::screening {

std::int64_t now_ns();

struct SiftRow {
  std::int64_t id = 0;
  SiftSummary summary;
  SiftOptions options;
};

struct RawJudgment {
  SiftJudgment j;
  std::string content;
};

}  // namespace lode::screening

namespace lode {

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

  Result<screening::SiftRow> find(const std::string& name) {
    if (!has_tables) return Status::NotFound("no sift named '" + name + "' in " + db.path());
    auto s = db.prepare("SELECT id, query, created_ns, created_by, options FROM sift WHERE name = ?");
    if (!s) return s.status();
    s->bind(1, std::string_view(name));
    if (!s->step()) {
      LODE_RETURN_IF_ERROR(s->status());
      return Status::NotFound("no sift named '" + name + "' in " + db.path() + " (lode sift list shows them)");
    }
    screening::SiftRow row;
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

  Result<std::vector<screening::RawJudgment>> judgments(std::int64_t sift) {
    auto s = db.prepare(
        "SELECT doc, content, relevant, reviewer, time_ns, batch FROM sift_judgment WHERE sift = ? ORDER BY seq");
    if (!s) return s.status();
    s->bind(1, sift);
    // Latest per document, ordered by when that latest judgment was made.
    std::map<std::string, std::size_t> at;
    std::vector<screening::RawJudgment> all;
    while (s->step()) {
      screening::RawJudgment r;
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
    std::erase_if(all, [](const screening::RawJudgment& r) { return r.j.doc.empty(); });
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

}  // namespace lode
