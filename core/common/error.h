#pragma once
// Errors as values at the core boundary. Every failure a user can cause (a bad file, a bad
// option, an impossible question) comes back as an Error naming where and what; core never
// throws across its public API for such failures.
#include <cstddef>
#include <string>
#include <utility>
#include <variant>

namespace foldline {

/// Whose fault a failure is, for a front end's exit code or dialog: the input (a file or a
/// database), the way the audit was asked for (options, a question that does not fit the data),
/// or Foldline itself.
enum class ErrorKind { Input, Usage, Internal };

/// Where and why something failed. line/column are 1-based; 0 means "not applicable".
struct Error {
    std::string file;      ///< path or source name; empty when not about a file
    std::size_t line = 0;  ///< 1-based physical line
    std::size_t column = 0;///< 1-based field (column) number
    std::string message;   ///< what was expected / what went wrong, in plain words
    ErrorKind kind = ErrorKind::Input;

    /// "file:line:column: message", omitting parts that are empty or zero.
    std::string to_string() const;
};

/// Either a value or an Error. Minimal on purpose: ok(), value(), error(), operator bool.
template <typename T>
class Result {
public:
    Result(T value) : v_(std::move(value)) {}
    Result(Error error) : v_(std::move(error)) {}

    bool ok() const { return v_.index() == 0; }
    explicit operator bool() const { return ok(); }
    T& value() & { return std::get<0>(v_); }
    const T& value() const& { return std::get<0>(v_); }
    T&& value() && { return std::get<0>(std::move(v_)); }
    const Error& error() const { return std::get<1>(v_); }
    T* operator->() { return &value(); }
    const T* operator->() const { return &value(); }
    T& operator*() & { return value(); }
    const T& operator*() const& { return value(); }

private:
    std::variant<T, Error> v_;
};

/// Result for operations that only succeed or fail.
struct Ok {};
using Status = Result<Ok>;

inline Error make_error(std::string message, std::string file = {}, std::size_t line = 0,
                        std::size_t column = 0) {
    return Error{std::move(file), line, column, std::move(message)};
}

/// The same error, marked as a usage error (an option or a question that does not fit).
inline Error usage_error(Error e) {
    e.kind = ErrorKind::Usage;
    return e;
}

/// The same error, marked as an internal error.
inline Error internal_error(Error e) {
    e.kind = ErrorKind::Internal;
    return e;
}

}  // namespace foldline
