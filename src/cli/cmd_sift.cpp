// `lode sift ...`: reviews that aim to find every relevant document
// (lode/screening.h). Argument parsing and printing only.
#include <cstdlib>
#include <fstream>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "lode/json_text.h"
#include "lode/screening_json.h"

namespace lode::cli {
namespace {

struct SiftArgs {
  std::string name, query, qid = "sift", out, reviewer;
  std::vector<std::string> seeds, yes, no;
  std::size_t size = 50;
  bool json = false, judgments = false;
  SiftOptions method;
};

std::string default_reviewer() {
  const char* u = std::getenv("USER");
  return u && *u ? u : "unknown";
}

// The index, a read scope on it and its sifts, opened together.
struct Open {
  std::unique_ptr<IndexReader> reader;
  std::optional<IndexReader::ReadScope> scope;
  std::unique_ptr<SiftBook> book;
};
std::optional<Open> open_all(const Setup& setup, bool writable) {
  Open o;
  o.reader = open_reader(setup);
  if (!o.reader) return std::nullopt;
  auto scope = o.reader->begin();
  if (!scope) return fail(scope.status()), std::nullopt;
  o.scope.emplace(std::move(scope.value()));
  auto book = SiftBook::open(resolve_index(setup), writable);
  if (!book) return fail(book.status()), std::nullopt;
  o.book = std::move(book.value());
  return o;
}

std::string percent(double x) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f%%", 100 * x);
  return buf;
}

void print_state(const SiftState& s) {
  std::printf("sift %s — query: %s\n", s.summary.name.c_str(), s.summary.query.c_str());
  std::printf("  in scope %zu, judged %zu (relevant %zu), not yet judged %zu", s.scope, s.summary.judged,
              s.summary.relevant, s.unjudged);
  if (s.changed || s.gone) std::printf(", text changed since judged %zu, gone %zu", s.changed, s.gone);
  std::printf("\n  batches %zu", s.summary.batches);
  if (s.open_batch) std::printf(", batch %lld open with %zu to judge", static_cast<long long>(s.open_batch->number), s.pending.size());
  const KneeVerdict& k = s.knee;
  std::printf("\n  stopping (knee rule): %s — reviewed %zu, found %zu, slope ratio %.1f of %.0f needed%s\n",
              k.stop ? "STOP, the rule says enough" : "keep going", k.reviewed, k.found, k.slope_ratio, k.needed,
              k.reviewed < KneeOptions{}.min_reviewed ? " (and at least 150 reviewed)" : "");
  if (s.recall.known)
    std::printf("  recall estimate: %s (95%% interval %s to %s; check sample %zu, %zu relevant)\n",
                percent(s.recall.value).c_str(), percent(s.recall.low).c_str(), percent(s.recall.high).c_str(),
                s.recall.sample, s.recall.sample_relevant);
  else
    std::printf("  recall estimate: none yet (lode sift check %s draws a random check sample)\n",
                s.summary.name.c_str());
}

void print_batch(const nlohmann::json& b) {
  std::printf("batch %lld (%s, model %s trained on %zu judgments)\n", b["number"].get<long long>(),
              b["kind"].get<std::string>().c_str(), b["model"].get<std::string>().c_str(),
              b["trained_on"].get<std::size_t>());
  for (auto& it : b["items"]) {
    std::string mark = it["judged"].is_null() ? "  ?" : it["judged"].get<bool>() ? "yes" : " no";
    std::printf("  %s  %-24s %s\n", mark.c_str(), it["doc"].get<std::string>().c_str(),
                it["title"].get<std::string>().c_str());
  }
}

// Shows a batch (open or new) and returns 0, or an exit code.
int show(Open& o, const SiftArgs& a, const SiftBatch& b) {
  auto st = o.book->state(*o.reader, a.name);
  if (!st) return fail(st.status());
  auto j = batch_json(*o.reader, a.name, b, *st);
  if (!j) return fail(j.status());
  if (a.json) std::cout << dump_json(*j, 2) << "\n";
  else print_batch(*j);
  return kExitOk;
}

int status(Open& o, const SiftArgs& a) {
  auto st = o.book->state(*o.reader, a.name);
  if (!st) return fail(st.status());
  if (a.json) std::cout << dump_json(sift_json(*st, a.judgments), 2) << "\n";
  else print_state(*st);
  return kExitOk;
}

// Interactive judging on the terminal: y / n / s(kip) / q per document.
int review(Open& o, const SiftArgs& a) {
  for (;;) {
    auto b = o.book->next(*o.reader, a.name);
    if (!b) return b.status().code() == Code::kNotFound ? (std::printf("%s\n", b.status().message().c_str()), kExitOk)
                                                       : fail(b.status());
    auto st = o.book->state(*o.reader, a.name);
    if (!st) return fail(st.status());
    std::printf("— batch %lld: %zu to judge (y relevant, n not, s skip, q quit)\n",
                static_cast<long long>(b->number), st->pending.size());
    for (const std::string& doc : st->pending) {
      auto id = o.reader->find_external(doc);
      if (!id) continue;
      auto info = o.reader->document(*id);
      auto body = o.reader->stored_text(*id, Field::kBody);
      if (!info || !body) return fail(!info ? info.status() : body.status());
      std::string excerpt = body->substr(0, 600);
      std::printf("\n[%s] %s\n%s%s\n> ", doc.c_str(), info->title.c_str(), excerpt.c_str(), body->size() > 600 ? "…" : "");
      std::fflush(stdout);
      std::string line;
      if (!std::getline(std::cin, line) || line == "q") return status(o, a);
      if (line != "y" && line != "n") continue;
      Status s = o.book->mark(*o.reader, a.name, {{doc, line == "y"}}, a.reviewer);
      if (!s.ok()) return fail(s);
    }
    auto after = o.book->state(*o.reader, a.name);
    if (!after) return fail(after.status());
    if (!after->pending.empty()) return status(o, a);  // skipped some: stop here rather than loop on them
    print_state(*after);
    if (after->knee.stop) return kExitOk;
  }
}

}  // namespace

Runner add_sift_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<SiftArgs>();
  app.require_subcommand(1);
  auto name = [&](CLI::App* s) { s->add_option("name", a->name, "the sift's name")->required(); };
  auto json = [&](CLI::App* s) { s->add_flag("--json", a->json, "print as JSON (docs/screening.md)"); };
  auto by = [&](CLI::App* s) { s->add_option("--by", a->reviewer, "reviewer's name (default: $USER)"); };
  auto* start = app.add_subcommand("start", "begin a sift from a query (its @filters set the scope) and seeds");
  name(start);
  start->add_option("query", a->query, "query: its words start the ranking, its @filters limit the scope");
  start->add_option("--seed", a->seeds, "a document known to be relevant (repeatable)");
  start->add_option("--first-batch", a->method.first_batch, "size of the first batch (default 1)");
  start->add_option("--growth", a->method.growth, "each batch grows by this share of the last (default 0.1)");
  start->add_option("--max-batch", a->method.max_batch, "largest batch (default 500)");
  start->add_option("--cost", a->method.classifier.cost, "classifier's C (default 1)");
  by(start);
  json(start);
  auto* next = app.add_subcommand("next", "the batch to judge now (the open one, else a new one)");
  name(next);
  json(next);
  auto* mark = app.add_subcommand("mark", "record judgments");
  name(mark);
  mark->add_option("--yes", a->yes, "documents judged relevant");
  mark->add_option("--no", a->no, "documents judged not relevant");
  by(mark);
  json(mark);
  auto* check = app.add_subcommand("check", "draw a random check sample of the unjudged rest (for the recall estimate)");
  name(check);
  check->add_option("--size", a->size, "documents in the sample (default 50)");
  json(check);
  auto* stat = app.add_subcommand("status", "where a sift stands: judged, found, stopping advice, recall estimate");
  name(stat);
  stat->add_flag("--judgments", a->judgments, "with --json: list every judgment");
  json(stat);
  auto* list = app.add_subcommand("list", "the sifts saved in the index");
  json(list);
  auto* qrels = app.add_subcommand("qrels", "export the judgments as TREC qrels (for lode eval)");
  name(qrels);
  qrels->add_option("--qid", a->qid, "query id written in the qrels (default: sift)");
  qrels->add_option("-o,--output", a->out, "file to write (default: standard output)");
  auto* drop = app.add_subcommand("drop", "delete a sift and its judgments");
  name(drop);
  auto* rev = app.add_subcommand("review", "judge on the terminal, batch after batch, until the rule says stop");
  name(rev);
  by(rev);

  return [a, &setup, start, next, mark, check, stat, list, qrels, drop, rev]() -> int {
    if (a->reviewer.empty()) a->reviewer = default_reviewer();
    bool writes = !(stat->parsed() || list->parsed() || qrels->parsed());
    auto o = open_all(setup, writes);
    if (!o) return kExitError;
    if (start->parsed()) {
      SiftStart s{a->name, a->query, a->seeds, a->reviewer, a->method};
      Status st = o->book->start(*o->reader, s);
      if (!st.ok()) return fail(st);
      return status(*o, *a);
    }
    if (next->parsed()) {
      auto b = o->book->next(*o->reader, a->name);
      if (!b) return fail(b.status());
      return show(*o, *a, *b);
    }
    if (mark->parsed()) {
      std::vector<std::pair<std::string, bool>> js;
      for (auto& d : a->yes) js.emplace_back(d, true);
      for (auto& d : a->no) js.emplace_back(d, false);
      if (js.empty()) return std::fprintf(stderr, "lode: sift mark: give --yes or --no documents\n"), int{kExitUsage};
      Status st = o->book->mark(*o->reader, a->name, js, a->reviewer);
      if (!st.ok()) return fail(st);
      return status(*o, *a);
    }
    if (check->parsed()) {
      auto b = o->book->check_sample(*o->reader, a->name, a->size);
      if (!b) return fail(b.status());
      return show(*o, *a, *b);
    }
    if (stat->parsed()) return status(*o, *a);
    if (list->parsed()) {
      auto l = o->book->list();
      if (!l) return fail(l.status());
      if (a->json) std::cout << dump_json(sift_list_json(*l), 2) << "\n";
      for (auto& s : *l)
        if (!a->json) std::printf("%-20s judged %5zu  relevant %5zu  batches %4zu  %s\n", s.name.c_str(), s.judged,
                                  s.relevant, s.batches, s.query.c_str());
      return int{kExitOk};
    }
    if (qrels->parsed()) {
      auto q = o->book->qrels(a->name, a->qid);
      if (!q) return fail(q.status());
      if (a->out.empty()) std::cout << *q;
      else if (!(std::ofstream(a->out, std::ios::binary) << *q))
        return fail(Status::IOError(a->out + ": cannot write"));
      return int{kExitOk};
    }
    if (drop->parsed()) {
      Status st = o->book->drop(a->name);
      return st.ok() ? int{kExitOk} : fail(st);
    }
    if (rev->parsed()) return review(*o, *a);
    return int{kExitUsage};
  };
}

}  // namespace lode::cli
