#include "indexer/id_clash.h"

#include <unordered_map>

#include "indexer/paths.h"

namespace lode::indexer {

std::vector<FileProblem> id_clashes(const std::vector<FileInfo>& crawled, const std::vector<std::string>& roots,
                                    const std::vector<FileRecord>& held) {
  // First path seen for each id; files held under the roots of this run are
  // looked at through the crawl, as they may be gone.
  std::unordered_map<std::string, std::string> owner;
  for (const FileRecord& f : held)
    if (root_of(f.path, roots).empty() && !f.root.empty()) owner.emplace(relative_id(f.path, f.root), f.path);
  std::vector<FileProblem> clashes;
  for (const FileInfo& f : crawled) {
    const std::string root = root_of(f.path, roots);
    if (root.empty()) continue;
    auto [it, fresh] = owner.emplace(relative_id(f.path, root), f.path);
    if (fresh || it->second == f.path) continue;
    clashes.push_back({f.path, "document id '" + it->first + "' is also the id of " + it->second +
                                   " (the same relative path under another indexed folder); commands given "
                                   "this id find only one of them. Index each folder into its own "
                                   "index, or index their common parent folder so ids differ"});
  }
  return clashes;
}

}  // namespace lode::indexer
