#pragma once
// How Foldline's JSON documents write a number: undefined (NaN, infinite) as null, a whole
// number as an integer (so counts read `200`, not `200.0`), anything else as a double. Shared by
// the rate document (core/report/scan_json.cpp, tree and streamed) and slope findings.
#include <cmath>

#include <nlohmann/json.hpp>

namespace foldline {

/// True when x is finite, whole and below 9e15 in magnitude (exact as a 64-bit integer and
/// as a double): such a number is written as a JSON integer.
inline bool json_whole_number(double x) {
    return std::isfinite(x) && x == std::floor(x) && std::fabs(x) < 9.0e15;
}

/// x as a JSON value: null when NaN or infinite, an integer when json_whole_number(x),
/// otherwise a double (a fractional weighted count stays fractional).
inline nlohmann::json json_number(double x) {
    if (!std::isfinite(x)) return nullptr;
    if (json_whole_number(x)) return static_cast<long long>(x);
    return x;
}

}  // namespace foldline
