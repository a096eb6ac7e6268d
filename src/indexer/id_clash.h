// Two files under different roots with the same relative path give the same
// document id (lode/indexer.h states the rule). Private to src/indexer/.
#pragma once

#include <string>
#include <vector>

#include "lode/index.h"
#include "lode/indexer.h"
#include "lode/ingest.h"

namespace lode::indexer {

// One warning per file of `crawled` whose relative id (under its root among
// `roots`) is also the relative id of a different file: another crawled file
// under another root, or a file `held` in the index under another root.
// `held` is every file the index holds; `crawled` is sorted by path.
std::vector<FileProblem> id_clashes(const std::vector<FileInfo>& crawled, const std::vector<std::string>& roots,
                                    const std::vector<FileRecord>& held);

}  // namespace lode::indexer
