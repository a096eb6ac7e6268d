// Compressed files that unpack far past what they hold: the real `lode
// index` keeps its memory near the text limit, however many extraction
// workers run. Peak memory is the child's own (wait4), not a timing.
#include <sys/resource.h>
#include <sys/wait.h>
#include <zlib.h>

#include <doctest/doctest.h>

#include "harness.h"

namespace {

using namespace lode::testing;

// A gzip file of `mb` MiB of log lines (about 1000:1: each holds little).
void write_gzip_lines(const std::string& path, int mb) {
  gzFile g = gzopen(path.c_str(), "wb1");
  REQUIRE(g != nullptr);
  std::string block;
  for (int i = 0; block.size() < (std::size_t{1} << 20); ++i)
    block += "the lamp keeper logged the tide and the fog at the north pier " + std::to_string(i % 10) + "\n";
  block.resize(std::size_t{1} << 20);
  for (int i = 0; i < mb; ++i) REQUIRE(gzwrite(g, block.data(), static_cast<unsigned>(block.size())) > 0);
  REQUIRE(gzclose(g) == Z_OK);
}

// Runs `lode ARGS`, returns its exit code; *peak_mb its peak resident memory.
int run_measured(const std::vector<std::string>& args, double* peak_mb) {
  const pid_t pid = start_lode(args);
  int status = 0;
  struct rusage ru {};
  REQUIRE(wait4(pid, &status, 0, &ru) == pid);
  *peak_mb = static_cast<double>(ru.ru_maxrss) / 1024.0;  // kB on Linux
  return WIFEXITED(status) ? WEXITSTATUS(status) : -1;
}

}  // namespace

TEST_CASE("four gzip files that each unpack to 200 MiB, read by four workers, stay near the text limit") {
  Scratch s;
  write_gzip_lines(s.file("log0.txt.gz"), 200);
  for (int i = 1; i < 4; ++i)
    std::filesystem::copy_file(s.file("log0.txt.gz"), s.file("log" + std::to_string(i) + ".txt.gz"));
  double peak_mb = 0;
  // Text limit 4 MiB: each file gives 4 MiB of text, 16 in all. Unpacking
  // each whole (200 MiB, as before) in four workers at once held over 800 MB.
  const int rc = run_measured({"--index", s.index(), "index", "-q", "-j", "4", "--max-text-mb", "4", s.tree()},
                              &peak_mb);
  CHECK(rc == 0);
  MESSAGE("peak resident memory: " << peak_mb << " MB");
  CHECK(peak_mb < 200);
  const auto hits = search(s.index(), "lamp keeper");
  CHECK(hits.hits.size() == 4);
  auto reader = lode::IndexReader::open(s.index());
  REQUIRE(reader.ok());
  auto scope = (*reader)->begin();
  auto problems = (*reader)->problems();
  REQUIRE(problems.ok());
  std::size_t cut = 0;
  for (const auto& p : *problems) cut += p.message.find("extracted text cut at the limit") != std::string::npos;
  CHECK(cut == 4);
}
