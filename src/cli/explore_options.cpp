#include "cli/explore_options.h"

#include <cmath>

#include "cli/common.h"
#include "lode/ranking.h"
#include "lode/similar.h"

namespace lode::cli {

void add_vector_options(CLI::App& app, VectorArgs& a) {
  // Not --weighting: that is search's document.query SMART notation (lnc.ltc).
  app.add_option("--vector-weighting", a.weighting,
                 "document vector tf and idf letters, SMART notation (default lt)")
      ->type_name("TI");
  app.add_option("--log-base", a.log_base, "base of the logarithms: a number or e (default 10)");
  app.add_option("--title-weight", a.title_weight, "weight of title terms (default 1)");
  app.add_option("--body-weight", a.body_weight, "weight of body terms (default 1)");
}

Result<VectorOptions> to_vector_options(const VectorArgs& a) {
  if (a.weighting.size() != 2)
    return Status::InvalidArgument("--vector-weighting takes two SMART letters, tf then idf (e.g. lt), not '" +
                                   a.weighting + "'");
  VectorOptions o;
  o.tf = a.weighting[0];
  o.idf = a.weighting[1];
  auto base = parse_log_base(a.log_base, "--log-base");
  if (!base) return base.status();
  o.log_base = *base;
  o.field_weight = {a.title_weight, a.body_weight};
  LODE_RETURN_IF_ERROR(o.check());
  return o;
}

std::unique_ptr<IndexReader> open_reader(const Setup& setup) {
  auto reader = IndexReader::open(resolve_index(setup));
  if (!reader) {
    fail(reader.status());
    return nullptr;
  }
  return std::move(reader.value());
}

std::optional<DocId> named_document(IndexReader& reader, const std::string& name) {
  auto doc = resolve_document(reader, name);
  if (!doc) {
    fail(doc.status());
    return std::nullopt;
  }
  return *doc;
}

}  // namespace lode::cli
