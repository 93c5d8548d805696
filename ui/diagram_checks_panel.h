#pragma once
// The Diagram step's "diagram against the data" panel: the conditional independences the
// diagram implies, each tested on the scanned rows (core/audit/diagram_checks.h), shown as plain
// sentences. Every computation (listing the claims and testing them) runs on a worker (ui/job.h),
// never on the GUI thread; a test already run for the same claim on the same rows is reused, so
// an edit only tests the claims it creates, and each numeric column is cut once per set of rows
// (core/audit/claim_strata.h), not once per claim or per edit. An edit during a run cancels it and runs again.
#include <QHash>
#include <QWidget>
#include <memory>
#include <optional>

#include "core/causal/diagram.h"
#include "core/causal/diagram_check.h"
#include "core/table/table.h"

class QLabel;

namespace foldline::audit {
class ClaimStrata;
}

namespace foldline::ui {

class Job;

class DiagramChecksPanel : public QWidget {
    Q_OBJECT
public:
    explicit DiagramChecksPanel(QWidget* parent = nullptr);
    ~DiagramChecksPanel() override;

    /// The rows to test on, numeric columns cut into `bins` quantile bins (or one level per whole
    /// number up to `max_levels`) as the scan cut them, claims judged at `alpha`; new rows drop
    /// every cached test. Null rows: nothing is tested (the panel says a scan is needed).
    void set_rows(std::shared_ptr<const Table> rows, int bins = 4, std::size_t max_levels = 50, double alpha = 0.05);
    /// The diagram as drawn now; schedules a recomputation.
    void set_diagram(const causal::Diagram& diagram);

    /// The last finished result; nullopt before the first one or without rows.
    const std::optional<causal::DiagramChecks>& checks() const { return checks_; }
    bool busy() const;
    /// Claims tested (not taken from the cache) by the last finished run.
    int tests_run() const { return tests_run_; }
    /// Waits for a running computation (tests and shutdown); true when idle.
    bool wait(int ms);

signals:
    void checks_changed();

private:
    void start();
    void finish();
    void show_result();

    Job* job_;
    std::shared_ptr<const Table> rows_;
    std::shared_ptr<audit::ClaimStrata> strata_;  ///< rows_ cut once, shared by every run
    int bins_ = 4;
    std::size_t max_levels_ = 50;
    double alpha_ = 0.05;
    causal::Diagram diagram_;
    bool pending_ = false;
    QHash<QString, causal::DiagramCheck> cache_;  ///< claim_key → tested claim, for rows_
    struct Outcome;
    std::shared_ptr<Outcome> running_;
    std::optional<causal::DiagramChecks> checks_;
    int tests_run_ = 0;
    QLabel* summary_;
    QLabel* list_;
};

}  // namespace foldline::ui
