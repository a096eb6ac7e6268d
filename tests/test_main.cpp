// The doctest main of every suite, plus one guard: CTest runs each case as
// `suite --test-case=NAME`, and a NAME that matches no case (a name CMake
// split at a ';', a renamed case) would otherwise pass without running
// anything. Such a run fails here instead.
#define DOCTEST_CONFIG_IMPLEMENT
#include <doctest/doctest.h>

#include <stdlib.h>

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <string>

namespace {

// Not called when listing cases (CTest's discovery), only for real runs.
struct MatchGuard : doctest::IReporter {
  explicit MatchGuard(const doctest::ContextOptions&) {}

  void test_run_end(const doctest::TestRunStats& s) override {
    if (s.numTestCasesPassingFilters == 0) {
      std::fprintf(stderr, "no test case matches the filters; nothing was run\n");
      std::fflush(stderr);
      std::exit(1);
    }
  }
  void report_query(const doctest::QueryData&) override {}
  void test_run_start() override {}
  void test_case_start(const doctest::TestCaseData&) override {}
  void test_case_reenter(const doctest::TestCaseData&) override {}
  void test_case_end(const doctest::CurrentTestCaseStats&) override {}
  void test_case_exception(const doctest::TestCaseException&) override {}
  void subcase_start(const doctest::SubcaseSignature&) override {}
  void subcase_end() override {}
  void log_assert(const doctest::AssertData&) override {}
  void log_message(const doctest::MessageData&) override {}
  void test_case_skipped(const doctest::TestCaseData&) override {}
};

}  // namespace

REGISTER_LISTENER("match-guard", 1, MatchGuard);

// Every lode a test starts inherits these: its default index and config file
// live in a fresh temporary folder, never in the real home (lode/config.h).
// A test that checks the XDG rules sets its own.
struct XdgSandbox {
  std::string root;
  XdgSandbox() {
    std::string tmpl = (std::filesystem::temp_directory_path() / "lode-xdg-XXXXXX").string();
    if (::mkdtemp(tmpl.data()) == nullptr) return;
    root = tmpl;
    ::setenv("XDG_DATA_HOME", (root + "/data").c_str(), 1);
    ::setenv("XDG_CONFIG_HOME", (root + "/config").c_str(), 1);
  }
  ~XdgSandbox() {
    std::error_code ec;
    if (!root.empty()) std::filesystem::remove_all(root, ec);
  }
};

int main(int argc, char** argv) {
  XdgSandbox sandbox;
  return doctest::Context(argc, argv).run();
}
