// The page's sift review, why-not box and what-moved table in headless
// Chromium (Debian's chromium), against a real server on loopback started
// with --allow-judging: judgments made with the y / n keys land in the index
// file and read back through the API.
#include "server/browser.h"
#include "server/server_util.h"

using namespace lode;
using namespace lode::test;

TEST_CASE("page: review mode judges with the keyboard, why-not and what-moved render the API's answers") {
  TempDir dir;
  std::string index = dir.str("sample.sqlite");
  index_sample(index);
  ServeOptions o;
  o.allow_judging = true;
  LiveServer server(index, o);
  auto c = server.client();
  Browser browser(dir.str("profile"));
  std::string tab = browser.open(server.url() + "/?q=fog+horn+compressor", 1280, 900, false);
  REQUIRE(browser.wait_for(tab, "document.querySelectorAll('.hit').length > 0"));

  // Sift: open the tool, name it, start from the page's query, judge by keys.
  browser.eval(tab, "document.querySelector('[data-tool=sift]').click()");
  REQUIRE(browser.wait_for(tab, "document.getElementById('sift-pick').options.length > 0"));
  browser.eval(tab, "document.getElementById('sift-name').value = 'fog'; "
                    "document.querySelector('#tool-sift button').click()");
  REQUIRE(browser.wait_for(tab, "document.querySelector('#sift-card h3') !== null"));
  std::string first = browser.eval(tab, "document.getElementById('sift-card').dataset.doc");
  browser.press(tab, "y");
  REQUIRE(browser.wait_for(tab, "document.getElementById('sift-status').textContent.includes('1 judged')"));
  // The next batch (two documents) comes up; judge one not relevant.
  REQUIRE(browser.wait_for(tab, "document.getElementById('sift-card').dataset.doc !== '" + first + "'"));
  std::string second = browser.eval(tab, "document.getElementById('sift-card').dataset.doc");
  browser.press(tab, "n");
  REQUIRE(browser.wait_for(tab, "document.getElementById('sift-status').textContent.includes('2 judged')"));
  auto st = body_json(get(c, "/api/v1/sift", {{"name", "fog"}, {"judgments", "true"}}));
  REQUIRE(st["judgments"].size() == 2);
  CHECK(st["judgments"][0]["doc"] == first);
  CHECK(st["judgments"][0]["relevant"] == true);
  CHECK(st["judgments"][1]["doc"] == second);
  CHECK(st["judgments"][1]["relevant"] == false);
  CHECK(st["judgments"][0]["reviewer"] == "page");
  browser.press(tab, "Escape");
  CHECK(browser.eval(tab, "document.getElementById('tool-sift').hidden") == true);

  // Why not: the rank shown is the API's.
  const std::string doc = "reports/1988-annual-report.txt";
  auto w = body_json(get(c, "/api/v1/whynot", {{"q", "fog horn compressor"}, {"doc", doc}}));
  browser.eval(tab, "document.querySelector('[data-tool=whynot]').click(); "
                    "document.getElementById('whynot-doc').value = '" + doc + "'; "
                    "document.querySelector('#tool-whynot form').requestSubmit()");
  REQUIRE(browser.wait_for(tab, "document.querySelector('#whynot-out .verdict') !== null"));
  std::string verdict = browser.eval(tab, "document.querySelector('#whynot-out .verdict').textContent");
  if (w["rank"].is_null()) CHECK(verdict.find("ranks") == std::string::npos);
  else CHECK(verdict.find("ranks " + std::to_string(w["rank"].get<int>()) + " of") != std::string::npos);
  CHECK(browser.eval(tab, "document.querySelectorAll('#whynot-out li').length") == w["words"].size());

  // What moved: pin the defaults, move k1, read the counts line.
  browser.eval(tab, "document.querySelector('[data-tool=moved]').click(); "
                    "document.querySelector('#tool-moved button').click()");
  REQUIRE(browser.wait_for(tab, "document.querySelector('#moved-out .verdict') !== null"));
  browser.eval(tab, "const k = document.getElementById('k1'); k.value = '0.1'; k.dispatchEvent(new Event('change'))");
  auto m = body_json(get(c, "/api/v1/moved", {{"q", "fog horn compressor"}, {"k1", "0.10"}, {"b", "0.75"}}));
  std::string line = "top 10: " + std::to_string(m["counts"]["entered"].get<int>()) + " entered";
  REQUIRE(browser.wait_for(tab, "document.querySelector('#moved-out .verdict').textContent.startsWith('" + line + "')"));
  CHECK(browser.eval(tab, "document.querySelectorAll('#moved-out tr').length - 1") == m["docs"].size());
  browser.screenshot(tab, "screening-page.png");
}
