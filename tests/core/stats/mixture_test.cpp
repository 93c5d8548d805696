// Tests of core/stats/mixture.h. Ground truth is the generating distribution of the simulated
// data (seeded); the BIC formula is Schwarz (1978) with 6k − 1 free parameters for k bivariate
// Gaussians with full covariances, and the single-Gaussian log-likelihood is checked against
// its closed form (the maximum-likelihood normal: −n/2 [2 ln 2π + ln det Σ̂ + 2]).
#include "core/stats/mixture.h"

#include <gtest/gtest.h>

#include <chrono>
#include <numbers>
#include <cmath>
#include <random>

using namespace foldline;

namespace {

void draw(std::mt19937_64& rng, int n, double mx, double my, double sx, double sy, double rho,
          std::vector<double>& x, std::vector<double>& y) {
    std::normal_distribution<double> n01(0, 1);
    for (int i = 0; i < n; ++i) {
        const double a = n01(rng), b = n01(rng);
        x.push_back(mx + sx * a);
        y.push_back(my + sy * (rho * a + std::sqrt(1 - rho * rho) * b));
    }
}

}  // namespace

TEST(Mixture, TwoSeparatedGaussiansGiveTwoComponentsWithTheirMeans) {
    std::mt19937_64 rng(2026);
    std::vector<double> x, y;
    draw(rng, 600, 0, 0, 1, 1, 0.5, x, y);
    draw(rng, 400, 8, -5, 1.5, 0.8, -0.6, x, y);
    MixtureOptions o;
    o.seed = 3;
    auto sel = select_gaussian_mixture(x, y, o);
    ASSERT_TRUE(sel.ok()) << sel.error().to_string();
    EXPECT_EQ(sel->best_k, 2);
    const auto& c = sel->fits[1].components;
    ASSERT_EQ(c.size(), 2u);
    EXPECT_NEAR(c[0].mean[0], 0, 0.15);
    EXPECT_NEAR(c[0].mean[1], 0, 0.15);
    EXPECT_NEAR(c[1].mean[0], 8, 0.2);
    EXPECT_NEAR(c[1].mean[1], -5, 0.15);
    EXPECT_NEAR(c[0].weight, 0.6, 0.02);
    EXPECT_NEAR(c[1].cov[1] / std::sqrt(c[1].cov[0] * c[1].cov[2]), -0.6, 0.08);
    // Same seed, same answer.
    auto again = select_gaussian_mixture(x, y, o);
    EXPECT_EQ(again->fits[1].bic, sel->fits[1].bic);
}

TEST(Mixture, OneGaussianGivesOneComponentAndClosedFormLikelihood) {
    std::mt19937_64 rng(7);
    std::vector<double> x, y;
    draw(rng, 2000, 100, -3, 10, 2, 0.7, x, y);
    auto sel = select_gaussian_mixture(x, y, MixtureOptions{});
    ASSERT_TRUE(sel.ok());
    EXPECT_EQ(sel->best_k, 1);
    // Closed form for k = 1 (the ridge of 1e-6 in standardised units shifts it negligibly).
    const double n = static_cast<double>(x.size());
    double mx = 0, my = 0;
    for (std::size_t i = 0; i < x.size(); ++i) mx += x[i], my += y[i];
    mx /= n, my /= n;
    double sxx = 0, sxy = 0, syy = 0;
    for (std::size_t i = 0; i < x.size(); ++i) {
        sxx += (x[i] - mx) * (x[i] - mx);
        sxy += (x[i] - mx) * (y[i] - my);
        syy += (y[i] - my) * (y[i] - my);
    }
    const double det = (sxx / n) * (syy / n) - (sxy / n) * (sxy / n);
    const double ll = -n / 2 * (2 * std::log(2 * std::numbers::pi) + std::log(det) + 2);
    EXPECT_NEAR(sel->fits[0].log_likelihood, ll, 1e-3);
    EXPECT_NEAR(sel->fits[0].bic, -2 * ll + 5 * std::log(n), 1e-2);
}

TEST(Mixture, LargeInputsAreSubsampledDeterministically) {
    std::mt19937_64 rng(9);
    std::vector<double> x, y;
    draw(rng, 30000, 0, 0, 1, 1, 0.0, x, y);
    MixtureOptions o;
    o.k_max = 2;
    auto t0 = std::chrono::steady_clock::now();
    auto a = select_gaussian_mixture(x, y, o);
    const double secs = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
    auto b = select_gaussian_mixture(x, y, o);
    ASSERT_TRUE(a.ok() && b.ok());
    EXPECT_EQ(a->points, 10000u);
    EXPECT_EQ(a->fits[0].bic, b->fits[0].bic);
    EXPECT_LT(secs, 10.0);
}

TEST(Mixture, TooFewOrFlatInputsAreErrors) {
    std::vector<double> x(5, 1.0), y(5, 2.0);
    EXPECT_FALSE(select_gaussian_mixture(x, y, {}).ok());
    x.assign(20, 1.0);
    y.assign(20, 0.0);
    for (int i = 0; i < 20; ++i) y[i] = i;
    EXPECT_FALSE(select_gaussian_mixture(x, y, {}).ok());
    EXPECT_FALSE(fit_gaussian_mixture(y, y, 0, {}).ok);
}
