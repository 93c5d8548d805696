#pragma once
// What reports and project files record about a database source, in place of a file's size
// and digest. Never a credential: the connection string is kept only with its passwords masked.
#include <string>

namespace foldline {

struct DatabaseRecord {
    std::string connection;  ///< ODBC connection string, every PWD=/PASSWORD= value masked as ***
    std::string driver;      ///< driver name and version (and the engine's name) as the driver reports them
    std::string database;    ///< database (catalog) name; empty when the driver does not say
    std::string table;       ///< the table scanned, or empty when `query` is set
    std::string query;       ///< the read-only query scanned, or empty when `table` is set
    double rows = 0;         ///< COUNT(*) of the source when it was queried
    std::string queried_at;  ///< UTC time the counting query started, ISO 8601 ("" = unknown)
};

/// "table T" or "query: Q" ("" when neither is set).
inline std::string source_words(const DatabaseRecord& r) {
    if (!r.table.empty()) return "table " + r.table;
    if (!r.query.empty()) return "query: " + r.query;
    return {};
}

}  // namespace foldline
