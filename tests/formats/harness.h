// Shared scaffolding for the formats suite: a scratch folder, an index in
// it, one-call indexing and searching.
#pragma once

#include <unistd.h>

#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <memory>
#include <random>
#include <string>
#include <vector>

#include "core/util.h"
#include "lode/indexer.h"
#include "lode/ranking.h"

namespace lode::testing {

namespace fs = std::filesystem;

class Scratch {
 public:
  Scratch() {
    std::string tmpl = (fs::temp_directory_path() / "lode-formats-XXXXXX").string();
    if (::mkdtemp(tmpl.data()) == nullptr) throw std::runtime_error("mkdtemp failed");
    root_ = tmpl;
    fs::create_directories(root_ / "tree");
  }
  ~Scratch() {
    std::error_code ec;
    fs::permissions(root_, fs::perms::owner_all, fs::perm_options::add, ec);
    fs::remove_all(root_, ec);
  }
  Scratch(const Scratch&) = delete;
  Scratch& operator=(const Scratch&) = delete;

  // Files go under tree/; the index sits beside it.
  std::string tree() const { return (root_ / "tree").string(); }
  std::string file(const std::string& rel) const { return (root_ / "tree" / rel).string(); }
  std::string index() const { return (root_ / "index.sqlite").string(); }
  std::string other(const std::string& rel) const { return (root_ / rel).string(); }

  std::string write(const std::string& rel, const std::string& bytes) const {
    const fs::path p = root_ / "tree" / rel;
    fs::create_directories(p.parent_path());
    std::ofstream out(p, std::ios::binary | std::ios::trunc);
    out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
    if (!out) throw std::runtime_error("cannot write " + p.string());
    return p.string();
  }

 private:
  fs::path root_;
};

// Runs the real `lode ARGS` (stderr joined to stdout), started through
// `prefix` if given (a command that runs its arguments).
inline std::string lode_run(const std::string& args, int* rc, const std::string& prefix = "") {
  return lode::test::run(prefix + std::string(LODE_BINARY) + " " + args + " 2>&1", rc);
}

// Starts the real `lode ARGS` (no shell) and returns its pid; the caller
// waits for it.
inline pid_t start_lode(const std::vector<std::string>& args) {
  const pid_t pid = fork();
  REQUIRE(pid >= 0);
  if (pid == 0) {
    std::vector<char*> argv{const_cast<char*>(LODE_BINARY)};
    for (const auto& a : args) argv.push_back(const_cast<char*>(a.c_str()));
    argv.push_back(nullptr);
    execv(LODE_BINARY, argv.data());
    _exit(127);
  }
  return pid;
}

inline IndexReport index_tree(const std::string& index, const std::vector<std::string>& roots,
                              IndexRunOptions options = {}) {
  auto w = IndexWriter::open(index, std::nullopt);
  REQUIRE_MESSAGE(w.ok(), w.status().to_string());
  auto r = index_paths(**w, roots, options);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  return std::move(r).value();
}

inline SearchResults search(const std::string& index, const std::string& query, SearchOptions options = {}) {
  auto reader = IndexReader::open(index);
  REQUIRE_MESSAGE(reader.ok(), reader.status().to_string());
  auto searcher = Searcher::create(**reader);
  REQUIRE(searcher.ok());
  auto r = (*searcher)->search(query, options);
  REQUIRE_MESSAGE(r.ok(), r.status().to_string());
  return std::move(r).value();
}

// The ids of the hits, best first.
inline std::vector<std::string> hit_ids(const SearchResults& r) {
  std::vector<std::string> out;
  for (auto& h : r.hits) out.push_back(h.external_id);
  return out;
}

inline bool has_problem(const IndexReport& r, const std::string& path, const std::string& words) {
  for (auto& p : r.problems)
    if (p.path == path && p.message.find(words) != std::string::npos) return true;
  return false;
}

}  // namespace lode::testing
