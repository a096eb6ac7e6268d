// Request parameters -> library options, with a problem naming the parameter
// at fault. The vocabulary is the CLI's: q, model, k1, b, weighting, log_base,
// title_weight, body_weight, top, offset (docs/api.md).
#pragma once

#include <httplib.h>

#include <map>
#include <string>
#include <variant>
#include <vector>

#include "lode/ranking.h"
#include "lode/server.h"
#include "server/problem.h"

namespace lode::server {

using Params = std::map<std::string, std::string>;

// Either a value or the problem to send.
template <typename T>
using Parsed = std::variant<T, Problem>;

// GET: the query string (a parameter given twice is a problem). POST: the
// body, a JSON object of strings, numbers and booleans.
Parsed<Params> request_params(const httplib::Request& req);

// Refuses any parameter not in `allowed` (a typo should not be ignored silently).
std::optional<Problem> check_known(const Params& p, const std::vector<std::string>& allowed);

struct Paging {
  std::size_t top = 10;     // hits per page, at most ServeLimits::max_page
  std::size_t offset = 0;   // offset + top at most ServeLimits::max_window
};
Parsed<Paging> parse_paging(const Params& p, const ServeLimits& limits);

// A whole number parameter in [0, hi] (over_limit above), `fallback` when absent.
Parsed<std::size_t> parse_count(const Params& p, const char* name, std::size_t fallback, std::size_t hi);

struct SearchRequest {
  std::string index;   // served index name; empty = the first
  std::string query;   // q (required)
  std::string doc;     // breakdown/document: the document id
  SearchOptions options;
};

// q, index and the model parameters; top/offset/breakdown/snippets when `paging`.
Parsed<SearchRequest> parse_search(const Params& p, const ServeLimits& limits, bool paging);

}  // namespace lode::server
