// The config file (lode/config.h): every key, quoting and comments, path
// expansion, and errors that name the file and the line.
#include "lode/config.h"
#include "util.h"

using namespace lode;

namespace {
Status error_of(const std::string& text) {
  auto c = parse_config(text, "/etc/lode/config", "/home/ann");
  REQUIRE_FALSE(c.ok());
  CHECK(c.status().code() == Code::kInvalidArgument);
  return c.status();
}
}  // namespace

TEST_CASE("config file: keys, comments, quotes and paths") {
  auto c = parse_config(
      "# defaults\n"
      "\n"
      "index = ~/archive/lode.sqlite   # my archive\n"
      "model=tfidf\n"
      "  title_weight = 3\n"
      "body_weight = 0.5\r\n"
      "serve.address = \"::1\"\n"
      "serve.port = 8080\n"
      "serve.token_file = token # beside this file\n",
      "/etc/lode/config", "/home/ann");
  REQUIRE_MESSAGE(c.ok(), c.status().to_string());
  CHECK(c->path == "/etc/lode/config");
  CHECK(c->index == "/home/ann/archive/lode.sqlite");
  CHECK(c->model == "tfidf");
  CHECK(c->title_weight == 3.0);
  CHECK(c->body_weight == 0.5);
  CHECK(c->serve_address == "::1");
  CHECK(c->serve_port == 8080);
  CHECK(c->serve_token_file == "/etc/lode/token");

  auto empty = parse_config("# nothing set\n", "/x/config", "/home/ann");
  REQUIRE(empty.ok());
  CHECK_FALSE(empty->index.has_value());
  CHECK_FALSE(empty->model.has_value());
  // A quoted value keeps its '#'.
  auto quoted = parse_config("index = \"/data/#1/lode.sqlite\"\n", "/x/config", "/home/ann");
  REQUIRE(quoted.ok());
  CHECK(quoted->index == "/data/#1/lode.sqlite");
}

TEST_CASE("config file: each error names the file, the line and what is wrong") {
  CHECK(error_of("model = bm25\nthis line has no equals sign\n").message() ==
        "/etc/lode/config:2: expected 'key = value', found 'this line has no equals sign'");
  CHECK(error_of("\n\ncolour = blue\n").message().rfind("/etc/lode/config:3: unknown key 'colour' (known: ", 0) == 0);
  CHECK(error_of("model = bm25\nmodel = tfidf\n").message() == "/etc/lode/config:2: 'model' is set twice");
  CHECK(error_of("model = vector\n").message() == "/etc/lode/config:1: 'model' takes bm25 or tfidf, not 'vector'");
  CHECK(error_of("title_weight = heavy\n").message() ==
        "/etc/lode/config:1: 'title_weight' takes a number from 0 to 1000000, not 'heavy'");
  CHECK(error_of("title_weight = -1\n").message().find("'title_weight' takes a number") != std::string::npos);
  CHECK(error_of("serve.port = 70000\n").message() ==
        "/etc/lode/config:1: 'serve.port' takes a port number from 0 to 65535, not '70000'");
  CHECK(error_of("index =\n").message() == "/etc/lode/config:1: 'index' has no value");
  CHECK(error_of("index = \"/a\n").message() == "/etc/lode/config:1: unclosed quote in the value");
  CHECK(error_of("= x\n").message() == "/etc/lode/config:1: no key before '='");
}

TEST_CASE("base folders follow XDG: absolute variables count, relative ones are ignored") {
  const char* saved_data = std::getenv("XDG_DATA_HOME");
  const char* saved_config = std::getenv("XDG_CONFIG_HOME");
  const std::string keep_data = saved_data ? saved_data : "", keep_config = saved_config ? saved_config : "";
  ::setenv("XDG_DATA_HOME", "/tmp/lode-xdg-data", 1);
  ::setenv("XDG_CONFIG_HOME", "relative/config", 1);
  BaseDirs d = BaseDirs::from_environment();
  CHECK(d.default_index() == "/tmp/lode-xdg-data/lode/index.sqlite");
  CHECK(d.config_file() == d.home + "/.config/lode/config");
  // Put back what the harness set (tests/test_main.cpp).
  ::setenv("XDG_DATA_HOME", keep_data.c_str(), 1);
  ::setenv("XDG_CONFIG_HOME", keep_config.c_str(), 1);
}
