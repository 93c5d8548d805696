#include "core/audit/mean_audit.h"

#include "core/scan/candidates.h"
#include "core/scan/mean_stability.h"

namespace foldline::audit {

MeanQuestion mean_question(const AuditSpec& spec, unsigned threads) {
    MeanQuestion q;
    q.outcome = spec.question.outcome;
    q.groups.exposure = spec.question.exposure;
    q.groups.focal = spec.question.focal;
    q.groups.reference = spec.question.reference;
    q.log_outcome = spec.question.log_outcome;
    q.pay_gap = spec.question.pay_gap;
    q.alpha = spec.scan.alpha;
    q.pairs = spec.scan.pairs;
    q.threads = threads;
    return q;
}

Result<ScanResult> scan_mean_question(const Table& table, const AuditSpec& spec, unsigned threads, const Work& work) {
    const MeanQuestion mq = mean_question(spec, threads);
    auto groups = check_mean_question(table, mq);
    if (!groups) return usage_error(groups.error());
    CandidateOptions co;
    co.threads = threads;
    co.columns = spec.scan.strata;
    co.bins = spec.scan.bins;
    co.max_levels = static_cast<std::size_t>(spec.scan.max_levels);
    auto cands = select_candidates(table, {mq.outcome, mq.groups.exposure}, co, table.column(mq.groups.exposure));
    if (!cands) return usage_error(cands.error());
    if (cands->candidates.empty())
        return make_error("no column qualifies as a stratifier (see the strata setting)", table.source);
    auto scan = scan_means(table, mq, *cands, work);
    if (!scan) return usage_error(scan.error());
    ScanResult r;
    r.question = scan->groups;
    r.excluded = cands->excluded;
    for (const auto& c : cands->candidates) {
        r.candidates.push_back(c.name);
        r.candidate_origin.push_back(c.origin);
    }
    r.rows = table.total_weight();
    r.alpha = spec.scan.alpha;
    r.bootstrap = spec.scan.bootstrap;
    r.seed = spec.scan.seed;
    r.mean_scan = true;
    r.log_outcome = mq.log_outcome;
    r.cancelled = scan->cancelled;
    r.mean_findings = std::move(scan->findings);
    apply_fdr(r);
    // Stability of the flagged findings after the FDR step has settled their classes, as for rates.
    if (!r.cancelled && !resample_mean_findings(r.mean_findings, r.alpha, spec.scan.bootstrap, r.seed, threads, work))
        r.cancelled = true;
    rank_findings(r);
    return r;
}

}  // namespace foldline::audit
