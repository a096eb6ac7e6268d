#include "cli/dash_args.h"

#include <cctype>

namespace lode::cli {
namespace {

// The option named by `token` ("--top", "--top=5", "-k") on `app`, or null.
const CLI::Option* option_of(const CLI::App& app, const std::string& token) {
  const std::string name = token.substr(0, token.find('='));
  if (auto* o = app.get_option_no_throw(name)) return o;
  // A short option with its value attached: "-k8".
  if (name.size() > 2 && name[1] != '-') return app.get_option_no_throw(name.substr(0, 2));
  return nullptr;
}

bool looks_like_number(const std::string& t) {
  return t.size() > 1 && (std::isdigit(static_cast<unsigned char>(t[1])) || t[1] == '.');
}

}  // namespace

std::vector<std::string> protect_dash_values(const CLI::App& app, int argc, const char* const* argv) {
  std::vector<std::string> out, trailing;
  const CLI::App* current = &app;
  const CLI::Option* wants_value = nullptr;  // the previous token, if an option waiting for its value
  bool literal = false;                      // after the user's own "--"
  for (int i = 1; i < argc; ++i) {
    std::string t = argv[i];
    if (literal) {
      out.push_back(std::move(t));
      continue;
    }
    if (t == "--") {
      literal = true;
      out.push_back(std::move(t));
      continue;
    }
    const bool dashed = t.size() > 1 && t[0] == '-' && !looks_like_number(t);
    const CLI::Option* opt = nullptr;
    // The subcommand's own options, then its parents' (options fall through).
    for (const CLI::App* at = current; dashed && !opt && at != nullptr; at = at->get_parent()) opt = option_of(*at, t);
    if (dashed && !opt && t != "-h" && t != "--help") {
      if (wants_value && !out.empty()) {
        out.back() += "=" + t;
        wants_value = nullptr;
        continue;
      }
      // "-storm" is a query; "--storm" is a mistyped option, left for CLI11 to name.
      if (t[1] != '-') {
        trailing.push_back(std::move(t));
        continue;
      }
    }
    if (!dashed && !wants_value) {  // a subcommand, at any depth ("eval compare")
      for (const CLI::App* sub : current->get_subcommands([](const CLI::App*) { return true; }))
        if (sub->get_name() == t) current = sub;
    }
    wants_value = opt != nullptr && opt->get_items_expected_min() > 0 && t.find('=') == std::string::npos ? opt : nullptr;
    out.push_back(std::move(t));
  }
  if (!trailing.empty()) {
    if (!literal) out.push_back("--");
    for (auto& t : trailing) out.push_back(std::move(t));
  }
  return out;
}

}  // namespace lode::cli
