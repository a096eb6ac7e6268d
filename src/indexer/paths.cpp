#include "indexer/paths.h"

#include <algorithm>
#include <filesystem>

namespace lode::indexer {

namespace fs = std::filesystem;

std::string absolute_root(const std::string& root) {
  std::error_code ec;
  fs::path p = fs::absolute(fs::path(root), ec).lexically_normal();
  std::string s = p.generic_string();
  while (s.size() > 1 && s.back() == '/') s.pop_back();
  return s;
}

bool is_under(std::string_view path, std::string_view folder) {
  if (folder == "/") return path.size() > 1 && path[0] == '/';
  return path.size() > folder.size() && path.compare(0, folder.size(), folder) == 0 && path[folder.size()] == '/';
}

std::string root_of(const std::string& path, const std::vector<std::string>& roots) {
  std::string best;
  for (auto& r : roots)
    if ((path == r || is_under(path, r)) && r.size() > best.size()) best = r;
  return best;
}

std::string relative_id(const std::string& path, const std::string& root) {
  if (path == root) return fs::path(path).filename().generic_string();
  return path.substr(root == "/" ? 1 : root.size() + 1);
}

std::string document_id(const std::string& reader_id, const std::string& path, const std::string& rel,
                        const std::string& kind) {
  if (reader_id.size() > path.size() && reader_id.compare(0, path.size() + 1, path + "#") == 0)
    return rel + reader_id.substr(path.size());
  if (kind == "jsonl" && !reader_id.empty()) return reader_id;
  return rel;
}

std::string reading_suffix(const std::string& path) {
  std::string name = fs::path(path).filename().string();
  std::transform(name.begin(), name.end(), name.begin(),
                 [](unsigned char c) { return static_cast<char>(c >= 'A' && c <= 'Z' ? c + 32 : c); });
  const bool gz = name.size() > 3 && name.ends_with(".gz");
  if (gz) name.resize(name.size() - 3);
  return fs::path(name).extension().string() + (gz ? ".gz" : "");
}

std::string kind_of_name(const std::string& path) {
  std::string ext = reading_suffix(path);
  if (ext.ends_with(".gz")) ext.resize(ext.size() - 3);
  if (ext == ".pdf") return "pdf";
  if (ext == ".html" || ext == ".htm" || ext == ".xhtml") return "html";
  if (ext == ".docx" || ext == ".odt" || ext == ".epub") return ext.substr(1);
  if (ext == ".eml" || ext == ".mbox" || ext == ".mbx") return "email";
  if (ext == ".md" || ext == ".markdown") return "markdown";
  if (ext == ".jsonl" || ext == ".ndjson") return "jsonl";
  return "text";
}

}  // namespace lode::indexer
