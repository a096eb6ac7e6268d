// The real `lode index`, SIGKILLed at random points while it commits every
// megabyte, on a tree that changes between runs: after every kill the index
// opens and verify_index() finds nothing wrong; a last run to the end equals
// a fresh build of the final tree in statistics and ranked results.
#include <signal.h>
#include <sys/wait.h>

#include <doctest/doctest.h>

#include <chrono>
#include <map>
#include <thread>

#include "harness.h"
#include "lode/verify.h"

namespace {

using namespace lode::testing;

const std::vector<std::string> kWords = {"lamp",  "keeper", "tide",   "fog",    "horn",  "gale",  "slipway",
                                         "pier",  "beacon", "shoal",  "reef",   "gull",  "storm", "ebb",
                                         "flood", "swell",  "lantern", "quay",  "wick",  "lens",  "brass",
                                         "oil",   "log",    "north",  "south",  "mist",  "rock",  "kelp"};

std::string note(std::mt19937& rng, std::size_t words) {
  std::uniform_int_distribution<std::size_t> pick(0, kWords.size() - 1);
  std::string out = kWords[pick(rng)] + " " + kWords[pick(rng)] + "\n";  // the title line
  for (std::size_t i = 0; i < words; ++i) out += kWords[pick(rng)] + (i % 12 == 11 ? ".\n" : " ");
  return out + "\n";
}

// Statistics and every hit's score for a few queries. Keyed by id, not
// by rank: documents with equal scores may come in another order.
struct Outcome {
  lode::CollectionStats stats;
  std::vector<std::map<std::string, double>> results;
};

Outcome outcome(const std::string& index) {
  Outcome o;
  {
    auto reader = lode::IndexReader::open(index);
    REQUIRE(reader.ok());
    auto scope = (*reader)->begin();
    REQUIRE(scope.ok());
    o.stats = (*reader)->stats();
  }
  for (const char* q : {"lamp keeper", "fog horn", "storm tide", "\"north pier\"", "kelp"}) {
    lode::SearchOptions options;
    options.top = 100000;
    options.snippets = false;
    std::map<std::string, double> hits;
    for (const auto& h : search(index, q, options).hits) hits[h.external_id] = h.score;
    o.results.push_back(std::move(hits));
  }
  return o;
}

}  // namespace

TEST_CASE("lode index killed at random points: every kill leaves a sound index, the last run equals a fresh build") {
  Scratch s;
  std::mt19937 rng(14);  // fixed: a failure reproduces
  constexpr int kFiles = 160;
  for (int i = 0; i < kFiles; ++i) s.write("notes/n" + std::to_string(i) + ".txt", note(rng, 2500));
  const std::vector<std::string> args = {"--index", s.index(), "index", "-q", "-j", "2", "--batch-mb", "1", s.tree()};
  std::uniform_int_distribution<int> delay_ms(30, 700), file(0, kFiles - 1);
  // A first run to the end: a run killed before its first commit leaves an
  // empty database, which the next run fills (not damage, nothing to verify).
  int rc = -1;
  std::string out = lode_run("--index '" + s.index() + "' index -q '" + s.tree() + "'", &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  int kills = 0;
  for (int round = 0; round < 20; ++round) {
    const pid_t pid = start_lode(args);
    std::this_thread::sleep_for(std::chrono::milliseconds(delay_ms(rng)));
    const bool killed = ::kill(pid, SIGKILL) == 0;
    int status = 0;
    REQUIRE(::waitpid(pid, &status, 0) == pid);
    kills += killed && WIFSIGNALED(status);
    CAPTURE(round);
    auto report = lode::verify_index(s.index());
    REQUIRE_MESSAGE(report.ok(), report.status().to_string());
    std::string findings;
    for (const auto& f : report->findings) findings += f + "\n";
    REQUIRE_MESSAGE(report->ok(), findings);
    // Between runs: 40 files changed (work enough for a run to be cut
    // short), one added, one renamed, one removed.
    for (int k = 0; k < 40; ++k) {
      const std::string changed = "notes/n" + std::to_string(file(rng)) + ".txt";
      if (std::filesystem::exists(s.file(changed))) s.write(changed, note(rng, 2500));
    }
    s.write("notes/new" + std::to_string(round) + ".txt", note(rng, 1500));
    const std::string from = "notes/n" + std::to_string(file(rng)) + ".txt";
    std::filesystem::create_directories(s.file("moved"));
    if (std::filesystem::exists(s.file(from)))
      std::filesystem::rename(s.file(from), s.file("moved/r" + std::to_string(round) + ".txt"));
    const std::string gone = "notes/n" + std::to_string(file(rng)) + ".txt";
    std::filesystem::remove(s.file(gone));
  }
  MESSAGE(kills << " of 20 runs killed mid-way");
  CHECK(kills >= 10);  // most runs must really be cut short, or the test proves little
  out = lode_run("--index '" + s.index() + "' index -q --batch-mb 1 '" + s.tree() + "'", &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  REQUIRE(lode::verify_index(s.index())->ok());
  const std::string fresh = s.other("fresh.sqlite");
  REQUIRE(lode_run("--index '" + fresh + "' index -q '" + s.tree() + "'", &rc).empty());
  const Outcome a = outcome(s.index()), b = outcome(fresh);
  CHECK(a.stats.documents == b.stats.documents);
  CHECK(a.stats.files == b.stats.files);
  CHECK(a.stats.terms == b.stats.terms);
  CHECK(a.stats.postings == b.stats.postings);
  CHECK(a.stats.total_length == b.stats.total_length);
  REQUIRE(a.results.size() == b.results.size());
  for (std::size_t q = 0; q < a.results.size(); ++q) {
    CAPTURE(q);
    REQUIRE(a.results[q].size() == b.results[q].size());
    for (const auto& [id, score] : a.results[q]) {
      CAPTURE(id);
      REQUIRE(b.results[q].count(id) == 1);
      CHECK(score == doctest::Approx(b.results[q].at(id)).epsilon(1e-9));
    }
  }
}
