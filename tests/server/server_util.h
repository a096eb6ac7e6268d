// Helpers for the server suite: a real HttpServer on 127.0.0.1 with a free
// port in a background thread, and the sample corpus indexed by the real CLI.
#pragma once

#include <httplib.h>

#include <arpa/inet.h>
#include <netinet/in.h>
#include <poll.h>
#include <sys/socket.h>
#include <sys/wait.h>
#include <unistd.h>

#include <chrono>
#include <nlohmann/json.hpp>
#include <thread>

#include "core/util.h"
#include "lode/server.h"

namespace lode::test {

inline const std::string kLode = LODE_BINARY;
inline const std::string kSampleCorpus = LODE_SOURCE_DIR "/sample_corpus/archive";

// Indexes the sample corpus into `index` with the lode binary.
inline void index_sample(const std::string& index) {
  int rc = -1;
  std::string out = run(kLode + " --index " + index + " index -q " + kSampleCorpus + " 2>&1", &rc);
  REQUIRE_MESSAGE(rc == 0, out);
}

// A plain TCP connection to 127.0.0.1, for what an HTTP client will not do:
// send a request slowly, stay idle, or forge headers byte by byte.
class RawConnection {
 public:
  explicit RawConnection(int port) {
    fd_ = ::socket(AF_INET, SOCK_STREAM, 0);
    REQUIRE(fd_ >= 0);
    sockaddr_in a{};
    a.sin_family = AF_INET;
    a.sin_port = htons(static_cast<std::uint16_t>(port));
    a.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
    REQUIRE(::connect(fd_, reinterpret_cast<sockaddr*>(&a), sizeof a) == 0);
  }
  ~RawConnection() { ::close(fd_); }
  RawConnection(const RawConnection&) = delete;
  RawConnection& operator=(const RawConnection&) = delete;

  // False once the server has closed the connection.
  bool send(const std::string& bytes) {
    return ::send(fd_, bytes.data(), bytes.size(), MSG_NOSIGNAL) == static_cast<ssize_t>(bytes.size());
  }
  // Everything the server sends until it closes the connection or `limit`
  // passes (a hang guard); `closed` says which.
  std::string read_until_closed(std::chrono::milliseconds limit, bool* closed = nullptr) {
    std::string got;
    auto end = std::chrono::steady_clock::now() + limit;
    if (closed) *closed = false;
    for (;;) {
      auto left = std::chrono::duration_cast<std::chrono::milliseconds>(end - std::chrono::steady_clock::now());
      if (left.count() <= 0) return got;
      pollfd p{fd_, POLLIN, 0};
      if (::poll(&p, 1, static_cast<int>(left.count())) <= 0) return got;
      char buf[65536];
      ssize_t n = ::recv(fd_, buf, sizeof buf, 0);
      if (n <= 0) {
        if (closed) *closed = true;
        return got;
      }
      got.append(buf, static_cast<std::size_t>(n));
    }
  }
  // One response (head and Content-Length body), or what came before
  // `limit` passed (a hang guard).
  std::string read_response(std::chrono::milliseconds limit) {
    std::string got;
    auto end = std::chrono::steady_clock::now() + limit;
    for (;;) {
      std::size_t head = got.find("\r\n\r\n");
      if (head != std::string::npos) {
        std::size_t at = got.find("Content-Length: ");
        std::size_t body = at < head ? std::stoul(got.substr(at + 16)) : 0;
        if (got.size() >= head + 4 + body) return got;
      }
      auto left = std::chrono::duration_cast<std::chrono::milliseconds>(end - std::chrono::steady_clock::now());
      pollfd p{fd_, POLLIN, 0};
      if (left.count() <= 0 || ::poll(&p, 1, static_cast<int>(left.count())) <= 0) return got;
      char buf[65536];
      ssize_t n = ::recv(fd_, buf, sizeof buf, 0);
      if (n <= 0) return got;
      got.append(buf, static_cast<std::size_t>(n));
    }
  }

 private:
  int fd_ = -1;
};

// `lode ARGS` (the real binary, e.g. "serve ...") in the background, its URL read from
// its stdout; SIGTERM on stop() or destruction.
class ServeProcess {
 public:
  // `env`: NAME=VALUE words put before the command.
  ServeProcess(const std::string& args, const std::string& out, const std::string& err, const std::string& env = "")
      : err_(err) {
    fs::remove(out);  // a URL left by an earlier process must not be read as this one's
    pid_ = fork();
    REQUIRE(pid_ >= 0);
    if (pid_ == 0) {
      std::string cmd = env + " exec " + kLode + " " + args + " >" + out + " 2>" + err;
      execl("/bin/sh", "sh", "-c", cmd.c_str(), static_cast<char*>(nullptr));
      _exit(127);
    }
    for (int i = 0; i < 600 && url_.empty(); ++i) {  // hang guard: up to a minute to start
      std::string text = read_text(out);
      if (text.find('\n') != std::string::npos) url_ = text.substr(0, text.find('\n'));
      else std::this_thread::sleep_for(std::chrono::milliseconds(100));
    }
    if (url_.rfind("http://127.0.0.1:", 0) != 0) stop();
    REQUIRE_MESSAGE(url_.rfind("http://127.0.0.1:", 0) == 0, read_text(err));
  }
  ~ServeProcess() { stop(); }
  const std::string& url() const { return url_; }
  int port() const { return std::stoi(url_.substr(17)); }
  std::string err_text() const { return read_text(err_); }
  // Sends SIGTERM and returns the exit status (-1 if killed by a signal).
  int stop() {
    if (pid_ <= 0) return status_;
    kill(pid_, SIGTERM);
    int status = 0;
    waitpid(pid_, &status, 0);
    pid_ = -1;
    status_ = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
    return status_;
  }

 private:
  pid_t pid_ = -1;
  int status_ = -1;
  std::string url_, err_;
};

// Opens `n` connections that send a request head one line and then wait
// (`slow`), and `n` that send nothing (`idle`).
inline void open_stalled(int port, int n, std::vector<std::unique_ptr<RawConnection>>& slow,
                         std::vector<std::unique_ptr<RawConnection>>& idle) {
  for (int i = 0; i < n; ++i) {
    slow.push_back(std::make_unique<RawConnection>(port));
    REQUIRE(slow.back()->send("GET /api/v1/search?q=storm HTTP/1.1\r\nHost: 127.0.0.1\r\n"));
    idle.push_back(std::make_unique<RawConnection>(port));
  }
}

// A temporary folder holding the sample corpus's index.
struct Fixture {
  TempDir dir;
  std::string index = dir.str("sample.sqlite");
  Fixture() { index_sample(index); }
};

// Serves `indexes` until destroyed.
class LiveServer {
 public:
  LiveServer(std::vector<ServedIndex> indexes, ServeOptions options = {}) {
    options.address = "127.0.0.1";
    options.port = 0;
    if (options.access_log == "-") options.access_log.clear();  // a test that reads the log names a file
    auto s = HttpServer::create(std::move(indexes), options);
    REQUIRE_MESSAGE(s.ok(), s.status().to_string());
    server_ = std::move(s.value());
    auto port = server_->bind();
    REQUIRE_MESSAGE(port.ok(), port.status().to_string());
    port_ = *port;
    thread_ = std::thread([this] { (void)server_->serve(); });
  }
  explicit LiveServer(const std::string& index, ServeOptions options = {})
      : LiveServer(std::vector<ServedIndex>{{"main", index}}, std::move(options)) {}
  ~LiveServer() {
    server_->stop();
    thread_.join();
  }
  int port() const { return port_; }
  std::string url() const { return "http://127.0.0.1:" + std::to_string(port_); }
  httplib::Client client() const {
    httplib::Client c("127.0.0.1", port_);
    c.set_read_timeout(60, 0);  // a hang guard, not a speed check
    return c;
  }

 private:
  std::unique_ptr<HttpServer> server_;
  std::thread thread_;
  int port_ = 0;
};

// GET `path` with `params`; REQUIREs that a response came back.
inline httplib::Result get(httplib::Client& c, const std::string& path, const httplib::Params& params = {},
                           const httplib::Headers& headers = {}) {
  auto r = c.Get(path, params, headers, httplib::Progress());
  REQUIRE_MESSAGE(r, ("no response from " + path + ": " + httplib::to_string(r.error())));
  return r;
}

inline nlohmann::json body_json(const httplib::Result& r) {
  auto j = nlohmann::json::parse(r->body, nullptr, false);
  REQUIRE_MESSAGE(!j.is_discarded(), ("not JSON: " + r->body.substr(0, 200)));
  return j;
}

// Checks `r` is an RFC 9457 problem with `status` and type slug; returns it.
inline nlohmann::json expect_problem(const httplib::Result& r, int status, const std::string& slug) {
  CHECK_MESSAGE(r->status == status, r->body);
  CHECK(r->get_header_value("Content-Type") == "application/problem+json");
  auto j = body_json(r);
  CHECK(j["status"] == status);
  CHECK(j["type"] == "urn:lode:problem:" + slug);
  CHECK(j["title"].is_string());
  CHECK(!j["detail"].get<std::string>().empty());
  return j;
}

// The same for a raw HTTP response as read from a socket.
inline nlohmann::json expect_problem_text(const std::string& raw, int status, const std::string& slug) {
  CHECK_MESSAGE(raw.rfind("HTTP/1.1 " + std::to_string(status), 0) == 0, raw);
  CHECK(raw.find("Content-Type: application/problem+json") != std::string::npos);
  std::size_t head = raw.find("\r\n\r\n");
  REQUIRE(head != std::string::npos);
  auto j = nlohmann::json::parse(raw.substr(head + 4), nullptr, false);
  REQUIRE_MESSAGE(!j.is_discarded(), raw);
  CHECK(j["status"] == status);
  CHECK(j["type"] == "urn:lode:problem:" + slug);
  return j;
}

}  // namespace lode::test
