#include "server/params.h"

#include <algorithm>
#include <charconv>
#include <cmath>

namespace lode::server {
namespace {

std::string describe(const nlohmann::json& v) {
  if (v.is_string()) return v.get<std::string>();
  if (v.is_boolean()) return v.get<bool>() ? "true" : "false";
  return v.dump();
}

// A finite number in [lo, hi]; `what` ends the detail message.
Parsed<double> number(const Params& p, const char* name, double fallback, double lo, double hi, const char* what) {
  auto it = p.find(name);
  if (it == p.end()) return fallback;
  const std::string& s = it->second;
  double v = 0;
  auto [end, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
  if (ec != std::errc() || end != s.data() + s.size() || !std::isfinite(v) || v < lo || v > hi)
    return bad_parameter(name, std::string(name) + " must be " + what + ", not '" + s + "'");
  return v;
}

Parsed<std::size_t> count(const Params& p, const char* name, std::size_t fallback, std::size_t hi) {
  auto it = p.find(name);
  if (it == p.end()) return fallback;
  const std::string& s = it->second;
  std::size_t v = 0;
  auto [end, ec] = std::from_chars(s.data(), s.data() + s.size(), v);
  if (ec != std::errc() || end != s.data() + s.size())
    return bad_parameter(name, std::string(name) + " must be a whole number >= 0, not '" + s + "'");
  if (v > hi)
    return over_limit(name, std::string(name) + " is at most " + std::to_string(hi) + " on this server, not " + s);
  return v;
}

Parsed<bool> flag(const Params& p, const char* name, bool fallback) {
  auto it = p.find(name);
  if (it == p.end()) return fallback;
  if (it->second == "true" || it->second == "1") return true;
  if (it->second == "false" || it->second == "0") return false;
  return bad_parameter(name, std::string(name) + " must be true or false, not '" + it->second + "'");
}

std::string get(const Params& p, const char* name) {
  auto it = p.find(name);
  return it == p.end() ? std::string() : it->second;
}

}  // namespace

Parsed<Params> request_params(const httplib::Request& req) {
  Params out;
  if (req.method == "POST") {
    auto body = nlohmann::json::parse(req.body, nullptr, false);
    if (body.is_discarded() || !body.is_object())
      return Problem{400, "bad-body", "The request body is not valid", "the body must be a JSON object of parameters", {}};
    for (auto& [k, v] : body.items()) {
      if (!v.is_string() && !v.is_number() && !v.is_boolean())
        return bad_parameter(k, k + " must be a string, number or boolean");
      out[k] = describe(v);
    }
    return out;
  }
  for (auto& [k, v] : req.params)
    if (!out.emplace(k, v).second) return bad_parameter(k, k + " is given more than once");
  return out;
}

std::optional<Problem> check_known(const Params& p, const std::vector<std::string>& allowed) {
  for (auto& [k, v] : p) {
    if (std::find(allowed.begin(), allowed.end(), k) != allowed.end()) continue;
    std::string list;
    for (const std::string& a : allowed) list += (list.empty() ? "" : ", ") + a;
    return bad_parameter(k, "unknown parameter '" + k + "'; this route takes " + list);
  }
  return std::nullopt;
}

Parsed<Paging> parse_paging(const Params& p, const ServeLimits& limits) {
  auto top = count(p, "top", 10, limits.max_page);
  if (auto* bad = std::get_if<Problem>(&top)) return *bad;
  auto offset = count(p, "offset", 0, limits.max_window);
  if (auto* bad = std::get_if<Problem>(&offset)) return *bad;
  Paging out{std::get<std::size_t>(top), std::get<std::size_t>(offset)};
  if (out.top + out.offset > limits.max_window)
    return over_limit("offset", "offset + top is at most " + std::to_string(limits.max_window) + " on this server");
  return out;
}

Parsed<SearchRequest> parse_search(const Params& p, const ServeLimits& limits, bool paging) {
  SearchRequest r;
  r.index = get(p, "index");
  r.query = get(p, "q");
  if (r.query.empty()) return bad_parameter("q", "q (the query text) is required");
  if (r.query.size() > limits.max_query_bytes)
    return over_limit("q", "q is " + std::to_string(r.query.size()) + " bytes; this server takes at most " +
                               std::to_string(limits.max_query_bytes));
  SearchOptions& o = r.options;
  o.limits.max_bytes = limits.max_query_bytes;
  o.limits.max_terms = limits.max_query_terms;
  std::string model = get(p, "model");
  if (!model.empty()) {
    auto m = parse_model(model);
    if (!m) return bad_parameter("model", "model must be bm25 or tfidf, not '" + model + "'");
    o.model = *m;
  }
  if (o.model == Model::kBm25 && (p.count("weighting") || p.count("log_base")))
    return bad_parameter(p.count("weighting") ? "weighting" : "log_base", "weighting and log_base apply to model tfidf");
  if (o.model == Model::kTfIdf && (p.count("k1") || p.count("b")))
    return bad_parameter(p.count("k1") ? "k1" : "b", "k1 and b apply to model bm25");
  auto k1 = number(p, "k1", o.bm25.k1, 0, 1000, "a number from 0 to 1000");
  auto b = number(p, "b", o.bm25.b, 0, 1, "a number from 0 to 1");
  Parsed<double> base = o.smart.log_base;
  if (p.count("log_base")) {
    auto parsed = parse_log_base(p.at("log_base"), "log_base");
    if (!parsed) return bad_parameter("log_base", parsed.status().message());
    base = *parsed;
  }
  auto tw = number(p, "title_weight", o.field_weight[0], 0, 1e6, "a number from 0 to 1000000");
  auto bw = number(p, "body_weight", o.field_weight[1], 0, 1e6, "a number from 0 to 1000000");
  for (auto* v : {&k1, &b, &base, &tw, &bw})
    if (auto* bad = std::get_if<Problem>(v)) return *bad;
  o.bm25 = {std::get<double>(k1), std::get<double>(b)};
  if (std::string f = get(p, "fields"); !f.empty()) {
    auto fs = parse_field_scoring(f);
    if (!fs) return bad_parameter("fields", "fields must be joint or sum, not '" + f + "'");
    o.fields = *fs;
  }
  if (std::string w = get(p, "weighting"); !w.empty()) {
    auto sw = SmartWeighting::parse(w);
    if (!sw) return bad_parameter("weighting", sw.status().message());
    o.smart = *sw;
  }
  o.smart.log_base = std::get<double>(base);
  o.field_weight = {std::get<double>(tw), std::get<double>(bw)};
  if (!paging) return r;
  auto page = parse_paging(p, limits);
  if (auto* bad = std::get_if<Problem>(&page)) return *bad;
  o.top = std::get<Paging>(page).top;
  o.offset = std::get<Paging>(page).offset;
  auto breakdown = flag(p, "breakdown", true);
  if (auto* bad = std::get_if<Problem>(&breakdown)) return *bad;
  auto snippets = flag(p, "snippets", true);
  if (auto* bad = std::get_if<Problem>(&snippets)) return *bad;
  o.breakdown = std::get<bool>(breakdown);
  o.snippets = std::get<bool>(snippets);
  auto count_all = flag(p, "count_all", false);
  if (auto* bad = std::get_if<Problem>(&count_all)) return *bad;
  o.count_all = std::get<bool>(count_all);
  return r;
}

Parsed<std::size_t> parse_count(const Params& p, const char* name, std::size_t fallback, std::size_t hi) {
  return count(p, name, fallback, hi);
}

}  // namespace lode::server
