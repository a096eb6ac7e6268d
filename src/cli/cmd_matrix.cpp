// `lode matrix --out PREFIX`: the document-term matrix as Matrix Market files.
#include <cstdio>
#include <iostream>
#include <map>

#include "cli/commands.h"
#include "cli/common.h"
#include "cli/explore_options.h"
#include "lode/explore_json.h"
#include "lode/json_text.h"

namespace lode::cli {

Runner add_matrix_command(CLI::App& app, const Setup& setup) {
  struct Args {
    std::string out, tf = "count", idf = "log", log_base = "10", norm = "l2", fields = "body";
    MatrixOptions o;
    bool json = false, quiet = false;
  };
  auto a = std::make_shared<Args>();
  app.add_option("--out", a->out, "writes PREFIX.mtx, PREFIX.terms and PREFIX.docs")->required()->type_name("PREFIX");
  app.add_option("--tf", a->tf, "count | share (count/length) | log (1 + log tf) | binary (default count)");
  app.add_option("--idf", a->idf, "none | log (log N/df) | smooth (log((1+N)/(1+df)) + 1) (default log)");
  app.add_option("--log-base", a->log_base, "base of tf and idf logs: a number or e (default 10)");
  app.add_option("--norm", a->norm, "l2 | none (default l2)");
  app.add_option("--fields", a->fields, "body | title | both (default body)");
  app.add_option("--min-df", a->o.min_df, "drop terms in fewer documents (default 1)");
  app.add_option("--max-df", a->o.max_df, "drop terms in a larger share of documents, 0..1 (default 1)");
  app.add_option("--max-terms", a->o.max_terms, "keep the terms of highest df only (default 0 = all)");
  app.add_flag("--json", a->json, "print the summary as JSON (schema lode.matrix/1)");
  app.add_flag("-q,--quiet", a->quiet, "no progress on the terminal");
  return [a, &setup] {
    static const std::map<std::string, char> tfs{{"count", 'n'}, {"share", 'r'}, {"log", 'l'}, {"binary", 'b'}};
    static const std::map<std::string, char> idfs{{"none", 'n'}, {"log", 't'}, {"smooth", 's'}};
    static const std::map<std::string, std::array<bool, kFieldCount>> fields{
        {"body", {false, true}}, {"title", {true, false}}, {"both", {true, true}}};
    MatrixOptions o = a->o;
    if (!tfs.count(a->tf)) return fail(Status::InvalidArgument("--tf must be count, share, log or binary"));
    if (!idfs.count(a->idf)) return fail(Status::InvalidArgument("--idf must be none, log or smooth"));
    if (a->norm != "l2" && a->norm != "none") return fail(Status::InvalidArgument("--norm must be l2 or none"));
    if (!fields.count(a->fields)) return fail(Status::InvalidArgument("--fields must be body, title or both"));
    auto base = parse_log_base(a->log_base, "--log-base");
    if (!base) return fail(base.status());
    o.tf = tfs.at(a->tf);
    o.idf = idfs.at(a->idf);
    o.log_base = *base;
    o.l2 = a->norm == "l2";
    o.fields = fields.at(a->fields);
    if (!a->quiet && stderr_is_tty())
      o.progress = [](std::size_t done, std::size_t total) {
        std::fprintf(stderr, "\rdocuments %zu/%zu", done, total);
        if (done == total) std::fprintf(stderr, "\n");
      };
    MatrixFiles files{a->out + ".mtx", a->out + ".terms", a->out + ".docs"};
    auto reader = open_reader(setup);
    if (!reader) return int{kExitError};
    auto r = export_matrix(*reader, o, files);
    if (!r) return fail(r.status());
    if (a->json) std::cout << dump_json(matrix_json(*r, files, o), 2) << "\n";
    else
      std::printf("%zu documents x %zu terms, %zu entries: %s, %s, %s\n", r->rows, r->columns, r->entries,
                  files.matrix.c_str(), files.vocabulary.c_str(), files.documents.c_str());
    return int{kExitOk};
  };
}

}  // namespace lode::cli
