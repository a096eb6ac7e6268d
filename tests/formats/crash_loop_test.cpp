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

// Every other body word is drawn from thousands of made-up ones, so a run
// fills its one-megabyte batch several times and a kill can land between
// commits as well as inside one.
std::string filler(std::mt19937& rng) {
  static constexpr const char* kSyllables[] = {"ba", "ko", "ri", "tu", "me", "sa", "lo", "ni", "pe", "du", "ga", "vi"};
  std::uniform_int_distribution<int> syllable(0, 11), count(2, 4);
  std::string w;
  for (int i = count(rng); i > 0; --i) w += kSyllables[syllable(rng)];
  return w;
}

std::string note(std::mt19937& rng, std::size_t words) {
  std::uniform_int_distribution<std::size_t> pick(0, kWords.size() - 1);
  std::string out = kWords[pick(rng)] + " " + kWords[pick(rng)] + "\n";  // the title line
  for (std::size_t i = 0; i < words; ++i)
    out += (i % 2 ? filler(rng) : kWords[pick(rng)]) + (i % 12 == 11 ? ".\n" : " ");
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
  std::uniform_int_distribution<int> file(0, kFiles - 1), nth_commit(1, 3), after_ms(0, 15);
  // A first run to the end: a run killed before its first commit leaves an
  // empty database, which the next run fills (not damage, nothing to verify).
  int rc = -1;
  std::string out = lode_run("--index '" + s.index() + "' index -q '" + s.tree() + "'", &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  // What a commit changes, seen by a reader.
  auto committed = [&] {
    auto reader = lode::IndexReader::open(s.index());
    REQUIRE(reader.ok());
    auto scope = (*reader)->begin();
    REQUIRE(scope.ok());
    const auto st = (*reader)->stats();
    return std::pair(st.documents, st.total_length);
  };
  // Kills are timed by what a reader sees, not by the clock (a fixed delay
  // misses on a machine faster or slower than the one it was chosen on):
  // each run is killed a random 0-15 ms after its first, second or third
  // commit, so kills land inside a commit, inside a batch and between them.
  constexpr int kRounds = 20;
  int kills = 0;
  for (int round = 0; round < kRounds; ++round) {
    CAPTURE(round);
    // Before each run: 40 files changed (work enough for several commits),
    // one added, one renamed, one removed.
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

    const int kill_after = nth_commit(rng), delay = after_ms(rng);
    auto seen = committed();
    const pid_t pid = start_lode(args);
    int status = 0, commits = 0;
    while (::waitpid(pid, &status, WNOHANG) == 0) {
      if (const auto now = committed(); now != seen) {
        seen = now;
        if (++commits == kill_after) {
          std::this_thread::sleep_for(std::chrono::milliseconds(delay));
          ::kill(pid, SIGKILL);
          REQUIRE(::waitpid(pid, &status, 0) == pid);
          break;
        }
      }
      std::this_thread::sleep_for(std::chrono::milliseconds(1));
    }
    kills += WIFSIGNALED(status);
    auto report = lode::verify_index(s.index());
    REQUIRE_MESSAGE(report.ok(), report.status().to_string());
    std::string findings;
    for (const auto& f : report->findings) findings += f + "\n";
    REQUIRE_MESSAGE(report->ok(), findings);
  }
  MESSAGE(kills << " of " << kRounds << " runs killed after a commit");
  CHECK(kills >= kRounds / 2);  // runs must really be cut short mid-way, or the test proves little
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
