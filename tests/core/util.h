// Helpers shared by the core tests: scratch folders, files, small indexes.
#pragma once

#include <doctest/doctest.h>

#include <atomic>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <map>
#include <sys/wait.h>
#include <memory>
#include <random>
#include <string>
#include <vector>

#include "lode/index.h"
#include "lode/ranking.h"

namespace lode::test {

namespace fs = std::filesystem;

// A fresh folder under the system temp dir, removed with its contents at scope end.
class TempDir {
 public:
  TempDir() {
    static std::atomic<int> counter{0};
    std::random_device rd;
    path_ = fs::temp_directory_path() /
            ("lode-test-" + std::to_string(rd()) + "-" + std::to_string(counter++));
    fs::create_directories(path_);
  }
  ~TempDir() {
    std::error_code ec;
    fs::remove_all(path_, ec);
  }
  const fs::path& path() const { return path_; }
  std::string str(const std::string& rel = "") const { return rel.empty() ? path_.string() : (path_ / rel).string(); }

 private:
  fs::path path_;
};

inline void write_file(const fs::path& p, const std::string& content) {
  fs::create_directories(p.parent_path());
  std::ofstream out(p, std::ios::binary);
  out << content;
}

inline std::string read_text(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), {});
}

// A document with just identity and text (other fields at their defaults).
inline DocumentInput doc_input(std::string id, std::string title, std::string body) {
  DocumentInput d;
  d.external_id = std::move(id);
  d.title = std::move(title);
  d.body = std::move(body);
  d.kind = "text";
  return d;
}

// Builds an index at `path` holding one file per document (title, body).
inline void build_index(const std::string& path, const std::vector<std::pair<std::string, std::string>>& docs,
                        const AnalyzerOptions& analyzer = {}, const WriterOptions& writer = {}) {
  auto w = IndexWriter::open(path, IndexSettings{analyzer}, writer);
  REQUIRE_MESSAGE(w.ok(), w.status().to_string());
  for (std::size_t i = 0; i < docs.size(); ++i) {
    std::string id = "d" + std::to_string(i + 1);
    FileRecord f{"/virtual/" + id, "/virtual", 1, 1, "h" + id, "text"};
    REQUIRE((*w)->put_file(f, {doc_input(id, docs[i].first, docs[i].second)}).ok());
  }
  REQUIRE((*w)->commit().ok());
}

// Runs a shell command, returns its stdout; exit status in *rc.
inline std::string run(const std::string& cmd, int* rc = nullptr) {
  std::string out;
  FILE* p = popen(cmd.c_str(), "r");
  REQUIRE(p != nullptr);
  char buf[4096];
  std::size_t n;
  while ((n = fread(buf, 1, sizeof buf, p)) > 0) out.append(buf, n);
  int status = pclose(p);
  if (rc) *rc = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  return out;
}

// An index opened for searching; the searcher goes before the reader it uses.
struct OpenIndex {
  std::unique_ptr<IndexReader> reader;
  std::unique_ptr<Searcher> searcher;
};
inline OpenIndex open_index(const std::string& path, const ReaderOptions& options = {}) {
  auto reader = IndexReader::open(path, options);
  REQUIRE_MESSAGE(reader.ok(), reader.status().to_string());
  auto searcher = Searcher::create(**reader);
  REQUIRE_MESSAGE(searcher.ok(), searcher.status().to_string());
  return OpenIndex{std::move(reader).value(), std::move(searcher).value()};
}

// Scores of every hit of `query` keyed by external id.
inline std::map<std::string, double> scores_of(IndexReader& reader, const std::string& query,
                                               SearchOptions options) {
  options.top = 100000;
  options.snippets = false;
  auto searcher = Searcher::create(reader);
  REQUIRE(searcher.ok());
  auto res = (*searcher)->search(query, options);
  REQUIRE_MESSAGE(res.ok(), res.status().to_string());
  std::map<std::string, double> out;
  for (auto& h : res->hits) out[h.external_id] = h.score;
  return out;
}

}  // namespace lode::test
