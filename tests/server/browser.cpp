#include "browser.h"

#include <doctest/doctest.h>
#include <fcntl.h>
#include <poll.h>
#include <signal.h>
#include <sys/wait.h>
#include <unistd.h>

#include <fstream>
#include <map>
#include <vector>

namespace lode::test {
namespace {

std::string base64_decode(const std::string& in) {
  auto value = [](char c) -> int {
    if (c >= 'A' && c <= 'Z') return c - 'A';
    if (c >= 'a' && c <= 'z') return c - 'a' + 26;
    if (c >= '0' && c <= '9') return c - '0' + 52;
    return c == '+' ? 62 : c == '/' ? 63 : -1;
  };
  std::string out;
  unsigned acc = 0;
  int bits = 0;
  for (char c : in) {
    int v = value(c);
    if (v < 0) continue;
    acc = (acc << 6) | static_cast<unsigned>(v);
    bits += 6;
    if (bits >= 8) {
      bits -= 8;
      out.push_back(static_cast<char>((acc >> bits) & 0xFF));
    }
  }
  return out;
}

}  // namespace

Browser::Browser(const std::string& profile_dir) {
  REQUIRE_MESSAGE(access(kChromium, X_OK) == 0,
                  "Chromium is not installed at /usr/bin/chromium: run scripts/setup-debian.sh");
  int to[2], from[2];
  REQUIRE(pipe(to) == 0);
  REQUIRE(pipe(from) == 0);
  std::string profile = "--user-data-dir=" + profile_dir;
  std::string log = profile_dir + ".log";
  pid_ = fork();
  REQUIRE(pid_ >= 0);
  if (pid_ == 0) {
    // The browser reads commands on fd 3 and writes replies on fd 4.
    int in = dup(to[0]), out = dup(from[1]);
    dup2(in, 3);
    dup2(out, 4);
    int logfd = ::open(log.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0600);
    if (logfd >= 0) {
      dup2(logfd, 1);
      dup2(logfd, 2);
    }
    for (int fd = 5; fd < 1024; ++fd) close(fd);
    execl(kChromium, kChromium, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
          "--disable-background-networking", "--disable-component-update", "--disable-sync",
          "--disable-dev-shm-usage", "--remote-debugging-pipe", profile.c_str(), "about:blank",
          static_cast<char*>(nullptr));
    _exit(127);
  }
  close(to[0]);
  close(from[1]);
  to_browser_ = to[1];
  from_browser_ = from[0];
  signal(SIGPIPE, SIG_IGN);  // a browser that died shows as a failed read, not a killed test
}

Browser::~Browser() {
  if (pid_ > 0) {
    nlohmann::json bye{{"id", next_id_++}, {"method", "Browser.close"}};
    std::string msg = bye.dump();
    msg.push_back('\0');
    (void)!write(to_browser_, msg.data(), msg.size());
    for (int i = 0; i < 50 && waitpid(pid_, nullptr, WNOHANG) == 0; ++i) usleep(100 * 1000);
    if (waitpid(pid_, nullptr, WNOHANG) == 0) {
      kill(pid_, SIGKILL);
      waitpid(pid_, nullptr, 0);
    }
  }
  close(to_browser_);
  close(from_browser_);
}

nlohmann::json Browser::read_reply(int id) {
  while (true) {
    std::size_t end;
    while ((end = buffer_.find('\0')) != std::string::npos) {
      auto msg = nlohmann::json::parse(buffer_.substr(0, end), nullptr, false);
      buffer_.erase(0, end + 1);
      if (msg.is_object() && msg.contains("id") && msg["id"] == id) return msg;  // events are skipped
    }
    pollfd p{from_browser_, POLLIN, 0};
    REQUIRE_MESSAGE(poll(&p, 1, 60000) == 1, "Chromium did not answer within a minute (hang guard)");
    char buf[65536];
    ssize_t n = read(from_browser_, buf, sizeof buf);
    REQUIRE_MESSAGE(n > 0, "Chromium closed the DevTools pipe");
    buffer_.append(buf, static_cast<std::size_t>(n));
  }
}

nlohmann::json Browser::call(const std::string& method, const nlohmann::json& params, const std::string& session) {
  int id = next_id_++;
  nlohmann::json cmd{{"id", id}, {"method", method}, {"params", params}};
  if (!session.empty()) cmd["sessionId"] = session;
  std::string msg = cmd.dump();
  msg.push_back('\0');
  REQUIRE(write(to_browser_, msg.data(), msg.size()) == static_cast<ssize_t>(msg.size()));
  auto reply = read_reply(id);
  REQUIRE_MESSAGE(!reply.contains("error"), (method + ": " + reply["error"].dump()));
  return reply["result"];
}

std::string Browser::open(const std::string& url, int width, int height, bool mobile) {
  auto target = call("Target.createTarget", {{"url", "about:blank"}});
  auto attached = call("Target.attachToTarget", {{"targetId", target["targetId"]}, {"flatten", true}});
  std::string session = attached["sessionId"];
  call("Emulation.setDeviceMetricsOverride",
       {{"width", width}, {"height", height}, {"deviceScaleFactor", 1}, {"mobile", mobile}}, session);
  call("Page.enable", nlohmann::json::object(), session);
  call("Page.navigate", {{"url", url}}, session);
  REQUIRE(wait_for(session, "document.readyState === 'complete'"));
  return session;
}

nlohmann::json Browser::eval(const std::string& session, const std::string& js) {
  auto r = call("Runtime.evaluate", {{"expression", js}, {"awaitPromise", true}, {"returnByValue", true}}, session);
  REQUIRE_MESSAGE(!r.contains("exceptionDetails"), (js + " threw: " + r["exceptionDetails"].dump()));
  return r["result"].contains("value") ? r["result"]["value"] : nlohmann::json();
}

bool Browser::wait_for(const std::string& session, const std::string& condition) {
  std::string js = "new Promise((done) => { const t0 = Date.now(); const tick = () => { let ok = false; "
                   "try { ok = !!(" + condition + "); } catch (e) {} "
                   "if (ok) done(true); else if (Date.now() - t0 > 20000) done(false); else setTimeout(tick, 25); };"
                   " tick(); })";
  return eval(session, js) == true;
}

void Browser::type(const std::string& session, const std::string& text) {
  for (char c : text) {
    std::string s(1, c);
    call("Input.dispatchKeyEvent", {{"type", "keyDown"}, {"key", s}, {"text", s}}, session);
    call("Input.dispatchKeyEvent", {{"type", "keyUp"}, {"key", s}}, session);
  }
}

void Browser::press(const std::string& session, const std::string& key) {
  // Enter types "\r" (it submits forms); other keys go as rawKeyDown, without
  // a character, as a key the page handles itself.
  static const std::map<std::string, int> codes = {{"Enter", 13}, {"Escape", 27}, {"ArrowDown", 40}, {"ArrowUp", 38}};
  nlohmann::json down{{"type", key == "Enter" ? "keyDown" : "rawKeyDown"}, {"key", key}};
  if (auto it = codes.find(key); it != codes.end()) {
    down["code"] = key;
    down["windowsVirtualKeyCode"] = it->second;
  }
  if (key == "Enter") down["text"] = "\r";
  call("Input.dispatchKeyEvent", down, session);
  call("Input.dispatchKeyEvent", {{"type", "keyUp"}, {"key", key}}, session);
}

void Browser::screenshot(const std::string& session, const std::string& path) {
  auto shot = call("Page.captureScreenshot", {{"format", "png"}, {"captureBeyondViewport", false}}, session);
  std::ofstream out(path, std::ios::binary);
  out << base64_decode(shot["data"].get<std::string>());
}

}  // namespace lode::test
