#include "ui/recovery_dialog.h"

#include <QDialogButtonBox>
#include <QFileInfo>
#include <QLabel>
#include <QLocale>
#include <QPushButton>
#include <QVBoxLayout>

namespace foldline::ui {

namespace {

QString describe_offer(const RecoveryOffer& o) {
    const project::Project& p = o.project;
    QStringList lines;
    lines << (o.project_file.isEmpty()
                  ? QObject::tr("Audit: never saved")
                  : QObject::tr("Audit: %1 (the copy is newer than the saved file)").arg(QFileInfo(o.project_file).fileName()));
    lines << QObject::tr("Data: %1").arg(QString::fromStdString(p.data.path));
    const QString outcome = QString::fromStdString(p.question.outcome), exposure = QString::fromStdString(p.question.exposure);
    if (p.question.kind == project::QuestionKind::Slope)
        lines << QObject::tr("Question: trend of %1 on %2").arg(outcome, exposure);
    else if (!outcome.isEmpty())
        lines << QObject::tr("Question: %1 by %2").arg(outcome, exposure);
    int decided = 0, notes = 0;
    for (const auto& r : p.reviews) {
        if (r.decision != Decision::Undecided) ++decided;
        if (!r.note.empty()) ++notes;
    }
    lines << QObject::tr("Reviewed: %1 %2, %3 %4")
                 .arg(decided)
                 .arg(decided == 1 ? QObject::tr("decision") : QObject::tr("decisions"))
                 .arg(notes)
                 .arg(notes == 1 ? QObject::tr("note") : QObject::tr("notes"));
    if (const causal::Diagram* d = p.diagram())
        lines << QObject::tr("Diagram: %1 nodes, %2 arrows").arg(d->nodes.size()).arg(d->edges.size());
    return lines.join(QLatin1Char('\n'));
}

}  // namespace

RecoveryDialog::RecoveryDialog(const RecoveryOffer& offer, QWidget* parent) : QDialog(parent) {
    setWindowTitle(tr("Restore unsaved audit?"));
    setObjectName(QStringLiteral("recovery_dialog"));
    auto* lay = new QVBoxLayout(this);
    const QString when = QLocale().toString(offer.written.toLocalTime(), QLocale::ShortFormat);
    auto* head = new QLabel((offer.project_file.isEmpty()
                                 ? tr("Foldline closed before this audit was saved. A copy from %1 was kept.")
                                 : tr("Foldline closed before the latest changes to this audit were saved. A copy "
                                      "from %1 was kept."))
                                .arg(when));
    head->setWordWrap(true);
    QFont bold = head->font();
    bold.setBold(true);
    head->setFont(bold);
    lay->addWidget(head);
    summary_ = describe_offer(offer);
    auto* body = new QLabel(summary_);
    body->setTextFormat(Qt::PlainText);  // names and paths come from the data: never markup
    body->setWordWrap(true);
    body->setTextInteractionFlags(Qt::TextSelectableByMouse);
    lay->addWidget(body);
    auto* hint = new QLabel(tr("Restore reopens the data, asks the saved question again and puts the decisions, "
                               "notes and diagram back. Your saved audit file is not changed until you save."));
    hint->setWordWrap(true);
    lay->addWidget(hint);

    auto* buttons = new QDialogButtonBox;
    restore_ = buttons->addButton(tr("&Restore"), QDialogButtonBox::AcceptRole);
    discard_ = buttons->addButton(tr("&Discard copy"), QDialogButtonBox::DestructiveRole);
    later_ = buttons->addButton(tr("Decide &later"), QDialogButtonBox::RejectRole);
    restore_->setObjectName(QStringLiteral("recovery_restore"));
    discard_->setObjectName(QStringLiteral("recovery_discard"));
    later_->setObjectName(QStringLiteral("recovery_later"));
    restore_->setToolTip(tr("Open the kept copy of the audit"));
    discard_->setToolTip(tr("Delete the kept copy; it cannot be restored afterwards"));
    later_->setToolTip(tr("Keep the copy and ask again next time"));
    restore_->setDefault(true);
    restore_->setFocus();
    connect(restore_, &QPushButton::clicked, this, [this] { answer(RecoveryChoice::Restore); });
    connect(discard_, &QPushButton::clicked, this, [this] { answer(RecoveryChoice::Discard); });
    connect(later_, &QPushButton::clicked, this, [this] { answer(RecoveryChoice::Later); });
    lay->addWidget(buttons);
    setMinimumWidth(460);
}

QPushButton* RecoveryDialog::button(RecoveryChoice c) const {
    switch (c) {
        case RecoveryChoice::Restore: return restore_;
        case RecoveryChoice::Discard: return discard_;
        case RecoveryChoice::Later: return later_;
    }
    return later_;
}

void RecoveryDialog::answer(RecoveryChoice c) {
    choice_ = c;
    if (c == RecoveryChoice::Later) reject();
    else accept();
}

RecoveryChoice ask_recovery(QWidget* parent, const RecoveryOffer& offer) {
    RecoveryDialog d(offer, parent);
    d.exec();
    return d.choice();
}

}  // namespace foldline::ui
