#include "screening/options_json.h"

namespace lode::screening {

nlohmann::json options_to_json(const SiftOptions& o) {
  return {{"tf", std::string(1, o.vectors.tf)},
          {"idf", std::string(1, o.vectors.idf)},
          {"log_base", o.vectors.log_base},
          {"title_weight", o.vectors.field_weight[0]},
          {"body_weight", o.vectors.field_weight[1]},
          {"cost", o.classifier.cost},
          {"tolerance", o.classifier.tolerance},
          {"intercept", o.classifier.intercept},
          {"presumed_negatives", o.presumed_negatives},
          {"first_batch", o.first_batch},
          {"growth", o.growth},
          {"max_batch", o.max_batch},
          {"seed", o.seed}};
}

Result<SiftOptions> options_from_json(const nlohmann::json& j) {
  SiftOptions o;
  try {
    auto letter = [&](const char* key, char& out) {
      if (j.contains(key)) {
        auto s = j.at(key).get<std::string>();
        if (s.size() != 1) throw nlohmann::json::type_error::create(302, key, nullptr);
        out = s[0];
      }
    };
    letter("tf", o.vectors.tf);
    letter("idf", o.vectors.idf);
    o.vectors.log_base = j.value("log_base", o.vectors.log_base);
    o.vectors.field_weight[0] = j.value("title_weight", o.vectors.field_weight[0]);
    o.vectors.field_weight[1] = j.value("body_weight", o.vectors.field_weight[1]);
    o.classifier.cost = j.value("cost", o.classifier.cost);
    o.classifier.tolerance = j.value("tolerance", o.classifier.tolerance);
    o.classifier.intercept = j.value("intercept", o.classifier.intercept);
    o.presumed_negatives = j.value("presumed_negatives", o.presumed_negatives);
    o.first_batch = j.value("first_batch", o.first_batch);
    o.growth = j.value("growth", o.growth);
    o.max_batch = j.value("max_batch", o.max_batch);
    o.seed = j.value("seed", o.seed);
  } catch (const nlohmann::json::exception& e) {
    return Status::Corruption(std::string("sift.options: ") + e.what());
  }
  LODE_RETURN_IF_ERROR(o.check());
  return o;
}

}  // namespace lode::screening
