// The optional access token. Scripts send `Authorization: Bearer TOKEN`; a
// browser cannot add that header to a page load, so POST /unlock (the form in
// web/unlock.html) checks the token once and sets an HttpOnly cookie holding it.
#pragma once

#include <httplib.h>

#include <string>
#include <string_view>

namespace lode::server {

inline constexpr const char* kAccessCookie = "lode_access";

// Equal strings, in time that depends only on the length of `secret`.
bool constant_time_equal(std::string_view given, std::string_view secret);

// True when the request carries `token` in the header or the cookie.
bool authorized(const httplib::Request& req, const std::string& token);

// Answers an unauthorized request: 401 with the unlock page for a browser
// asking for HTML, a problem for everything else.
void refuse(const httplib::Request& req, httplib::Response& res);

// POST /unlock with form field `token`: sets the cookie and redirects to the
// page, or answers 401.
void unlock(const httplib::Request& req, httplib::Response& res, const std::string& token);

// Token characters: visible ASCII except those with a meaning in a cookie or
// header ('"', ',', ';', '\\'), so the value travels unquoted.
bool valid_token(std::string_view token);

}  // namespace lode::server
