// The page in headless Chromium (Debian's chromium; the test starts the
// server and the browser itself): type a query with the keyboard, see the
// hits the API returns, open a breakdown, switch the model and see the order
// change, page, open a document, load a shared URL. Screenshots of a desktop
// and a phone viewport are left in the test's working folder for review.
#include <algorithm>

#include "browser.h"
#include "server_util.h"

using namespace lode;
using namespace lode::test;

namespace {

// The documents shown, in order.
const char* kShownDocs = "[...document.querySelectorAll('.hit')].map(h => h.dataset.doc)";
const char* kReady = "document.body.dataset.ready === '1'";

std::vector<std::string> api_docs(httplib::Client& c, const httplib::Params& params) {
  auto j = body_json(get(c, "/api/v1/search", params));
  std::vector<std::string> docs;
  for (auto& h : j["hits"]) docs.push_back(h["doc"]);
  return docs;
}

// The sample indexed into a temporary folder and served on loopback.
struct ServedSample {
  TempDir dir;
  std::string index = dir.str("sample.sqlite");
  bool indexed = (index_sample(index), true);  // before the server opens it
  LiveServer server{index};
};

}  // namespace

TEST_CASE("Browser: search, breakdown, model switch, paging and the reader in headless Chromium") {
  ServedSample sample;
  TempDir& dir = sample.dir;
  LiveServer& server = sample.server;
  auto c = server.client();
  const std::string query = "storm damage";
  auto bm25 = api_docs(c, {{"q", query}, {"top", "10"}});
  auto tfidf = api_docs(c, {{"q", query}, {"top", "10"}, {"model", "tfidf"}});
  REQUIRE(bm25.size() == 10);
  REQUIRE(bm25 != tfidf);  // the query must tell the models apart for the check below to mean anything

  Browser browser(dir.str("profile"));
  std::string tab = browser.open(server.url() + "/", 1280, 900, false);

  // Type a query: "/" focuses the box, then real key events and Enter.
  browser.press(tab, "/");
  CHECK(browser.eval(tab, "document.activeElement.id") == "q");
  CHECK(browser.eval(tab, "document.getElementById('q').value") == "");  // the "/" itself is not typed
  browser.type(tab, query);
  browser.press(tab, "Enter");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && document.querySelectorAll('.hit').length > 0"));
  CHECK(browser.eval(tab, kShownDocs).get<std::vector<std::string>>() == bm25);
  CHECK(browser.eval(tab, "new URLSearchParams(location.search).get('q')") == query);
  // Each hit's term bar covers its whole score (shares sum to 100%).
  auto widths = browser.eval(tab, "[...document.querySelectorAll('.hit')].map(h => [...h.querySelectorAll("
                                  "'.shares span')].reduce((s, e) => s + parseFloat(e.style.width), 0))");
  for (auto& w : widths) CHECK(std::abs(w.get<double>() - 100.0) < 0.1);

  // Open the breakdown of the first hit with the keyboard (down from the box, then w).
  CHECK(browser.eval(tab, "document.querySelectorAll('table.breakdown').length") == 0);
  browser.press(tab, "ArrowDown");
  CHECK(browser.eval(tab, "document.activeElement.dataset.doc") == bm25[0]);
  browser.press(tab, "w");
  REQUIRE(browser.wait_for(tab, "document.querySelector('.hit table.breakdown') !== null"));
  auto first = body_json(get(c, "/api/v1/search", {{"q", query}, {"top", "1"}}))["hits"][0];
  CHECK(browser.eval(tab, "document.querySelectorAll('.hit:first-child table.breakdown tbody tr').length") ==
        first["breakdown"].size());
  double shown_score =
      browser.eval(tab, "parseFloat(document.querySelector('.hit:first-child tfoot td:nth-child(2)').textContent)");
  CHECK(std::abs(shown_score - first["score"].get<double>()) < 5e-5);  // printed with 4 decimals
  browser.screenshot(tab, "server-page-desktop.png");

  // Switch the model: the order changes to the TF-IDF ranking.
  browser.eval(tab, "document.querySelector('input[name=model][value=tfidf]').click()");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && document.body.dataset.model === 'tfidf'"));
  auto shown = browser.eval(tab, kShownDocs).get<std::vector<std::string>>();
  CHECK(shown == tfidf);
  CHECK(shown != bm25);
  CHECK(browser.eval(tab, "new URLSearchParams(location.search).get('model')") == "tfidf");
  // Back to BM25 with the keyboard ("m"), then k1 re-ranks live.
  browser.press(tab, "m");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && document.body.dataset.model === 'bm25'"));
  CHECK(browser.eval(tab, kShownDocs).get<std::vector<std::string>>() == bm25);
  browser.eval(tab, "(() => { const k = document.getElementById('k1'); k.value = '0'; "
                    "k.dispatchEvent(new Event('input')); })()");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && new URLSearchParams(location.search).get('k1') === '0'"));
  CHECK(browser.eval(tab, kShownDocs).get<std::vector<std::string>>() == api_docs(c, {{"q", query}, {"k1", "0"}}));

  // Pruned retrieval left the count a lower bound: the page says "at least"
  // and still offers the next page.
  auto counted = body_json(get(c, "/api/v1/search", {{"q", query}, {"k1", "0"}}));
  REQUIRE(counted["matched_exact"] == false);
  const std::string status = browser.eval(tab, "document.getElementById('status').textContent");
  CHECK(status.find("of at least " + std::to_string(counted["matched"].get<int>()) + " matching") != std::string::npos);
  CHECK(browser.eval(tab, "document.getElementById('page-of').textContent") == "page 1");
  CHECK(browser.eval(tab, "document.getElementById('next').disabled") == false);

  // Paging: the next page starts at rank 11.
  browser.eval(tab, "document.getElementById('next').click()");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && document.querySelector('.hit .rank').textContent === '11'"));
  CHECK(browser.eval(tab, kShownDocs).get<std::vector<std::string>>() ==
        api_docs(c, {{"q", query}, {"k1", "0"}, {"offset", "10"}}));

  // The reader shows the stored text with the query's words marked; Esc closes it.
  browser.press(tab, "j");
  browser.press(tab, "o");
  REQUIRE(browser.wait_for(tab, "!document.getElementById('reader').hidden && "
                                "document.querySelectorAll('#reader-text mark').length > 0"));
  auto marked = browser.eval(tab, "[...document.querySelectorAll('#reader-text mark')].map(m => m.textContent."
                                  "toLowerCase())");
  for (auto& m : marked) {
    std::string w = m;
    CHECK((w.rfind("storm", 0) == 0 || w.rfind("damag", 0) == 0));
  }
  browser.press(tab, "Escape");
  CHECK(browser.eval(tab, "document.getElementById('reader').hidden") == true);

  // A shared URL shows the same results without typing, on a phone-sized screen.
  std::string phone = browser.open(server.url() + "/?q=storm+damage&model=tfidf", 390, 844, true);
  REQUIRE(browser.wait_for(phone, std::string(kReady) + " && document.querySelectorAll('.hit').length > 0"));
  CHECK(browser.eval(phone, kShownDocs).get<std::vector<std::string>>() == tfidf);
  // Nothing spills sideways on the phone.
  CHECK(browser.eval(phone, "document.documentElement.scrollWidth <= window.innerWidth") == true);
  browser.screenshot(phone, "server-page-phone.png");
}

TEST_CASE("Browser: empty start page, filter and field-weight controls, words in the legend, query warnings") {
  ServedSample sample;
  TempDir& dir = sample.dir;
  LiveServer& server = sample.server;
  auto c = server.client();
  Browser browser(dir.str("profile"));
  std::string tab = browser.open(server.url() + "/", 1280, 900, false);

  // The start page shows no pager (the `hidden` attribute must win over its flex layout).
  REQUIRE(browser.wait_for(tab, "document.getElementById('status').textContent.startsWith('Type a query')"));
  CHECK(browser.eval(tab, "document.getElementById('pager').hidden") == true);
  CHECK(browser.eval(tab, "getComputedStyle(document.getElementById('pager')).display") == "none");

  // The legend names terms by the words of the documents, not by their stems.
  browser.press(tab, "/");
  browser.type(tab, "storm damage");
  browser.press(tab, "Enter");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && document.querySelectorAll('.hit').length > 0"));
  auto legend = browser.eval(tab, "[...document.querySelectorAll('#legend li')].map(li => li.textContent)")
                    .get<std::vector<std::string>>();
  CHECK(std::find(legend.begin(), legend.end(), "damage") != legend.end());
  CHECK(std::find(legend.begin(), legend.end(), "damag") == legend.end());
  CHECK(browser.eval(tab, "[...document.querySelectorAll('#legend li')].some(li => li.title === 'index term: damag')") ==
        true);

  // A kind filter control: the hits are the API's for the query with @kind:markdown.
  browser.eval(tab, "(() => { const s = document.getElementById('f-kind'); s.value = 'markdown'; "
                    "s.dispatchEvent(new Event('change')); })()");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && new URLSearchParams(location.search).get('kind') === 'markdown'"));
  auto filtered = api_docs(c, {{"q", "storm damage @kind:markdown"}, {"top", "10"}});
  REQUIRE(!filtered.empty());
  CHECK(browser.eval(tab, kShownDocs).get<std::vector<std::string>>() == filtered);
  CHECK(browser.eval(tab, "[...document.querySelectorAll('.hit .kind')].every(k => k.textContent === 'markdown')") ==
        true);
  // Dates and author: the letters of late 1987 by A. Tulloch.
  browser.eval(tab, "(() => { const s = document.getElementById('f-kind'); s.value = ''; "
                    "s.dispatchEvent(new Event('change')); "
                    "for (const [id, v] of [['f-since', '1987-10'], ['f-until', '1987-12'], ['f-by', 'tulloch']]) {"
                    " const e = document.getElementById(id); e.value = v; e.dispatchEvent(new Event('change')); } })()");
  REQUIRE(browser.wait_for(tab, std::string(kReady) + " && new URLSearchParams(location.search).get('by') === 'tulloch'"));
  auto dated = api_docs(c, {{"q", "storm damage @since:1987-10 @until:1987-12 @by:tulloch"}, {"top", "10"}});
  REQUIRE(!dated.empty());
  CHECK(browser.eval(tab, kShownDocs).get<std::vector<std::string>>() == dated);

  // The title-weight control re-ranks as the API's title_weight does.
  browser.eval(tab, "(() => { for (const id of ['f-since', 'f-until', 'f-by']) { const e = document.getElementById(id);"
                    " e.value = ''; e.dispatchEvent(new Event('change')); }"
                    " const t = document.getElementById('title_weight'); t.value = '0';"
                    " t.dispatchEvent(new Event('input')); })()");
  REQUIRE(browser.wait_for(tab, std::string(kReady) +
                                    " && new URLSearchParams(location.search).get('title_weight') === '0'"
                                    " && !new URLSearchParams(location.search).get('by')"));
  auto untitled = api_docs(c, {{"q", "storm damage"}, {"title_weight", "0"}, {"top", "10"}});
  CHECK(untitled != api_docs(c, {{"q", "storm damage"}, {"top", "10"}}));  // the control has something to show
  CHECK(browser.eval(tab, kShownDocs).get<std::vector<std::string>>() == untitled);

  // A query warning shows in the status line.
  std::string warned = browser.open(server.url() + "/?q=%22north+quay", 1280, 900, false);
  REQUIRE(browser.wait_for(warned, std::string(kReady)));
  const std::string status = browser.eval(warned, "document.getElementById('status').textContent");
  CHECK(status.find("unbalanced quote") != std::string::npos);
}
