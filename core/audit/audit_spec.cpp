#include "core/audit/audit_spec.h"

namespace foldline::project {

const causal::Diagram* AuditSpec::diagram() const {
    if (diagrams.empty()) return nullptr;
    for (const auto& d : diagrams)
        if (d.name == active_diagram) return &d.diagram;
    return &diagrams.front().diagram;
}

std::vector<std::string> settings_problems(const ScanSettings& s) {
    std::vector<std::string> out;
    if (s.bins < 0 || s.bins > limits::kMaxBins)
        out.push_back("bins must be a whole number from 0 (off) to " + std::to_string(limits::kMaxBins));
    if (static_cast<double>(s.max_levels) < limits::kMinMaxLevels || static_cast<double>(s.max_levels) > limits::kMaxMaxLevels)
        out.push_back("the level limit must be a whole number from 2 to 1000000");
    if (!(s.alpha >= limits::kMinAlpha && s.alpha <= limits::kMaxAlpha))
        out.push_back("alpha must lie in (0, 0.5]");
    if (s.bootstrap < 0 || s.bootstrap > limits::kMaxBootstrap)
        out.push_back("the number of resamples must be a whole number from 0 to 1000000");
    if (s.slope_bootstrap < 0 || s.slope_bootstrap > limits::kMaxBootstrap)
        out.push_back("the number of slope resamples must be a whole number from 0 to 1000000");
    return out;
}

}  // namespace foldline::project
