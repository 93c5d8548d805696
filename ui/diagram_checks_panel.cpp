// Core headers first: they use `slots` as a name, which Qt defines as a keyword macro.
#include "core/audit/diagram_checks.h"
#include "ui/diagram_checks_panel.h"

#include <QCoreApplication>
#include <QElapsedTimer>
#include <QLabel>
#include <QVBoxLayout>
#include <cmath>

#include "ui/job.h"

namespace foldline::ui {

// What one worker run hands back: written by the worker only, read after Job::finished.
struct DiagramChecksPanel::Outcome {
    std::optional<causal::DiagramChecks> checks;
    QString problem;
    int tests_run = 0;
};

DiagramChecksPanel::DiagramChecksPanel(QWidget* parent) : QWidget(parent), job_(new Job(this)) {
    setObjectName(QStringLiteral("diagram_checks"));
    auto* lay = new QVBoxLayout(this);
    lay->setContentsMargins(0, 0, 0, 0);
    lay->addWidget(new QLabel(tr("<b>The diagram against the data</b>")));
    summary_ = new QLabel(tr("Run a scan to check the diagram's claims against the rows."));
    summary_->setObjectName(QStringLiteral("diagram_checks_summary"));
    summary_->setWordWrap(true);
    list_ = new QLabel;
    list_->setObjectName(QStringLiteral("diagram_checks_list"));
    list_->setWordWrap(true);
    list_->setTextFormat(Qt::RichText);
    list_->setTextInteractionFlags(Qt::TextSelectableByMouse);
    lay->addWidget(summary_);
    lay->addWidget(list_);
    connect(job_, &Job::finished, this, &DiagramChecksPanel::finish);
}

DiagramChecksPanel::~DiagramChecksPanel() { job_->cancel(); }

void DiagramChecksPanel::set_rows(std::shared_ptr<const Table> rows, int bins, std::size_t max_levels, double alpha) {
    if (rows == rows_ && bins == bins_ && max_levels == max_levels_ && alpha == alpha_) return;
    rows_ = std::move(rows);
    bins_ = bins;
    max_levels_ = max_levels;
    alpha_ = alpha;
    cache_.clear();
    // The columns cut once for these rows, shared by every later run (a run holds its own
    // reference, so a run still finishing on the old rows keeps them alive).
    strata_ = rows_ ? std::make_shared<audit::ClaimStrata>(*rows_, bins_, max_levels_) : nullptr;
    start();
}

void DiagramChecksPanel::set_diagram(const causal::Diagram& diagram) {
    diagram_ = diagram;
    start();
}

bool DiagramChecksPanel::busy() const { return job_->running() || pending_; }

bool DiagramChecksPanel::wait(int ms) {
    QElapsedTimer t;
    t.start();
    while (busy() && t.elapsed() < ms) {
        job_->wait(std::max<int>(1, ms - static_cast<int>(t.elapsed())));
        QCoreApplication::processEvents();  // delivers finished(), which may start the next run
    }
    return !busy();
}

void DiagramChecksPanel::start() {
    if (job_->running()) {
        pending_ = true;
        job_->cancel();
        return;
    }
    pending_ = false;
    if (!rows_ || diagram_.nodes.empty()) {
        running_.reset();
        checks_.reset();
        show_result();
        return;
    }
    summary_->setText(tr("Checking the diagram's claims against the rows…"));
    auto out = std::make_shared<Outcome>();
    running_ = out;
    // The worker gets its own copies: the diagram, the cache as it is now, the rows (shared, const).
    const audit::EstimateSettings settings{bins_, max_levels_, alpha_};
    job_->start([out, rows = rows_, strata = strata_, settings, diagram = diagram_, cache = cache_](const Work& work) {
        auto graph = causal::CausalGraph::build(diagram);
        if (!graph) {
            out->problem = QString::fromStdString(graph.error().message);
            return;
        }
        std::vector<std::string> columns;
        for (const auto& c : rows->columns) columns.push_back(c.name);
        if (auto st = causal::check_columns(*graph, columns); !st) {
            out->problem = QString::fromStdString(st.error().message);
            return;
        }
        causal::DiagramChecks checks;
        checks.checks = audit::list_claims(*graph);
        for (auto& c : checks.checks) {
            if (work.cancelled()) return;
            const auto hit = cache.constFind(QString::fromStdString(audit::claim_key(c)));
            if (hit != cache.constEnd() && hit->form == c.form) {
                c = *hit;
                continue;
            }
            audit::test_claim(c, *strata);
            ++out->tests_run;
        }
        audit::finish_checks(checks, settings.alpha);
        out->checks = std::move(checks);
    });
}

void DiagramChecksPanel::finish() {
    const auto out = running_;
    running_.reset();
    if (pending_ || !out) {
        start();
        return;
    }
    tests_run_ = out->tests_run;
    if (out->checks) {
        for (const auto& c : out->checks->checks)
            if (c.form != causal::ClaimForm::Untestable) cache_.insert(QString::fromStdString(audit::claim_key(c)), c);
        checks_ = std::move(out->checks);
    } else {
        checks_.reset();
    }
    show_result();
    if (!out->problem.isEmpty()) summary_->setText(tr("The diagram cannot be checked: %1").arg(out->problem));
    emit checks_changed();
}

void DiagramChecksPanel::show_result() {
    list_->clear();
    if (!rows_) {
        summary_->setText(tr("Run a scan to check the diagram's claims against the rows."));
        return;
    }
    if (!checks_) {
        summary_->setText(tr("Draw the diagram to check its claims against the rows."));
        return;
    }
    const auto& c = *checks_;
    if (c.checks.empty()) {
        summary_->setText(tr("Every pair of observed columns is joined by an arrow: the diagram makes no claim the "
                             "data could contradict."));
        return;
    }
    summary_->setText(c.contradicted > 0
                          ? tr("%1 of %2 tested claims are contradicted by the data (q < %3): the verdict may rest "
                               "on a diagram that misses an arrow or a common cause.")
                                .arg(c.contradicted)
                                .arg(c.tested)
                                .arg(c.alpha)
                          : tr("None of the %1 tested claims is contradicted by the data (q < %2).")
                                .arg(c.tested)
                                .arg(c.alpha));
    QString html;
    for (const auto& k : c.checks) {
        const QString s = QString::fromStdString(k.sentence).toHtmlEscaped();
        html += k.contradicted ? QStringLiteral("<p><b>%1</b></p>").arg(s) : QStringLiteral("<p>%1</p>").arg(s);
    }
    list_->setText(html);
}

}  // namespace foldline::ui
