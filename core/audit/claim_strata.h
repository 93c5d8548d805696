#pragma once
// The columns of one data set in the categorical form the diagram's tests use, made once and
// shared by every claim: each numeric column is cut once (as joint_stratifier cuts it: one level
// per whole number up to `max_levels`, else `bins` quantile bins), and the joint strata of a
// conditioning set are kept for the next claim that conditions on the same set (up to a memory
// budget). Testing a diagram of k claims thus cuts each column once instead of once per claim.
//
// Holds a pointer to the table: the table must outlive it. Safe to call from several threads.
#include <cstddef>
#include <cstdint>
#include <map>
#include <memory>
#include <mutex>
#include <string>
#include <vector>

#include "core/common/error.h"
#include "core/table/table.h"

namespace foldline::audit {

/// Joint strata of a set of columns: one code per row in [0, levels), `levels` for a row missing
/// any column of the set. Strata are numbered in order of first appearance (as joint_stratifier
/// numbers its levels); an empty set gives one stratum holding every row.
struct JointStrata {
    std::vector<std::uint32_t> codes;  ///< empty when the set is empty (every row in stratum 0)
    std::size_t levels = 1;
    std::uint32_t code(std::size_t i) const { return codes.empty() ? 0u : codes[i]; }
    std::uint32_t missing_code() const { return static_cast<std::uint32_t>(levels); }
};

class ClaimStrata {
public:
    /// `joint_budget_bytes`: the most the kept joint strata may take together (beyond it a set's
    /// strata are computed for the claim at hand and not kept).
    ClaimStrata(const Table& table, int bins, std::size_t max_levels, std::size_t joint_budget_bytes = 256u << 20);

    const Table& table() const { return *table_; }
    int bins() const { return bins_; }
    std::size_t max_levels() const { return max_levels_; }

    /// The column as a categorical: itself, or its cut (made on first use). Errors: not a
    /// column, or a numeric column that cannot be cut.
    Result<std::shared_ptr<const Column>> categorical(const std::string& name);

    /// The joint strata of `names` (order matters for the numbering only). Errors as
    /// categorical(), or more joint levels than fit in 32 bits.
    Result<std::shared_ptr<const JointStrata>> joint(const std::vector<std::string>& names);

    /// Columns cut so far and joint strata computed so far (cache misses), for tests and benches.
    std::size_t cuts_made() const;
    std::size_t joints_made() const;

private:
    const Table* table_;
    int bins_;
    std::size_t max_levels_;
    std::size_t budget_;
    mutable std::mutex mutex_;
    std::map<std::string, std::shared_ptr<const Column>> cut_;
    std::map<std::vector<std::string>, std::shared_ptr<const JointStrata>> joint_;
    std::size_t joint_bytes_ = 0;
    std::size_t cuts_made_ = 0;
    std::size_t joints_made_ = 0;
};

}  // namespace foldline::audit
