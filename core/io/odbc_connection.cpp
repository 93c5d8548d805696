#include "core/io/odbc_connection.h"

#include <cctype>
#include <cstdlib>
#include <vector>

namespace foldline {
namespace {

std::string lower(std::string_view s) {
    std::string out(s);
    for (auto& c : out) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return out;
}

std::string trim(std::string_view k) {
    while (!k.empty() && k.front() == ' ') k.remove_prefix(1);
    while (!k.empty() && k.back() == ' ') k.remove_suffix(1);
    return std::string(k);
}

/// One ';'-separated piece of a connection string: text[begin, eq) is the key and
/// text(eq, end) the value; a piece without '=' has eq == npos. `end` is the position of the
/// ';' that closes the piece, or the string's size.
struct Attribute {
    std::size_t begin = 0, eq = std::string_view::npos, end = 0;
};

std::vector<Attribute> attributes(std::string_view text) {
    std::vector<Attribute> out;
    std::size_t i = 0;
    while (i < text.size()) {
        const std::size_t eq = text.find('=', i);
        const std::size_t semi = text.find(';', i);
        if (eq == std::string_view::npos || (semi != std::string_view::npos && semi < eq)) {
            const std::size_t end = semi == std::string_view::npos ? text.size() : semi;
            out.push_back({i, std::string_view::npos, end});
            i = end + 1;
            continue;
        }
        std::size_t v = eq + 1;
        while (v < text.size() && text[v] == ' ') ++v;
        std::size_t end = v;
        if (v < text.size() && text[v] == '{') {  // a braced value runs to its closing brace
            end = v + 1;
            while (end < text.size()) {
                if (text[end] == '}') {
                    if (end + 1 < text.size() && text[end + 1] == '}') {
                        end += 2;
                        continue;
                    }
                    ++end;
                    break;
                }
                ++end;
            }
        }
        end = text.find(';', end);
        if (end == std::string_view::npos) end = text.size();
        out.push_back({i, eq, end});
        i = end + 1;
    }
    return out;
}

bool is_password_key(std::string_view text, const Attribute& a) {
    if (a.eq == std::string_view::npos) return false;
    const std::string key = lower(trim(text.substr(a.begin, a.eq - a.begin)));
    return key == "pwd" || key == "password";
}

}  // namespace

std::string odbc_connection_string(std::string_view text) {
    std::string s(text);
    if (lower(s.substr(0, 5)) == "odbc:") s = s.substr(5);
    if (s.empty()) return s;
    if (connection_has_password(s)) return s;
    if (const char* p = std::getenv("FOLDLINE_ODBC_PASSWORD"); p && *p) return connection_with_password(s, p);
    return s;
}

std::string redact_connection_string(std::string_view text) {
    std::string out;
    for (const Attribute& a : attributes(text)) {
        if (a.eq == std::string_view::npos) {
            out += text.substr(a.begin, a.end - a.begin);
        } else {
            out += text.substr(a.begin, a.eq + 1 - a.begin);
            out += is_password_key(text, a) ? std::string_view("***") : text.substr(a.eq + 1, a.end - a.eq - 1);
        }
        if (a.end < text.size()) out += ';';
    }
    return out;
}

bool connection_has_password(std::string_view connection) {
    for (const Attribute& a : attributes(connection))
        if (is_password_key(connection, a)) return true;
    return false;
}

std::string connection_with_password(std::string_view connection, std::string_view password) {
    std::string out(connection);
    if (password.empty()) return out;
    if (!out.empty() && out.back() != ';') out += ';';
    out += "PWD={";
    for (char c : password) {
        out += c;
        if (c == '}') out += '}';
    }
    out += "};";
    return out;
}

}  // namespace foldline
