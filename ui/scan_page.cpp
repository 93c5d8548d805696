#include "core/scan/scan_result.h"  // core before Qt (DEVELOPERS.md)
#include "ui/scan_page.h"

#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QProgressBar>
#include <QPushButton>
#include <QTableView>
#include <QTimer>
#include <QVBoxLayout>

#include "ui/caution_band.h"
#include "ui/findings_model.h"
#include "ui/job.h"

namespace foldline::ui {

ScanPage::ScanPage(FindingsModel* model, QWidget* parent)
    : QWidget(parent), model_(model), job_(new Job(this)), flush_timer_(new QTimer(this)) {
    question_ = new QLabel(tr("No scan yet. Set the question (step 2) and press Scan."));
    question_->setWordWrap(true);
    question_->setTextFormat(Qt::RichText);
    progress_ = new QProgressBar;
    progress_->setObjectName(QStringLiteral("scan_progress"));
    progress_->setRange(0, 1);
    progress_->setValue(0);
    progress_->setFormat(tr("idle"));
    cancel_ = new QPushButton(tr("Stop  (Esc)"));
    cancel_->setObjectName(QStringLiteral("cancel_scan"));
    cancel_->setEnabled(false);
    connect(cancel_, &QPushButton::clicked, this, &ScanPage::cancel);
    status_ = new QLabel;
    status_->setObjectName(QStringLiteral("scan_status"));
    live_ = new QTableView;
    live_->setModel(model_);
    live_->verticalHeader()->hide();
    live_->horizontalHeader()->setStretchLastSection(true);
    live_->setToolTip(tr("Findings in the order they were computed; the Findings step ranks them"));
    live_->setSelectionMode(QAbstractItemView::NoSelection);

    auto* row = new QHBoxLayout;
    row->addWidget(progress_, 1);
    row->addWidget(cancel_);
    auto* lay = new QVBoxLayout(this);
    lay->addWidget(question_);
    lay->addLayout(row);
    lay->addWidget(status_);
    lay->addWidget(new QLabel(tr("<b>Arriving findings</b>")));
    lay->addWidget(live_, 1);
    lay->addWidget(new CautionBand);

    flush_timer_->setInterval(50);
    connect(flush_timer_, &QTimer::timeout, this, &ScanPage::flush);
    connect(job_, &Job::progress, this, [this](double done, double total, const QString& step) {
        progress_->setRange(0, std::max(1, int(total)));
        progress_->setValue(int(done));
        // The engine counts stratifications (each candidate, and each pair when pairs are on),
        // then the flagged findings it resamples: the bar says which it is counting.
        const bool resampling = step == QLatin1String("bootstrap");
        progress_->setFormat((resampling ? tr("stability: finding %1 of %2") : tr("stratification %1 of %2"))
                                 .arg(done, 0, 'f', 0)
                                 .arg(total, 0, 'f', 0) +
                             (step.isEmpty() || resampling ? QString() : QStringLiteral(" — ") + step));
        if (resampling)
            status_->setText(tr("Every stratification is scanned; resampling the flagged findings to measure their stability…"));
        else if (total > 0 && done >= total)
            status_->setText(tr("Every stratification is scanned; ranking the findings…"));
    });
    connect(job_, &Job::finished, this, [this] {
        flush_timer_->stop();
        flush();
        seconds_ = double(clock_.elapsed()) / 1000.0;
        cancel_->setEnabled(false);
        auto result = std::move(result_);
        const bool stopped = job_->cancelled() || (result && result->ok() && (*result)->cancelled);
        if (result && result->ok() && !stopped) {
            // The final findings carry q-values, stabilities and the ranking: they replace
            // the provisional ones shown while the scan ran.
            model_->clear();
            for (FindingView& f : (*result)->findings) model_->add(std::move(f));
            scan_result_ = (*result)->result;
            scanned_table_ = (*result)->table;
        }
        if (stopped) {
            status_->setText(tr("Stopped after %1 s; %2 provisional finding(s) kept. They have no q-values over the "
                                "whole scan and no stability, so the Diagram and Memo steps wait for a finished "
                                "scan: press Scan (F5) to run it again.")
                                 .arg(seconds_, 0, 'f', 2)
                                 .arg(model_->size()));
            progress_->setFormat(tr("stopped"));
            emit scan_finished(false, model_->size());
        } else if (!result || !result->ok()) {
            const QString msg = result ? QString::fromStdString(result->error().to_string()) : tr("scan failed");
            status_->setText(QStringLiteral("⚠ ") + msg);
            progress_->setFormat(tr("failed"));
            emit scan_finished(false, model_->size());
        } else {
            progress_->setRange(0, 1);
            progress_->setValue(1);
            progress_->setFormat(tr("done"));
            QString text = tr("Done in %1 s: %2 finding(s).").arg(seconds_, 0, 'f', 2).arg(model_->size());
            if (scan_result_ && !scan_result_->rows_filter.empty())
                text += tr(" Rows to include: %1 (%2 of %3 rows kept).")
                            .arg(QString::fromStdString(scan_result_->rows_filter))
                            .arg(qlonglong(scanned_table_ ? scanned_table_->rows : 0))
                            .arg(qlonglong(table_ ? table_->rows : 0));
            if (!(*result)->excluded.isEmpty())
                text += tr(" Left out: %1.").arg((*result)->excluded.join(QStringLiteral("; ")));
            status_->setText(text);
            emit scan_finished(true, model_->size());
        }
    });
}

ScanPage::~ScanPage() {
    // The worker writes into this page's inbox: stop it before the members go.
    job_->cancel();
    job_->wait(-1);
}

bool ScanPage::running() const { return job_->running(); }
bool ScanPage::wait(int ms) { return job_->wait(ms); }
QString ScanPage::status() const { return status_->text(); }
double ScanPage::elapsed_seconds() const { return running() ? double(clock_.elapsed()) / 1000.0 : seconds_; }

bool ScanPage::start(std::shared_ptr<const Table> table, const QuestionSpec& q, const project::AuditSpec& spec) {
    if (job_->running() || !table) return false;
    model_->clear();
    scan_result_.reset();
    scanned_table_.reset();
    {
        std::lock_guard<std::mutex> lock(mutex_);
        inbox_.clear();
    }
    table_ = std::move(table);
    if (q.slope)
        question_->setText(tr("Trend of <b>%1</b> on <b>%2</b>, pooled and within strata of %3 candidate(s)%4.")
                               .arg(q.outcome.toHtmlEscaped(), q.exposure.toHtmlEscaped())
                               .arg(q.candidates.size())
                               .arg(q.pairs ? tr(" and their pairs") : QString()));
    else if (q.mean)
        question_->setText(tr("Mean%1 of <b>%2</b> for <b>%3</b> against <b>%4</b> (column %5), pooled and within strata of %6 candidate(s)%7.")
                               .arg(q.log_outcome ? tr(" log") : QString(), q.outcome.toHtmlEscaped(), q.focal.toHtmlEscaped(),
                                    q.reference.toHtmlEscaped(), q.exposure.toHtmlEscaped())
                               .arg(q.candidates.size())
                               .arg(q.pairs ? tr(" and their pairs") : QString()));
    else
    question_->setText(tr("Rate of <b>%1 = %2</b> for <b>%3</b> against <b>%4</b> (column %5), stratified by %6 candidate(s)%7.")
                           .arg(q.outcome.toHtmlEscaped(), q.positive.toHtmlEscaped(), q.focal.toHtmlEscaped(),
                                q.reference.toHtmlEscaped(), q.exposure.toHtmlEscaped())
                           .arg(q.candidates.size())
                           .arg(q.pairs ? tr(" and their pairs (up to %1 stratifications)")
                                              .arg(q.candidates.size() + q.candidates.size() * (q.candidates.size() - 1) / 2)
                                        : QString()));
    progress_->setRange(0, 0);
    progress_->setFormat(tr("starting…"));
    status_->setText(tr("Scanning the stratifications…"));
    cancel_->setEnabled(true);
    clock_.start();
    result_ = std::make_shared<Result<ScanOutcome>>(make_error("not run"));
    auto result = result_;
    auto table_ref = table_;
    flush_timer_->start();
    job_->start([this, result, table_ref, spec](const Work& work) {
        *result = run_scan(table_ref, spec, work, [this](FindingView f) {
            std::lock_guard<std::mutex> lock(mutex_);
            inbox_.push_back(std::move(f));
        });
    });
    return true;
}

void ScanPage::cancel() {
    if (job_->running()) {
        job_->cancel();
        status_->setText(tr("Stopping…"));
    }
}

void ScanPage::flush() {
    std::vector<FindingView> batch;
    {
        std::lock_guard<std::mutex> lock(mutex_);
        batch.swap(inbox_);
    }
    for (FindingView& f : batch) model_->add(std::move(f));
}

}  // namespace foldline::ui
