// `lode serve`: the HTTP API and browser page over one or more indexes.
#include <pthread.h>
#include <signal.h>

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <thread>

#include "cli/commands.h"
#include "cli/common.h"
#include "lode/server.h"

namespace lode::cli {
namespace {

struct ServeArgs {
  std::vector<std::string> indexes;  // [NAME=]FILE
  ServeOptions options;
  std::string token_file;
  std::size_t max_body_kb = 16;
  std::size_t time_budget_ms = 10000;
  std::size_t head_deadline_ms = 10000;
  std::size_t result_cache_mb = 32;
  bool no_access_log = false;
};

// "NAME=FILE" or "FILE" (named by its file stem, made URL-safe).
ServedIndex parse_served(const std::string& arg) {
  auto eq = arg.find('=');
  if (eq != std::string::npos && eq > 0) return {arg.substr(0, eq), arg.substr(eq + 1)};
  std::string name = std::filesystem::path(arg).stem().string();
  for (char& c : name)
    if (!std::isalnum(static_cast<unsigned char>(c)) && c != '_' && c != '.' && c != '-') c = '-';
  return {name.empty() ? "index" : name, arg};
}

// The token from --token-file (first line), else $LODE_SERVE_TOKEN, else
// from the config file's serve.token_file, else none.
Result<std::string> read_token(std::string file, const UserConfig& config) {
  if (file.empty()) {
    const char* env = std::getenv("LODE_SERVE_TOKEN");
    if (env && *env) return std::string(env);
    if (!config.serve_token_file) return std::string();
    file = *config.serve_token_file;
  }
  std::ifstream in(file);
  if (!in) return Status::IOError("cannot read token file '" + file + "'");
  std::string token;
  std::getline(in, token);
  while (!token.empty() && (token.back() == '\r' || token.back() == ' ')) token.pop_back();
  if (token.empty()) return Status::InvalidArgument("token file '" + file + "' is empty");
  return token;
}

int run_serve(ServeArgs& a, const Setup& setup) {
  std::vector<ServedIndex> served;
  if (a.indexes.empty() || !setup.index_flag.empty()) served.push_back(parse_served(resolve_index(setup)));
  for (const std::string& arg : a.indexes) served.push_back(parse_served(arg));
  auto token = read_token(a.token_file, setup.config);
  if (!token) return fail(token.status());
  a.options.token = *token;
  a.options.limits.max_body_bytes = a.max_body_kb * 1024;
  a.options.limits.time_budget = std::chrono::milliseconds(a.time_budget_ms);
  a.options.limits.head_deadline = std::chrono::milliseconds(a.head_deadline_ms);
  a.options.result_cache_bytes = a.result_cache_mb * 1024 * 1024;
  if (a.no_access_log) a.options.access_log.clear();

  // Signals go to one thread that stops the server; workers never see them.
  sigset_t stop_signals;
  sigemptyset(&stop_signals);
  sigaddset(&stop_signals, SIGINT);
  sigaddset(&stop_signals, SIGTERM);
  pthread_sigmask(SIG_BLOCK, &stop_signals, nullptr);

  auto server = HttpServer::create(served, a.options);
  if (!server) return fail(server.status());
  auto port = (*server)->bind();
  if (!port) return fail(port.status());
  if (!is_loopback_address(a.options.address))
    std::fprintf(stderr,
                 "lode: WARNING: listening on %s, not loopback: anyone who can reach port %d can read the text of "
                 "every indexed document%s\n",
                 a.options.address.c_str(), *port,
                 a.options.token.empty() ? " (and no access token is set: see --token-file)" : "");
  for (const ServedIndex& s : served) std::fprintf(stderr, "lode: serving '%s' (%s)\n", s.name.c_str(), s.path.c_str());
  std::string host = a.options.address.find(':') != std::string::npos ? "[" + a.options.address + "]" : a.options.address;
  std::printf("http://%s:%d/\n", host.c_str(), *port);
  std::fflush(stdout);

  HttpServer* srv = server->get();
  std::thread waiter([srv, stop_signals] {
    int sig = 0;
    sigwait(&stop_signals, &sig);
    srv->stop();
  });
  Status served_status = srv->serve();
  kill(getpid(), SIGTERM);  // wakes the waiter if serve() ended on its own
  waiter.join();
  if (!served_status.ok()) return fail(served_status);
  std::fprintf(stderr, "lode: stopped\n");
  return kExitOk;
}

}  // namespace

Runner add_serve_command(CLI::App& app, const Setup& setup) {
  auto a = std::make_shared<ServeArgs>();
  // The config file's defaults; options given on the command line win.
  if (setup.config.serve_address) a->options.address = *setup.config.serve_address;
  if (setup.config.serve_port) a->options.port = *setup.config.serve_port;
  ServeLimits& l = a->options.limits;
  app.add_option("indexes", a->indexes, "indexes to serve as [NAME=]FILE (default: the --index file)");
  app.add_option("--address", a->options.address,
                 "address to listen on (default 127.0.0.1; any other exposes the archive's text)");
  app.add_option("--port", a->options.port, "port (default 7340; 0 = any free port)")->check(CLI::Range(0, 65535));
  app.add_option("--threads", a->options.threads, "worker threads (default 8)")->check(CLI::Range(1, 256));
  app.add_option("--token-file", a->token_file,
                 "require the token in this file on every request (default: $LODE_SERVE_TOKEN if set, else the "
                 "config file's serve.token_file)")
      ->type_name("FILE");
  app.add_flag("--allow-judging", a->options.allow_judging,
               "let the page and API record sift judgments in the index file (default: the server writes nothing)");
  app.add_option("--max-page", l.max_page, "most hits per request (default 100)")->check(CLI::Range(1, 10000));
  app.add_option("--max-query-bytes", l.max_query_bytes, "longest query (default 1024)")->check(CLI::Range(1, 16384));
  app.add_option("--max-terms", l.max_query_terms, "most words in a query (default 32)")->check(CLI::Range(1, 1024));
  app.add_option("--max-body-kb", a->max_body_kb, "largest request body in KiB (default 16)")->check(CLI::Range(1, 4096));
  app.add_option("--time-budget-ms", a->time_budget_ms,
                 "longest wait for a reader and socket timeout, ms (default 10000)")
      ->check(CLI::Range(100, 600000));
  app.add_option("--reached-as", a->options.reached_as,
                 "a host name clients reach this server by (repeatable; loopback names and addresses always "
                 "work; without a token, requests naming another host are refused)")
      ->type_name("NAME");
  app.add_option("--max-connections", l.max_connections, "most open connections (default 512)")
      ->check(CLI::Range(1, 100000));
  app.add_option("--max-queued", l.max_queued, "most requests waiting for a worker; beyond, 503 (default 64)")
      ->check(CLI::Range(0, 100000));
  app.add_option("--head-deadline-ms", a->head_deadline_ms,
                 "time for a whole request to arrive, ms (default 10000)")
      ->check(CLI::Range(100, 600000));
  app.add_option("--result-cache-mb", a->result_cache_mb, "memory for cached search results, MiB (default 32; 0 = off)")
      ->check(CLI::Range(0, 65536));
  app.add_option("--access-log", a->options.access_log,
                 "access log: - = standard error (default) or a file appended to")
      ->type_name("FILE");
  app.add_flag("--no-access-log", a->no_access_log, "write no access log");
  return [a, &setup] { return run_serve(*a, setup); };
}

}  // namespace lode::cli
