// Tests of core/stats/moments.h. The reference is the textbook two-pass computation (means
// first, then Σ(x−x̄)(y−ȳ)) in long double over the same numbers (Chan, Golub & LeVeque 1983,
// "Algorithms for computing the sample variance", Am. Stat. 37:242 — the two-pass algorithm is
// their accuracy baseline).
#include "core/stats/moments.h"

#include <gtest/gtest.h>

#include <cmath>
#include <random>

using namespace foldline;

namespace {

struct TwoPass {
    double mx, my, cxx, cxy, cyy;
};

TwoPass two_pass(const std::vector<double>& x, const std::vector<double>& y) {
    long double mx = 0, my = 0;
    for (std::size_t i = 0; i < x.size(); ++i) {
        mx += x[i];
        my += y[i];
    }
    mx /= x.size();
    my /= y.size();
    long double sxx = 0, sxy = 0, syy = 0;
    for (std::size_t i = 0; i < x.size(); ++i) {
        const long double dx = x[i] - mx, dy = y[i] - my;
        sxx += dx * dx;
        sxy += dx * dy;
        syy += dy * dy;
    }
    return {double(mx), double(my), double(sxx), double(sxy), double(syy)};
}

void expect_matches(const BivariateMoments& m, const TwoPass& r, double rel) {
    EXPECT_NEAR(m.mean_x() / r.mx, 1.0, rel);
    EXPECT_NEAR(m.mean_y() / r.my, 1.0, rel);
    EXPECT_NEAR(m.cxx / r.cxx, 1.0, rel);
    EXPECT_NEAR(m.cxy / r.cxy, 1.0, rel);
    EXPECT_NEAR(m.cyy / r.cyy, 1.0, rel);
}

}  // namespace

// Values around 1e9 with a spread of about 1: every accumulation path must agree with the
// two-pass reference to 1e-9 relative.
TEST(Moments, HugeOffsetSmallSpreadAgreesWithTwoPass) {
    std::mt19937_64 rng(11);
    std::normal_distribution<double> noise(0.0, 1.0);
    std::vector<double> x, y;
    for (int i = 0; i < 200000; ++i) {
        const double u = noise(rng);
        x.push_back(1e9 + u);
        y.push_back(-2e9 + 0.5 * u + noise(rng));
    }
    const TwoPass ref = two_pass(x, y);

    BivariateMoments welford;
    for (std::size_t i = 0; i < x.size(); ++i) welford.add(x[i], y[i]);
    expect_matches(welford, ref, 1e-9);

    StratumMoments blocks(3, 5000);
    for (std::size_t i = 0; i < x.size(); ++i) blocks.add(i % 3, x[i], y[i]);
    expect_matches(merge_all(blocks.finish()), ref, 1e-9);

    MomentMatrix mm(2);
    for (std::size_t i = 0; i < x.size(); ++i) {
        const double z[2] = {x[i], y[i]};
        mm.add(z);
    }
    expect_matches(mm.xy(), ref, 1e-9);
}

// Merging summaries of parts equals one pass over the whole (the merge is exact algebra).
TEST(Moments, MergeOfPartsEqualsWholeAndWeightsActAsCounts) {
    std::mt19937_64 rng(3);
    std::uniform_real_distribution<double> u(-5, 5);
    std::vector<double> x, y;
    for (int i = 0; i < 1000; ++i) {
        x.push_back(u(rng));
        y.push_back(2 * x.back() + u(rng));
    }
    BivariateMoments whole, a, b;
    for (std::size_t i = 0; i < x.size(); ++i) {
        whole.add(x[i], y[i]);
        (i < 300 ? a : b).add(x[i], y[i]);
    }
    a.merge(b);
    EXPECT_EQ(a.rows, 1000);
    EXPECT_NEAR(a.cxy, whole.cxy, 1e-9 * std::abs(whole.cxy));
    EXPECT_NEAR(a.mean_x(), whole.mean_x(), 1e-12);

    // A weight of 2 is two identical rows.
    BivariateMoments w2, twice;
    for (std::size_t i = 0; i < 10; ++i) {
        w2.add(x[i], y[i], 2.0);
        twice.add(x[i], y[i]);
        twice.add(x[i], y[i]);
    }
    EXPECT_EQ(w2.w, 20);
    EXPECT_EQ(w2.rows, 10);
    EXPECT_NEAR(w2.cxx, twice.cxx, 1e-12);

    // NaN and non-positive weights are ignored; merging empty changes nothing.
    BivariateMoments e;
    e.add(std::nan(""), 1);
    e.add(1, 1, 0.0);
    EXPECT_TRUE(e.empty());
    const double before = whole.cxx;
    whole.merge(BivariateMoments{});
    EXPECT_EQ(whole.cxx, before);

    // A summary from figures computed elsewhere merges like one accumulated here.
    const TwoPass r = two_pass(x, y);
    BivariateMoments outside = BivariateMoments::from_means(1000, 1000, r.mx, r.my, r.cxx, r.cxy, r.cyy);
    EXPECT_NEAR(outside.cxy, whole.cxy, 1e-9 * std::abs(r.cxy));
}

// StratumMoments routes each row to its stratum: per stratum it equals a separate pass.
TEST(Moments, StratumMomentsMatchesSeparatePasses) {
    std::mt19937_64 rng(5);
    std::uniform_real_distribution<double> u(0, 1);
    StratumMoments acc(4, 64);
    std::vector<BivariateMoments> sep(4);
    for (int i = 0; i < 10000; ++i) {
        const std::size_t k = static_cast<std::size_t>(u(rng) * 3);  // stratum 3 stays empty
        const double x = 100 * k + u(rng), y = x * x + u(rng), w = 1 + (i % 4);
        acc.add(k, x, y, w);
        sep[k].add(x, y, w);
    }
    auto got = acc.finish();
    ASSERT_EQ(got.size(), 4u);
    for (std::size_t k = 0; k < 3; ++k) {
        EXPECT_EQ(got[k].rows, sep[k].rows);
        EXPECT_DOUBLE_EQ(got[k].w, sep[k].w);
        EXPECT_NEAR(got[k].cxy / sep[k].cxy, 1.0, 1e-12);
        EXPECT_NEAR(got[k].mean_y(), sep[k].mean_y(), 1e-9 * std::abs(sep[k].mean_y()));
    }
    EXPECT_TRUE(got[3].empty());
}

// Sums of values centred by a shift, as the database push-down returns them: the co-moments
// must match the two-pass reference to 1e-9 for values near 1e6 whose shift is a table-wide
// mean a few hundred units away from the stratum's own mean; a stratum known to have one x
// value gets exactly zero spread, whatever the rounding of the sums.
TEST(Moments, CentredSumsFromADatabaseAgreeWithTwoPass) {
    std::mt19937_64 rng(11);
    std::normal_distribution<double> noise(0.0, 25.0);
    std::vector<double> x, y;
    for (int i = 0; i < 5000; ++i) {
        const double xi = 1000400.0 + noise(rng);
        x.push_back(xi);
        y.push_back(300000.0 - 0.8 * (xi - 1000400.0) + noise(rng));
    }
    const double shift_x = 1000050.0, shift_y = 301000.0;  // another stratum's pull on the table mean
    double sx = 0, sy = 0, sxx = 0, sxy = 0, syy = 0;
    for (std::size_t i = 0; i < x.size(); ++i) {
        const double dx = x[i] - shift_x, dy = y[i] - shift_y;
        sx += dx;
        sy += dy;
        sxx += dx * dx;
        sxy += dx * dy;
        syy += dy * dy;
    }
    const auto m = BivariateMoments::from_centred_sums(5000, sx, sy, sxx, sxy, syy, shift_x, shift_y);
    const auto ref = two_pass(x, y);
    EXPECT_EQ(m.rows, 5000);
    EXPECT_EQ(m.w, 5000);
    EXPECT_NEAR(m.mean_x(), ref.mx, 1e-9 * std::abs(ref.mx));
    EXPECT_NEAR(m.cxx, ref.cxx, 1e-9 * ref.cxx);
    EXPECT_NEAR(m.cxy, ref.cxy, 1e-9 * std::abs(ref.cxy));
    EXPECT_NEAR(m.cyy, ref.cyy, 1e-9 * ref.cyy);

    // One x value in the stratum: exactly no spread, and no co-moment with y.
    const double c = 1000123.5 - shift_x;
    const auto flat = BivariateMoments::from_centred_sums(3, 3 * c, 3.0, 3 * c * c, c * 3.0, 5.0, shift_x, shift_y, true);
    EXPECT_EQ(flat.cxx, 0.0);
    EXPECT_EQ(flat.cxy, 0.0);
    EXPECT_NEAR(flat.cyy, 5.0 - 3.0, 1e-12);
    EXPECT_TRUE(BivariateMoments::from_centred_sums(0, 0, 0, 0, 0, 0, 1, 1).empty());
}
