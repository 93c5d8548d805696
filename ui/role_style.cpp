#include "ui/role_style.h"

#include <QCoreApplication>
#include <algorithm>

#include "ui/palette.h"

namespace foldline::ui {

namespace {

using causal::Role;

// Okabe–Ito indices: 0 orange, 1 sky blue, 2 bluish green, 3 yellow, 5 vermillion,
// 6 reddish purple, 7 grey.
RoleStyle make(int okabe_ito, RoleShape shape, const char* words) {
    return RoleStyle{colors::okabe_ito(okabe_ito), shape, words};
}

}  // namespace

const std::vector<causal::Role>& all_roles() {
    static const std::vector<Role> roles = {
        Role::Exposure,        Role::Outcome,       Role::Mediator,      Role::OutcomeDescendant,
        Role::MediatorDescendant, Role::Confounder, Role::Collider,      Role::ColliderDescendant,
        Role::ExposureDescendant, Role::ExposureCause, Role::OutcomeCause, Role::Unrelated,
    };
    return roles;
}

const RoleStyle& role_style(std::optional<causal::Role> role) {
    static const RoleStyle none = make(7, RoleShape::Box, "");
    // Exposure and outcome: two outlines (a framed box; an octagon), vermillion and yellow.
    static const RoleStyle exposure = make(5, RoleShape::Framed, QT_TRANSLATE_NOOP("RoleStyle", "exposure"));
    static const RoleStyle outcome = make(3, RoleShape::Octagon, QT_TRANSLATE_NOOP("RoleStyle", "outcome"));
    static const RoleStyle confounder = make(0, RoleShape::Hexagon, QT_TRANSLATE_NOOP("RoleStyle", "confounder"));
    static const RoleStyle mediator = make(2, RoleShape::Capsule, QT_TRANSLATE_NOOP("RoleStyle", "mediator"));
    static const RoleStyle after_mediator =
        make(2, RoleShape::Capsule, QT_TRANSLATE_NOOP("RoleStyle", "after a mediator"));
    static const RoleStyle collider = make(6, RoleShape::Funnel, QT_TRANSLATE_NOOP("RoleStyle", "collider"));
    static const RoleStyle after_collider =
        make(6, RoleShape::Funnel, QT_TRANSLATE_NOOP("RoleStyle", "after a collider"));
    static const RoleStyle after_outcome =
        make(1, RoleShape::Notched, QT_TRANSLATE_NOOP("RoleStyle", "after the outcome"));
    static const RoleStyle side_effect =
        make(7, RoleShape::Box, QT_TRANSLATE_NOOP("RoleStyle", "side effect of exposure"));
    static const RoleStyle exposure_cause =
        make(7, RoleShape::Pointer, QT_TRANSLATE_NOOP("RoleStyle", "cause of exposure only"));
    static const RoleStyle outcome_cause =
        make(7, RoleShape::Box, QT_TRANSLATE_NOOP("RoleStyle", "cause of outcome only"));
    static const RoleStyle unrelated = make(7, RoleShape::Box, QT_TRANSLATE_NOOP("RoleStyle", "unrelated"));
    if (!role) return none;
    switch (*role) {
        case Role::Exposure: return exposure;
        case Role::Outcome: return outcome;
        case Role::Confounder: return confounder;
        case Role::Mediator: return mediator;
        case Role::MediatorDescendant: return after_mediator;
        case Role::Collider: return collider;
        case Role::ColliderDescendant: return after_collider;
        case Role::OutcomeDescendant: return after_outcome;
        case Role::ExposureDescendant: return side_effect;
        case Role::ExposureCause: return exposure_cause;
        case Role::OutcomeCause: return outcome_cause;
        case Role::Unrelated: return unrelated;
    }
    return none;
}

QString role_words(std::optional<causal::Role> role) {
    const char* words = role_style(role).words;
    return *words ? QCoreApplication::translate("RoleStyle", words) : QString();
}

int fill_alpha(bool dark) { return dark ? 110 : 70; }

QPainterPath role_path(RoleShape shape, const QRectF& r) {
    QPainterPath p;
    const double c = std::min(r.height(), r.width()) * 0.3;
    switch (shape) {
        case RoleShape::Hexagon:
            p.moveTo(r.left() + c, r.top());
            p.lineTo(r.right() - c, r.top());
            p.lineTo(r.right(), r.center().y());
            p.lineTo(r.right() - c, r.bottom());
            p.lineTo(r.left() + c, r.bottom());
            p.lineTo(r.left(), r.center().y());
            p.closeSubpath();
            break;
        case RoleShape::Capsule: p.addRoundedRect(r, r.height() / 2, r.height() / 2); break;
        case RoleShape::Funnel:
            p.moveTo(r.topLeft());
            p.lineTo(r.topRight());
            p.lineTo(r.right() - c, r.bottom());
            p.lineTo(r.left() + c, r.bottom());
            p.closeSubpath();
            break;
        case RoleShape::Pointer:
            p.moveTo(r.topLeft());
            p.lineTo(r.right() - c, r.top());
            p.lineTo(r.right(), r.center().y());
            p.lineTo(r.right() - c, r.bottom());
            p.lineTo(r.bottomLeft());
            p.closeSubpath();
            break;
        case RoleShape::Framed: p.addRect(r); break;
        case RoleShape::Octagon: {
            const double k = std::min(r.height(), r.width()) * 0.22;
            p.moveTo(r.left() + k, r.top());
            p.lineTo(r.right() - k, r.top());
            p.lineTo(r.right(), r.top() + k);
            p.lineTo(r.right(), r.bottom() - k);
            p.lineTo(r.right() - k, r.bottom());
            p.lineTo(r.left() + k, r.bottom());
            p.lineTo(r.left(), r.bottom() - k);
            p.lineTo(r.left(), r.top() + k);
            p.closeSubpath();
            break;
        }
        case RoleShape::Notched:
            p.moveTo(r.topLeft());
            p.lineTo(r.topRight());
            p.lineTo(r.right() - c, r.center().y());
            p.lineTo(r.bottomRight());
            p.lineTo(r.bottomLeft());
            p.closeSubpath();
            break;
        case RoleShape::Box: p.addRect(r); break;
    }
    return p;
}

double inner_frame(RoleShape shape, const QRectF& r) {
    if (shape != RoleShape::Framed && shape != RoleShape::Octagon) return 0;
    return std::clamp(std::min(r.width(), r.height()) * 0.1, 2.0, 4.0);
}

}  // namespace foldline::ui
