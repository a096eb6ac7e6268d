// The why-not, what-moved and sift routes on a real server on loopback, over
// the sample archive indexed by the real lode binary.
#include "server/server_util.h"

using namespace lode;
using namespace lode::test;

namespace {

httplib::Result post(httplib::Client& c, const std::string& path, const nlohmann::json& body) {
  auto r = c.Post(path, body.dump(), "application/json");
  REQUIRE_MESSAGE(r, ("no response from " + path));
  return r;
}

}  // namespace

TEST_CASE("api: /whynot and /moved answer with the CLI's shapes, bad parameters are problems") {
  TempDir dir;
  std::string index = dir.str("s.sqlite");
  index_sample(index);
  LiveServer server(index);
  auto c = server.client();
  auto w = get(c, "/api/v1/whynot", {{"q", "fog horn"}, {"doc", "reports/1988-annual-report.txt"}, {"k", "3"}});
  REQUIRE_MESSAGE(w->status == 200, w->body);
  auto wj = body_json(w);
  CHECK(wj["schema"] == "lode.whynot/1");
  CHECK(wj["k"] == 3);
  CHECK(wj["hit"]["doc"] == "reports/1988-annual-report.txt");
  expect_problem(get(c, "/api/v1/whynot", {{"q", "fog"}}), 400, "bad-parameter");
  expect_problem(get(c, "/api/v1/whynot", {{"q", "fog"}, {"doc", "no/such"}}), 404, "not-found");
  auto m = get(c, "/api/v1/moved", {{"q", "fog horn"}, {"before_k1", "0.3"}, {"k1", "2"}, {"depth", "5"}});
  REQUIRE_MESSAGE(m->status == 200, m->body);
  auto mj = body_json(m);
  CHECK(mj["schema"] == "lode.moved/1");
  CHECK(mj["before"]["k1"] == 0.3);
  CHECK(mj["after"]["k1"] == 2.0);
  CHECK(mj["depth"] == 5);
  auto bad = expect_problem(get(c, "/api/v1/moved", {{"q", "fog"}, {"before_b", "7"}}), 400, "bad-parameter");
  CHECK(bad["parameter"] == "before_b");
}

TEST_CASE("api: sifts are read-only unless the server is started to allow judging") {
  TempDir dir;
  std::string index = dir.str("s.sqlite");
  index_sample(index);
  {
    LiveServer server(index);
    auto c = server.client();
    expect_problem(post(c, "/api/v1/sift/start", {{"name", "fog"}, {"q", "fog horn"}}), 403, "read-only");
    auto l = get(c, "/api/v1/sifts");
    REQUIRE(l->status == 200);
    CHECK(body_json(l)["judging"] == false);
    CHECK(body_json(l)["sifts"].empty());
  }
  ServeOptions o;
  o.allow_judging = true;
  LiveServer server(index, o);
  auto c = server.client();
  auto s = post(c, "/api/v1/sift/start", {{"name", "fog"}, {"q", "fog horn compressor"}, {"reviewer", "ada"}});
  REQUIRE_MESSAGE(s->status == 201, s->body);
  CHECK(body_json(s)["schema"] == "lode.sift/1");
  expect_problem(get(c, "/api/v1/sift/batch", {{"name", "fog"}}), 404, "no-open-batch");
  auto b = post(c, "/api/v1/sift/next", {{"name", "fog"}});
  REQUIRE_MESSAGE(b->status == 200, b->body);
  auto bj = body_json(b);
  REQUIRE(bj["items"].size() == 1);
  std::string doc = bj["items"][0]["doc"];
  CHECK(body_json(get(c, "/api/v1/sift/batch", {{"name", "fog"}}))["number"] == 0);
  auto mk = post(c, "/api/v1/sift/mark", {{"name", "fog"}, {"doc", doc}, {"relevant", true}, {"reviewer", "ada"}});
  REQUIRE_MESSAGE(mk->status == 200, mk->body);
  CHECK(body_json(mk)["judged"] == 1);
  expect_problem(post(c, "/api/v1/sift/mark", {{"name", "fog"}, {"doc", doc}, {"relevant", "maybe"}}), 400,
                 "bad-parameter");
  expect_problem(post(c, "/api/v1/sift/mark", {{"name", "nosuch"}, {"doc", doc}, {"relevant", true}}), 404, "not-found");
  auto st = get(c, "/api/v1/sift", {{"name", "fog"}, {"judgments", "true"}});
  REQUIRE(st->status == 200);
  auto sj = body_json(st);
  CHECK(sj["judgments"][0]["doc"] == doc);
  CHECK(sj["judgments"][0]["reviewer"] == "ada");
  // The judgment is in the index file: a fresh read-only server sees it.
  LiveServer again(index);
  auto c2 = again.client();
  CHECK(body_json(get(c2, "/api/v1/sift", {{"name", "fog"}}))["judged"] == 1);
}
