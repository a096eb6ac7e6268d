// `lode verify`: reads the whole index and says whether it is sound; a
// damaged index is named finding by finding (lode/verify.h), with how to
// rebuild it.
#include <cstdio>

#include "cli/commands.h"
#include "cli/common.h"
#include "lode/verify.h"

namespace lode::cli {

Runner add_verify_command(CLI::App& /*app: no options*/, const Setup& setup) {
  return [&setup] {
    const std::string path = resolve_index(setup);
    auto report = verify_index(path);
    if (!report) return fail(report.status());
    auto u = [](std::uint64_t v) { return static_cast<unsigned long long>(v); };
    for (const std::string& f : report->findings) std::printf("damaged\t%s\n", f.c_str());
    if (report->unlisted > 0) std::printf("damaged\t(%llu more findings not listed)\n", u(report->unlisted));
    if (report->ok()) {
      std::printf("%s: sound (%llu documents, %llu terms, %llu postings segments, %llu postings read)\n",
                  path.c_str(), u(report->documents), u(report->terms), u(report->segments), u(report->postings));
      return int{kExitOk};
    }
    std::fprintf(stderr,
                 "lode: %s is damaged (%llu findings). Queries may fail or rank wrongly. Rebuild it: move it "
                 "aside and run 'lode index --index %s' on your folders again (README: \"Damage\").\n",
                 path.c_str(), u(report->findings.size() + report->unlisted), path.c_str());
    return int{kExitDamaged};
  };
}

}  // namespace lode::cli
