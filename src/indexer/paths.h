// Path rules shared by index_paths() and watch_paths() (private to src/indexer/).
#pragma once

#include <string>
#include <string_view>
#include <vector>

namespace lode::indexer {

// `root` made absolute and lexically normal, without a trailing '/'.
std::string absolute_root(const std::string& root);

// True when `path` is strictly inside folder `folder`.
bool is_under(std::string_view path, std::string_view folder);

// The root a file was found under: the longest root equal to it or a folder
// above it; "" when none.
std::string root_of(const std::string& path, const std::vector<std::string>& roots);

// The id users see: the path relative to its root (the file name for a root
// that is a file), so runs and judgments survive moving the archive.
std::string relative_id(const std::string& path, const std::string& root);

// A document's id: a reader's id "<path>#<n>" (JSON Lines lines, mbox
// messages) becomes "<relative id>#<n>"; a JSON Lines record id is kept; any
// other id becomes the relative id.
std::string document_id(const std::string& reader_id, const std::string& path, const std::string& rel,
                        const std::string& kind);

// The kind a file name suggests ("pdf" for a.pdf, "html" for a.htm.gz), for
// files that failed before a reader could say.
std::string kind_of_name(const std::string& path);

// What of a file's name decides how it is read: its extension, lower case,
// with the one inside a ".gz" (".md.gz" for Notes.MD.gz, "" for README).
// A renamed file keeps its documents only when this is unchanged: a.md
// renamed to a.txt reads differently (title, markup), a.txt to a.png not at all.
std::string reading_suffix(const std::string& path);

}  // namespace lode::indexer
