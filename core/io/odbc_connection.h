#pragma once
// ODBC connection strings, in one place for the command line and the workbench: attributes are
// KEY=VALUE separated by ';', and a value in braces may hold ';', '=' and '{', with '}' written
// as "}}" (the connection-string grammar of SQLDriverConnect [from memory]). Plain text
// handling only, so it builds without unixODBC.
#include <string>
#include <string_view>

namespace foldline {

/// The connection string with an "odbc:" prefix removed and, when it has no PWD= and the
/// environment variable FOLDLINE_ODBC_PASSWORD is set, that password added as
/// connection_with_password does. "" stays "".
std::string odbc_connection_string(std::string_view text);

/// The connection string with every PWD=/PASSWORD= value replaced by "***" (for messages).
std::string redact_connection_string(std::string_view text);

/// True when the connection string (without an "odbc:" prefix) has a PWD= or PASSWORD=
/// attribute: the key in any case, spaces around it allowed, never inside a braced value.
bool connection_has_password(std::string_view connection);

/// `connection` with PWD={password}; appended (a ';' first when it does not end with one): the
/// value braced and every '}' doubled, so a password may hold ';', '{', '}' and '='. An empty
/// password gives `connection` unchanged.
std::string connection_with_password(std::string_view connection, std::string_view password);

}  // namespace foldline
