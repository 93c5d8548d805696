#include "core/table/row_filter.h"

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <limits>
#include <unordered_map>

namespace foldline::filter {
namespace {

// ---------------------------------------------------------------------------------------------
// Reading

enum class Tok { End, Name, Text, Number, LParen, RParen, Comma, Cmp, Word };

struct Token {
    Tok kind = Tok::End;
    std::string text;  ///< the name, the text, the number as written, the operator, the keyword (lower case)
    std::size_t at = 0;  ///< 1-based character
};

bool name_start(char c) { return std::isalpha(static_cast<unsigned char>(c)) || c == '_'; }
bool name_char(char c) { return std::isalnum(static_cast<unsigned char>(c)) || c == '_' || c == '.'; }

std::string lower(std::string s) {
    for (auto& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
    return s;
}

bool is_keyword(const std::string& w) {
    return w == "and" || w == "or" || w == "not" || w == "in" || w == "is" || w == "missing";
}

Error at_error(std::size_t at, const std::string& what) {
    return usage_error(make_error("rows filter, character " + std::to_string(at) + ": " + what));
}

std::string describe(const Token& t) {
    switch (t.kind) {
        case Tok::End: return "the end of the filter";
        case Tok::Name: return "the name '" + t.text + "'";
        case Tok::Text: return "the text '" + t.text + "'";
        case Tok::Number: return "the number " + t.text;
        case Tok::LParen: return "'('";
        case Tok::RParen: return "')'";
        case Tok::Comma: return "','";
        case Tok::Cmp: return "'" + t.text + "'";
        case Tok::Word: return "'" + t.text + "'";
    }
    return "?";
}

Result<std::vector<Token>> tokenize(std::string_view s) {
    std::vector<Token> out;
    std::size_t i = 0;
    while (true) {
        while (i < s.size() && std::isspace(static_cast<unsigned char>(s[i]))) ++i;
        Token t;
        t.at = i + 1;
        if (i >= s.size()) {
            out.push_back(t);
            return out;
        }
        const char c = s[i];
        if (c == '(' || c == ')' || c == ',') {
            t.kind = c == '(' ? Tok::LParen : c == ')' ? Tok::RParen : Tok::Comma;
            t.text = std::string(1, c);
            ++i;
        } else if (c == '=' ) {
            t.kind = Tok::Cmp, t.text = "=", ++i;
        } else if (c == '<' || c == '>') {
            t.kind = Tok::Cmp;
            t.text = std::string(1, c);
            ++i;
            if (i < s.size() && (s[i] == '=' || (c == '<' && s[i] == '>'))) t.text += s[i++];
        } else if (c == '!' && i + 1 < s.size() && s[i + 1] == '=') {
            return at_error(t.at, "expected = or <> (not-equal is written <>), found '!='");
        } else if (c == '\'' || c == '"') {
            std::string v;
            std::size_t j = i + 1;
            bool closed = false;
            while (j < s.size()) {
                if (s[j] == c) {
                    if (j + 1 < s.size() && s[j + 1] == c) {
                        v += c;
                        j += 2;
                        continue;
                    }
                    closed = true;
                    ++j;
                    break;
                }
                v += s[j++];
            }
            if (!closed)
                return at_error(t.at, std::string("expected a closing ") + (c == '\'' ? "single" : "double") +
                                          " quote for the " + (c == '\'' ? "text" : "name") + " that starts here");
            if (c == '"' && v.empty()) return at_error(t.at, "expected a column name inside the double quotes");
            t.kind = c == '\'' ? Tok::Text : Tok::Name;
            t.text = std::move(v);
            i = j;
        } else if (std::isdigit(static_cast<unsigned char>(c)) || c == '-' || c == '+' || c == '.') {
            std::size_t j = i;
            if (s[j] == '-' || s[j] == '+') ++j;
            const std::size_t digits_from = j;
            while (j < s.size() && (std::isdigit(static_cast<unsigned char>(s[j])) || s[j] == '.')) ++j;
            if (j < s.size() && (s[j] == 'e' || s[j] == 'E')) {
                std::size_t k = j + 1;
                if (k < s.size() && (s[k] == '-' || s[k] == '+')) ++k;
                if (k < s.size() && std::isdigit(static_cast<unsigned char>(s[k]))) {
                    j = k;
                    while (j < s.size() && std::isdigit(static_cast<unsigned char>(s[j]))) ++j;
                }
            }
            std::string text(s.substr(i, j - i));
            double v = 0;
            const char* b = text.data() + (text[0] == '+' ? 1 : 0);
            auto [p, ec] = std::from_chars(b, text.data() + text.size(), v);
            if (j == digits_from || ec != std::errc() || p != text.data() + text.size() || !std::isfinite(v))
                return at_error(t.at, "expected a number, found '" + text + "'");
            if (j < s.size() && name_char(s[j]))
                return at_error(j + 1, "expected a space or an operator after the number " + text +
                                           " (a column name starting with a digit goes in double quotes)");
            t.kind = Tok::Number;
            t.text = std::move(text);
            i = j;
        } else if (name_start(c)) {
            std::size_t j = i;
            while (j < s.size() && name_char(s[j])) ++j;
            t.text = std::string(s.substr(i, j - i));
            const std::string w = lower(t.text);
            if (is_keyword(w)) {
                t.kind = Tok::Word;
                t.text = w;
            } else {
                t.kind = Tok::Name;
            }
            i = j;
        } else {
            return at_error(t.at, std::string("expected a column name, a value, an operator or a parenthesis, found '") +
                                      c + "'");
        }
        out.push_back(std::move(t));
    }
}

class Parser {
public:
    explicit Parser(std::vector<Token> t) : toks_(std::move(t)) {}

    Result<RowFilter> run() {
        RowFilter f;
        if (peek().kind == Tok::End) return f;
        auto root = parse_or(f);
        if (!root) return root.error();
        if (peek().kind != Tok::End) {
            const Token& t = peek();
            if (t.kind == Tok::RParen) return at_error(t.at, "found ')' with no '(' before it");
            return at_error(t.at, "expected 'and', 'or' or the end of the filter, found " + describe(t));
        }
        f.root = *root;
        return f;
    }

private:
    const Token& peek() const { return toks_[pos_]; }
    Token take() { return toks_[pos_ < toks_.size() - 1 ? pos_++ : pos_]; }
    bool word(const char* w) const { return peek().kind == Tok::Word && peek().text == w; }

    static int add(RowFilter& f, Node n) {
        f.nodes.push_back(std::move(n));
        return static_cast<int>(f.nodes.size()) - 1;
    }

    Result<int> parse_or(RowFilter& f) {
        auto l = parse_and(f);
        if (!l) return l;
        int left = *l;
        while (word("or")) {
            take();
            auto r = parse_and(f);
            if (!r) return r;
            Node n;
            n.kind = Node::Kind::Or;
            n.left = left;
            n.right = *r;
            left = add(f, std::move(n));
        }
        return left;
    }

    Result<int> parse_and(RowFilter& f) {
        auto l = parse_unary(f);
        if (!l) return l;
        int left = *l;
        while (word("and")) {
            take();
            auto r = parse_unary(f);
            if (!r) return r;
            Node n;
            n.kind = Node::Kind::And;
            n.left = left;
            n.right = *r;
            left = add(f, std::move(n));
        }
        return left;
    }

    Result<int> parse_unary(RowFilter& f) {
        if ((word("not") || peek().kind == Tok::LParen) && depth_ == kMaxNesting)
            return at_error(peek().at, "expected a test, found " + describe(peek()) + " nested more than " +
                                           std::to_string(kMaxNesting) + " deep ('not' and '(' together)");
        if (word("not")) {
            take();
            ++depth_;
            auto inner = parse_unary(f);
            --depth_;
            if (!inner) return inner;
            Node n;
            n.kind = Node::Kind::Not;
            n.left = *inner;
            return add(f, std::move(n));
        }
        if (peek().kind == Tok::LParen) {
            const Token open = take();
            ++depth_;
            auto inner = parse_or(f);
            --depth_;
            if (!inner) return inner;
            if (peek().kind != Tok::RParen)
                return at_error(peek().at, "expected ')' to close the '(' at character " + std::to_string(open.at) +
                                               ", found " + describe(peek()));
            take();
            return inner;
        }
        return parse_test(f);
    }

    Result<Literal> literal() {
        const Token t = peek();
        if (t.kind == Tok::Text) {
            take();
            return Literal{true, t.text, 0};
        }
        if (t.kind == Tok::Number) {
            take();
            double v = 0;
            const char* b = t.text.data() + (t.text[0] == '+' ? 1 : 0);
            std::from_chars(b, t.text.data() + t.text.size(), v);
            return Literal{false, t.text, v};
        }
        if (t.kind == Tok::Name)
            return at_error(t.at, "expected a value ('text in single quotes' or a number), found the name '" + t.text +
                                      "' (text values go in single quotes)");
        return at_error(t.at, "expected a value ('text in single quotes' or a number), found " + describe(t));
    }

    Result<int> parse_test(RowFilter& f) {
        const Token name = peek();
        if (name.kind != Tok::Name)
            return at_error(name.at, "expected a column name, 'not' or '(', found " + describe(name));
        if (++tests_ > kMaxTests)
            return at_error(name.at, "a filter holds at most " + std::to_string(kMaxTests) + " tests");
        take();
        Node n;
        n.column = name.text;
        n.at = name.at;
        if (peek().kind == Tok::Cmp) {
            const std::string op = take().text;
            n.kind = Node::Kind::Compare;
            n.op = op == "=" ? Op::Eq : op == "<>" ? Op::Ne : op == "<" ? Op::Lt : op == "<=" ? Op::Le
                 : op == ">" ? Op::Gt : Op::Ge;
            auto v = literal();
            if (!v) return v.error();
            n.literals.push_back(std::move(*v));
            return add(f, std::move(n));
        }
        if (word("is")) {
            take();
            n.kind = Node::Kind::Missing;
            if (word("not")) {
                take();
                n.negated = true;
            }
            if (!word("missing")) return at_error(peek().at, "expected 'missing' after 'is', found " + describe(peek()));
            take();
            return add(f, std::move(n));
        }
        if (word("not") || word("in")) {
            if (word("not")) {
                take();
                n.negated = true;
                if (!word("in")) return at_error(peek().at, "expected 'in' after 'not', found " + describe(peek()));
            }
            take();
            n.kind = Node::Kind::In;
            if (peek().kind != Tok::LParen) return at_error(peek().at, "expected '(' after 'in', found " + describe(peek()));
            take();
            while (true) {
                auto v = literal();
                if (!v) return v.error();
                n.literals.push_back(std::move(*v));
                if (peek().kind == Tok::Comma) {
                    take();
                    continue;
                }
                if (peek().kind == Tok::RParen) {
                    take();
                    break;
                }
                return at_error(peek().at, "expected ',' or ')' in the list, found " + describe(peek()));
            }
            return add(f, std::move(n));
        }
        return at_error(peek().at, "expected a comparison (=, <>, <, <=, >, >=), 'in', 'not in' or 'is missing' after "
                                   "the column '" + name.text + "', found " + describe(peek()));
    }

    // Bounds that keep every recursive walk of the tree (writing, evaluating) shallow: a filter
    // a person writes stays far below them, a generated one is refused with a message.
    static constexpr int kMaxNesting = 100;
    static constexpr int kMaxTests = 1000;

    std::vector<Token> toks_;
    std::size_t pos_ = 0;
    int depth_ = 0;
    int tests_ = 0;
};

// ---------------------------------------------------------------------------------------------
// Writing

const char* op_text(Op op) {
    switch (op) {
        case Op::Eq: return "=";
        case Op::Ne: return "<>";
        case Op::Lt: return "<";
        case Op::Le: return "<=";
        case Op::Gt: return ">";
        case Op::Ge: return ">=";
    }
    return "=";
}

std::string quoted(const std::string& s, char q) {
    std::string out(1, q);
    for (char c : s) {
        out += c;
        if (c == q) out += c;
    }
    out += q;
    return out;
}

std::string name_text(const std::string& n) {
    bool bare = !n.empty() && name_start(n[0]) && !is_keyword(lower(n));
    for (char c : n) bare = bare && name_char(c);
    return bare ? n : quoted(n, '"');
}

std::string sql_number(double v) {
    char buf[64];
    auto [p, ec] = std::to_chars(buf, buf + sizeof buf, v);
    (void)ec;
    return std::string(buf, p);
}

// Precedence: Or 1, And 2, everything else 3.
int precedence(const Node& n) { return n.kind == Node::Kind::Or ? 1 : n.kind == Node::Kind::And ? 2 : 3; }

std::string write(const RowFilter& f, int i, bool sql) {
    const Node& n = f.nodes[static_cast<std::size_t>(i)];
    auto lit = [&](const Literal& l) { return l.text ? quoted(l.value, '\'') : (sql ? sql_number(l.number) : l.value); };
    auto col = [&] { return sql ? quoted(n.column, '"') : name_text(n.column); };
    auto child = [&](int c, int min_prec) {
        const std::string s = write(f, c, sql);
        return precedence(f.nodes[static_cast<std::size_t>(c)]) < min_prec ? "(" + s + ")" : s;
    };
    switch (n.kind) {
        case Node::Kind::Compare: return col() + " " + op_text(n.op) + " " + lit(n.literals[0]);
        case Node::Kind::In: {
            std::string s = col() + (n.negated ? (sql ? " NOT IN (" : " not in (") : (sql ? " IN (" : " in ("));
            for (std::size_t k = 0; k < n.literals.size(); ++k) s += (k ? ", " : "") + lit(n.literals[k]);
            return s + ")";
        }
        case Node::Kind::Missing:
            if (sql) return col() + (n.negated ? " IS NOT NULL" : " IS NULL");
            return col() + (n.negated ? " is not missing" : " is missing");
        case Node::Kind::Not: {
            const std::string inner = write(f, n.left, sql);
            return std::string(sql ? "NOT " : "not ") +
                   (sql || precedence(f.nodes[static_cast<std::size_t>(n.left)]) < 3 ? "(" + inner + ")" : inner);
        }
        case Node::Kind::And: return child(n.left, 2) + (sql ? " AND " : " and ") + child(n.right, 3);
        case Node::Kind::Or: return child(n.left, 1) + (sql ? " OR " : " or ") + child(n.right, 2);
    }
    return {};
}

// ---------------------------------------------------------------------------------------------
// Evaluating: one byte per row, 0 false, 1 true, 2 unknown (three-valued, as SQL).

constexpr std::uint8_t F = 0, T = 1, U = 2;

Status check_node(const Node& n, const Table& t) {
    const Column* c = t.column(n.column);
    if (!c) {
        std::string names;
        for (std::size_t k = 0; k < t.columns.size() && k < 12; ++k) names += (k ? ", " : "") + t.columns[k].name;
        if (t.columns.size() > 12) names += ", ...";
        return at_error(n.at, "no column named '" + n.column + "' in the data (columns: " + names + ")");
    }
    if (n.kind == Node::Kind::Missing) return Ok{};
    for (const auto& l : n.literals) {
        if (c->is_numeric() && l.text)
            return at_error(n.at, "column '" + n.column + "' is numeric: compare it with a number, not the text '" +
                                      l.value + "'");
        if (c->is_categorical() && !l.text)
            return at_error(n.at, "column '" + n.column + "' holds text: write the value in single quotes ('" +
                                      l.value + "')");
    }
    if (n.kind == Node::Kind::Compare && c->is_categorical() && n.op != Op::Eq && n.op != Op::Ne)
        return at_error(n.at, std::string("'") + op_text(n.op) + "' orders numbers, and column '" + n.column +
                                  "' holds text: use =, <> or in (...)");
    return Ok{};
}

bool compare(double a, Op op, double b) {
    switch (op) {
        case Op::Eq: return a == b;
        case Op::Ne: return a != b;
        case Op::Lt: return a < b;
        case Op::Le: return a <= b;
        case Op::Gt: return a > b;
        case Op::Ge: return a >= b;
    }
    return false;
}

std::vector<std::uint8_t> eval(const RowFilter& f, int i, const Table& t) {
    const Node& n = f.nodes[static_cast<std::size_t>(i)];
    const std::size_t rows = t.rows;
    // Only a test allocates its own bytes: an 'and' / 'or' reuses its left side's, so a long
    // chain holds two masks at a time, not one per link.
    std::vector<std::uint8_t> out;
    switch (n.kind) {
        case Node::Kind::Compare:
        case Node::Kind::In:
        case Node::Kind::Missing: {
            out.assign(rows, F);
            const Column& c = *t.column(n.column);
            if (n.kind == Node::Kind::Missing) {
                for (std::size_t r = 0; r < rows; ++r) out[r] = (c.is_missing(r) != n.negated) ? T : F;
                return out;
            }
            if (c.is_numeric()) {
                for (std::size_t r = 0; r < rows; ++r) {
                    const double v = c.values[r];
                    if (std::isnan(v)) {
                        out[r] = U;
                        continue;
                    }
                    bool hit = false;
                    if (n.kind == Node::Kind::Compare) {
                        hit = compare(v, n.op, n.literals[0].number);
                    } else {
                        for (const auto& l : n.literals) hit = hit || v == l.number;
                        hit = hit != n.negated;
                    }
                    out[r] = hit ? T : F;
                }
                return out;
            }
            // Text: which levels make the test true (the missing code is unknown).
            std::vector<std::uint8_t> by_code(c.levels.size() + 1, F);
            by_code[c.levels.size()] = U;
            for (std::size_t k = 0; k < c.levels.size(); ++k) {
                bool hit = false;
                for (const auto& l : n.literals) hit = hit || c.levels[k] == l.value;
                if (n.kind == Node::Kind::Compare) hit = (n.op == Op::Eq) ? hit : !hit;
                else hit = hit != n.negated;
                by_code[k] = hit ? T : F;
            }
            visit_codes(c, [&](const auto& codes) {
                for (std::size_t r = 0; r < rows; ++r) out[r] = by_code[codes[r]];
            });
            return out;
        }
        case Node::Kind::Not: {
            out = eval(f, n.left, t);
            for (auto& v : out) v = v == U ? U : (v == T ? F : T);
            return out;
        }
        case Node::Kind::And:
        case Node::Kind::Or: {
            out = eval(f, n.left, t);
            const auto rhs = eval(f, n.right, t);
            const bool is_and = n.kind == Node::Kind::And;
            const std::uint8_t dominant = is_and ? F : T;
            for (std::size_t r = 0; r < rows; ++r) {
                const std::uint8_t a = out[r], b = rhs[r];
                out[r] = (a == dominant || b == dominant) ? dominant : (a == U || b == U) ? U : (is_and ? T : F);
            }
            return out;
        }
    }
    return out;
}

void collect(const RowFilter& f, int i, std::vector<std::string>& out) {
    const Node& n = f.nodes[static_cast<std::size_t>(i)];
    if (n.left >= 0) collect(f, n.left, out);
    if (n.right >= 0) collect(f, n.right, out);
    if (!n.column.empty() && std::find(out.begin(), out.end(), n.column) == out.end()) out.push_back(n.column);
}

template <typename Code>
Column keep_categorical(const Column& c, const std::vector<Code>& codes, const std::vector<std::uint8_t>& keep,
                        std::size_t kept) {
    const std::uint32_t missing = c.missing_code();
    std::vector<std::uint32_t> map(c.levels.size() + 1, std::numeric_limits<std::uint32_t>::max());
    std::vector<std::string> levels;
    std::vector<std::uint32_t> out;
    out.reserve(kept);
    std::vector<std::uint32_t> raw;
    raw.reserve(kept);
    for (std::size_t r = 0; r < keep.size(); ++r) {
        if (!keep[r]) continue;
        const std::uint32_t code = codes[r];
        if (code != missing && map[code] == std::numeric_limits<std::uint32_t>::max()) {
            map[code] = static_cast<std::uint32_t>(levels.size());
            levels.push_back(c.levels[code]);
        }
        raw.push_back(code);
    }
    const auto n_levels = static_cast<std::uint32_t>(levels.size());
    for (auto code : raw) out.push_back(code == missing ? n_levels : map[code]);
    Column col = Column::categorical(c.name, std::move(levels), out);
    return col;
}

}  // namespace

Result<RowFilter> parse(std::string_view text) {
    auto toks = tokenize(text);
    if (!toks) return toks.error();
    return Parser(std::move(*toks)).run();
}

std::string canonical_text(const RowFilter& f) { return f.empty() ? std::string() : write(f, f.root, false); }

std::string to_sql(const RowFilter& f) { return f.empty() ? std::string() : write(f, f.root, true); }

std::vector<std::string> columns(const RowFilter& f) {
    std::vector<std::string> out;
    if (!f.empty()) collect(f, f.root, out);
    return out;
}

Status check(const RowFilter& f, const Table& t) {
    for (const auto& n : f.nodes)
        if (n.kind == Node::Kind::Compare || n.kind == Node::Kind::In || n.kind == Node::Kind::Missing)
            if (auto st = check_node(n, t); !st) return st;
    return Ok{};
}

Result<std::vector<std::uint8_t>> keep_mask(const RowFilter& f, const Table& table) {
    if (f.empty()) return std::vector<std::uint8_t>(table.rows, 1);
    if (auto st = check(f, table); !st) return st.error();
    auto v = eval(f, f.root, table);
    for (auto& b : v) b = b == T ? 1 : 0;
    return v;
}

Result<Table> apply(const RowFilter& f, const Table& table) {
    auto mask = keep_mask(f, table);
    if (!mask) return mask.error();
    const std::size_t kept = static_cast<std::size_t>(std::count(mask->begin(), mask->end(), std::uint8_t{1}));
    Table out;
    out.rows = kept;
    out.source = table.source;
    out.weight_column = table.weight_column;
    out.filter = canonical_text(f);
    out.combined = table.combined;
    out.columns.reserve(table.columns.size());
    for (const auto& c : table.columns) {
        if (c.is_numeric()) {
            std::vector<double> v;
            v.reserve(kept);
            for (std::size_t r = 0; r < table.rows; ++r)
                if ((*mask)[r]) v.push_back(c.values[r]);
            out.columns.push_back(Column::numeric(c.name, std::move(v)));
        } else {
            out.columns.push_back(visit_codes(c, [&](const auto& codes) { return keep_categorical(c, codes, *mask, kept); }));
        }
        // The variable label and the codes behind value labels describe the column, not its rows.
        out.columns.back().label = c.label;
        out.columns.back().description = c.description;
    }
    if (table.weighted()) {
        out.weights.reserve(kept);
        for (std::size_t r = 0; r < table.rows; ++r)
            if ((*mask)[r]) out.weights.push_back(table.weights[r]);
    }
    return out;
}

}  // namespace foldline::filter
