#include "core/audit/class_changes.h"

#include <map>

namespace foldline::audit {

project::FindingKey key_of(const RateFinding& f) { return project::rate_key(f.strata, f.focal, f.reference); }
project::FindingKey key_of(const SlopeFinding& f) { return project::slope_key(f.strata, f.x, f.y); }
project::FindingKey key_of(const MeanFinding& f) { return project::mean_key(f.strata, f.outcome, f.focal, f.reference); }

std::vector<ClassChange> class_changes(const project::Project& p, const ScanResult& result) {
    std::vector<ClassChange> changes;
    bool any_saved = false;
    for (const auto& r : p.reviews) any_saved = any_saved || r.saved_class.has_value();
    if (!any_saved) return changes;
    std::map<project::FindingKey, FindingClass> now;
    for (const auto& f : result.rate_findings) now[key_of(f)] = f.cls;
    for (const auto& f : result.slope_findings) now[key_of(f)] = f.cls;
    for (const auto& f : result.mean_findings) now[key_of(f)] = f.cls;
    for (const auto& r : p.reviews) {
        if (!r.saved_class) continue;
        auto it = now.find(r.key);
        if (it == now.end()) changes.push_back({r.key, r.saved_class, std::nullopt});
        else if (it->second != *r.saved_class) changes.push_back({r.key, r.saved_class, it->second});
    }
    for (const auto& [key, cls] : now) {
        const auto* r = p.review(key);
        if (cls != FindingClass::Stable && (!r || !r->saved_class)) changes.push_back({key, std::nullopt, cls});
    }
    return changes;
}

void record_classes(project::Project& p, const ScanResult& result) {
    for (const auto& f : result.rate_findings) p.review_for(key_of(f)).saved_class = f.cls;
    for (const auto& f : result.slope_findings) p.review_for(key_of(f)).saved_class = f.cls;
    for (const auto& f : result.mean_findings) p.review_for(key_of(f)).saved_class = f.cls;
}

}  // namespace foldline::audit
