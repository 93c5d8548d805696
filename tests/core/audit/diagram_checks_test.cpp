#include "core/audit/diagram_checks.h"

#include <gtest/gtest.h>

#include <cmath>
#include <cstdio>
#include <random>

using namespace foldline;
using causal::CheckMethod;
using causal::ClaimForm;
using causal::DiagramCheck;

namespace {

Column cat(const std::string& name, const std::vector<std::uint32_t>& codes, int levels) {
    std::vector<std::string> labels;
    for (int i = 0; i < levels; ++i) labels.push_back("L" + std::to_string(i));
    return Column::categorical(name, labels, codes);
}

causal::Diagram diagram(const std::vector<std::string>& nodes, const std::vector<std::pair<std::string, std::string>>& edges,
                        const std::vector<std::string>& unobserved = {}) {
    causal::Diagram d;
    for (const auto& n : nodes)
        d.nodes.push_back({n, std::find(unobserved.begin(), unobserved.end(), n) == unobserved.end(), {}, {}});
    for (const auto& [a, b] : edges) d.edges.push_back({a, b});
    return d;
}

// Categorical chain a → b → c over 3, 2, 3 levels; `direct` > 0 adds the arrow a → c that the
// diagram a → b → c leaves out. Returns the table.
Table categorical_sample(std::mt19937_64& rng, std::size_t n, double direct) {
    std::uniform_real_distribution<double> u(0, 1);
    std::vector<std::uint32_t> a(n), b(n), c(n);
    for (std::size_t i = 0; i < n; ++i) {
        a[i] = static_cast<std::uint32_t>(u(rng) * 3);
        b[i] = u(rng) < 0.3 + 0.2 * a[i];
        const double w[3] = {1.0, std::exp(0.6 * b[i] + direct * a[i]), std::exp(-0.3 + 0.4 * b[i])};
        const double r = u(rng) * (w[0] + w[1] + w[2]);
        c[i] = r < w[0] ? 0 : r < w[0] + w[1] ? 1 : 2;
    }
    Table t;
    t.rows = n;
    t.columns = {cat("a", a, 3), cat("b", b, 2), cat("c", c, 3)};
    return t;
}

// Linear-Gaussian: g (two groups) → x, x → m, m → y, g → y; `direct` adds x → y, which the
// diagram leaves out.
Table gaussian_sample(std::mt19937_64& rng, std::size_t n, double direct) {
    std::normal_distribution<double> e(0, 1);
    std::uniform_real_distribution<double> u(0, 1);
    std::vector<std::uint32_t> g(n);
    std::vector<double> x(n), m(n), y(n);
    for (std::size_t i = 0; i < n; ++i) {
        g[i] = u(rng) < 0.4;
        x[i] = 1.0 * g[i] + e(rng);
        m[i] = 0.8 * x[i] + e(rng);
        y[i] = 0.5 * m[i] - 0.7 * g[i] + direct * x[i] + e(rng);
    }
    Table t;
    t.rows = n;
    t.columns = {cat("g", g, 2), Column::numeric("x", x), Column::numeric("m", m), Column::numeric("y", y)};
    return t;
}

// Share of `reps` samples in which the claim is rejected at 0.05.
template <typename Sample>
double rejection_rate(Sample sample, DiagramCheck claim, std::size_t n, double direct, int reps, unsigned seed) {
    std::mt19937_64 rng(seed);
    int rejected = 0;
    for (int r = 0; r < reps; ++r) {
        const Table t = sample(rng, n, direct);
        DiagramCheck c = claim;
        audit::test_claim(c, t, {});
        rejected += c.test.p < 0.05;
    }
    return static_cast<double>(rejected) / reps;
}

DiagramCheck claim(std::string a, std::string b, std::vector<std::string> given) {
    DiagramCheck c;
    c.a = std::move(a);
    c.b = std::move(b);
    c.given = std::move(given);
    return c;
}

}  // namespace

TEST(DiagramChecks, ClaimsOfAChainWithALatentCause) {
    // a → b → c, and u (unobserved) → a, u → d: b ⫫ d needs u's parents... the claims are
    // a ⫫ c | b (parents of c), b ⫫ d | a (parents of b), c ⫫ d | b (parents of c), and
    // a ⫫ d given u, which no observed set separates (untestable).
    auto g = causal::CausalGraph::build(
        diagram({"u", "a", "b", "c", "d"}, {{"u", "a"}, {"u", "d"}, {"a", "b"}, {"b", "c"}}, {"u"}));
    ASSERT_TRUE(g);
    const auto claims = audit::list_claims(*g);
    ASSERT_EQ(claims.size(), 4u);
    EXPECT_EQ(claims[0].a, "a");
    EXPECT_EQ(claims[0].b, "c");
    EXPECT_EQ(claims[0].given, std::vector<std::string>{"b"});
    EXPECT_EQ(claims[1].b, "d");
    EXPECT_EQ(claims[1].form, ClaimForm::Untestable);
    EXPECT_EQ(claims[1].unobserved, std::vector<std::string>{"u"});
    EXPECT_EQ(claims[2].a, "b");
    EXPECT_EQ(claims[2].given, std::vector<std::string>{"a"});
    EXPECT_EQ(claims[3].a, "c");
    EXPECT_EQ(claims[3].given, std::vector<std::string>{"b"});
}

// Partial correlation of x and y given a two-group column g (stratum intercepts) and a numeric z,
// through the row pass. Reference [calc, numpy 1.24 Debian]: residuals of x and y on
// (1, g, z) by numpy.linalg.lstsq, their Pearson r 0.43838170179449254, Fisher z
// atanh(r)·√(40 − 2 − 3) = 2.781893076610944, two-sided p 0.005404284178103187 (scipy.stats.norm.sf).
TEST(DiagramChecks, PartialCorrelationWithStratumInterceptsMatchesNumpy) {
    const double rows[40][4] = {
    {0, 0.0012301533574825742, 0.11169429660696316, -0.38273214725134064},
    {0, 0.29874553750846988, 0.36252731176353181, -0.009296694905081726},
    {0, -0.27413785536221758, -1.499193681779911, -0.38415733310780781},
    {0, -0.89059183875727421, -0.81445160838026609, -0.89184700781719872},
    {0, -0.45467078517172255, 0.90415263656981504, -0.062958565923657811},
    {0, -0.99164655499646237, -2.5387912331249449, -2.6254069138992655},
    {0, 0.060143602597438485, 0.91952629061903668, 0.38636084950778571},
    {0, 1.3402152455545335, 1.4595692712511148, 0.81035410830329346},
    {0, -0.49220651855132963, -1.1336769126585511, 0.46655375185113745},
    {0, -0.62047489981994042, 1.3799416465224823, 0.89482771140018658},
    {0, 0.48984205018519822, 1.25210176226991, 0.72161811699063094},
    {0, 0.35688700816006075, -0.84240189394516252, 0.50986376976930914},
    {0, 0.10541424899789856, 0.179930477769362, -0.21519023610645532},
    {0, -0.93046804470820466, -0.35377846103801935, 0.4453809516576368},
    {0, -0.029251822463273489, -0.2180339478140228, -0.10723905102887246},
    {0, 0.69530319445828781, 1.3782134616534938, 1.4823193360709555},
    {0, -1.3442145472850819, -1.4107318674344975, -2.5272932659398268},
    {0, -0.45761576104021817, 0.20963179979410973, 0.20172488827596455},
    {0, -1.9012227398008441, -0.46270014814469218, -2.8238955465248408},
    {0, -1.2895377397849761, -1.9651999907906288, -3.4661778111486719},
    {1, -1.8417350377917323, -0.6385964274021233, -2.4807829675681523},
    {1, -0.23509113107468127, 0.30160129238690359, -1.8968326561811746},
    {1, -1.2674464814437032, -0.14017807021787237, -1.5257416730967779},
    {1, 0.27126435882170152, 0.084069830971561732, 1.4140167382855249},
    {1, 0.15675108662422516, 0.577449490121552, -1.5223678420513482},
    {1, -0.18693094462995438, 0.61687308256554885, -1.4706598257326635},
    {1, -2.5167597108205131, -0.61799583872010533, -2.3001742448335998},
    {1, -0.5386928958466366, 1.6065291116074953, -0.13372151186796383},
    {1, -0.048500945401071985, -0.37202873788532698, -1.349468033760425},
    {1, 0.11330898600330756, 0.31866662001625812, -1.0218091892450594},
    {1, -1.5301357655053935, 0.11676765706802827, -1.0158978648049413},
    {1, -0.47775327603393064, -1.4701730602084251, -1.307038225066437},
    {1, -0.97851907805663951, -0.44168894300900646, -2.6996109483056112},
    {1, -0.80883723942559926, 0.093875834904311714, -1.4460496043669169},
    {1, 1.0608986233860787, 3.3179136006728984, 0.89290160062367296},
    {1, -0.80753467533189649, 0.88186922523885913, -2.105504269619515},
    {1, -0.032521704945520598, 0.64026487483228145, -0.50031580186548441},
    {1, 0.88438986738317393, 1.5158139732832148, -0.80943595417167102},
    {1, -0.58360043274330198, 0.16620416673877308, -0.25325184175909909},
    {1, -0.11170194958415963, 2.4118274508720008, 0.10162591816179284}
    };
    std::vector<std::uint32_t> g;
    std::vector<double> z, x, y;
    for (const auto& r : rows) {
        g.push_back(static_cast<std::uint32_t>(r[0]));
        z.push_back(r[1]);
        x.push_back(r[2]);
        y.push_back(r[3]);
    }
    Table t;
    t.rows = 40;
    t.columns = {cat("g", g, 2), Column::numeric("z", z), Column::numeric("x", x), Column::numeric("y", y)};
    auto c = claim("x", "y", {"g", "z"});
    audit::test_claim(c, t, {});
    EXPECT_EQ(c.method, CheckMethod::PartialCorrelation);
    EXPECT_NEAR(c.test.partial_r, 0.43838170179449254, 1e-12);
    EXPECT_NEAR(c.test.statistic, 2.781893076610944, 1e-10);
    EXPECT_NEAR(c.test.p, 0.005404284178103187, 1e-11);
    EXPECT_EQ(c.test.n, 40);
    // A categorical member of the pair sends the claim to G², the numeric one cut as the scan cuts it.
    auto mixed = claim("g", "y", {"x"});
    audit::test_claim(mixed, t, {});
    EXPECT_EQ(mixed.method, CheckMethod::GSquared);
    EXPECT_GT(mixed.test.df, 0);
}

// Nominal rate: on data simulated from the diagram itself, a true claim is rejected at 0.05 in
// about 5% of samples. 400 samples give a binomial standard error of 1.1 points; the band
// [0.025, 0.08] holds about ±2.5 SE. Seeds are fixed, so the figures are reproducible.
TEST(DiagramChecks, TrueClaimsRejectAtAboutTheNominalRate) {
    const double cat_rate = rejection_rate(categorical_sample, claim("a", "c", {"b"}), 500, 0.0, 400, 11);
    const double lin_rate = rejection_rate(gaussian_sample, claim("x", "y", {"g", "m"}), 500, 0.0, 400, 12);
    std::printf("null rejection at 0.05, n 500, 400 samples: G² %.4f, partial correlation %.4f\n", cat_rate, lin_rate);
    EXPECT_GE(cat_rate, 0.025);
    EXPECT_LE(cat_rate, 0.08);
    EXPECT_GE(lin_rate, 0.025);
    EXPECT_LE(lin_rate, 0.08);
}

// Power: data from a graph with an arrow the diagram leaves out (a → c; x → y). The claim the
// missing arrow breaks is rejected more often as n grows; at n 1000 in at least 80% of samples.
TEST(DiagramChecks, AMissingArrowIsFlagged) {
    for (std::size_t n : {100u, 300u, 1000u}) {
        const double cat_power = rejection_rate(categorical_sample, claim("a", "c", {"b"}), n, 0.35, 200, 21);
        const double lin_power = rejection_rate(gaussian_sample, claim("x", "y", {"g", "m"}), n, 0.15, 200, 22);
        std::printf("power at 0.05, n %zu, 200 samples: G² (a → c, log-odds 0.35 per level) %.3f, "
                    "partial correlation (x → y, slope 0.15) %.3f\n", n, cat_power, lin_power);
        if (n == 1000) {
            EXPECT_GE(cat_power, 0.8);
            EXPECT_GE(lin_power, 0.8);
        }
    }
    // The whole path on one sample: the diagram without the arrow is flagged in plain words.
    std::mt19937_64 rng(5);
    const Table t = categorical_sample(rng, 5000, 0.35);
    auto checks = audit::check_diagram(diagram({"a", "b", "c"}, {{"a", "b"}, {"b", "c"}}), t, {});
    ASSERT_TRUE(checks);
    ASSERT_EQ(checks->checks.size(), 1u);
    EXPECT_EQ(checks->contradicted, 1);
    EXPECT_EQ(checks->checks[0].sentence,
              "The diagram says a and c are independent given b; the data disagree, q < 0.001: an arrow or a "
              "common cause may be missing.");
    // With the arrow drawn there is nothing left to claim.
    auto full = audit::check_diagram(diagram({"a", "b", "c"}, {{"a", "b"}, {"b", "c"}, {"a", "c"}}), t, {});
    ASSERT_TRUE(full);
    EXPECT_TRUE(full->checks.empty());
}

TEST(DiagramChecks, SentencesForUncontradictedUntestableAndMissingColumns) {
    std::mt19937_64 rng(9);
    Table t = categorical_sample(rng, 2000, 0.0);
    auto checks = audit::check_diagram(
        diagram({"a", "b", "c", "u"}, {{"a", "b"}, {"b", "c"}, {"u", "a"}, {"u", "c"}}, {"u"}), t, {});
    ASSERT_TRUE(checks);
    // a ⫫ c needs u: untestable; no other non-adjacent observed pair.
    ASSERT_EQ(checks->checks.size(), 1u);
    EXPECT_EQ(checks->checks[0].form, ClaimForm::Untestable);
    EXPECT_TRUE(std::isnan(checks->checks[0].q));
    EXPECT_EQ(checks->checks[0].sentence,
              "The diagram says a and c are independent given b and u; it rests on u, which the data do not hold, "
              "so it cannot be checked.");
    auto ok = audit::check_diagram(diagram({"a", "b", "c"}, {{"a", "b"}, {"b", "c"}}), t, {});
    ASSERT_TRUE(ok);
    ASSERT_EQ(ok->checks.size(), 1u);
    EXPECT_EQ(ok->tested, 1);
    EXPECT_EQ(ok->checks[0].sentence.rfind("The diagram says a and c are independent given b; the data do not "
                                           "contradict it (q = ", 0), 0u)
        << ok->checks[0].sentence;
    auto missing = audit::check_diagram(diagram({"a", "zz"}, {}), t, {});
    ASSERT_FALSE(missing);
    EXPECT_NE(missing.error().message.find("zz"), std::string::npos);
}
