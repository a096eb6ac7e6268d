// `lode serve` with no options, as lode.service runs it: the index, address,
// port and token file come from the config file ($XDG_CONFIG_HOME/lode/config),
// and LODE_SERVE_TOKEN still wins over the file's token (option > environment
// > config file > default).
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include "server_util.h"

using namespace lode;
using namespace lode::test;

namespace {

int health(int port, const std::string& token) {
  httplib::Client c("127.0.0.1", port);
  c.set_read_timeout(60, 0);  // a hang guard
  httplib::Headers h;
  if (!token.empty()) h.emplace("Authorization", "Bearer " + token);
  auto r = c.Get("/api/v1/health", h);
  REQUIRE(r);
  return r->status;
}

}  // namespace

TEST_CASE("CLI: lode serve takes index and address and port and token file from the config file") {
  TempDir dir;
  const std::string index = dir.str("sample.sqlite");
  index_sample(index);
  write_file(dir.path() / "token", "tok-from-file\n");
  write_file(dir.path() / "config" / "lode" / "config",
             "index = " + index + "\nserve.address = 127.0.0.1\nserve.port = 0\nserve.token_file = ../../token\n");
  const std::string env = "unset LODE_INDEX LODE_SERVE_TOKEN; XDG_CONFIG_HOME=" + dir.str("config") +
                          " XDG_DATA_HOME=" + dir.str("data");
  {
    ServeProcess serve("serve", dir.str("serve.out"), dir.str("serve.err"), env);
    CHECK(serve.port() != 7340);  // port 0 from the file: any free port, not the default
    CHECK(health(serve.port(), "") == 401);
    CHECK(health(serve.port(), "tok-from-file") == 200);
  }
  {
    ServeProcess serve("serve", dir.str("serve.out"), dir.str("serve.err"), env + " LODE_SERVE_TOKEN=tok-from-env");
    CHECK(health(serve.port(), "tok-from-file") == 401);
    CHECK(health(serve.port(), "tok-from-env") == 200);
  }
}
