// `lode index` on archives as users have them: pictures and other binary
// files beside the documents (skipped, counted, exit 0), real read failures
// (exit 3), and two folders that give the same document id (a warning).
#include "util.h"

using namespace lode;
using namespace lode::test;

namespace {
const std::string kLode = LODE_BINARY;
}  // namespace

TEST_CASE("CLI: binary and media files are skipped quietly and counted while real failures still exit 3") {
  TempDir dir;
  auto tree = dir.path() / "archive";
  write_file(tree / "notes" / "tide.md", "# Tide\n\nThe spring tide reached the north quay.");
  write_file(tree / "photos" / "tower.jpg", std::string("\xff\xd8\xff\xe0", 4) + std::string(64, '\0'));
  write_file(tree / "photos" / "scan.tif", "not looked at: the extension decides");
  write_file(tree / "notes" / "blob", std::string("\x01\x02\0\0", 4) + "binary data without a signature");
  const std::string idx = kLode + " --index " + dir.str("i.sqlite");
  int rc = -1;
  std::string out = run(idx + " index " + tree.string() + " 2>&1", &rc);
  CHECK(rc == 0);
  CHECK(out.find("0 failed, 3 binary or media skipped") != std::string::npos);
  CHECK(out.find("tower.jpg") == std::string::npos);  // quiet: no line per skipped file
  // Every run again: still exit 0, still counted, nothing recorded as a problem.
  out = run(idx + " index -q " + tree.string() + " 2>&1", &rc);
  CHECK(rc == 0);
  CHECK(out.empty());
  out = run(idx + " index " + tree.string() + " 2>&1", &rc);
  CHECK(out.find("1 unchanged, 0 removed, 0 failed, 3 binary or media skipped") != std::string::npos);
  run(idx + " problems 2>&1", &rc);
  CHECK(rc == 0);

  // A file that claims to be a PDF and is not: a real failure.
  write_file(tree / "notes" / "report.pdf", "%PDF-1.4 this is not a PDF at all");
  out = run(idx + " index " + tree.string() + " 2>&1", &rc);
  CHECK(rc == 3);
  CHECK(out.find("report.pdf") != std::string::npos);
  CHECK(out.find("1 failed, 3 binary or media skipped") != std::string::npos);
}

TEST_CASE("CLI: two folders with the same relative path give a warning naming both files") {
  TempDir dir;
  write_file(dir.path() / "north" / "logs" / "day.txt", "Day\nthe north tower log");
  write_file(dir.path() / "south" / "logs" / "day.txt", "Day\nthe south tower log");
  write_file(dir.path() / "south" / "logs" / "other.txt", "Other\nno clash here");
  const std::string idx = kLode + " --index " + dir.str("i.sqlite");
  int rc = -1;
  std::string out = run(idx + " index " + dir.str("north") + " " + dir.str("south") + " 2>&1", &rc);
  CHECK(rc == 0);
  CHECK(out.find("lode: warning: " + dir.str("south") + "/logs/day.txt: document id 'logs/day.txt' is also the id of " +
                 dir.str("north") + "/logs/day.txt") != std::string::npos);
  CHECK(out.find("other.txt") == std::string::npos);
  // Also when the folders are indexed in separate runs.
  out = run(kLode + " --index " + dir.str("j.sqlite") + " index " + dir.str("north") + " 2>&1", &rc);
  CHECK(out.find("warning") == std::string::npos);
  out = run(kLode + " --index " + dir.str("j.sqlite") + " index " + dir.str("south") + " 2>&1", &rc);
  CHECK(rc == 0);
  CHECK(out.find("document id 'logs/day.txt' is also the id of " + dir.str("north") + "/logs/day.txt") !=
        std::string::npos);
}
