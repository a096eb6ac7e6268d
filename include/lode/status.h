// lode/status.h — the error values every component returns at its boundary.
//
// A Status is ok or carries a code and a message that names the file, field or
// value at fault. Result<T> holds either a T or a non-ok Status. The library
// throws nothing across its public headers; exceptions, if any, stop at the
// edges (CLI main, HTTP handlers).
//
// Thread safety: values; copy freely, no shared state.
#pragma once

#include <string>
#include <utility>
#include <variant>

namespace lode {

enum class Code {
  kOk = 0,
  kInvalidArgument,  // caller's input is wrong (option, query, field name)
  kNotFound,         // file, document, index or term does not exist
  kCorruption,       // stored bytes do not decode; message says which table/blob
  kIOError,          // the operating system or SQLite refused
  kBusy,             // another writer holds the index
  kUnsupported,      // a format or feature this build does not handle
  kLimit,            // input exceeds a configured limit (size, terms, depth)
};

class [[nodiscard]] Status {
 public:
  Status() = default;  // ok
  static Status Ok() { return {}; }
  static Status InvalidArgument(std::string m) { return {Code::kInvalidArgument, std::move(m)}; }
  static Status NotFound(std::string m) { return {Code::kNotFound, std::move(m)}; }
  static Status Corruption(std::string m) { return {Code::kCorruption, std::move(m)}; }
  static Status IOError(std::string m) { return {Code::kIOError, std::move(m)}; }
  static Status Busy(std::string m) { return {Code::kBusy, std::move(m)}; }
  static Status Unsupported(std::string m) { return {Code::kUnsupported, std::move(m)}; }
  static Status Limit(std::string m) { return {Code::kLimit, std::move(m)}; }

  bool ok() const { return code_ == Code::kOk; }
  explicit operator bool() const { return ok(); }
  Code code() const { return code_; }
  const std::string& message() const { return message_; }
  // "invalid argument: <message>", for logs and the CLI.
  std::string to_string() const;

 private:
  Status(Code c, std::string m) : code_(c), message_(std::move(m)) {}
  Code code_ = Code::kOk;
  std::string message_;
};

// Either a value or an error. REQUIRES: the Status given is not ok.
template <typename T>
class [[nodiscard]] Result {
 public:
  Result(T value) : v_(std::move(value)) {}          // NOLINT: implicit by design
  Result(Status error) : v_(std::move(error)) {}     // NOLINT: implicit by design
  bool ok() const { return std::holds_alternative<T>(v_); }
  explicit operator bool() const { return ok(); }
  // REQUIRES: ok().
  T& value() & { return std::get<T>(v_); }
  const T& value() const& { return std::get<T>(v_); }
  T&& value() && { return std::get<T>(std::move(v_)); }
  T* operator->() { return &value(); }
  const T* operator->() const { return &value(); }
  T& operator*() & { return value(); }
  // Ok status when ok(), else the error.
  Status status() const { return ok() ? Status() : std::get<Status>(v_); }

 private:
  std::variant<T, Status> v_;
};

}  // namespace lode

// Propagate a non-ok Status from an expression returning Status.
#define LODE_RETURN_IF_ERROR(expr)        \
  do {                                    \
    ::lode::Status lode_s_ = (expr);      \
    if (!lode_s_.ok()) return lode_s_;    \
  } while (0)
