// Connection strings of the database source (core/io/odbc_connection.h): the password comes
// only from the string, the workbench's password field or FOLDLINE_ODBC_PASSWORD, goes in
// braced with '}' doubled, and is masked in anything shown. Key=value pairs separated by ';'
// and braces around a value follow the ODBC connection-string grammar of SQLDriverConnect
// [from memory]. The database side runs in tests/reference/sql_pushdown_test.py, whose
// throwaway PostgreSQL account logs in with such strings.
#include "core/io/odbc_connection.h"

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
    EXPECT_EQ(odbc_connection_string("DSN=w; pwd = given"), "DSN=w; pwd = given");
    // The environment's password is escaped like any other: '}' doubled inside the braces.
    ::setenv("FOLDLINE_ODBC_PASSWORD", "a}b{c;d", 1);
    EXPECT_EQ(odbc_connection_string("odbc:DSN=w"), "DSN=w;PWD={a}}b{c;d};");
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
    EXPECT_EQ(redact_connection_string("novalue;DSN=w"), "novalue;DSN=w");
}

TEST(OdbcConnection, PasswordsHoldingSemicolonsAndBracesGoInBraced) {
    // ';' inside braces does not end the value; '{' needs no escape; '}' is doubled.
    EXPECT_EQ(connection_with_password("DSN=w;Uid=r", "p;w"), "DSN=w;Uid=r;PWD={p;w};");
    EXPECT_EQ(connection_with_password("DSN=w;", "p}w"), "DSN=w;PWD={p}}w};");
    EXPECT_EQ(connection_with_password("DSN=w;", "{pw"), "DSN=w;PWD={{pw};");
    EXPECT_EQ(connection_with_password("DSN=w;", "}}"), "DSN=w;PWD={}}}}};");
    EXPECT_EQ(connection_with_password("DSN=w;", "a=b;PWD=c}"), "DSN=w;PWD={a=b;PWD=c}}};");
    // No password: the string as it was.
    EXPECT_EQ(connection_with_password("DSN=w", ""), "DSN=w");
    EXPECT_EQ(connection_with_password("", "x"), "PWD={x};");

    // Whatever the password holds, the result is read back as one PWD attribute: masking
    // leaves nothing of it, and the attribute after it survives.
    for (const char* pw : {"p;w", "p}w", "{pw", "}}", "}", "{", ";", "a=b;Uid=x}", "}; DSN=other"}) {
        const std::string s = connection_with_password("DSN=w;Uid=r", pw) + "Port=5;";
        EXPECT_EQ(redact_connection_string(s), "DSN=w;Uid=r;PWD=***;Port=5;") << pw;
        EXPECT_TRUE(connection_has_password(s)) << pw;
    }
}

TEST(OdbcConnection, FindsAPasswordWrittenInTheString) {
    EXPECT_TRUE(connection_has_password("DSN=w;PWD=x"));
    EXPECT_TRUE(connection_has_password("DSN=w; Password = {x;y}"));
    EXPECT_TRUE(connection_has_password("pwd=;DSN=w"));  // even an empty one
    EXPECT_FALSE(connection_has_password("DSN=w;Uid=r"));
    EXPECT_FALSE(connection_has_password(""));
    EXPECT_FALSE(connection_has_password("DSN=pwd;Uid=password"));  // values, not keys
    EXPECT_FALSE(connection_has_password("Uid={r;PWD=x};DSN=w"));   // inside a braced value
    EXPECT_FALSE(connection_has_password("PWDX=1;PASSWORDS=2;pwd"));
}

}  // namespace
}  // namespace foldline
