#include "index/sqlite.h"

namespace lode::sql {
namespace {

// SQLite's result code as a Status: Busy, Corruption (damaged or not a
// database: `lode verify` says more), else IOError.
Status classify(int rc, std::string msg) {
  if ((rc & 0xff) == SQLITE_BUSY) return Status::Busy(std::move(msg));
  if ((rc & 0xff) == SQLITE_CORRUPT || (rc & 0xff) == SQLITE_NOTADB) return Status::Corruption(std::move(msg));
  return Status::IOError(std::move(msg));
}

}  // namespace

Stmt& Stmt::operator=(Stmt&& o) noexcept {
  if (this != &o) {
    sqlite3_finalize(s_);
    db_ = o.db_;
    s_ = o.s_;
    status_ = std::move(o.status_);
    o.s_ = nullptr;
  }
  return *this;
}

bool Stmt::step() {
  int rc = sqlite3_step(s_);
  if (rc == SQLITE_ROW) return true;
  if (rc != SQLITE_DONE) {
    // Named by its file: "database or disk is full" alone does not say which disk.
    const char* file = sqlite3_db_filename(db_, "main");
    status_ = classify(rc, (file != nullptr && *file != '\0' ? std::string(file) + ": " : std::string()) +
                               sqlite3_errmsg(db_));
  }
  return false;
}

Status Stmt::run() {
  status_ = Status();
  while (step()) {
  }
  Status s = status_;
  reset();
  return s;
}

std::string_view Stmt::text(int col) const {
  auto* p = reinterpret_cast<const char*>(sqlite3_column_text(s_, col));
  int n = sqlite3_column_bytes(s_, col);
  return p ? std::string_view(p, static_cast<std::size_t>(n)) : std::string_view();
}

std::string_view Stmt::blob(int col) const {
  auto* p = static_cast<const char*>(sqlite3_column_blob(s_, col));
  int n = sqlite3_column_bytes(s_, col);
  return p ? std::string_view(p, static_cast<std::size_t>(n)) : std::string_view();
}

Result<Db> Db::open(const std::string& path, int flags, const std::string& uri) {
  Db db;
  db.path_ = path;
  // No per-connection mutex: a connection serves one thread at a time
  // (lode/index.h), and the lock around every call cost ~6% of indexing.
  int rc = sqlite3_open_v2(uri.empty() ? path.c_str() : uri.c_str(), &db.db_, flags | SQLITE_OPEN_NOMUTEX, nullptr);
  if (rc != SQLITE_OK) return db.error(rc, "cannot open");
  sqlite3_busy_timeout(db.db_, 5000);
  sqlite3_extended_result_codes(db.db_, 1);
  return db;
}

Status Db::exec(const std::string& sql) {
  char* err = nullptr;
  int rc = sqlite3_exec(db_, sql.c_str(), nullptr, nullptr, &err);
  if (rc != SQLITE_OK) {
    std::string msg = err ? err : sqlite3_errstr(rc);
    sqlite3_free(err);
    return classify(rc, path_ + ": " + msg);
  }
  return Status();
}

Result<Stmt> Db::prepare(std::string_view sql) {
  sqlite3_stmt* s = nullptr;
  int rc = sqlite3_prepare_v3(db_, sql.data(), static_cast<int>(sql.size()),
                              SQLITE_PREPARE_PERSISTENT, &s, nullptr);
  if (rc != SQLITE_OK) return error(rc, "cannot prepare statement");
  return Stmt(db_, s);
}

Status Db::prepare_all(std::initializer_list<Prepared> all) {
  for (const Prepared& p : all) {
    auto s = prepare(p.sql);
    if (!s) return s.status();
    *p.stmt = std::move(s.value());
  }
  return Status();
}

Row one_row(Stmt& s, std::string_view missing) {
  if (s.step()) return Row(s, Status());
  Status st = s.status();
  return Row(s, st.ok() ? Status::NotFound(std::string(missing)) : st);
}

Status Db::error(int rc, std::string_view what) const {
  return classify(rc, path_ + ": " + std::string(what) + ": " + (db_ ? sqlite3_errmsg(db_) : sqlite3_errstr(rc)));
}

}  // namespace lode::sql
