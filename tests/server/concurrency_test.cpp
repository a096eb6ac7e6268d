// Many clients search while `lode index`, in another process, adds and
// removes documents in the same index: no request fails, each response is
// one snapshot, and the server shows new commits without a restart.
#include <atomic>
#include <mutex>

#include "server_util.h"

using namespace lode;
using namespace lode::test;

namespace {

// Every response of one kind must hold together on its own.
struct Tally {
  std::atomic<int> ok{0}, failed{0}, inconsistent{0};
  std::atomic<int> saw_with{0}, saw_without{0};
  std::mutex mu;
  std::string first_problem;
  void problem(const std::string& what) {
    std::lock_guard lock(mu);
    if (first_problem.empty()) first_problem = what;
  }
};

constexpr int kBase = 40;    // documents always present
constexpr int kExtra = 12;   // documents added and removed in each round

std::string doc_text(int i, bool extra) {
  // Every document holds "harbour"; the extra ones also hold "marigold".
  return "Report " + std::to_string(i) + "\n\nThe harbour log for day " + std::to_string(i) +
         (extra ? " notes marigold paint on the harbour wall." : " notes calm water.") + "\n";
}

void check_search(httplib::Client& c, Tally& t) {
  auto r = c.Get("/api/v1/search", httplib::Params{{"q", "harbour"}, {"top", "1000"}, {"snippets", "false"}}, httplib::Headers{},
               httplib::Progress());
  if (!r || r->status != 200) {
    ++t.failed;
    t.problem(r ? r->body : httplib::to_string(r.error()));
    return;
  }
  auto j = nlohmann::json::parse(r->body);
  const std::size_t matched = j["matched"].get<std::size_t>();
  const std::size_t hits = j["hits"].size();
  std::size_t marigold = 0;
  for (auto& h : j["hits"]) marigold += h["doc"].get<std::string>().find("extra") != std::string::npos;
  // One snapshot: the count equals the hits, and the extra set is all or nothing.
  bool consistent = matched == hits && (matched == kBase || matched == kBase + kExtra) &&
                    marigold == matched - kBase;
  if (!consistent) {
    ++t.inconsistent;
    t.problem("search: matched " + std::to_string(matched) + ", hits " + std::to_string(hits));
  }
  ++(matched == kBase ? t.saw_without : t.saw_with);
  ++t.ok;
}

void check_listing(httplib::Client& c, Tally& t) {
  auto r = c.Get("/api/v1/documents", httplib::Params{{"top", "1000"}}, httplib::Headers{}, httplib::Progress());
  if (!r || r->status != 200) {
    ++t.failed;
    t.problem(r ? r->body : httplib::to_string(r.error()));
    return;
  }
  auto j = nlohmann::json::parse(r->body);
  const std::size_t documents = j["documents"].get<std::size_t>();
  const std::size_t items = j["items"].size();
  if (documents != items || (documents != kBase && documents != kBase + kExtra)) {
    ++t.inconsistent;
    t.problem("listing: documents " + std::to_string(documents) + ", items " + std::to_string(items));
  }
  ++t.ok;
}

}  // namespace

TEST_CASE("Concurrency: searches stay whole while lode index adds and removes documents") {
  TempDir dir;
  std::string index = dir.str("live.sqlite");
  fs::path archive = dir.path() / "archive", spare = dir.path() / "spare";
  for (int i = 0; i < kBase; ++i) write_file(archive / ("base-" + std::to_string(i) + ".txt"), doc_text(i, false));
  for (int i = 0; i < kExtra; ++i) write_file(spare / ("extra-" + std::to_string(i) + ".txt"), doc_text(i, true));
  int rc = -1;
  std::string out = run(kLode + " --index " + index + " index -q " + archive.string() + " 2>&1", &rc);
  REQUIRE_MESSAGE(rc == 0, out);

  ServeOptions options;
  options.threads = 8;
  options.limits.max_page = 1000;
  LiveServer server(index, options);

  // The writer: a shell loop in another process, each `lode index` one commit.
  constexpr int kRounds = 6;
  std::string script = "set -e; for r in $(seq " + std::to_string(kRounds) + "); do cp " + spare.string() + "/* " +
                       archive.string() + "/; " + kLode + " --index " + index + " index -q " + archive.string() +
                       "; rm " + archive.string() + "/extra-*; " + kLode + " --index " + index + " index -q " +
                       archive.string() + "; done; cp " + spare.string() + "/* " + archive.string() + "/; " + kLode +
                       " --index " + index + " index -q " + archive.string();
  std::atomic<bool> writing{true};
  int writer_rc = -1;
  std::thread writer([&] {
    std::string log = run("sh -c '" + script + "' 2>&1", &writer_rc);
    if (writer_rc != 0) MESSAGE(log);
    writing = false;
  });

  Tally t;
  std::vector<std::thread> clients;
  for (int k = 0; k < 12; ++k)
    clients.emplace_back([&, k] {
      auto c = server.client();
      while (writing) (k % 3 == 2) ? check_listing(c, t) : check_search(c, t);
    });
  for (auto& th : clients) th.join();
  writer.join();
  REQUIRE(writer_rc == 0);

  INFO("first problem: " << t.first_problem);
  CHECK(t.failed == 0);
  CHECK(t.inconsistent == 0);
  CHECK(t.ok > 50);
  MESSAGE("responses: " << t.ok.load() << " (" << t.saw_with.load() << " with the extra set, " << t.saw_without.load()
                         << " without)");

  // The last commit added the extra set: the running server shows it.
  auto c = server.client();
  auto j = body_json(get(c, "/api/v1/search", {{"q", "marigold"}, {"top", "100"}}));
  CHECK(j["matched"] == kExtra);
  auto stats = body_json(get(c, "/api/v1/stats"));
  CHECK(stats["documents"] == kBase + kExtra);
}
