// Connection strings of the database source (core/io/odbc_source.h): the password comes only
// from the string or FOLDLINE_ODBC_PASSWORD and is masked in anything shown. Key=value pairs
// separated by ';' and braces around a value follow the ODBC connection-string grammar of
// SQLDriverConnect [from memory]. The database side runs in tests/reference/sql_pushdown_test.py.
#include "core/io/odbc_source.h"

#include <gtest/gtest.h>

#include <cstdlib>

namespace foldline {
namespace {

TEST(OdbcConnection, StripsThePrefixAndAddsThePasswordFromTheEnvironment) {
    ::unsetenv("FOLDLINE_ODBC_PASSWORD");
    EXPECT_EQ(odbc_connection_string("odbc:DSN=warehouse;"), "DSN=warehouse;");
    EXPECT_EQ(odbc_connection_string(""), "");
    ::setenv("FOLDLINE_ODBC_PASSWORD", "s;cret", 1);
    EXPECT_EQ(odbc_connection_string("odbc:DSN=warehouse;Uid=reader"), "DSN=warehouse;Uid=reader;PWD={s;cret};");
    // A password already in the string wins.
    EXPECT_EQ(odbc_connection_string("DSN=w;PWD=given;"), "DSN=w;PWD=given;");
    EXPECT_EQ(odbc_connection_string("DSN=w;Password=given"), "DSN=w;Password=given");
    ::unsetenv("FOLDLINE_ODBC_PASSWORD");
}

TEST(OdbcConnection, MasksPasswords) {
    EXPECT_EQ(redact_connection_string("DSN=w;Uid=r;PWD=topsecret;"), "DSN=w;Uid=r;PWD=***;");
    EXPECT_EQ(redact_connection_string("Driver=x;password=abc"), "Driver=x;password=***");
    EXPECT_EQ(redact_connection_string("DSN=w"), "DSN=w");
    EXPECT_EQ(redact_connection_string(""), "");
    // A braced value may hold ';' and a doubled '}': all of it is the password.
    EXPECT_EQ(redact_connection_string("Uid=r;PWD={se;cr}}et};Port=5"), "Uid=r;PWD=***;Port=5");
    EXPECT_EQ(redact_connection_string(" Password = {a;b;c}"), " Password =***");
}

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
