#include "index/schema.h"

#include <filesystem>
#include <string>

namespace lode::schema {
namespace {

constexpr const char* kCreate = R"sql(
CREATE TABLE meta(key TEXT PRIMARY KEY, value ANY) WITHOUT ROWID;
CREATE TABLE files(
  file_id INTEGER PRIMARY KEY,
  path TEXT NOT NULL UNIQUE,
  root TEXT NOT NULL,
  size INTEGER NOT NULL,
  mtime_ns INTEGER NOT NULL,
  hash TEXT NOT NULL,
  kind TEXT NOT NULL);
CREATE TABLE docs(
  doc_id INTEGER PRIMARY KEY,
  file_id INTEGER NOT NULL,
  external_id TEXT NOT NULL,
  title TEXT NOT NULL,
  kind TEXT NOT NULL,
  len_title INTEGER NOT NULL,
  len_body INTEGER NOT NULL,
  live INTEGER NOT NULL);
CREATE INDEX docs_by_file ON docs(file_id) WHERE live = 1;
CREATE INDEX docs_by_external ON docs(external_id) WHERE live = 1;
CREATE TABLE terms(
  term_id INTEGER PRIMARY KEY,
  field INTEGER NOT NULL,
  term TEXT NOT NULL,
  df INTEGER NOT NULL,
  cf INTEGER NOT NULL,
  UNIQUE(field, term));
CREATE TABLE postings(
  seg_id INTEGER PRIMARY KEY,
  term_id INTEGER NOT NULL,
  first_doc INTEGER NOT NULL,
  last_doc INTEGER NOT NULL,
  count INTEGER NOT NULL,
  head BLOB NOT NULL,
  data BLOB NOT NULL);
CREATE UNIQUE INDEX postings_by_term ON postings(term_id, first_doc);
CREATE TABLE positions(seg_id INTEGER PRIMARY KEY, data BLOB NOT NULL);
CREATE TABLE doc_terms(doc_id INTEGER PRIMARY KEY, data BLOB NOT NULL);
CREATE TABLE doc_text(doc_id INTEGER PRIMARY KEY, title BLOB NOT NULL, body BLOB NOT NULL);
CREATE TABLE norms(chunk INTEGER PRIMARY KEY, data BLOB NOT NULL);
CREATE TABLE doc_meta(
  doc_id INTEGER PRIMARY KEY,
  author TEXT NOT NULL,
  date INTEGER NOT NULL,
  pages INTEGER NOT NULL,
  page_map BLOB);
CREATE TABLE problems(
  path TEXT NOT NULL,
  error INTEGER NOT NULL,
  message TEXT NOT NULL,
  time_ns INTEGER NOT NULL);
CREATE INDEX problems_by_path ON problems(path);
)sql";

Status put_meta(sql::Db& db, std::string_view key, std::string_view text) {
  auto st = db.prepare("INSERT OR REPLACE INTO meta(key, value) VALUES(?, ?)");
  if (!st) return st.status();
  st->bind(1, key).bind(2, text);
  return st->run();
}

Status put_meta(sql::Db& db, std::string_view key, std::int64_t v) {
  auto st = db.prepare("INSERT OR REPLACE INTO meta(key, value) VALUES(?, ?)");
  if (!st) return st.status();
  st->bind(1, key).bind(2, v);
  return st->run();
}

}  // namespace

Status create(sql::Db& db, const IndexSettings& settings) {
  LODE_RETURN_IF_ERROR(db.exec(kCreate));
  LODE_RETURN_IF_ERROR(put_meta(db, "format_version", std::int64_t{kIndexFormatVersion}));
  LODE_RETURN_IF_ERROR(put_meta(db, "created_by", "lode " LODE_VERSION));
  LODE_RETURN_IF_ERROR(put_meta(db, "language", settings.analyzer.language));
  LODE_RETURN_IF_ERROR(put_meta(db, "stopwords", std::int64_t{settings.analyzer.stopwords ? 1 : 0}));
  return store_counters(db, Counters{});
}

Result<bool> exists(sql::Db& db) {
  auto st = db.prepare("SELECT 1 FROM sqlite_schema WHERE type='table' AND name='meta'");
  if (!st) return st.status();
  bool found = st->step();
  if (!st->status().ok()) return st->status();
  return found;
}

Result<IndexSettings> load_settings(sql::Db& db) {
  auto st = db.prepare("SELECT key, value FROM meta");
  if (!st) return st.status();
  IndexSettings s;
  std::int64_t version = -1;
  bool have_language = false;
  while (st->step()) {
    auto key = st->text(0);
    if (key == "format_version") version = st->i64(1);
    if (key == "language") {
      s.analyzer.language = std::string(st->text(1));
      have_language = true;
    }
    if (key == "stopwords") s.analyzer.stopwords = st->i64(1) != 0;
  }
  LODE_RETURN_IF_ERROR(st->status());
  if (version < 0 || !have_language)
    return Status::Corruption(db.path() + ": not a lode index (meta table incomplete)");
  if (version < kIndexFormatVersion)
    return Status::Unsupported(db.path() + ": index format " + std::to_string(version) +
                               " is older than this lode's (" + std::to_string(kIndexFormatVersion) +
                               "); re-index: remove the file and run 'lode index' on your folders again");
  if (version > kIndexFormatVersion)
    return Status::Corruption(db.path() + ": index format " + std::to_string(version) +
                              " is newer than this lode understands (" +
                              std::to_string(kIndexFormatVersion) + ")");
  return s;
}

Result<Counters> load_counters(sql::Db& db) {
  auto st = db.prepare("SELECT key, value FROM meta");
  if (!st) return st.status();
  Counters c;
  while (st->step()) {
    auto key = st->text(0);
    auto v = static_cast<std::uint64_t>(st->i64(1));
    if (key == "documents") c.documents = v;
    else if (key == "dead_documents") c.dead_documents = v;
    else if (key == "length_title") c.total_length[0] = v;
    else if (key == "length_body") c.total_length[1] = v;
    else if (key == "files") c.files = v;
    else if (key == "terms") c.terms = v;
    else if (key == "postings") c.postings = v;
    else if (key == "next_doc_id") c.next_doc_id = v;
    else if (key == "generation") c.generation = v;
  }
  LODE_RETURN_IF_ERROR(st->status());
  return c;
}

Status store_counters(sql::Db& db, const Counters& c) {
  auto i = [](std::uint64_t v) { return static_cast<std::int64_t>(v); };
  LODE_RETURN_IF_ERROR(put_meta(db, "documents", i(c.documents)));
  LODE_RETURN_IF_ERROR(put_meta(db, "dead_documents", i(c.dead_documents)));
  LODE_RETURN_IF_ERROR(put_meta(db, "length_title", i(c.total_length[0])));
  LODE_RETURN_IF_ERROR(put_meta(db, "length_body", i(c.total_length[1])));
  LODE_RETURN_IF_ERROR(put_meta(db, "files", i(c.files)));
  LODE_RETURN_IF_ERROR(put_meta(db, "terms", i(c.terms)));
  LODE_RETURN_IF_ERROR(put_meta(db, "postings", i(c.postings)));
  LODE_RETURN_IF_ERROR(put_meta(db, "generation", i(c.generation)));
  return put_meta(db, "next_doc_id", i(c.next_doc_id));
}

Status configure(sql::Db& db, bool writer) {
  if (writer) {
    LODE_RETURN_IF_ERROR(db.exec("PRAGMA journal_mode=WAL"));
    LODE_RETURN_IF_ERROR(db.exec("PRAGMA synchronous=NORMAL"));
    LODE_RETURN_IF_ERROR(db.exec("PRAGMA cache_size=-65536"));  // 64 MiB
  } else {
    LODE_RETURN_IF_ERROR(db.exec("PRAGMA cache_size=-32768"));  // 32 MiB
  }
  return db.exec("PRAGMA temp_store=MEMORY");
}

namespace {

// `path` as an SQLite URI filename: '%', '?', '#' and bytes outside
// printable ASCII percent-encoded (https://www.sqlite.org/uri.html).
std::string uri_of(const std::string& path) {
  static constexpr char kHex[] = "0123456789ABCDEF";
  std::string out = "file:";
  for (const char ch : path) {
    const auto c = static_cast<unsigned char>(ch);
    if (c <= 0x20 || c >= 0x7F || c == '%' || c == '?' || c == '#') {
      out += '%';
      out += kHex[c >> 4];
      out += kHex[c & 0xF];
    } else {
      out += ch;
    }
  }
  return out;
}

// Opens `path` (through `uri` if given) with `flags` and reads the schema once, so that a file SQLite cannot
// read fails here; *rc receives SQLite's primary result code (SQLITE_OK when read).
Result<sql::Db> open_and_probe(const std::string& path, const std::string& uri, int flags, int* rc) {
  *rc = SQLITE_CANTOPEN;
  auto db = sql::Db::open(path, flags, uri);
  if (!db) return db.status();
  LODE_RETURN_IF_ERROR(configure(*db, false));
  LODE_RETURN_IF_ERROR(db->exec("PRAGMA query_only=1"));
  auto probe = db->prepare("SELECT count(*) FROM sqlite_schema");
  *rc = probe ? (probe->step() ? SQLITE_OK : sqlite3_extended_errcode(db->raw()) & 0xff)
              : sqlite3_extended_errcode(db->raw()) & 0xff;
  if (*rc != SQLITE_OK) return db->error(*rc, "cannot read");
  return db;
}

}  // namespace

Result<sql::Db> open_for_reading(const std::string& path) {
  std::error_code ec;
  if (!std::filesystem::exists(path, ec))
    return Status::NotFound("no index at " + path + " (create one with: lode index --index " + path + " FOLDER)");
  // Read-write so the WAL's -shm file can be made and shared with a writer;
  // nothing is written (query_only). A read-only file in a writable folder
  // opens this way too (SQLite falls back to reading).
  int rc = SQLITE_OK;
  auto db = open_and_probe(path, "", SQLITE_OPEN_READWRITE, &rc);
  if (db || (rc != SQLITE_READONLY && rc != SQLITE_CANTOPEN)) return db;
  // A folder we may not write: SQLite cannot make the -shm file a WAL reader
  // needs. With no WAL content pending, the file alone is the last commit:
  // read it as immutable (no -shm, no locks, nothing created). Pending WAL
  // content cannot be read without a -shm file: say so rather than read an
  // older state.
  const std::string wal = path + "-wal";
  if (std::filesystem::file_size(wal, ec) > 0 && !ec)
    return Status::IOError(path + ": cannot read: its folder is not writable and " + wal +
                           " holds commits not yet in the index file (run any lode command with write access "
                           "to the folder once, or copy the index with its -wal file somewhere writable)");
  return open_and_probe(path, uri_of(path) + "?immutable=1", SQLITE_OPEN_READONLY | SQLITE_OPEN_URI, &rc);
}

Result<std::vector<RecordedProblem>> load_problems(sql::Db& db) {
  auto q = db.prepare("SELECT path, error, message, time_ns FROM problems ORDER BY path, rowid");
  if (!q) return q.status();
  std::vector<RecordedProblem> out;
  while (q->step())
    out.push_back(RecordedProblem{std::string(q->text(0)), q->i64(1) != 0, std::string(q->text(2)), q->i64(3)});
  LODE_RETURN_IF_ERROR(q->status());
  return out;
}

std::uint64_t bytes_on_disk(const std::string& path) {
  std::error_code ec;
  std::uint64_t total = 0;
  for (const char* suffix : {"", "-wal"}) {
    auto n = std::filesystem::file_size(path + suffix, ec);
    if (!ec) total += n;
  }
  return total;
}

}  // namespace lode::schema
