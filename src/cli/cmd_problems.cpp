// `lode problems`: the files the index could not read (and, with
// --warnings, those read with a warning), as recorded by the last runs.
#include <ctime>

#include "cli/commands.h"
#include "cli/common.h"
#include "lode/index.h"

namespace lode::cli {
namespace {

struct ProblemsArgs {
  bool warnings = false;
};

int run_problems(const ProblemsArgs& a, const Setup& setup) {
  auto reader = IndexReader::open(resolve_index(setup));
  if (!reader) return fail(reader.status());
  auto scope = (*reader)->begin();
  if (!scope) return fail(scope.status());
  auto problems = (*reader)->problems();
  if (!problems) return fail(problems.status());
  std::size_t errors = 0;
  for (auto& p : *problems) {
    errors += p.error;
    if (!p.error && !a.warnings) continue;
    const std::time_t t = static_cast<std::time_t>(p.time_ns / 1000000000);
    char when[32] = "";
    std::tm tm{};
    if (gmtime_r(&t, &tm) != nullptr) std::strftime(when, sizeof when, "%Y-%m-%dT%H:%M:%SZ", &tm);
    std::printf("%s\t%s\t%s\t%s\n", p.error ? "failed" : "warning", when, shown(p.path).c_str(),
                shown(p.message).c_str());
  }
  return errors > 0 ? kExitSomeFailed : kExitOk;
}

}  // namespace

Runner add_problems_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<ProblemsArgs>();
  app.add_flag("--warnings", a->warnings, "also list files indexed with a warning");
  return [a, &setup] { return run_problems(*a, setup); };
}

}  // namespace lode::cli
