// The database source (core/io/odbc_source.h) without a database: checks made before
// connecting and a data source that does not exist. Connection strings are tested in
// odbc_connection_test.cpp; the database side runs in tests/reference/sql_pushdown_test.py.
#include "core/io/odbc_source.h"

#include <gtest/gtest.h>

#include <cstdlib>

namespace foldline {
namespace {

TEST(OdbcSource, RefusedQueryFailsBeforeConnecting) {
    OdbcOptions o;
    o.connection = "odbc:DSN=does_not_matter;";
    o.source = sql::SqlSource{std::string(), std::string("SELECT 1; DELETE FROM t")};
    auto r = read_odbc_cells(o);
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("';'"), std::string::npos);
}

TEST(OdbcSource, MissingDataSourceIsAClearError) {
    OdbcOptions o;
    o.connection = "odbc:DSN=foldline_no_such_dsn;";
    o.source = sql::SqlSource{std::string("t"), std::string()};
    auto r = read_odbc_cells(o);
    ASSERT_FALSE(r.ok());
    EXPECT_NE(r.error().message.find("cannot connect"), std::string::npos);
}

}  // namespace
}  // namespace foldline
