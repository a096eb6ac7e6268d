// The Debian package, built by CPack before these cases run (the CTest
// fixture "package: build the .deb" in tests/CMakeLists.txt): its file list,
// its control data, and the binary run from a temporary root it was unpacked
// into. Real tools: dpkg-deb (Debian's dpkg), man (man-db) and bash.
#include <fstream>
#include <sstream>

#include "core/util.h"

using namespace lode;
using namespace lode::test;

namespace {

const std::string kPackageDir = LODE_PACKAGE_DIR;

// The one .deb CPack wrote.
std::string the_deb() {
  std::vector<std::string> debs;
  for (auto& e : fs::directory_iterator(kPackageDir))
    if (e.path().extension() == ".deb") debs.push_back(e.path().string());
  REQUIRE_MESSAGE(debs.size() == 1, "expected one .deb in " << kPackageDir);
  return debs[0];
}

}  // namespace

TEST_CASE("package: the .deb holds the binary with its manual and completions and unit and docs and postinst") {
  const std::string deb = the_deb();
  int rc = -1;
  std::string list = run("dpkg-deb -c " + deb, &rc);
  REQUIRE(rc == 0);
  for (const std::string path :
       {"./usr/bin/lode", "./usr/share/man/man1/lode.1.gz", "./usr/share/bash-completion/completions/lode",
        "./usr/share/zsh/vendor-completions/_lode", "./usr/lib/systemd/system/lode.service",
        "./usr/share/doc/lode/README.md", "./usr/share/doc/lode/copyright", "./usr/share/doc/lode/docs/api.md",
        "./usr/share/doc/lode/docs/openapi.yaml", "./usr/share/doc/lode/examples/config"}) {
    CAPTURE(path);
    CHECK(list.find(" " + path + "\n") != std::string::npos);
  }
  CHECK(list.find("-rwxr-xr-x root/root") != std::string::npos);  // the binary, executable, owned by root
  // Nothing outside /usr (no stray build paths).
  std::istringstream lines(list);
  std::string line;
  while (std::getline(lines, line)) {
    CAPTURE(line);
    CHECK((line.find(" ./usr/") != std::string::npos || line.substr(line.size() - 3) == " ./"));
  }
  std::string control = run("dpkg-deb -f " + deb + " Package Version Depends", &rc);
  REQUIRE(rc == 0);
  CHECK(control.find("Package: lode") != std::string::npos);
  CHECK(control.find("Version: " LODE_VERSION) != std::string::npos);
  CHECK(control.find("adduser") != std::string::npos);
  CHECK(control.find("libsqlite3-0") != std::string::npos);  // found by dpkg-shlibdeps
  // The maintainer script creates the service's user.
  TempDir dir;
  run("dpkg-deb -e " + deb + " " + dir.str("control"), &rc);
  REQUIRE(rc == 0);
  std::ifstream postinst(dir.path() / "control" / "postinst");
  std::stringstream script;
  script << postinst.rdbuf();
  CHECK(script.str().find("adduser --system --group --home /var/lib/lode") != std::string::npos);
}

TEST_CASE("package: unpacked into a temporary root the binary runs and its files work") {
  const std::string deb = the_deb();
  TempDir root;
  int rc = -1;
  run("dpkg-deb -x " + deb + " " + root.str() + " 2>&1", &rc);
  REQUIRE(rc == 0);
  const std::string lode = root.str("usr/bin/lode");
  std::string version = run(lode + " --version", &rc);
  CHECK(rc == 0);
  CHECK(version == "lode " LODE_VERSION "\n");
  // The binary works from there: index and search a small archive, with its
  // default index under the XDG data folder given.
  write_file(root.path() / "archive" / "note.txt", "Tide note\nthe spring tide flooded the north quay");
  const std::string env = "XDG_DATA_HOME=" + root.str("data") + " XDG_CONFIG_HOME=" + root.str("config") + " ";
  run(env + lode + " index -q " + root.str("archive") + " 2>&1", &rc);
  CHECK(rc == 0);
  std::string hits = run(env + lode + " search quay", &rc);
  CHECK(rc == 0);
  CHECK(hits.find("1 matching documents") != std::string::npos);

  // The manual renders and lists every command.
  std::string man = run("MANWIDTH=100 man -l " + root.str("usr/share/man/man1/lode.1.gz") + " 2>&1", &rc);
  CHECK(rc == 0);
  for (const std::string cmd : {"lode index", "lode search", "lode serve", "lode nearest", "lode themes"}) {
    CAPTURE(cmd);
    CHECK(man.find(cmd) != std::string::npos);
  }
  CHECK(man.find("XDG_DATA_HOME") != std::string::npos);
  // bash completion offers the commands and a command's options, from the binary's own help.
  std::string completion =
      run("PATH=" + root.str("usr/bin") + ":$PATH bash -c 'source " +
              root.str("usr/share/bash-completion/completions/lode") +
              "; COMP_WORDS=(lode se); COMP_CWORD=1; _lode; echo ${COMPREPLY[@]}; "
              "COMP_WORDS=(lode search --co); COMP_CWORD=2; _lode; echo ${COMPREPLY[@]}'",
          &rc);
  CHECK(rc == 0);
  CHECK(completion.find("search serve") != std::string::npos);
  CHECK(completion.find("--count-all") != std::string::npos);
  // The unit runs the installed binary as the lode user, on loopback by default, sandboxed.
  std::ifstream unit(root.path() / "usr/lib/systemd/system/lode.service");
  std::stringstream u;
  u << unit.rdbuf();
  for (const std::string line : {"ExecStart=/usr/bin/lode serve", "User=lode", "StateDirectory=lode",
                                 "NoNewPrivileges=yes", "ProtectSystem=strict", "ProtectHome=yes"}) {
    CAPTURE(line);
    CHECK(u.str().find(line + "\n") != std::string::npos);
  }
  CHECK(u.str().find("--address") == std::string::npos);  // loopback unless the admin's config says otherwise
}
