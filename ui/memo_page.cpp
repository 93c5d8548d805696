#include "ui/memo_page.h"

#include <QComboBox>
#include <QDateTime>
#include <QHBoxLayout>
#include <QLabel>
#include <QScrollArea>
#include <QSplitter>
#include <QPushButton>
#include <QTextBrowser>
#include <QVBoxLayout>

#include "ui/caution_band.h"
#include "ui/engine.h"
#include "ui/findings_model.h"
#include "ui/mean_view.h"

namespace foldline::ui {

MemoPage::MemoPage(FindingsModel* model, QWidget* parent) : QWidget(parent), model_(model) {
    text_ = new QTextBrowser;
    text_->setObjectName(QStringLiteral("memo_preview"));
    text_->setOpenLinks(false);
    auto* pdf = new QPushButton(tr("Save memo as PDF…  (Ctrl+E)"));
    pdf->setObjectName(QStringLiteral("export_memo"));
    pdf->setToolTip(tr("Write the memo with the findings, tables, charts, diagram, decisions and the caution"));
    connect(pdf, &QPushButton::clicked, this, &MemoPage::export_requested);
    detail_ = new QComboBox;
    detail_->setObjectName(QStringLiteral("memo_detail"));
    detail_->addItem(tr("One section per family (related findings in a table)"), QStringLiteral("families"));
    detail_->addItem(tr("One section per finding"), QStringLiteral("full"));
    detail_->setToolTip(tr("How much the PDF memo repeats: by default one section per family lead, its "
                           "related findings listed in a table; or a full section for every finding"));
    connect(detail_, &QComboBox::currentIndexChanged, this, [this] { emit detail_changed(); });
    auto* detail_label = new QLabel(tr("Memo &detail:"));
    detail_label->setBuddy(detail_);
    auto* row = new QHBoxLayout;
    row->addWidget(detail_label);
    row->addWidget(detail_);
    row->addStretch();
    row->addWidget(pdf);
    preview_ = new QLabel;
    preview_->setObjectName(QStringLiteral("memo_page_preview"));
    preview_->setAlignment(Qt::AlignHCenter | Qt::AlignTop);
    preview_->setToolTip(tr("Page 1 of the PDF memo as it will be written"));
    auto* scroll = new QScrollArea;
    scroll->setWidget(preview_);
    scroll->setWidgetResizable(true);
    auto* split = new QSplitter;
    split->addWidget(text_);
    split->addWidget(scroll);
    split->setStretchFactor(0, 1);
    split->setStretchFactor(1, 1);
    scroll->setMinimumWidth(280);
    split->setSizes({600, 560});  // room for the page at its preview width
    auto* lay = new QVBoxLayout(this);
    lay->addWidget(new CautionBand);
    lay->addWidget(split, 1);
    lay->addLayout(row);
    refresh({}, nullptr);
    set_page_preview({});
}

QString MemoPage::html() const { return text_->toHtml(); }

QString MemoPage::detail() const { return detail_->currentData().toString(); }

void MemoPage::set_detail(const QString& detail) {
    const QSignalBlocker block(detail_);
    const int i = detail_->findData(detail);
    detail_->setCurrentIndex(i < 0 ? 0 : i);
}

void MemoPage::set_page_preview(const QImage& page) {
    page_ = page;
    if (page.isNull()) {
        preview_->setPixmap({});
        preview_->setText(tr("Page 1 of the PDF memo appears here once a scan has finished."));
    } else {
        preview_->setText({});
        preview_->setPixmap(QPixmap::fromImage(page));
    }
}

void MemoPage::refresh(const QString& source, const QuestionSpec* q) {
    auto esc = [](const QString& s) { return s.toHtmlEscaped(); };
    QString h = tr("<h2>Audit memo (preview)</h2><p>%1</p>").arg(QDateTime::currentDateTime().toString(Qt::ISODate));
    h += tr("<p><b>Data:</b> %1</p>").arg(source.isEmpty() ? tr("none yet") : esc(source));
    if (q && q->slope)
        h += tr("<p><b>Question:</b> does <i>%1</i> rise or fall with <i>%2</i>, and does the answer change within "
                "strata of %3?</p>").arg(esc(q->outcome), esc(q->exposure), esc(q->candidates.join(QStringLiteral(", "))));
    else if (q && q->mean && !q->outcome.isEmpty())
        h += tr("<p><b>Question:</b> is the mean of <i>%1</i> different for <i>%2</i> than for <i>%3</i> "
                "(column <i>%4</i>), and does the answer change within strata of %5?</p>")
                 .arg(esc(q->outcome), esc(q->focal), esc(q->reference), esc(q->exposure),
                      esc(q->candidates.join(QStringLiteral(", "))));
    else if (q && !q->outcome.isEmpty())
        h += tr("<p><b>Question:</b> is the rate of <i>%1 = %2</i> different for <i>%3</i> than for <i>%4</i> "
                "(column <i>%5</i>), and does the answer change within strata of %6?</p>")
                 .arg(esc(q->outcome), esc(q->positive), esc(q->focal), esc(q->reference), esc(q->exposure),
                      esc(q->candidates.join(QStringLiteral(", "))));
    int counts[5] = {0, 0, 0, 0, 0};
    for (const FindingView& f : model_->findings()) ++counts[int(f.cls)];
    h += tr("<p><b>Summary:</b> %1 finding(s): %2 reversal, %3 explained, %4 masked, %5 heterogeneous, %6 stable.</p>")
             .arg(model_->size()).arg(counts[0]).arg(counts[1]).arg(counts[2]).arg(counts[3]).arg(counts[4]);
    const bool trend = q && q->slope;
    h += tr("<table border='1' cellspacing='0' cellpadding='4'><tr><th>Class</th><th>Stratified by</th><th>%1</th>"
            "<th>%2</th><th>q-value</th><th>Decision</th><th>Note</th></tr>")
             .arg(trend ? tr("Pooled slope") : tr("Pooled gap"),
                  trend ? tr("Within slope") : q && q->mean ? tr("Within-strata gap (fixed effects)") : tr("Adjusted gap (Mantel-Haenszel)"));
    std::vector<const FindingView*> order;
    for (const FindingView& f : model_->findings()) order.push_back(&f);
    std::stable_sort(order.begin(), order.end(), [](const FindingView* a, const FindingView* b) {
        if (a->cls != b->cls) return rank(a->cls) < rank(b->cls);
        return (std::isfinite(a->q_value) ? a->q_value : 2) < (std::isfinite(b->q_value) ? b->q_value : 2);
    });
    for (const FindingView* f : order)
        h += QStringLiteral("<tr><td>%1</td><td>%2</td><td>%3</td><td>%4</td><td>%5</td><td>%6</td><td>%7</td></tr>")
                 .arg(esc(class_title(f->cls)), esc(f->strata_label()), esc(format_gap(*f, f->crude)),
                      esc(format_gap(*f, f->adjusted)),
                      std::isfinite(f->q_value) ? QString::number(f->q_value, 'g', 3) : QStringLiteral("—"),
                      esc(decision_title(f->decision)), esc(f->note));
    h += QStringLiteral("</table>");
    h += QStringLiteral("<p><i>%1</i></p>").arg(esc(caution_text()));
    if (q && q->mean) h += QStringLiteral("<p><i>%1</i></p>").arg(esc(pay_review_caution()));
    text_->setHtml(h);
}

}  // namespace foldline::ui
