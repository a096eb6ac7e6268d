// Headless Chromium driven over the DevTools protocol through a pipe
// (--remote-debugging-pipe: JSON messages ending in a NUL byte on fds 3 and 4),
// so the browser test needs no Node.js, no WebSocket and no npm package.
#pragma once

#include <sys/types.h>

#include <nlohmann/json.hpp>
#include <string>

namespace lode::test {

inline constexpr const char* kChromium = "/usr/bin/chromium";

class Browser {
 public:
  // Starts Chromium with a fresh profile in `profile_dir`. REQUIREs that it
  // is installed (the message says to run scripts/setup-debian.sh).
  explicit Browser(const std::string& profile_dir);
  ~Browser();
  Browser(const Browser&) = delete;
  Browser& operator=(const Browser&) = delete;

  // Sends one command and returns its "result"; REQUIREs no protocol error.
  nlohmann::json call(const std::string& method, const nlohmann::json& params = nlohmann::json::object(),
                      const std::string& session = "");
  // Opens `url` in a new tab and returns the tab's session id.
  std::string open(const std::string& url, int width, int height, bool mobile);
  // Evaluates `js` (awaiting a promise) and returns its value.
  nlohmann::json eval(const std::string& session, const std::string& js);
  // Polls `condition` (a JS expression) until true; false after ~20 s (a hang guard).
  bool wait_for(const std::string& session, const std::string& condition);
  // Real key events: `text` character by character, or one named key.
  void type(const std::string& session, const std::string& text);
  void press(const std::string& session, const std::string& key);
  // Saves a PNG of the tab to `path`.
  void screenshot(const std::string& session, const std::string& path);

 private:
  nlohmann::json read_reply(int id);
  pid_t pid_ = -1;
  int to_browser_ = -1, from_browser_ = -1;
  int next_id_ = 1;
  std::string buffer_;
};

}  // namespace lode::test
