// An index in a folder the user may only read: searched, counted, verified
// and listed with read permission alone, creating nothing beside it.
#include <unistd.h>

#include <doctest/doctest.h>

#include <set>

#include "harness.h"

namespace {

using namespace lode::testing;

std::set<std::string> names_in(const std::string& folder) {
  std::set<std::string> out;
  for (const auto& e : std::filesystem::directory_iterator(folder)) out.insert(e.path().filename().string());
  return out;
}

// `lode ARGS` as a user without write permission: as root, chmod stops
// nothing, so the command runs as the unprivileged user "nobody" (setpriv,
// util-linux), with config folders that do not exist; as any other user,
// as that user.
std::string lode_without_write(const std::string& args, int* rc) {
  if (::geteuid() != 0) return lode_run(args, rc);
  return lode_run(args, rc,
                  "env HOME=/nonexistent XDG_CONFIG_HOME=/nonexistent XDG_DATA_HOME=/nonexistent "
                  "setpriv --reuid=65534 --regid=65534 --clear-groups ");
}

}  // namespace

TEST_CASE("an index in a read-only folder is searched, counted, verified and listed, and nothing is created") {
  namespace fs = std::filesystem;
  Scratch s;
  s.write("log.txt", "the lamp was trimmed at dusk and the fog horn sounded\n");
  s.write("tide.txt", "high water at noon, the tide table for the week\n");
  const std::string folder = s.other("shelf"), index = s.other("shelf/index.sqlite");
  fs::create_directories(folder);
  index_tree(index, {s.tree()});
  const auto before = names_in(folder);
  REQUIRE(before == std::set<std::string>{"index.sqlite", "index.sqlite.lock"});
  // Readable by anyone, writable by no one.
  fs::permissions(s.other(""), fs::perms::owner_all | fs::perms::group_read | fs::perms::group_exec |
                                    fs::perms::others_read | fs::perms::others_exec);
  fs::permissions(index, fs::perms::owner_read | fs::perms::group_read | fs::perms::others_read);
  fs::permissions(folder, fs::perms::owner_read | fs::perms::owner_exec | fs::perms::group_read |
                              fs::perms::group_exec | fs::perms::others_read | fs::perms::others_exec);
  const std::string at = "--index '" + index + "' ";
  int rc = -1;
  std::string out = lode_without_write(at + "search lamp --json", &rc);
  CHECK_MESSAGE(rc == 0, out);
  CHECK(out.find("\"log.txt\"") != std::string::npos);
  out = lode_without_write(at + "stats", &rc);
  CHECK_MESSAGE(rc == 0, out);
  CHECK(out.find("2 live") != std::string::npos);
  out = lode_without_write(at + "verify", &rc);
  CHECK_MESSAGE(rc == 0, out);
  out = lode_without_write(at + "problems", &rc);
  CHECK_MESSAGE(rc == 0, out);
  out = lode_without_write(at + "sift list", &rc);
  CHECK_MESSAGE(rc == 0, out);
  // Writing is still refused, by name.
  out = lode_without_write(at + "index '" + s.tree() + "'", &rc);
  CHECK(rc != 0);
  CHECK(names_in(folder) == before);
  fs::permissions(folder, fs::perms::owner_all, fs::perm_options::add);
}
