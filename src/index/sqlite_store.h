// The embedded store: an index as tables in one SQLite file
// (docs/index-format.md), behind the store seam of index/store.h.
#pragma once

#include <memory>
#include <optional>
#include <string>

#include "index/store.h"

namespace lode::store {

// Opens an existing index file to read (read permission alone suffices: see
// schema::open_for_reading). Errors: NotFound (no index at path; the message
// says how to make one), Corruption (not a lode index / newer format), IOError.
Result<std::unique_ptr<ReadStore>> open_sqlite_reader(const std::string& path);

// Opens the index file at `path` to write, creating it with `settings` (or
// the defaults) when it does not exist. Takes the writer lock first: Busy
// naming the holder's pid when another writer has it.
Result<std::unique_ptr<WriteStore>> open_sqlite_writer(const std::string& path,
                                                       const std::optional<IndexSettings>& settings);

}  // namespace lode::store
