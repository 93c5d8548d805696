#!/usr/bin/python3
"""Writes decimal_comma.csv: an invented retailer's branch sales, written as a German-locale
spreadsheet exports them (semicolons, decimal commas, '.' grouping thousands), and
decimal_point.csv, the same table written with decimal points (the reference).
Columns: branch (text), revenue ("1.234,50": a decimal comma proven by both marks),
margin ("0,25": a comma with two decimals), units ("1.234": reads as 1.234 or as 1234 — the
column stays as written with an automatic reading and is read as thousands with ','),
returned ("1,250": three digits after the only comma — ambiguous under an automatic reading).
"""
import pathlib

HERE = pathlib.Path(__file__).parent
ROWS = [("Nord", 1234.5, 0.25, 1234, 1.25), ("Süd", 98765.25, 0.3, 2500, 2.5),
        ("West", 12.75, 0.125, 3001, 0.75), ("Ost", 1000000.0, 0.05, 1999, 3.0)]


def comma(x, decimals):
    whole, frac = f"{x:,.{decimals}f}".split(".") if decimals else (f"{x:,.0f}", "")
    whole = whole.replace(",", ".")
    return whole + ("," + frac if decimals else "")


def main():
    with open(HERE / "decimal_comma.csv", "w", encoding="utf-8", newline="") as f:
        f.write("branch;revenue;margin;units;returned\n")
        for b, rev, m, u, r in ROWS:
            f.write(f"{b};{comma(rev, 2)};{comma(m, 2 if m * 100 == int(m * 100) else 3)};{comma(u, 0)};{comma(r, 3)}\n")
    with open(HERE / "decimal_point.csv", "w", encoding="utf-8", newline="") as f:
        f.write("branch,revenue,margin,units,returned\n")
        for b, rev, m, u, r in ROWS:
            f.write(f"{b},{rev!r},{m!r},{u},{r!r}\n")


if __name__ == "__main__":
    main()
