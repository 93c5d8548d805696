#include "core/stats/moments.h"

#include <algorithm>
#include <cmath>

namespace foldline {

BivariateMoments BivariateMoments::from_centred_sums(double n, double sx, double sy, double sxx,
                                                     double sxy, double syy, double shift_x,
                                                     double shift_y, bool x_constant, bool y_constant) {
    if (!(n > 0)) return {};
    const double ux = sx / n, uy = sy / n;
    BivariateMoments m;
    m.rows = n;
    m.w = n;
    m.x0 = shift_x;
    m.y0 = shift_y;
    m.dx = ux;
    m.dy = uy;
    m.cxx = x_constant ? 0.0 : std::max(0.0, sxx - sx * ux);
    m.cyy = y_constant ? 0.0 : std::max(0.0, syy - sy * uy);
    m.cxy = x_constant || y_constant ? 0.0 : sxy - sx * uy;
    return m;
}

BivariateMoments BivariateMoments::from_means(double rows, double w, double mean_x,
                                              double mean_y, double cxx, double cxy,
                                              double cyy) {
    BivariateMoments m;
    m.rows = rows;
    if (!(w > 0)) return m;
    m.w = w;
    m.x0 = mean_x;
    m.y0 = mean_y;
    m.cxx = cxx;
    m.cxy = cxy;
    m.cyy = cyy;
    return m;
}

void BivariateMoments::add(double x, double y, double weight) {
    if (!(weight > 0) || std::isnan(x) || std::isnan(y)) return;
    if (!(w > 0)) {
        x0 = x;
        y0 = y;
        dx = dy = 0;
    }
    rows += 1;
    const double total = w + weight;
    const double u = x - x0, v = y - y0;
    const double du = u - dx, dv = v - dy;
    dx += du * (weight / total);
    dy += dv * (weight / total);
    cxx += weight * du * (u - dx);
    cxy += weight * du * (v - dy);
    cyy += weight * dv * (v - dy);
    w = total;
}

void BivariateMoments::merge(const BivariateMoments& o) {
    if (!(o.w > 0)) {
        rows += o.rows;
        return;
    }
    if (!(w > 0)) {
        const double r = rows;
        *this = o;
        rows += r;
        return;
    }
    const double total = w + o.w;
    // Difference of the means, origin part and offset part apart so neither loses digits.
    const double ddx = (o.x0 - x0) + (o.dx - dx), ddy = (o.y0 - y0) + (o.dy - dy);
    const double f = w * o.w / total;
    dx += ddx * (o.w / total);
    dy += ddy * (o.w / total);
    cxx += o.cxx + ddx * ddx * f;
    cxy += o.cxy + ddx * ddy * f;
    cyy += o.cyy + ddy * ddy * f;
    w = total;
    rows += o.rows;
}

BivariateMoments merge_all(const std::vector<BivariateMoments>& parts) {
    BivariateMoments m;
    for (const auto& p : parts) m.merge(p);
    return m;
}

MomentMatrix::MomentMatrix(Eigen::Index d)
    : origin(Eigen::VectorXd::Zero(d)),
      offset(Eigen::VectorXd::Zero(d)),
      cross(Eigen::MatrixXd::Zero(d, d)) {}

void MomentMatrix::add(const double* z, double weight) {
    if (!(weight > 0)) return;
    const Eigen::Index d = dim();
    const Eigen::Map<const Eigen::VectorXd> v(z, d);
    if (!(w > 0)) {
        origin = v;
        offset.setZero();
    }
    rows += 1;
    const double total = w + weight;
    const Eigen::VectorXd u = v - origin;
    const Eigen::VectorXd before = u - offset;
    offset += before * (weight / total);
    const Eigen::VectorXd after = u - offset;
    // Σ w (z − z̄_old)(z − z̄_new)ᵀ is symmetric in exact arithmetic; symmetrise the update so
    // rounding cannot make it drift apart.
    cross.noalias() += (weight * 0.5) * (before * after.transpose() + after * before.transpose());
    w = total;
}

void MomentMatrix::merge(const MomentMatrix& o) {
    if (!(o.w > 0)) {
        rows += o.rows;
        return;
    }
    if (!(w > 0)) {
        const double r = rows;
        *this = o;
        rows += r;
        return;
    }
    const double total = w + o.w;
    const Eigen::VectorXd delta = (o.origin - origin) + (o.offset - offset);
    offset += delta * (o.w / total);
    cross += o.cross + (w * o.w / total) * (delta * delta.transpose());
    w = total;
    rows += o.rows;
}

BivariateMoments MomentMatrix::xy() const {
    BivariateMoments m;
    m.rows = rows;
    if (!(w > 0) || dim() < 2) return m;
    const Eigen::Index y = dim() - 1;
    m.w = w;
    m.x0 = origin(0);
    m.y0 = origin(y);
    m.dx = offset(0);
    m.dy = offset(y);
    m.cxx = cross(0, 0);
    m.cxy = cross(0, y);
    m.cyy = cross(y, y);
    return m;
}

StratumMoments::StratumMoments(std::size_t strata, std::size_t block_rows)
    : lane_mask_(strata <= kFewStrata ? kLanes - 1 : 0),
      block_((lane_mask_ + 1) * strata),
      total_(strata),
      block_rows_(block_rows ? block_rows : 65536) {}

void StratumMoments::start_block(Block& b, std::size_t k, double x, double y) {
    const BivariateMoments& t = total_[k];
    if (t.w > 0) {
        b.sx0 = t.mean_x();
        b.sy0 = t.mean_y();
    } else {
        b.sx0 = x;
        b.sy0 = y;
    }
}

void StratumMoments::fold() {
    const std::size_t s = total_.size();
    for (std::size_t slot = 0; slot < block_.size(); ++slot) {
        Block& b = block_[slot];
        if (b.rows == 0) continue;
        BivariateMoments m;
        m.rows = b.rows;
        if (b.w > 0) {
            m.w = b.w;
            const double ux = b.sx / b.w, uy = b.sy / b.w;
            m.x0 = b.sx0;
            m.y0 = b.sy0;
            m.dx = ux;
            m.dy = uy;
            m.cxx = std::max(0.0, b.sxx - b.sx * ux);
            m.cxy = b.sxy - b.sx * uy;
            m.cyy = std::max(0.0, b.syy - b.sy * uy);
        }
        total_[slot % s].merge(m);
        b = Block{};
    }
    pending_ = 0;
}

std::vector<BivariateMoments> StratumMoments::finish() {
    fold();
    return total_;
}

}  // namespace foldline
