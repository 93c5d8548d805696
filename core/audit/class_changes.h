#pragma once
// Re-running a saved audit: which findings' classes differ from those the project recorded, and
// recording the new ones (`foldline run`, `--update`, and the workbench's reopened audits).
#include <optional>
#include <vector>

#include "core/audit/project_file.h"
#include "core/scan/scan_result.h"

namespace foldline::audit {

struct ClassChange {
    project::FindingKey key;
    std::optional<FindingClass> before;  ///< nullopt: a newly flagged finding
    std::optional<FindingClass> after;   ///< nullopt: no longer produced
};

/// The project key of a finding (kind, strata, comparison).
project::FindingKey key_of(const RateFinding& f);
project::FindingKey key_of(const SlopeFinding& f);
project::FindingKey key_of(const MeanFinding& f);

/// Findings whose class differs from the saved one: a saved class that changed or vanished, and
/// (when the project saved any class) a flagged finding that had none. No saved class → empty.
std::vector<ClassChange> class_changes(const project::Project& p, const ScanResult& result);

/// Saves the classes of every finding of `result` into the project's reviews (decisions and
/// notes kept).
void record_classes(project::Project& p, const ScanResult& result);

}  // namespace foldline::audit
