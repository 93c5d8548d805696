#include "core/stats/mixture.h"

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>
#include <random>

namespace foldline {
namespace {

constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();
constexpr double kLog2Pi = 1.8378770664093454836;

// SplitMix64 (Steele, Lea & Flood 2014): derives independent seeds for each (k, start).
std::uint64_t mix_seed(std::uint64_t s) {
    s += 0x9E3779B97F4A7C15ull;
    s = (s ^ (s >> 30)) * 0xBF58476D1CE4E5B9ull;
    s = (s ^ (s >> 27)) * 0x94D049BB133111EBull;
    return s ^ (s >> 31);
}

double uniform01(std::mt19937_64& rng) { return (rng() >> 11) * 0x1.0p-53; }

struct Comp {
    double w, mx, my, sxx, sxy, syy;
    // Cached for the density.
    double ixx, ixy, iyy, log_norm;
    bool prepare() {
        const double det = sxx * syy - sxy * sxy;
        if (!(det > 0)) return false;
        ixx = syy / det;
        ixy = -sxy / det;
        iyy = sxx / det;
        log_norm = std::log(w) - kLog2Pi - 0.5 * std::log(det);
        return std::isfinite(log_norm);
    }
    double log_density(double x, double y) const {
        const double dx = x - mx, dy = y - my;
        return log_norm - 0.5 * (ixx * dx * dx + 2 * ixy * dx * dy + iyy * dy * dy);
    }
};

struct Run {
    bool ok = false;
    std::vector<Comp> comps;
    double ll = -std::numeric_limits<double>::infinity();
    int iterations = 0;
    bool converged = false;
};

// M-step from responsibilities r (n × k, row-major). False when a component has < 2 points.
bool m_step(const std::vector<double>& x, const std::vector<double>& y, const std::vector<double>& r,
            int k, double reg, std::vector<Comp>& comps) {
    const std::size_t n = x.size();
    for (int j = 0; j < k; ++j) {
        double nk = 0, sx = 0, sy = 0;
        for (std::size_t i = 0; i < n; ++i) {
            const double ri = r[i * k + j];
            nk += ri;
            sx += ri * x[i];
            sy += ri * y[i];
        }
        if (!(nk >= 2)) return false;
        const double mx = sx / nk, my = sy / nk;
        double cxx = 0, cxy = 0, cyy = 0;
        for (std::size_t i = 0; i < n; ++i) {
            const double ri = r[i * k + j], dx = x[i] - mx, dy = y[i] - my;
            cxx += ri * dx * dx;
            cxy += ri * dx * dy;
            cyy += ri * dy * dy;
        }
        Comp& c = comps[j];
        c.w = nk / static_cast<double>(n);
        c.mx = mx;
        c.my = my;
        c.sxx = cxx / nk + reg;
        c.sxy = cxy / nk;
        c.syy = cyy / nk + reg;
        if (!c.prepare()) return false;
    }
    return true;
}

// E-step: fills r, returns the total log-likelihood.
double e_step(const std::vector<double>& x, const std::vector<double>& y,
              const std::vector<Comp>& comps, std::vector<double>& r) {
    const std::size_t n = x.size();
    const int k = static_cast<int>(comps.size());
    double total = 0;
    double lp[16];
    for (std::size_t i = 0; i < n; ++i) {
        double top = -std::numeric_limits<double>::infinity();
        for (int j = 0; j < k; ++j) {
            lp[j] = comps[j].log_density(x[i], y[i]);
            top = std::max(top, lp[j]);
        }
        double s = 0;
        for (int j = 0; j < k; ++j) s += std::exp(lp[j] - top);
        const double ll = top + std::log(s);
        for (int j = 0; j < k; ++j) r[i * k + j] = std::exp(lp[j] - ll);
        total += ll;
    }
    return total;
}

Run one_start(const std::vector<double>& x, const std::vector<double>& y, int k,
              const MixtureOptions& o, std::uint64_t seed) {
    const std::size_t n = x.size();
    std::mt19937_64 rng(seed);
    // k-means++ centres.
    std::vector<std::size_t> centre;
    centre.push_back(static_cast<std::size_t>(rng() % n));
    std::vector<double> d2(n, std::numeric_limits<double>::infinity());
    while (static_cast<int>(centre.size()) < k) {
        const std::size_t c = centre.back();
        double sum = 0;
        for (std::size_t i = 0; i < n; ++i) {
            const double dx = x[i] - x[c], dy = y[i] - y[c];
            d2[i] = std::min(d2[i], dx * dx + dy * dy);
            sum += d2[i];
        }
        if (!(sum > 0)) return {};
        double target = uniform01(rng) * sum;
        std::size_t pick = n - 1;
        for (std::size_t i = 0; i < n; ++i) {
            target -= d2[i];
            if (target < 0) {
                pick = i;
                break;
            }
        }
        centre.push_back(pick);
    }
    // Hard assignment to the nearest centre as the first responsibilities.
    std::vector<double> r(n * k, 0.0);
    for (std::size_t i = 0; i < n; ++i) {
        int best = 0;
        double bd = std::numeric_limits<double>::infinity();
        for (int j = 0; j < k; ++j) {
            const double dx = x[i] - x[centre[j]], dy = y[i] - y[centre[j]];
            const double d = dx * dx + dy * dy;
            if (d < bd) {
                bd = d;
                best = j;
            }
        }
        r[i * k + best] = 1.0;
    }
    Run run;
    run.comps.resize(k);
    if (!m_step(x, y, r, k, o.regularisation, run.comps)) return {};
    double ll = -std::numeric_limits<double>::infinity();
    for (int it = 1; it <= o.max_iterations; ++it) {
        const double next = e_step(x, y, run.comps, r);
        run.iterations = it;
        if (!std::isfinite(next)) return {};
        const bool done = next - ll < o.tolerance * static_cast<double>(n);
        ll = next;
        if (done) {
            run.converged = true;
            break;
        }
        if (!m_step(x, y, r, k, o.regularisation, run.comps)) return {};
    }
    run.ll = ll;
    run.ok = true;
    return run;
}

}  // namespace

MixtureFit fit_gaussian_mixture(const std::vector<double>& x, const std::vector<double>& y, int k,
                                const MixtureOptions& o) {
    MixtureFit fit;
    fit.k = k;
    fit.log_likelihood = fit.bic = kNaN;
    const std::size_t n = std::min(x.size(), y.size());
    if (k < 1 || k > 16 || n < static_cast<std::size_t>(2 * k)) return fit;
    // Standardise.
    double mx = 0, my = 0;
    for (std::size_t i = 0; i < n; ++i) {
        mx += x[i];
        my += y[i];
    }
    mx /= n;
    my /= n;
    double vx = 0, vy = 0;
    for (std::size_t i = 0; i < n; ++i) {
        vx += (x[i] - mx) * (x[i] - mx);
        vy += (y[i] - my) * (y[i] - my);
    }
    const double sx = std::sqrt(vx / n), sy = std::sqrt(vy / n);
    if (!(sx > 0) || !(sy > 0)) return fit;
    std::vector<double> zx(n), zy(n);
    for (std::size_t i = 0; i < n; ++i) {
        zx[i] = (x[i] - mx) / sx;
        zy[i] = (y[i] - my) / sy;
    }
    Run best;
    for (int s = 0; s < std::max(1, o.starts); ++s) {
        const std::uint64_t seed = mix_seed(o.seed ^ mix_seed(static_cast<std::uint64_t>(k) * 1000 + s));
        Run run = one_start(zx, zy, k, o, seed);
        if (run.ok && (!best.ok || run.ll > best.ll)) best = std::move(run);
    }
    if (!best.ok) return fit;
    fit.ok = true;
    fit.iterations = best.iterations;
    fit.converged = best.converged;
    // Back to the original scale: the density picks up the Jacobian 1/(sx sy) per point.
    fit.log_likelihood = best.ll - static_cast<double>(n) * std::log(sx * sy);
    fit.bic = -2 * fit.log_likelihood + (6.0 * k - 1) * std::log(static_cast<double>(n));
    for (const Comp& c : best.comps) {
        Gaussian2 g;
        g.weight = c.w;
        g.mean[0] = mx + sx * c.mx;
        g.mean[1] = my + sy * c.my;
        g.cov[0] = c.sxx * sx * sx;
        g.cov[1] = c.sxy * sx * sy;
        g.cov[2] = c.syy * sy * sy;
        fit.components.push_back(g);
    }
    std::sort(fit.components.begin(), fit.components.end(), [](const Gaussian2& a, const Gaussian2& b) {
        return a.mean[0] != b.mean[0] ? a.mean[0] < b.mean[0] : a.mean[1] < b.mean[1];
    });
    return fit;
}

Result<MixtureSelection> select_gaussian_mixture(const std::vector<double>& x,
                                                 const std::vector<double>& y,
                                                 const MixtureOptions& o, const Work& work) {
    std::vector<std::size_t> idx;
    const std::size_t n = std::min(x.size(), y.size());
    for (std::size_t i = 0; i < n; ++i)
        if (std::isfinite(x[i]) && std::isfinite(y[i])) idx.push_back(i);
    if (idx.size() < 12)
        return make_error("hidden-group search needs at least 12 rows with both values; found " +
                          std::to_string(idx.size()));
    if (o.max_points > 0 && idx.size() > o.max_points) {
        // Partial Fisher-Yates: a seeded simple random sample, then back to row order.
        std::mt19937_64 rng(mix_seed(o.seed ^ 0x5A5A5A5Aull));
        for (std::size_t i = 0; i < o.max_points; ++i) {
            const std::size_t j = i + static_cast<std::size_t>(rng() % (idx.size() - i));
            std::swap(idx[i], idx[j]);
        }
        idx.resize(o.max_points);
        std::sort(idx.begin(), idx.end());
    }
    std::vector<double> px(idx.size()), py(idx.size());
    for (std::size_t i = 0; i < idx.size(); ++i) {
        px[i] = x[idx[i]];
        py[i] = y[idx[i]];
    }
    const auto [xlo, xhi] = std::minmax_element(px.begin(), px.end());
    const auto [ylo, yhi] = std::minmax_element(py.begin(), py.end());
    if (*xlo == *xhi || *ylo == *yhi)
        return make_error("hidden-group search needs spread in both columns");
    MixtureSelection sel;
    sel.points = idx.size();
    double best = std::numeric_limits<double>::infinity();
    for (int k = 1; k <= o.k_max; ++k) {
        if (work.cancelled()) return make_error("cancelled");
        work.report(k - 1, o.k_max, "fitting mixtures");
        sel.fits.push_back(fit_gaussian_mixture(px, py, k, o));
        const MixtureFit& f = sel.fits.back();
        if (f.ok && f.bic < best) {
            best = f.bic;
            sel.best_k = k;
        }
    }
    work.report(o.k_max, o.k_max, "fitting mixtures");
    return sel;
}

}  // namespace foldline
