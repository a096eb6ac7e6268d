// The connection loop on its own (server/connection_loop.h), with a handler
// the test controls, over real sockets on loopback: workers held busy on
// purpose show that a full queue answers 503 with Retry-After at once, that
// the inline route still answers, and that slow, idle, oversized and
// surplus connections meet their bounds.
#include <netinet/in.h>
#include <sys/socket.h>

#include <condition_variable>
#include <mutex>

#include "server/connection_loop.h"
#include "server_util.h"

using namespace lode;
using namespace lode::server;
using namespace lode::test;

namespace {

std::string reply(int status, const std::string& body) {
  return "HTTP/1.1 " + std::to_string(status) + " X\r\nContent-Length: " + std::to_string(body.size()) +
         "\r\n\r\n" + body;
}

// A loop on a free loopback port whose workers wait until release().
class HeldLoop {
 public:
  explicit HeldLoop(LoopLimits limits) {
    int fd = ::socket(AF_INET, SOCK_STREAM, 0);
    REQUIRE(fd >= 0);
    sockaddr_in a{};
    a.sin_family = AF_INET;
    a.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
    REQUIRE(::bind(fd, reinterpret_cast<sockaddr*>(&a), sizeof a) == 0);
    REQUIRE(::listen(fd, 64) == 0);
    socklen_t len = sizeof a;
    getsockname(fd, reinterpret_cast<sockaddr*>(&a), &len);
    port_ = ntohs(a.sin_port);
    LoopHooks hooks{[this](Exchange& ex) {
                      bool inline_route = ex.request.find("/inline") != std::string_view::npos;
                      if (!inline_route) {
                        std::unique_lock lock(mu_);
                        ++held_;
                        cv_.notify_all();
                        cv_.wait(lock, [&] { return released_; });
                      }
                      ex.response = reply(200, inline_route ? "inline" : "worked");
                    },
                    [](std::string_view head) { return head.find("/inline") != std::string_view::npos; },
                    [](Refusal r, const std::string&) {
                      std::string extra = r == Refusal::kBusy ? "Retry-After: 1\r\n" : "";
                      int status = r == Refusal::kBusy || r == Refusal::kTooManyConnections ? 503
                                   : r == Refusal::kTooSlow                                    ? 408
                                   : r == Refusal::kHeadTooLarge                               ? 431
                                                                                               : 400;
                      return "HTTP/1.1 " + std::to_string(status) + " X\r\n" + extra +
                             "Connection: close\r\nContent-Length: 0\r\n\r\n";
                    }};
    auto loop = ConnectionLoop::create(fd, limits, std::move(hooks));
    REQUIRE(loop.ok());
    loop_ = std::move(loop.value());
    thread_ = std::thread([this] { (void)loop_->run(); });
  }
  ~HeldLoop() {
    release();
    loop_->stop();
    thread_.join();
  }
  int port() const { return port_; }
  ConnectionLoop& loop() { return *loop_; }
  void release() {
    std::lock_guard lock(mu_);
    released_ = true;
    cv_.notify_all();
  }
  // Waits (hang guard: 20 s) until `n` requests are held by workers.
  bool wait_held(int n) {
    std::unique_lock lock(mu_);
    return cv_.wait_for(lock, std::chrono::seconds(20), [&] { return held_ >= n; });
  }

 private:
  int port_ = 0;
  std::unique_ptr<ConnectionLoop> loop_;
  std::thread thread_;
  std::mutex mu_;
  std::condition_variable cv_;
  int held_ = 0;
  bool released_ = false;
};

const std::string kGet = "GET /work HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n";

// Waits (hang guard) until `pred` holds.
template <typename Pred>
bool eventually(Pred pred) {
  for (int i = 0; i < 2000 && !pred(); ++i) std::this_thread::sleep_for(std::chrono::milliseconds(10));
  return pred();
}

}  // namespace

TEST_CASE("Loop: with every worker busy and the queue full, a request gets 503 with Retry-After and the inline route answers") {
  LoopLimits limits;
  limits.workers = 2;
  limits.max_queued = 2;
  HeldLoop held(limits);
  std::vector<std::unique_ptr<RawConnection>> busy;
  for (int i = 0; i < 2; ++i) {
    busy.push_back(std::make_unique<RawConnection>(held.port()));
    REQUIRE(busy.back()->send(kGet));
  }
  REQUIRE(held.wait_held(2));
  for (int i = 0; i < 2; ++i) {
    busy.push_back(std::make_unique<RawConnection>(held.port()));
    REQUIRE(busy.back()->send(kGet));
  }
  REQUIRE(eventually([&] { return held.loop().load().queued == 2; }));
  CHECK(held.loop().load().busy_workers == 2);

  RawConnection extra(held.port());
  REQUIRE(extra.send(kGet));
  bool closed = false;
  std::string refused = extra.read_until_closed(std::chrono::seconds(20), &closed);
  CHECK(refused.rfind("HTTP/1.1 503", 0) == 0);
  CHECK(refused.find("Retry-After: 1") != std::string::npos);
  CHECK(closed);
  CHECK(held.loop().load().refused_busy == 1);

  // The inline route does not queue: it answers while every worker is held.
  RawConnection health(held.port());
  REQUIRE(health.send("GET /inline HTTP/1.1\r\nHost: 127.0.0.1\r\nConnection: close\r\n\r\n"));
  std::string answer = health.read_until_closed(std::chrono::seconds(2));
  CHECK(answer.find("inline") != std::string::npos);

  // Released, the held and queued requests all get their answers.
  held.release();
  for (auto& c : busy) CHECK(c->read_response(std::chrono::seconds(20)).find("worked") != std::string::npos);
}

TEST_CASE("Loop: keep-alive connections beyond the worker count hold no worker") {
  LoopLimits limits;
  limits.workers = 1;
  HeldLoop held(limits);
  held.release();  // workers answer at once here
  // Forty connections each make a request and keep the connection open.
  std::vector<std::unique_ptr<RawConnection>> kept;
  for (int i = 0; i < 40; ++i) {
    kept.push_back(std::make_unique<RawConnection>(held.port()));
    REQUIRE(kept.back()->send(kGet));
    CHECK(kept.back()->read_response(std::chrono::seconds(20)).find("worked") != std::string::npos);
  }
  CHECK(held.loop().load().open_connections == 40);
  CHECK(held.loop().load().busy_workers == 0);
  // Each can ask again on the same connection.
  for (auto& c : kept) {
    REQUIRE(c->send(kGet));
    CHECK(c->read_response(std::chrono::seconds(20)).find("worked") != std::string::npos);
  }
}

TEST_CASE("Loop: slow, idle and oversized requests meet their bounds") {
  LoopLimits limits;
  limits.workers = 1;
  limits.head_deadline = std::chrono::milliseconds(600);
  limits.idle_timeout = std::chrono::milliseconds(400);
  limits.max_head_bytes = 1024;
  HeldLoop held(limits);
  held.release();

  // Slow: a head that never ends gets 408 and a close after the deadline,
  // although it keeps sending.
  RawConnection slow(held.port());
  REQUIRE(slow.send("GET /work HTTP/1.1\r\n"));
  auto start = std::chrono::steady_clock::now();
  std::string got;
  bool closed = false;
  for (int i = 0; i < 100 && !closed; ++i) {
    slow.send("X-Drip: " + std::to_string(i) + "\r\n");
    got += slow.read_until_closed(std::chrono::milliseconds(50), &closed);
  }
  CHECK(closed);
  CHECK(got.rfind("HTTP/1.1 408", 0) == 0);
  CHECK(std::chrono::steady_clock::now() - start < std::chrono::seconds(4));  // hang guard, not a speed check
  CHECK(held.loop().load().timed_out == 1);

  // Idle: closed without a word.
  RawConnection idle(held.port());
  bool idle_closed = false;
  CHECK(idle.read_until_closed(std::chrono::seconds(5), &idle_closed).empty());
  CHECK(idle_closed);

  // Oversized head: 431 at once, before the head ends.
  RawConnection big(held.port());
  REQUIRE(big.send("GET /work HTTP/1.1\r\nX-Fill: " + std::string(2000, 'a')));
  CHECK(big.read_until_closed(std::chrono::seconds(5)).rfind("HTTP/1.1 431", 0) == 0);
}

TEST_CASE("Loop: a connection beyond the cap gets 503 and a close") {
  LoopLimits limits;
  limits.workers = 1;
  limits.max_connections = 3;
  HeldLoop held(limits);
  held.release();
  std::vector<std::unique_ptr<RawConnection>> open;
  for (int i = 0; i < 3; ++i) {
    open.push_back(std::make_unique<RawConnection>(held.port()));
    REQUIRE(open.back()->send(kGet));
    CHECK(open.back()->read_response(std::chrono::seconds(20)).find("worked") != std::string::npos);
  }
  RawConnection fourth(held.port());
  bool fourth_closed = false;
  CHECK(fourth.read_until_closed(std::chrono::seconds(5), &fourth_closed).rfind("HTTP/1.1 503", 0) == 0);
  CHECK(fourth_closed);
  CHECK(held.loop().load().refused_connections == 1);
  // The three still work.
  for (auto& c : open) {
    REQUIRE(c->send(kGet));
    CHECK(c->read_response(std::chrono::seconds(20)).find("worked") != std::string::npos);
  }
}

TEST_CASE("Loop: framing finds the end of a request from its head alone") {
  auto f = frame_request("GET / HTTP/1.1\r\nHost: a\r\n", 1024, 100);
  CHECK(f.state == Frame::State::kIncomplete);
  f = frame_request("GET / HTTP/1.1\r\nHost: a\r\n\r\nGET", 1024, 100);
  CHECK(f.state == Frame::State::kComplete);
  CHECK(f.length == 27);
  f = frame_request("POST / HTTP/1.1\r\ncontent-length: 5\r\n\r\nab", 1024, 100);
  CHECK(f.state == Frame::State::kIncomplete);
  f = frame_request("POST / HTTP/1.1\r\nContent-Length: 5\r\nExpect: 100-continue\r\n\r\n", 1024, 100);
  CHECK(f.expects_continue);
  f = frame_request("POST / HTTP/1.1\r\nContent-Length: 5\r\n\r\nabcdeGET", 1024, 100);
  CHECK(f.state == Frame::State::kComplete);
  CHECK(f.length == 43);
  f = frame_request("POST / HTTP/1.1\r\nContent-Length: 500\r\n\r\n", 1024, 100);
  CHECK((f.state == Frame::State::kRefused && f.refusal == Refusal::kBodyTooLarge));
  f = frame_request("POST / HTTP/1.1\r\nTransfer-Encoding: chunked\r\n\r\n", 1024, 100);
  CHECK((f.state == Frame::State::kRefused && f.refusal == Refusal::kLengthRequired));
  f = frame_request("POST / HTTP/1.1\r\nContent-Length: 1x\r\n\r\n", 1024, 100);
  CHECK((f.state == Frame::State::kRefused && f.refusal == Refusal::kBadFraming));
  f = frame_request("GET / HTTP/1.1\nHost: a\n\n", 1024, 100);
  CHECK(f.state == Frame::State::kComplete);
  CHECK(request_path("GET /api/v1/health?x=1 HTTP/1.1\r\n") == "/api/v1/health");
  CHECK(is_read_method("HEAD /x HTTP/1.1\r\n"));
  CHECK(!is_read_method("POST /x HTTP/1.1\r\n"));
}
