// The SQLite schema of a lode index and its meta table (docs/index-format.md).
#pragma once

#include "index/sqlite.h"
#include "index/store.h"
#include "lode/index.h"

namespace lode::schema {

// Creates every table in an empty database and records `settings`.
Status create(sql::Db& db, const IndexSettings& settings);
// True when the database has lode's meta table.
Result<bool> exists(sql::Db& db);
// Reads the recorded analyzer settings; Corruption if the format is newer or absent.
Result<IndexSettings> load_settings(sql::Db& db);

// Counters kept in meta, exact at every commit.
using Counters = store::Counters;
Result<Counters> load_counters(sql::Db& db);
Status store_counters(sql::Db& db, const Counters& c);

// Opens an existing index to read it, never to write, with read permission
// alone: in a folder the user may not write, the file is opened as SQLite's
// "immutable" (nothing created beside it) unless WAL content is pending
// (docs/index-format.md). Reads the schema once. Errors: NotFound (naming
// how to create one) when there is no file at `path`, Corruption when
// SQLite cannot read it as a database, IOError otherwise.
Result<sql::Db> open_for_reading(const std::string& path);

// Applies the pragmas every connection uses (WAL, foreign-free, page cache).
Status configure(sql::Db& db, bool writer);

// Every row of the problems table, by path then insertion order.
Result<std::vector<RecordedProblem>> load_problems(sql::Db& db);

// Size of the index file plus its WAL, in bytes (0 if missing).
std::uint64_t bytes_on_disk(const std::string& path);

}  // namespace lode::schema
