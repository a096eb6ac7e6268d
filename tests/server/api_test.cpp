// The JSON API over loopback with a real client: the same results as
// `lode search --json`, the document, breakdown, stats and listing routes, and
// RFC 9457 problems for every kind of bad request.
#include <set>

#include "server_util.h"

using namespace lode;
using namespace lode::test;

namespace {

// `lode search --json` for the same query and options (the reference).
nlohmann::json cli_search(const std::string& index, const std::string& args) {
  int rc = -1;
  std::string out = run(kLode + " --index " + index + " search --json " + args, &rc);
  REQUIRE_MESSAGE(rc == 0, out);
  return nlohmann::json::parse(out);
}

}  // namespace

TEST_CASE("API: search equals the CLI's --json output, field for field") {
  Fixture f;
  LiveServer server(f.index);
  auto c = server.client();
  struct Case {
    httplib::Params params;
    std::string cli;
  };
  std::vector<Case> cases = {
      {{{"q", "storm damage"}}, "'storm damage'"},
      {{{"q", "fog horn compressor"}, {"top", "20"}}, "--top 20 'fog horn compressor'"},
      {{{"q", "kelp growth"}, {"model", "tfidf"}, {"weighting", "ltc.ltc"}},
       "--model tfidf --weighting ltc.ltc 'kelp growth'"},
      {{{"q", "generator fuel"}, {"k1", "2"}, {"b", "0.3"}, {"offset", "3"}, {"top", "4"}},
       "--k1 2 --b 0.3 --offset 3 --top 4 'generator fuel'"},
      {{{"q", "+seal pup -grey"}, {"title_weight", "0"}}, "--title-weight 0 '+seal pup -grey'"},
      {{{"q", "storm damage"}, {"fields", "sum"}, {"title_weight", "0.5"}}, "--fields sum --title-weight 0.5 'storm damage'"},
      {{{"q", "\"tide gauge\""}, {"model", "tfidf"}, {"log_base", "2.718281828459045"}},
       "--model tfidf --log-base 2.718281828459045 '\"tide gauge\"'"},
      {{{"q", "storm damage harbour"}, {"top", "2"}, {"count_all", "true"}}, "--top 2 --count-all 'storm damage harbour'"},
      {{{"q", "kelp"}, {"model", "tfidf"}, {"log_base", "e"}}, "--model tfidf --log-base e kelp"},
      {{{"q", "kelp growth"}, {"model", "tfidf"}, {"fields", "sum"}}, "--model tfidf --fields sum 'kelp growth'"},
      {{{"q", "storm \"great storm"}}, "'storm \"great storm'"},
  };
  for (auto& k : cases) {
    CAPTURE(k.cli);
    auto r = get(c, "/api/v1/search", k.params);
    REQUIRE_MESSAGE(r->status == 200, r->body);
    CHECK(r->get_header_value("Content-Type") == "application/json");
    auto api = body_json(r);
    auto cli = cli_search(f.index, k.cli);
    CHECK(api == cli);
    CHECK(!cli["hits"].empty());
  }
  // Pruned (default) and counted-all searches return the same hits; only the count may differ.
  auto pruned = body_json(get(c, "/api/v1/search", {{"q", "storm damage harbour"}, {"top", "2"}}));
  auto counted = body_json(get(c, "/api/v1/search", {{"q", "storm damage harbour"}, {"top", "2"}, {"count_all", "true"}}));
  CHECK(pruned["hits"] == counted["hits"]);
  CHECK(counted["matched_exact"] == true);
  CHECK(pruned["matched"].get<int>() <= counted["matched"].get<int>());
  CHECK(counted["matched"].get<int>() > 2);
  // POST takes the same parameters as a JSON object.
  auto r = c.Post("/api/v1/search", R"({"q": "storm damage", "top": 5, "breakdown": false})", "application/json");
  REQUIRE(r);
  REQUIRE(r->status == 200);
  auto posted = body_json(r);
  auto cli = cli_search(f.index, "--top 5 'storm damage'");
  REQUIRE(posted["hits"].size() == 5);
  for (std::size_t i = 0; i < 5; ++i) {
    CHECK(posted["hits"][i]["doc"] == cli["hits"][i]["doc"]);
    CHECK(posted["hits"][i]["score"] == cli["hits"][i]["score"]);
    CHECK(!posted["hits"][i].contains("breakdown"));
  }
}

TEST_CASE("API: query warnings, and the words behind the terms") {
  Fixture f;
  LiveServer server(f.index);
  auto c = server.client();
  auto has = [](const nlohmann::json& j, const std::string& part) {
    for (auto& w : j["warnings"])
      if (w.get<std::string>().find(part) != std::string::npos) return true;
    return false;
  };
  CHECK(has(body_json(get(c, "/api/v1/search", {{"q", "\"north quay"}})), "unbalanced quote"));
  CHECK(has(body_json(get(c, "/api/v1/search", {{"q", "author:tulloch"}})), "'author:' is not a field"));
  CHECK(has(body_json(get(c, "/api/v1/search", {{"q", "storm @kind:photo"}})), "@kind:photo matches no document"));
  auto only = body_json(get(c, "/api/v1/search", {{"q", "-storm"}}));
  CHECK(has(only, "only excluded words"));
  CHECK(only["hits"].empty());

  // Every term of the breakdowns has a word; the word analyzes back to the
  // term, and it is a word of the text, not a stem ("damage", never "damag").
  auto res = body_json(get(c, "/api/v1/search", {{"q", "storm damage jetties"}}));
  auto analyzer = Analyzer::create(AnalyzerOptions{});
  REQUIRE(analyzer.ok());
  std::set<std::string> terms;
  for (auto& h : res["hits"])
    for (auto& b : h["breakdown"]) terms.insert(b["term"].get<std::string>());
  REQUIRE(terms.count("damag") == 1);
  CHECK(res["words"]["damag"] == "damage");
  for (auto& t : terms) {
    CAPTURE(t);
    REQUIRE(res["words"].contains(t));
    const std::string word = res["words"][t];
    auto analyzed = (*analyzer)->analyze(word);
    REQUIRE(analyzed.tokens.size() == 1);
    CHECK(analyzed.tokens[0].term == t);
  }
  // Without breakdowns there are no terms to name.
  auto bare = body_json(get(c, "/api/v1/search", {{"q", "storm"}, {"breakdown", "false"}}));
  CHECK(bare["words"].empty());
}

TEST_CASE("API: breakdown, document, stats, listing and health agree with the index") {
  Fixture f;
  LiveServer server(f.index);
  auto c = server.client();
  auto hits = body_json(get(c, "/api/v1/search", {{"q", "storm damage"}, {"top", "3"}}))["hits"];
  REQUIRE(hits.size() == 3);
  std::string doc = hits[1]["doc"];

  // breakdown: the same breakdown and score as the hit in the ranked list.
  auto ex = body_json(get(c, "/api/v1/breakdown", {{"q", "storm damage"}, {"doc", doc}}));
  CHECK(ex["schema"] == "lode.breakdown/1");
  CHECK(ex["matches"] == true);
  CHECK(ex["hit"]["doc"] == doc);
  CHECK(ex["hit"]["score"] == hits[1]["score"]);
  CHECK(ex["hit"]["breakdown"] == hits[1]["breakdown"]);
  auto none = body_json(get(c, "/api/v1/breakdown", {{"q", "xylophone"}, {"doc", doc}}));
  CHECK(none["matches"] == false);
  CHECK(none["hit"]["score"] == 0.0);

  // document: the stored text exactly, each mark on a word that analyzes to a query term.
  auto d = get(c, "/api/v1/document", {{"doc", doc}, {"q", "storm damage"}});
  REQUIRE_MESSAGE(d->status == 200, d->body);
  auto dj = body_json(d);
  CHECK(dj["schema"] == "lode.document/1");
  auto reader = IndexReader::open(f.index);
  REQUIRE(reader.ok());
  {
    auto scope = (*reader)->begin();
    REQUIRE(scope.ok());
    auto id = (*reader)->find_external(doc);
    REQUIRE(id.ok());
    CHECK(dj["fields"]["body"]["text"] == (*reader)->stored_text(*id, Field::kBody).value());
    CHECK(dj["fields"]["title"]["text"] == (*reader)->stored_text(*id, Field::kTitle).value());
  }
  auto analyzer = Analyzer::create((*reader)->settings().analyzer);
  REQUIRE(analyzer.ok());
  std::string body = dj["fields"]["body"]["text"];
  auto marks = dj["fields"]["body"]["marks"];
  REQUIRE(!marks.empty());
  for (auto& m : marks) {
    std::string word = body.substr(m[0].get<std::size_t>(), m[1].get<std::size_t>() - m[0].get<std::size_t>());
    auto tokens = (*analyzer)->analyze(word).tokens;
    REQUIRE(tokens.size() == 1);
    CHECK((tokens[0].term == "storm" || tokens[0].term == "damag"));
  }
  // Without a query nothing is marked; excluded words are not marked either.
  CHECK(body_json(get(c, "/api/v1/document", {{"doc", doc}}))["fields"]["body"]["marks"].empty());
  CHECK(body_json(get(c, "/api/v1/document", {{"doc", doc}, {"q", "-storm -damage"}}))["fields"]["body"]["marks"]
            .empty());

  // stats: what `lode stats --json` prints.
  int rc = -1;
  auto cli_stats = nlohmann::json::parse(run(kLode + " --index " + f.index + " stats --json", &rc));
  CHECK(body_json(get(c, "/api/v1/stats")) == cli_stats);

  // listing: one snapshot, so the count and the items agree.
  std::size_t listed = 0;
  for (std::size_t offset = 0;; offset += 100) {
    auto page = body_json(get(c, "/api/v1/documents", {{"top", "100"}, {"offset", std::to_string(offset)}}));
    CHECK(page["documents"] == cli_stats["documents"]);
    if (page["items"].empty()) break;
    listed += page["items"].size();
  }
  CHECK(listed == cli_stats["documents"].get<std::size_t>());

  auto health = body_json(get(c, "/api/v1/health"));
  CHECK(health["serving"] == true);
  CHECK(health["indexes"][0]["name"] == "main");
  CHECK(health["indexes"][0]["documents"] == cli_stats["documents"]);

  // The OpenAPI file and the page are served from the binary.
  auto spec = get(c, "/api/v1/openapi.yaml");
  CHECK(spec->status == 200);
  CHECK(spec->body.rfind("openapi: 3.1", 0) == 0);
  auto page = get(c, "/");
  CHECK(page->status == 200);
  CHECK(page->get_header_value("Content-Type") == "text/html; charset=utf-8");
  CHECK(page->body.find("/app.js") != std::string::npos);
  CHECK(get(c, "/app.js")->status == 200);
  CHECK(get(c, "/style.css")->status == 200);
}

TEST_CASE("API: bad parameters get problem details naming the parameter") {
  Fixture f;
  ServeOptions o;
  o.limits.max_page = 50;
  LiveServer server(f.index, o);
  auto c = server.client();
  struct Case {
    httplib::Params params;
    int status;
    std::string slug, parameter, in_detail;
  };
  std::string many_words;
  for (int i = 0; i < 40; ++i) many_words += "word" + std::to_string(i) + "x ";
  std::vector<Case> cases = {
      {{}, 400, "bad-parameter", "q", "required"},
      {{{"q", "storm"}, {"model", "nope"}}, 400, "bad-parameter", "model", "'nope'"},
      {{{"q", "storm"}, {"k1", "abc"}}, 400, "bad-parameter", "k1", "'abc'"},
      {{{"q", "storm"}, {"k1", "nan"}}, 400, "bad-parameter", "k1", "'nan'"},
      {{{"q", "storm"}, {"b", "1.5"}}, 400, "bad-parameter", "b", "0 to 1"},
      {{{"q", "storm"}, {"top", "-1"}}, 400, "bad-parameter", "top", "whole number"},
      {{{"q", "storm"}, {"top", "51"}}, 400, "over-limit", "top", "at most 50"},
      {{{"q", "storm"}, {"offset", "9990"}, {"top", "20"}}, 400, "over-limit", "offset", "10000"},
      {{{"q", "storm"}, {"weighting", "lnc.ltc"}}, 400, "bad-parameter", "weighting", "tfidf"},
      {{{"q", "storm"}, {"model", "tfidf"}, {"k1", "1"}}, 400, "bad-parameter", "k1", "bm25"},
      {{{"q", "storm"}, {"fields", "both"}}, 400, "bad-parameter", "fields", "'both'"},
      {{{"q", "storm"}, {"model", "tfidf"}, {"fields", "apart"}}, 400, "bad-parameter", "fields", "'apart'"},
      {{{"q", "storm"}, {"model", "tfidf"}, {"weighting", "lxc.ltc"}}, 400, "bad-parameter", "weighting", "x"},
      {{{"q", "storm"}, {"breakdown", "maybe"}}, 400, "bad-parameter", "breakdown", "true or false"},
      {{{"q", "storm"}, {"count_all", "all"}}, 400, "bad-parameter", "count_all", "true or false"},
      {{{"q", "storm"}, {"qq", "1"}}, 400, "bad-parameter", "qq", "unknown parameter"},
      {{{"q", std::string(1100, 'a')}}, 400, "over-limit", "q", "1024"},
      {{{"q", many_words}}, 400, "over-limit", "q", "32"},
      {{{"q", "storm"}, {"index", "other"}}, 404, "unknown-index", "index", "main"},
  };
  for (auto& k : cases) {
    CAPTURE(k.parameter);
    CAPTURE(k.in_detail);
    auto j = expect_problem(get(c, "/api/v1/search", k.params), k.status, k.slug);
    CHECK(j["parameter"] == k.parameter);
    CHECK(j["instance"] == "/api/v1/search");
    CHECK_MESSAGE(j["detail"].get<std::string>().find(k.in_detail) != std::string::npos, j["detail"]);
  }
  // A parameter given twice is ambiguous.
  expect_problem(get(c, "/api/v1/search?q=a&q=b"), 400, "bad-parameter");
  // The document routes need a known id.
  auto j = expect_problem(get(c, "/api/v1/document", {{"doc", "no/such/doc.txt"}}), 404, "not-found");
  CHECK(j["detail"].get<std::string>().find("no/such/doc.txt") != std::string::npos);
  expect_problem(get(c, "/api/v1/breakdown", {{"q", "storm"}}), 400, "bad-parameter");
  expect_problem(get(c, "/api/v1/breakdown", {{"q", "storm"}, {"doc", "nope"}}), 404, "not-found");
  // A body that is not a JSON object, and routes that do not exist.
  auto r = c.Post("/api/v1/search", "[1,2]", "application/json");
  REQUIRE(r);
  expect_problem(r, 400, "bad-body");
  expect_problem(get(c, "/api/v1/nothing-here"), 404, "not-found");
}

TEST_CASE("API: path traversal and oversized bodies are refused") {
  Fixture f;
  ServeOptions o;
  o.limits.max_body_bytes = 4096;
  LiveServer server(f.index, o);
  auto c = server.client();
  for (std::string path : {"/../../../../etc/passwd", "/%2e%2e/%2e%2e/etc/passwd", "/..%2f..%2fetc%2fpasswd",
                           "/style.css/../../../etc/passwd", "/./index.html", "/..\\..\\etc\\passwd"}) {
    CAPTURE(path);
    auto r = c.Get(path);
    REQUIRE(r);
    CHECK(r->status == 400);
    CHECK(r->body.find("root:") == std::string::npos);
  }
  // No route reads the disk: an absolute path is just an unknown page.
  auto r = get(c, "/etc/passwd");
  expect_problem(r, 404, "not-found");
  CHECK(r->body.find("root:") == std::string::npos);

  std::string big = R"({"q": ")" + std::string(8000, 'a') + R"("})";
  auto p = c.Post("/api/v1/search", big, "application/json");
  REQUIRE(p);
  auto j = expect_problem(p, 413, "body-too-large");
  CHECK(j["detail"].get<std::string>().find("4096") != std::string::npos);
  // The server still answers after refusing.
  CHECK(get(c, "/api/v1/health")->status == 200);
}

TEST_CASE("API: the access token is enforced on every route when set") {
  Fixture f;
  ServeOptions o;
  o.token = "tok-3f9a-river";
  LiveServer server(f.index, o);
  auto c = server.client();
  for (std::string path : {"/api/v1/health", "/api/v1/search?q=storm", "/api/v1/stats", "/api/v1/openapi.yaml",
                           "/app.js", "/"}) {
    CAPTURE(path);
    auto r = get(c, path);
    CHECK(r->status == 401);
    CHECK(r->get_header_value("WWW-Authenticate").find("Bearer") == 0);
    CHECK(r->body.find("storm") == std::string::npos);
    CHECK(get(c, path, {}, {{"Authorization", "Bearer tok-3f9a-rive"}})->status == 401);
    CHECK(get(c, path, {}, {{"Authorization", "Bearer tok-3f9a-river2"}})->status == 401);
    CHECK(get(c, path, {}, {{"Authorization", "Bearer tok-3f9a-river"}})->status == 200);
    CHECK(get(c, path, {}, {{"Cookie", "x=1; lode_access=tok-3f9a-river"}})->status == 200);
  }
  expect_problem(get(c, "/api/v1/health"), 401, "unauthorized");
  // A browser gets the unlock form; the right token sets the cookie.
  auto page = get(c, "/", {}, {{"Accept", "text/html"}});
  CHECK(page->status == 401);
  CHECK(page->body.find("action=\"/unlock\"") != std::string::npos);
  auto bad = c.Post("/unlock", "token=wrong", "application/x-www-form-urlencoded");
  REQUIRE(bad);
  CHECK(bad->status == 401);
  CHECK(bad->get_header_value("Set-Cookie").empty());
  auto good = c.Post("/unlock", "token=tok-3f9a-river", "application/x-www-form-urlencoded");
  REQUIRE(good);
  CHECK(good->status == 303);
  CHECK(good->get_header_value("Set-Cookie").find("lode_access=tok-3f9a-river") == 0);
  CHECK(good->get_header_value("Set-Cookie").find("HttpOnly") != std::string::npos);
}

TEST_CASE("API: refuses bad server settings with a message") {
  Fixture f;
  ServeOptions o;
  CHECK(HttpServer::create({}, o).status().code() == Code::kInvalidArgument);
  CHECK(HttpServer::create({{"a b", f.index}}, o).status().message().find("'a b'") != std::string::npos);
  CHECK(HttpServer::create({{"a", f.index}, {"a", f.index}}, o).status().message().find("twice") !=
        std::string::npos);
  auto missing = HttpServer::create({{"a", f.dir.str("missing.sqlite")}}, o);
  CHECK(missing.status().code() == Code::kNotFound);
  CHECK(missing.status().message().find("missing.sqlite") != std::string::npos);
  o.token = "has space";
  CHECK(HttpServer::create({{"a", f.index}}, o).status().code() == Code::kInvalidArgument);
  CHECK(is_loopback_address("127.0.0.1"));
  CHECK(is_loopback_address("::1"));
  CHECK(!is_loopback_address("0.0.0.0"));
  CHECK(!is_loopback_address("192.168.1.4"));
}

TEST_CASE("API: several indexes are served by name") {
  Fixture f;
  TempDir other;
  std::string small = other.str("small.sqlite");
  build_index(small, {{"Tern census", "arctic tern nests on the north shore"}});
  LiveServer server({{"sample", f.index}, {"terns", small}});
  auto c = server.client();
  auto a = body_json(get(c, "/api/v1/search", {{"q", "tern"}, {"index", "terns"}}));
  CHECK(a["matched"] == 1);
  CHECK(a["hits"][0]["doc"] == "d1");
  auto health = body_json(get(c, "/api/v1/health"));
  REQUIRE(health["indexes"].size() == 2);
  CHECK(health["indexes"][1]["documents"] == 1);
  auto s = body_json(get(c, "/api/v1/search", {{"q", "storm"}}));  // default: the first
  CHECK(s["matched"].get<int>() > 1);
}

TEST_CASE("CLI: lode serve prints its address, answers, and stops on SIGTERM") {
  Fixture f;
  ServeProcess serve("--index " + f.index + " serve --port 0", f.dir.str("serve.out"), f.dir.str("serve.err"));
  httplib::Client c("127.0.0.1", serve.port());
  auto r = c.Get("/api/v1/health");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK(serve.err_text().find("serving 'sample'") != std::string::npos);
  CHECK(serve.stop() == 0);
}
