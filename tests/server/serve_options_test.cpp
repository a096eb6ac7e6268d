// The serving options of a real server on loopback: names it is reached by,
// the token's override of the Host check, the head deadline, health under
// saturation, the result cache across a commit, and the access log.
#include <sqlite3.h>

#include <atomic>
#include <regex>
#include <sstream>

#include "server_util.h"

using namespace lode;
using namespace lode::test;

namespace {

nlohmann::json cache_of(httplib::Client& c) { return body_json(get(c, "/api/v1/health"))["result_cache"]; }

}  // namespace

TEST_CASE("Serve: names listed with reached_as are answered, and a token replaces the Host check") {
  Fixture f;
  ServeOptions o;
  o.reached_as = {"Archive.Lan", "search.example.org"};
  LiveServer named(f.index, o);
  auto c = named.client();
  CHECK(get(c, "/api/v1/stats", {}, {{"Host", "archive.lan:8443"}})->status == 200);
  CHECK(get(c, "/api/v1/stats", {}, {{"Host", "search.example.org"}})->status == 200);
  expect_problem(get(c, "/api/v1/stats", {}, {{"Host", "archive.lan.evil.example"}}), 421, "host-not-allowed");

  o.reached_as.clear();
  o.token = "tok-tern-91";
  LiveServer guarded(f.index, o);
  auto g = guarded.client();
  auto r = get(g, "/api/v1/stats", {}, {{"Host", "evil.example"}, {"Authorization", "Bearer tok-tern-91"}});
  CHECK(r->status == 200);
  CHECK(get(g, "/api/v1/stats", {}, {{"Host", "evil.example"}})->status == 401);
}

TEST_CASE("Serve: a request head that trickles past the deadline gets 408, and others are served meanwhile") {
  Fixture f;
  ServeOptions o;
  o.threads = 2;
  o.limits.head_deadline = std::chrono::milliseconds(800);
  LiveServer server(f.index, o);
  std::vector<std::unique_ptr<RawConnection>> slow, idle;
  open_stalled(server.port(), 8, slow, idle);
  auto c = server.client();
  CHECK(get(c, "/api/v1/search", {{"q", "storm"}})->status == 200);
  CHECK(get(c, "/api/v1/health")->status == 200);
  // Each slow client keeps sending a line, yet is cut off: the deadline is
  // for the whole head, not per read.
  std::string got;
  bool closed = false;
  for (int i = 0; i < 200 && !closed; ++i) {
    (void)slow[0]->send("X-Drip-" + std::to_string(i) + ": 1\r\n");
    got += slow[0]->read_until_closed(std::chrono::milliseconds(50), &closed);
  }
  CHECK(closed);
  expect_problem_text(got, 408, "request-too-slow");
  auto health = body_json(get(c, "/api/v1/health"));
  CHECK(health["connections"]["timed_out"].get<int>() >= 1);
}

TEST_CASE("Serve: health answers while searches saturate the workers and the queue") {
  Fixture f;
  ServeOptions o;
  o.threads = 1;
  o.limits.max_queued = 1;
  o.result_cache_bytes = 0;  // every search runs
  LiveServer server(f.index, o);
  std::atomic<bool> go{true};
  std::atomic<int> ok{0}, busy{0}, other{0};
  std::vector<std::thread> load;
  for (int k = 0; k < 8; ++k)
    load.emplace_back([&] {
      auto c = server.client();
      while (go) {
        auto r = c.Get("/api/v1/search?q=storm+harbour+lamp&count_all=true&top=100");
        if (r && r->status == 200) ++ok;
        else if (r && r->status == 503 && r->get_header_value("Retry-After") == "1") ++busy;
        else ++other;
      }
    });
  auto c = server.client();
  c.set_read_timeout(5, 0);  // a hang guard: health must not wait behind the queue
  int answered = 0;
  for (int i = 0; i < 20; ++i) {
    auto r = c.Get("/api/v1/health");
    answered += r && r->status == 200;
    std::this_thread::sleep_for(std::chrono::milliseconds(50));
  }
  go = false;
  for (auto& t : load) t.join();
  CHECK(answered == 20);
  CHECK(other == 0);
  CHECK(ok > 0);
  MESSAGE("searches answered " << ok.load() << ", refused busy " << busy.load());
}

TEST_CASE("Serve: a repeated search comes from the cache until a commit, which the next search shows") {
  TempDir dir;
  std::string index = dir.str("live.sqlite");
  build_index(index, {{"Lamp room", "the lamp room glass was cleaned"}, {"Tide table", "spring tide at dawn"}});
  LiveServer server(index);
  auto c = server.client();
  auto first = body_json(get(c, "/api/v1/search", {{"q", "heron"}}));
  CHECK(first["matched"] == 0);
  auto before = cache_of(c);
  CHECK(before["misses"] == 1);
  CHECK(before["entries"] == 1);
  // The same search again is a hit; top=10 is another parameter set.
  auto again = get(c, "/api/v1/search", {{"q", "heron"}});
  CHECK(body_json(again) == first);
  CHECK(get(c, "/api/v1/search?top=10&q=heron")->status == 200);
  auto hit = cache_of(c);
  CHECK(hit["hits"] == 1);  // top=10 is another parameter set: a miss of its own
  CHECK(hit["misses"] == 2);
  CHECK(body_json(get(c, "/api/v1/search", {{"q", "heron"}})) == first);
  CHECK(cache_of(c)["hits"] == 2);

  // A writer in this process commits a document with the word.
  {
    auto w = IndexWriter::open(index, IndexSettings{}, WriterOptions{});
    REQUIRE_MESSAGE(w.ok(), w.status().to_string());
    FileRecord file{"/virtual/d9", "/virtual", 1, 1, "hd9", "text"};
    REQUIRE((*w)->put_file(file, {doc_input("d9", "Heron count", "a grey heron on the breakwater")}).ok());
    REQUIRE((*w)->commit().ok());
  }
  auto after = body_json(get(c, "/api/v1/search", {{"q", "heron"}}));
  CHECK(after["matched"] == 1);
  REQUIRE(after["hits"].size() == 1);
  CHECK(after["hits"][0]["doc"] == "d9");
  CHECK(cache_of(c)["misses"] == 3);
  auto health = body_json(get(c, "/api/v1/health"));
  CHECK(health["indexes"][0]["generation"].get<int>() >= 2);
}

TEST_CASE("Serve: the result cache stays within its bytes") {
  Fixture f;
  ServeOptions o;
  o.result_cache_bytes = 64 * 1024;
  LiveServer server(f.index, o);
  auto c = server.client();
  for (int i = 0; i < 120; ++i) REQUIRE(get(c, "/api/v1/search", {{"q", "storm"}, {"offset", std::to_string(i)}})->status == 200);
  auto cache = cache_of(c);
  CHECK(cache["capacity_bytes"] == 64 * 1024);
  CHECK(cache["bytes"].get<std::size_t>() <= 64 * 1024);
  CHECK(cache["entries"].get<int>() > 0);
  CHECK(cache["entries"].get<int>() < 120);
  CHECK(cache["misses"] == 120);
}

TEST_CASE("Serve: SQLite's heap for the readers is capped as the option says") {
  Fixture f;
  ServeOptions o;
  o.sqlite_heap_bytes = 48 * 1024 * 1024;
  auto server = HttpServer::create({{"main", f.index}}, o);
  REQUIRE(server.ok());
  CHECK(sqlite3_soft_heap_limit64(-1) == 48 * 1024 * 1024);  // -1 reads the limit without changing it
  o.sqlite_heap_bytes = 64 * 1024 * 1024;
  REQUIRE(HttpServer::create({{"main", f.index}}, o).ok());
  CHECK(sqlite3_soft_heap_limit64(-1) == 64 * 1024 * 1024);
}

TEST_CASE("Serve: the access log has one line per request, without the query text, and can be off") {
  Fixture f;
  ServeOptions o;
  o.access_log = f.dir.str("access.log");
  {
    LiveServer server(f.index, o);
    auto c = server.client();
    CHECK(get(c, "/api/v1/search", {{"q", "secret heron survey"}})->status == 200);
    CHECK(get(c, "/api/v1/nothing")->status == 404);
    CHECK(get(c, "/api/v1/health")->status == 200);
    CHECK(get(c, "/a b")->status != 200);
  }
  std::string log = read_text(o.access_log);
  CHECK(log.find("heron") == std::string::npos);
  CHECK(log.find("secret") == std::string::npos);
  std::vector<std::string> lines;
  std::istringstream in(log);
  for (std::string line; std::getline(in, line);) lines.push_back(line);
  REQUIRE(lines.size() == 4);
  // time, client, method, path, status, bytes, milliseconds (docs/api.md)
  const std::regex format(R"(\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z 127\.0\.0\.1 [A-Z]+ \S+ \d{3} \d+ \d+\.\d\d)");
  for (auto& line : lines) CHECK_MESSAGE(std::regex_match(line, format), line);
  CHECK(lines[0].find(" GET /api/v1/search 200 ") != std::string::npos);
  CHECK(lines[1].find(" GET /api/v1/nothing 404 ") != std::string::npos);
  CHECK(lines[2].find(" GET /api/v1/health 200 ") != std::string::npos);
  CHECK(lines[3].find(" /a%20b ") != std::string::npos);

  o.access_log.clear();
  std::filesystem::remove(f.dir.str("access.log"));
  {
    LiveServer quiet(f.index, o);
    auto c = quiet.client();
    CHECK(get(c, "/api/v1/health")->status == 200);
  }
  CHECK(!std::filesystem::exists(f.dir.str("access.log")));
  // A log file that cannot be opened is an error naming it.
  o.access_log = f.dir.str("no-such-dir/access.log");
  auto bad = HttpServer::create({{"main", f.index}}, o);
  CHECK(bad.status().code() == Code::kIOError);
  CHECK(bad.status().message().find("no-such-dir/access.log") != std::string::npos);
}

TEST_CASE("CLI: lode serve logs to standard error by default, to a file with --access-log, none with --no-access-log") {
  Fixture f;
  struct Run {
    std::string args;
    std::string where;  // "err", "file" or "" (no log)
  };
  const std::string file = f.dir.str("served.log");
  int n = 0;
  for (const Run& run : {Run{"", "err"}, Run{"--access-log " + file, "file"}, Run{"--no-access-log", ""}}) {
    CAPTURE(run.args);
    std::filesystem::remove(file);
    ++n;
    ServeProcess serve("--index " + f.index + " serve --port 0 " + run.args,
                       f.dir.str("cli" + std::to_string(n) + ".out"), f.dir.str("cli" + std::to_string(n) + ".err"));
    httplib::Client c("127.0.0.1", serve.port());
    auto r = c.Get("/api/v1/health");
    REQUIRE(r);
    CHECK(r->status == 200);
    CHECK(serve.stop() == 0);
    const std::string line = " GET /api/v1/health 200 ";
    CHECK((serve.err_text().find(line) != std::string::npos) == (run.where == "err"));
    CHECK((std::filesystem::exists(file) && read_text(file).find(line) != std::string::npos) == (run.where == "file"));
  }
}
