// The block postings cursor over one term (private to src/index).
#pragma once

#include <memory>

#include "index/sqlite.h"
#include "lode/index.h"

namespace lode {

// Creates a cursor reading `term`'s blocks through `db` (which must stay open
// and inside one read transaction for the cursor's life).
std::unique_ptr<PostingCursor> make_block_cursor(sql::Db& db, TermId term);

}  // namespace lode
