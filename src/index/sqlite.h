// Thin RAII wrappers over the SQLite C API: a connection and a prepared
// statement whose errors come back as lode::Status. Private to src/index.
#pragma once

#include <sqlite3.h>

#include <cstdint>
#include <initializer_list>
#include <string>
#include <string_view>

#include "lode/status.h"

namespace lode::sql {

class Stmt {
 public:
  Stmt() = default;
  Stmt(sqlite3* db, sqlite3_stmt* s) : db_(db), s_(s) {}
  Stmt(Stmt&& o) noexcept : db_(o.db_), s_(o.s_) { o.s_ = nullptr; }
  Stmt& operator=(Stmt&& o) noexcept;
  Stmt(const Stmt&) = delete;
  ~Stmt() { sqlite3_finalize(s_); }

  // Binding: 1-based index as SQLite. Returns *this for chaining.
  Stmt& bind(int i, std::int64_t v) { sqlite3_bind_int64(s_, i, v); return *this; }
  Stmt& bind(int i, double v) { sqlite3_bind_double(s_, i, v); return *this; }
  // An empty view binds an empty value, never NULL (whatever its data()).
  Stmt& bind(int i, std::string_view v) {
    sqlite3_bind_text(s_, i, v.data() ? v.data() : "", static_cast<int>(v.size()), SQLITE_TRANSIENT);
    return *this;
  }
  Stmt& bind_blob(int i, std::string_view v) {
    sqlite3_bind_blob(s_, i, v.data() ? v.data() : "", static_cast<int>(v.size()), SQLITE_TRANSIENT);
    return *this;
  }
  // Steps once: true for a row, false when done; errors set status().
  bool step();
  // Runs to completion (for writes); resets afterwards.
  Status run();
  void reset() { sqlite3_reset(s_); sqlite3_clear_bindings(s_); }
  Status status() const { return status_; }

  std::int64_t i64(int col) const { return sqlite3_column_int64(s_, col); }
  double f64(int col) const { return sqlite3_column_double(s_, col); }
  bool is_null(int col) const { return sqlite3_column_type(s_, col) == SQLITE_NULL; }
  std::string_view text(int col) const;
  std::string_view blob(int col) const;

 private:
  sqlite3* db_ = nullptr;
  sqlite3_stmt* s_ = nullptr;
  Status status_;
};

// The outcome of a one-row lookup; resets its statement when destroyed so the
// statement can be bound again. Columns are read from the Stmt meanwhile.
class Row {
 public:
  Row(Stmt& s, Status st) : s_(s), status_(std::move(st)) {}
  Row(const Row&) = delete;
  ~Row() { s_.reset(); }
  explicit operator bool() const { return status_.ok(); }
  const Status& status() const { return status_; }

 private:
  Stmt& s_;
  Status status_;
};

// Steps `s` once: ok with a row, NotFound(missing) without, else the error.
Row one_row(Stmt& s, std::string_view missing);

struct Prepared {
  Stmt* stmt;
  const char* sql;
};

class Db {
 public:
  Db() = default;
  Db(Db&& o) noexcept : db_(o.db_), path_(std::move(o.path_)) { o.db_ = nullptr; }
  Db& operator=(Db&& o) noexcept {
    if (this != &o) {
      sqlite3_close_v2(db_);
      db_ = o.db_;
      path_ = std::move(o.path_);
      o.db_ = nullptr;
    }
    return *this;
  }
  Db(const Db&) = delete;
  ~Db() { sqlite3_close_v2(db_); }

  // flags: SQLITE_OPEN_* bits. `uri`, when given, is what SQLite opens (with
  // SQLITE_OPEN_URI in flags); `path` still names the file in messages.
  static Result<Db> open(const std::string& path, int flags, const std::string& uri = "");
  Status exec(const std::string& sql);
  Result<Stmt> prepare(std::string_view sql);
  // Prepares each statement into its slot; stops at the first error.
  Status prepare_all(std::initializer_list<Prepared> all);
  sqlite3* raw() const { return db_; }
  const std::string& path() const { return path_; }
  // "<path>: <sqlite message>" as an IOError (or Busy for SQLITE_BUSY).
  Status error(int rc, std::string_view what) const;
  std::int64_t last_insert_rowid() const { return sqlite3_last_insert_rowid(db_); }

 private:
  sqlite3* db_ = nullptr;
  std::string path_;
};

}  // namespace lode::sql
