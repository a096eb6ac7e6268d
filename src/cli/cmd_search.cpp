// `lode search`: one query (text or --json) or a batch file (TREC run out).
#include <algorithm>
#include <cstdio>
#include <iostream>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/model_options.h"
#include "lode/eval.h"
#include "lode/json_text.h"
#include "lode/present.h"
#include "lode/ranking.h"

namespace lode::cli {
namespace {

struct SearchArgs {
  std::string query;
  ModelArgs model;
  std::size_t top = 10, offset = 0;
  bool json = false, why = false, no_snippets = false, count_all = false;
  bool query_syntax = false;  // --batch: parse the queries as query syntax (default: plain text)
  std::string batch, run_tag;
};

Result<SearchOptions> to_options(const SearchArgs& a) {
  auto o = to_search_options(a.model);
  if (!o) return o.status();
  o->top = a.top;
  o->offset = a.offset;
  o->snippets = !a.no_snippets;
  o->count_all = a.count_all;
  return o;
}

// Marks snippet words: bold on a terminal, [brackets] in a pipe.
std::string marked(const Snippet& s, bool tty) {
  std::string out;
  std::size_t at = 0;
  for (auto& [b, e] : s.marks) {
    out.append(s.text, at, b - at);
    out += tty ? "\033[1m" : "[";
    out.append(s.text, b, e - b);
    out += tty ? "\033[0m" : "]";
    at = e;
  }
  out.append(s.text, at, std::string::npos);
  return out;
}

void print_breakdown(const Hit& h, Model model) {
  std::printf("      %-18s %-5s %4s %6s %8s %6s %8s %9s %8s %6s %12s\n", "term", "field", "tf", "df", "idf", "len",
              "avg_len", model == Model::kBm25 ? "tf_part" : "doc_wt", "query_wt", "fw", "contribution");
  for (const TermContribution& c : h.breakdown)
    std::printf("      %-18s %-5s %4u %6llu %8.4f %6u %8.2f %9.4f %8.4f %6.2f %12.6f\n",
                (c.proximity ? "~" + c.term : c.term).c_str(), std::string(field_name(c.field)).c_str(), c.tf, static_cast<unsigned long long>(c.df), c.idf,
                c.doc_length, c.avg_length, c.tf_part, c.query_weight, c.field_weight, c.contribution);
  std::printf("      %-18s %87s %12.6f\n", "= score", "", h.score);
  if (std::any_of(h.breakdown.begin(), h.breakdown.end(), [](const TermContribution& c) { return c.proximity; }))
    std::printf("      (~word: the word's proximity part, BM25TP: idf = min(1, ln N/df), tf_part = saturated "
                "nearness to other query words)\n");
}

int run_single(IndexReader& reader, Searcher& searcher, const SearchArgs& a, const SearchOptions& o) {
  auto results = searcher.search(a.query, o);
  if (!results) return fail(results.status());
  if (a.json) {
    auto analyzer = Analyzer::create(reader.settings().analyzer);
    if (!analyzer) return fail(analyzer.status());
    auto words = hit_words(reader, **analyzer, results->hits);
    if (!words) return fail(words.status());
    nlohmann::json out = results_json(a.query, *results, o);
    out["words"] = *words;
    std::cout << dump_json(out, 2) << "\n";
    return kExitOk;
  }
  for (auto& w : results->warnings) std::fprintf(stderr, "lode: note: %s\n", w.c_str());
  bool tty = stdout_styled();
  // A pruned count is the documents scored before the top ones were certain:
  // say so, since it grows with --top and --offset.
  if (results->matched_exact)
    std::printf("%llu matching documents (%s)\n", static_cast<unsigned long long>(results->matched),
                describe(o).c_str());
  else
    std::printf("at least %llu matching documents (%s; counting stops once the top %zu are certain, so the "
                "number grows with --top; --count-all counts every one)\n",
                static_cast<unsigned long long>(results->matched), describe(o).c_str(), o.offset + o.top);
  for (std::size_t i = 0; i < results->hits.size(); ++i) {
    const Hit& h = results->hits[i];
    std::printf("%3zu. %9.4f  %s\n", o.offset + i + 1, h.score, h.title.empty() ? "(untitled)" : shown(h.title).c_str());
    std::printf("      %s  [%s]\n", shown(h.external_id).c_str(), h.kind.c_str());
    if (!h.snippet.text.empty()) std::printf("      %s\n", marked(h.snippet, tty).c_str());
    if (a.why) print_breakdown(h, o.model);
  }
  return kExitOk;
}

int run_batch(Searcher& searcher, const SearchArgs& a, SearchOptions o, CLI::App& app) {
  auto queries = read_queries(a.batch);
  if (!queries) return fail(queries.status());
  if (!app.count("--top")) o.top = 1000;  // the usual depth of a TREC run
  o.breakdown = false;
  o.snippets = false;
  o.reading = a.query_syntax ? QueryReading::kSyntax : QueryReading::kPlain;
  // A TREC run has no header line: say how the queries were read on stderr.
  std::fprintf(stderr, "lode: %s, %s\n", describe(o).c_str(), describe_reading(o.reading).c_str());
  std::string tag = a.run_tag.empty() ? "lode-" + std::string(model_name(o.model)) : a.run_tag;
  for (const QueryLine& q : *queries) {
    auto results = searcher.search(q.text, o);
    if (!results) {
      // The same error as for the query given alone, and the same exit code.
      std::fprintf(stderr, "lode: query %s: %s\n", shown(q.id, stderr).c_str(),
                   shown(results.status().to_string(), stderr).c_str());
      return exit_code(results.status());
    }
    for (std::size_t i = 0; i < results->hits.size(); ++i)
      std::printf("%s\n", format_run_line(q.id, results->hits[i].external_id, o.offset + i + 1,
                                          results->hits[i].score, tag).c_str());
  }
  return kExitOk;
}

int run_search(const SearchArgs& a, const Setup& setup, CLI::App& app) {
  if (a.batch.empty() == a.query.empty())
    return fail(Status::InvalidArgument("give either a QUERY or --batch FILE"));
  if (a.query_syntax && a.batch.empty())
    return fail(Status::InvalidArgument("--query-syntax applies to --batch (a single QUERY is always parsed)"));
  auto opts = to_options(a);
  if (!opts) return fail(opts.status());
  auto reader = IndexReader::open(resolve_index(setup));
  if (!reader) return fail(reader.status());
  auto searcher = Searcher::create(**reader);
  if (!searcher) return fail(searcher.status());
  return a.batch.empty() ? run_single(**reader, **searcher, a, *opts) : run_batch(**searcher, a, *opts, app);
}

}  // namespace

Runner add_search_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<SearchArgs>();
  app.add_option("query", a->query, "the query: words, \"phrases\", +required, -excluded, title:word, @kind:... filters (may begin with -)");
  apply_config(a->model, setup.config);
  add_model_options(app, a->model);
  app.add_option("--top", a->top, "number of hits (default 10; 1000 with --batch)");
  app.add_option("--offset", a->offset, "skip this many hits first (paging)");
  app.add_flag("--json", a->json, "print results as JSON (schema lode.search/1)");
  app.add_flag("--why", a->why, "print each hit's per-term score breakdown as a table");
  app.add_flag("--no-snippets", a->no_snippets, "leave snippets out (faster)");
  app.add_flag("--count-all", a->count_all,
               "count every matching document exactly (slower: scores them all instead of pruning)");
  app.add_option("--batch", a->batch, "queries file, one 'id<TAB>text' per line; prints a TREC run")
      ->type_name("FILE");
  app.add_flag("--query-syntax", a->query_syntax,
               "--batch: read the queries as query syntax (\"phrases\", +required, -excluded); default: plain text");
  app.add_option("--run-tag", a->run_tag, "last column of the TREC run (default lode-MODEL)");
  return [a, &setup, &app] { return run_search(*a, setup, app); };
}

}  // namespace lode::cli
