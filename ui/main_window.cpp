#include "ui/main_window.h"

#include "core/common/sha256.h"
#include "core/audit/project_file.h"

#include <QAction>
#include <QActionGroup>
#include <QApplication>
#include <QCloseEvent>
#include <QDragEnterEvent>
#include <QEventLoop>
#include <QFile>
#include <QFileDialog>
#include <QFileInfo>
#include <QGraphicsView>
#include <QLineEdit>
#include <QMenuBar>
#include <QMessageBox>
#include <QMimeData>
#include <QSettings>
#include <QSplitter>
#include <QStackedWidget>
#include <QStatusBar>
#include <QTableView>
#include <QTreeView>
#include <QUndoGroup>
#include <QUndoStack>
#include <QVBoxLayout>

#include "ui/caution_band.h"
#include "ui/counts_grid.h"
#include "ui/diagram_doc.h"
#include "ui/diagram_checks_panel.h"
#include "ui/diagram_page.h"
#include "ui/findings_model.h"
#include "ui/findings_page.h"
#include "ui/job.h"
#include "ui/memo_page.h"
#include "ui/question_page.h"
#include "ui/scan_page.h"
#include "ui/source_page.h"
#include "ui/step_bar.h"

namespace foldline::ui {

struct MainWindow::PendingProject {
    project::Project project;
    QString path;
    bool scanned = false;
    bool recovered = false;  ///< a recovery copy: its changes were never saved
};

namespace {
QAction* add(QMenu* menu, QAction* a) {
    menu->addAction(a);
    return a;
}
}  // namespace

MainWindow::MainWindow(QWidget* parent) : QMainWindow(parent) {
    setWindowTitle(tr("Foldline — rate and slope reversal audit[*]"));
    setObjectName(QStringLiteral("foldline_main"));
    setAcceptDrops(true);
    model_ = new FindingsModel(this);
    steps_ = new StepBar({tr("Source"), tr("Question"), tr("Scan"), tr("Findings"), tr("Diagram"), tr("Memo")});
    stack_ = new QStackedWidget;
    source_ = new SourcePage;
    question_ = new QuestionPage;
    scan_ = new ScanPage(model_);
    findings_ = new FindingsPage(model_);
    diagram_ = new DiagramPage;
    memo_ = new MemoPage(model_);
    for (QWidget* w : std::initializer_list<QWidget*>{source_, question_, scan_, findings_, diagram_, memo_}) stack_->addWidget(w);

    auto* central = new QWidget;
    auto* lay = new QVBoxLayout(central);
    lay->setContentsMargins(6, 0, 6, 6);
    lay->setSpacing(2);
    lay->addWidget(steps_);
    lay->addWidget(stack_, 1);
    setCentralWidget(central);
    connect(steps_, &StepBar::step_requested, this, &MainWindow::go_to);

    connect(source_, &SourcePage::table_loaded, this, [this](std::shared_ptr<const Table> t, const QString& src) {
        // Reading the same file again (another column type, count column or missing markers) is
        // not new data; anything else starts the question afresh.
        const bool typed = t && source_->kind() == SourceKind::TypedIn;
        const bool new_data = !t || typed || src != last_source_;
        last_source_ = t ? src : QString();
        question_->set_table(t, new_data);
        if (typed) {
            // A typed-in table names its own question: the groups and outcome as typed.
            const CountsGrid* g = source_->counts_grid();
            question_->propose_groups(g->outcome_name(), g->positive_label(), g->group_column_name(), g->focal_name(),
                                      g->reference_name());
        }
        model_->clear();
        seeded_row_ = -1;
        for (int s = Scan; s < StepCount; ++s) steps_->set_state(s, StepBar::State::Locked);
        steps_->set_state(Source, t ? StepBar::State::Done : StepBar::State::Open);
        steps_->set_state(Question, t ? StepBar::State::Open : StepBar::State::Locked);
        statusBar()->showMessage(t ? tr("Loaded %1").arg(src) : QString(), 5000);
        setWindowTitle(t ? tr("Foldline — %1[*]").arg(QFileInfo(src).fileName()) : tr("Foldline[*]"));
        // A loaded file stays on the Source step so its columns can be reviewed (Next or Ctrl+2
        // moves on); typed-in counts were reviewed as they were typed, and an opened audit
        // goes on to its scan.
        if (typed || (t && pending_)) go_to(Question);
        if (t && pending_ && !pending_->scanned) restore_pending();
    });
    connect(source_, &SourcePage::recent_files_changed, this, &MainWindow::rebuild_recent_menu);
    connect(source_, &SourcePage::next_requested, this, [this] { go_to(Question); });
    connect(question_, &QuestionPage::scan_requested, this, [this] { start_scan(); });
    connect(scan_, &ScanPage::scan_finished, this, [this](bool completed, int n) {
        steps_->set_state(Scan, completed ? StepBar::State::Done : StepBar::State::Open);
        steps_->set_state(Findings, n > 0 ? StepBar::State::Open : StepBar::State::Locked);
        // A stopped scan's findings are provisional: the list says so, and the Diagram and Memo
        // steps (which read q-values, stability and the whole ranking) wait for a finished scan.
        steps_->set_state(Memo, completed ? StepBar::State::Open : StepBar::State::Locked);
        if (!completed) steps_->set_state(Diagram, StepBar::State::Locked);
        findings_->set_partial_note(
            completed ? QString()
                      : tr("the scan was stopped, so these %n finding(s) are provisional (no q-values over the whole scan, "
                           "no stability). The Diagram and Memo steps need a finished scan: press Scan (F5) again.",
                           nullptr, n));
        action("action_stop")->setEnabled(false);
        statusBar()->showMessage(scan_->status(), 8000);
        // A trend audit asked to look for hidden groups: core's note, shown as a hint.
        findings_->set_hidden_group_hint(completed ? hidden_group_note(scan_->scan_result().get()) : QString());
        if (completed && n > 0 && step() == Scan) {
            go_to(Findings);
            findings_->select_top();
        }
        if (pending_ && pending_->scanned) restore_pending();
    });
    connect(findings_, &FindingsPage::finding_selected, this, [this](int row) {
        steps_->set_state(Diagram, row >= 0 && findings_->partial_note().isEmpty() ? StepBar::State::Open
                                                                                     : StepBar::State::Locked);
    });
    connect(memo_, &MemoPage::export_requested, this, &MainWindow::export_memo_dialog);
    connect(model_, &FindingsModel::dataChanged, this, [this] { if (step() == Memo) refresh_memo(); });

    // The diagram step's verdict and the estimate it points to come from core/audit, computed
    // on the scan's findings with the audit's settings, as `foldline run` computes them.
    diagram_->doc()->set_judge([this](const causal::Diagram& d, const QString& exposure, const QString& outcome,
                                      const QStringList& strata) {
        // The rows the scan read (a rows filter applied), else the source's before any scan.
        const Table* rows = scan_->scanned_table() ? scan_->scanned_table().get() : source_->table().get();
        return judge(d, exposure, outcome, strata, scan_->scan_result().get(), rows, last_spec_);
    });
    build_menus();
    restore_layout();

    // Autosave: every edit of the audit marks it changed; the write happens within the interval.
    autosave_ = new Autosave([this]() -> std::optional<project::Project> {
        auto p = current_project();
        if (!p) return std::nullopt;
        recovery_lacks_digest_ = !p->data.database && p->data.sha256.empty();
        return std::move(*p);
    }, this);
    // The data file's digest: hashed on a worker when a file is loaded (start_digest).
    digest_job_ = new Job(this);
    connect(digest_job_, &Job::finished, this, &MainWindow::digest_finished);
    prompt_ = [this](const RecoveryOffer& offer) { return ask_recovery(this, offer); };
    connect(model_, &FindingsModel::dataChanged, autosave_, &Autosave::mark_changed);
    connect(question_, &QuestionPage::changed, autosave_, &Autosave::mark_changed);
    connect(scan_, &ScanPage::scan_finished, autosave_, &Autosave::mark_changed);
    connect(diagram_->doc(), &DiagramDoc::structure_changed, autosave_, &Autosave::mark_changed);
    connect(diagram_->undo_stack(), &QUndoStack::indexChanged, autosave_, &Autosave::mark_changed);
    // The same edits make the audit unsaved until a save writes them (the title shows a mark).
    // Opening a saved audit replays them; restore_pending clears the mark when it is done. A scan
    // finishing is no edit of its own (its question's changes already count).
    const auto edited = [this] { set_unsaved(true); };
    connect(model_, &FindingsModel::dataChanged, this, edited);
    connect(question_, &QuestionPage::changed, this, edited);
    connect(diagram_->doc(), &DiagramDoc::structure_changed, this, edited);
    connect(diagram_->undo_stack(), &QUndoStack::indexChanged, this, edited);
    connect(memo_, &MemoPage::detail_changed, this, [this] {
        set_unsaved(true);
        autosave_->mark_changed();
        if (step() == Memo) refresh_memo();
    });
    connect(source_, &SourcePage::table_loaded, this, [this](std::shared_ptr<const Table> t, const QString&) {
        if (t && !pending_) {
            // New data outside a project: a new audit, unsaved.
            base_.reset();
            memo_->set_detail({});
            project_path_.clear();
            autosave_->set_project_file({});
        }
        autosave_->mark_changed();
        if (t) start_digest();
    });
    connect(autosave_, &Autosave::written, this, [this] {
        statusBar()->showMessage(tr("Unsaved changes kept for recovery"), 3000);
    });
    connect(autosave_, &Autosave::failed, this, [this](const QString& reason) {
        statusBar()->showMessage(tr("Autosave failed: %1. Save the audit to keep your changes.").arg(reason), 15000);
    });
    go_to(Source);
}

MainWindow::~MainWindow() = default;

int MainWindow::step() const { return stack_->currentIndex(); }

void MainWindow::go_to(int s) {
    if (s < 0 || s >= StepCount) return;
    if (s == Diagram) {
        if (findings_->selected() < 0) {
            if (findings_->select_top() < 0) return;
        }
        seed_diagram_for(findings_->selected());
    }
    if (s == Memo) refresh_memo();
    if (undo_group_)
        undo_group_->setActiveStack(s == Question   ? question_->undo_stack()
                                    : s == Findings ? findings_->undo_stack()
                                                    : diagram_->undo_stack());
    stack_->setCurrentIndex(s);
    steps_->set_current(s);
    for (int i = 0; i < StepCount; ++i)
        if (QAction* a = action(QStringLiteral("action_step_%1").arg(i))) a->setChecked(i == s);
}

/// The key a finding's review is saved under in the project file.
static project::FindingKey finding_key(const FindingView& f, const std::vector<std::string>& strata) {
    const std::string a = f.focal.toStdString(), b = f.reference.toStdString();
    if (f.mean) return project::mean_key(strata, f.outcome.toStdString(), a, b);
    return f.slope ? project::slope_key(strata, a, b) : project::rate_key(strata, a, b);
}

/// The finding as the Diagram step names it: "Reversal: product (B vs A)".
static QString finding_words(const FindingView& f) {
    QString cls = QString::fromUtf8(to_string(f.cls).data());
    if (!cls.isEmpty()) cls[0] = cls[0].toUpper();
    const QString strata = f.strata.join(QStringLiteral(" × "));
    return f.slope ? QObject::tr("%1: %2 (%3 on %4)").arg(cls, strata, f.reference, f.focal)
                   : QObject::tr("%1: %2 (%3 vs %4)").arg(cls, strata, f.focal, f.reference);
}

void MainWindow::seed_diagram_for(int row) {
    const FindingView* f = model_->at(row);
    if (!f || row == seeded_row_) return;
    const bool first = seeded_row_ < 0;
    seeded_row_ = row;
    diagram_->set_finding(finding_words(*f));
    if (!first) {
        // The audit has one diagram: choosing another finding changes which finding the verdict
        // is read for, never what the reviewer drew (nor the undo history).
        diagram_->doc()->set_strata(f->strata);
        return;
    }
    QStringList columns;
    // The rows the scan read: they hold the combined groups column when the groups combine columns.
    if (const Table* t = scan_->scanned_table() ? scan_->scanned_table().get() : source_->table().get())
        for (const Column& c : t->columns) columns << QString::fromStdString(c.name);
    diagram_->seed(last_question_.exposure, last_question_.outcome, f->strata, columns);
    // The diagram's claims are tested on the rows the scan read, as the verdicts are.
    // Cut and judged with the audit's scan settings, as audit::estimate_settings gives them.
    diagram_->checks_panel()->set_rows(scan_->scanned_table() ? scan_->scanned_table() : source_->table(),
                                       last_spec_.scan.bins, static_cast<std::size_t>(last_spec_.scan.max_levels),
                                       last_spec_.scan.alpha);
}

void MainWindow::refresh_memo() {
    memo_->refresh(source_->source(), last_question_.outcome.isEmpty() ? nullptr : &last_question_);
    memo_->set_page_preview(memo_preview_image(kMemoPreviewWidth));
}

bool MainWindow::start_scan() {
    if (!source_->table() || !question_->problems().isEmpty()) {
        go_to(Question);
        return false;
    }
    last_question_ = question_->spec();
    last_spec_ = audit_spec(last_question_, base_ ? static_cast<const project::AuditSpec&>(*base_) : project::AuditSpec{});
    seeded_row_ = -1;
    if (!scan_->start(source_->table(), last_question_, last_spec_)) return false;
    findings_->set_hidden_group_hint({});
    findings_->set_partial_note({});
    {
        // Exported charts carry the data set, the groups and the question in their heading.
        const QuestionSpec& q = last_question_;
        const QString data = source_->kind() == SourceKind::File ? QFileInfo(source_->source()).fileName() : source_->source();
        findings_->set_export_context(
            audit_name(), q.slope  ? tr("%1 — trend of %2 on %3").arg(data, q.outcome, q.exposure)
                          : q.mean ? tr("%1 — mean %2, %3 against %4 (%5)").arg(data, q.outcome, q.focal, q.reference, q.exposure)
                                   : tr("%1 — %2 = %3, %4 against %5 (%6)")
                                        .arg(data, q.outcome, q.positive, q.focal, q.reference, q.exposure));
    }
    action("action_stop")->setEnabled(true);
    steps_->set_state(Question, StepBar::State::Done);
    steps_->set_state(Scan, StepBar::State::Open);
    steps_->set_state(Findings, StepBar::State::Open);
    go_to(Scan);
    return true;
}

QAction* MainWindow::make_action(const QString& name, const QString& text, const QKeySequence& key, const QString& tip) {
    auto* a = new QAction(text, this);
    a->setObjectName(name);
    if (!key.isEmpty()) a->setShortcut(key);
    a->setToolTip(tip);
    a->setStatusTip(tip);
    actions_.insert(name, a);
    addAction(a);
    return a;
}

void MainWindow::build_menus() {
    QMenu* file = menuBar()->addMenu(tr("&File"));
    connect(add(file, make_action("action_open", tr("&Open data file…"), QKeySequence::Open,
                                        tr("Open a CSV or TSV file"))),
            &QAction::triggered, this, [this] {
                go_to(Source);
                source_->open_dialog();
            });
    connect(add(file, make_action("action_type_counts", tr("&Type in counts…"), QKeySequence(tr("Ctrl+T")),
                                        tr("Enter a table of counts by stratum and group"))),
            &QAction::triggered, this, [this] {
                go_to(Source);
                source_->show_counts_grid();
            });
    recent_menu_ = file->addMenu(tr("Open &recent"));
    file->addSeparator();
    connect(add(file, make_action("action_open_project", tr("Open au&dit…"), QKeySequence(tr("Ctrl+Shift+A")),
                                  tr("Open a saved audit (NAME.foldline): data, question, diagram, decisions"))),
            &QAction::triggered, this, &MainWindow::open_project_dialog);
    connect(add(file, make_action("action_save", tr("&Save audit"), QKeySequence::Save,
                                  tr("Save the audit to its file (asks for a name the first time)"))),
            &QAction::triggered, this, &MainWindow::save_project_now);
    connect(add(file, make_action("action_save_project", tr("Save audit &as…"), QKeySequence(tr("Ctrl+Alt+S")),
                                  tr("Save the audit as NAME.foldline (no data rows are stored)"))),
            &QAction::triggered, this, &MainWindow::save_project_dialog);
    connect(add(file, make_action("action_export_memo", tr("Save memo as &PDF…"), QKeySequence(tr("Ctrl+E")),
                                  tr("Write the audit memo as a PDF"))),
            &QAction::triggered, this, &MainWindow::export_memo_dialog);
    rebuild_recent_menu();
    file->addSeparator();
    connect(add(file, make_action("action_quit", tr("&Quit"), QKeySequence::Quit, tr("Close the workbench"))),
            &QAction::triggered, this, &QWidget::close);

    QMenu* edit = menuBar()->addMenu(tr("&Edit"));
    // One Undo for the step on screen: the Question step's combined groups, the Findings step's
    // decisions, else the diagram.
    undo_group_ = new QUndoGroup(this);
    undo_group_->addStack(question_->undo_stack());
    undo_group_->addStack(findings_->undo_stack());
    undo_group_->addStack(diagram_->undo_stack());
    undo_group_->setActiveStack(diagram_->undo_stack());
    QAction* undo = undo_group_->createUndoAction(this, tr("&Undo"));
    undo->setShortcut(QKeySequence::Undo);
    undo->setObjectName("action_undo");
    actions_.insert("action_undo", undo);
    QAction* redo = undo_group_->createRedoAction(this, tr("&Redo"));
    redo->setShortcuts({QKeySequence(tr("Ctrl+Shift+Z")), QKeySequence(tr("Ctrl+Y"))});
    redo->setObjectName("action_redo");
    actions_.insert("action_redo", redo);
    edit->addAction(undo);
    edit->addAction(redo);
    edit->addSeparator();
    connect(add(edit, make_action("action_copy_table", tr("&Copy table as TSV"), QKeySequence(tr("Ctrl+Shift+C")),
                                        tr("Copy the finding's table as tab-separated text"))),
            &QAction::triggered, findings_, &FindingsPage::copy_table);
    connect(add(edit, make_action("action_paste_counts", tr("&Paste counts"), QKeySequence(tr("Ctrl+Shift+V")),
                                        tr("Paste tab-separated counts into the typed-in table"))),
            &QAction::triggered, this, [this] {
                go_to(Source);
                source_->show_counts_grid();
                source_->counts_grid()->paste_from_clipboard();
            });
    connect(add(edit, make_action("action_find", tr("&Find finding…"), QKeySequence::Find,
                                        tr("Search the findings by stratifier"))),
            &QAction::triggered, this, [this] {
                go_to(Findings);
                if (auto* s = findings_->findChild<QWidget*>(QStringLiteral("search_findings"))) s->setFocus();
            });

    QMenu* go = menuBar()->addMenu(tr("&Go"));
    auto* group = new QActionGroup(this);
    const QStringList names = {tr("&Source"), tr("&Question"), tr("S&can"), tr("&Findings"), tr("&Diagram"), tr("&Memo")};
    for (int i = 0; i < StepCount; ++i) {
        QAction* a = make_action(QStringLiteral("action_step_%1").arg(i), names[i],
                                 QKeySequence(QStringLiteral("Ctrl+%1").arg(i + 1)), tr("Go to step %1").arg(i + 1));
        a->setCheckable(true);
        group->addAction(a);
        go->addAction(a);
        connect(a, &QAction::triggered, this, [this, i] {
            if (steps_->state(i) != StepBar::State::Locked || i == step()) go_to(i);
            else if ((i == Diagram || i == Memo) && !findings_->partial_note().isEmpty())
                statusBar()->showMessage(tr("The Diagram and Memo steps need a finished scan; the last one was stopped. "
                                            "Press Scan (F5) to run it again."), 8000);
            else statusBar()->showMessage(tr("That step opens once the earlier steps are done."), 4000);
        });
    }
    go->addSeparator();
    connect(add(go, make_action("action_next", tr("&Next step"), QKeySequence(tr("Ctrl+PgDown")), tr("Go to the next step"))),
            &QAction::triggered, this, [this] {
                if (step() + 1 < StepCount && steps_->state(step() + 1) != StepBar::State::Locked) go_to(step() + 1);
            });
    connect(add(go, make_action("action_previous", tr("&Previous step"), QKeySequence(tr("Ctrl+PgUp")),
                                      tr("Go to the previous step"))),
            &QAction::triggered, this, [this] { go_to(step() - 1); });

    QMenu* audit = menuBar()->addMenu(tr("&Audit"));
    connect(add(audit, make_action("action_scan", tr("&Scan"), QKeySequence(Qt::Key_F5), tr("Scan every candidate stratifier"))),
            &QAction::triggered, this, &MainWindow::start_scan);
    QAction* stop = make_action("action_stop", tr("S&top scan"), QKeySequence(Qt::Key_Escape), tr("Stop the running scan"));
    stop->setEnabled(false);
    audit->addAction(stop);
    connect(stop, &QAction::triggered, scan_, &ScanPage::cancel);
    audit->addSeparator();
    const std::tuple<const char*, QString, QKeySequence, Decision> decisions[] = {
        {"action_upheld", tr("Mark &upheld"), QKeySequence(tr("Ctrl+Shift+U")), Decision::Upheld},
        {"action_set_aside", tr("Mark set &aside"), QKeySequence(tr("Ctrl+Shift+X")), Decision::SetAside},
        {"action_follow_up", tr("Mark &follow up"), QKeySequence(tr("Ctrl+Shift+F")), Decision::FollowUp}};
    for (const auto& [name, text, key, d] : decisions)
        connect(add(audit, make_action(name, text, key, tr("Record the decision on the selected finding"))),
                &QAction::triggered, this, [this, d = d] { findings_->decide(d); });
    {
        QAction* a = findings_->apply_family_action();
        actions_.insert(a->objectName(), a);
        addAction(a);
        audit->addAction(a);
    }
    audit->addSeparator();
    connect(add(audit, make_action("action_save_chart", tr("Save &chart…"), QKeySequence(tr("Ctrl+Shift+S")),
                                         tr("Save the visible chart as PNG, SVG or PDF"))),
            &QAction::triggered, findings_, &FindingsPage::save_chart);

    QMenu* diagram = menuBar()->addMenu(tr("&Diagram"));
    connect(add(diagram, make_action("action_open_diagram", tr("&Open diagram…"), QKeySequence(tr("Ctrl+Shift+O")),
                                     tr("Read a diagram file (NAME.diagram.json) into the editor"))),
            &QAction::triggered, this, [this] {
                go_to(Diagram);
                diagram_->open_dialog();
            });
    connect(add(diagram, make_action("action_save_diagram", tr("&Save diagram as…"), QKeySequence(tr("Ctrl+Shift+D")),
                                     tr("Write the diagram as NAME.diagram.json"))),
            &QAction::triggered, diagram_, &DiagramPage::save_dialog);
    connect(add(diagram, make_action("action_export_dot", tr("Export as &DOT…"), QKeySequence(tr("Ctrl+Alt+D")),
                                     tr("Write the diagram in Graphviz DOT for other drawing tools"))),
            &QAction::triggered, diagram_, &DiagramPage::export_dot_dialog);
    diagram->addSeparator();
    QAction* draw = make_action("action_draw_arrows", tr("&Draw arrows"), QKeySequence(tr("Ctrl+D")),
                                tr("Drag from node to node to draw an arrow"));
    draw->setCheckable(true);
    diagram->addAction(draw);
    connect(draw, &QAction::toggled, diagram_, &DiagramPage::set_connect_mode);
    connect(add(diagram, make_action("action_add_unobserved", tr("Add &unobserved node…"), QKeySequence(tr("Ctrl+Shift+N")),
                                           tr("Declare a variable the data does not hold"))),
            &QAction::triggered, this, [this] {
                go_to(Diagram);
                if (auto* e = diagram_->findChild<QLineEdit*>()) e->setFocus();
            });
    QAction* del = make_action("action_delete", tr("De&lete selection"), QKeySequence::Delete, tr("Delete the selected nodes and arrows"));
    del->setShortcutContext(Qt::WidgetWithChildrenShortcut);
    diagram_->view()->addAction(del);
    diagram->addAction(del);
    connect(del, &QAction::triggered, diagram_, &DiagramPage::delete_selected);
    connect(add(diagram, make_action("action_tidy", tr("&Tidy layout"), QKeySequence(tr("Ctrl+L")),
                                           tr("Arrange the nodes along the arrows"))),
            &QAction::triggered, diagram_, &DiagramPage::auto_layout);

    QMenu* view = menuBar()->addMenu(tr("&View"));
    connect(add(view, make_action("action_reset_layout", tr("&Reset layout"), {}, tr("Restore the default panel sizes"))),
            &QAction::triggered, this, [this] {
                QSettings().remove("layout");
                for (QSplitter* s : findChildren<QSplitter*>()) {
                    QList<int> even(s->count(), 1000);
                    s->setSizes(even);
                }
            });

    QMenu* help = menuBar()->addMenu(tr("&Help"));
    connect(add(help, make_action("action_reading", tr("&Reading a finding"), QKeySequence::HelpContents,
                                        tr("What the classes and numbers mean"))),
            &QAction::triggered, this, [this] {
                QString text = tr("<p>Foldline compares a rate between two groups, first pooled and then within strata of "
                                  "each candidate column. Each comparison gets one class:</p><ul>");
                for (FindingClass c : {FindingClass::Reversal, FindingClass::Explained, FindingClass::Masked,
                                       FindingClass::Heterogeneous, FindingClass::Stable})
                    text += QStringLiteral("<li><b>%1 %2</b>: %3</li>").arg(class_glyph(c), class_title(c), class_meaning(c));
                text += tr("</ul><p>Which view to quote depends on how the columns cause one another: draw it in the "
                           "Diagram step.</p><p><i>%1</i></p>").arg(caution_text());
                QMessageBox::information(this, tr("Reading a finding"), text);
            });
    connect(add(help, make_action("action_about", tr("&About Foldline"), {}, tr("Version and purpose"))),
            &QAction::triggered, this, [this] {
                QMessageBox::about(this, tr("About Foldline"),
                                   tr("<b>Foldline</b> %1<p>Audits tables for pooled-versus-stratified reversals of rates "
                                      "and slopes, and uses a causal diagram to decide which view answers the question.</p>"
                                      "<p>%2</p>").arg(QApplication::applicationVersion(), caution_text()));
            });
}

Status MainWindow::with_memo_request(const std::function<void(const MemoRequest&)>& use) const {
    MemoRequest r;
    r.scan = scan_->scan_result();
    if (!r.scan) return make_error("the memo needs a finished scan: run one first");
    r.data_path = source_->source();
    const std::shared_ptr<const Table> table = source_->table();
    r.rows = table ? double(table->rows) : 0;  // rows read; the scan records the rows its filter kept
    r.table = scan_->scanned_table() ? scan_->scanned_table().get() : table.get();
    // The audit as it would be saved, so the memo carries the same title, analyst, decisions,
    // notes, memo choices and diagram as `foldline memo` on the saved file.
    auto project = current_project();
    // A diagram whose arrows nobody has drawn or confirmed claims nothing: the memo gives no
    // verdict from it.
    const bool diagram_claims = seeded_row_ >= 0 && diagram_->doc()->confirmed();
    if (project && !diagram_claims && seeded_row_ >= 0) {
        project->diagrams.clear();
        project->active_diagram.clear();
    }
    if (project) r.project = &*project;
    r.reviewed = model_->findings();
    if (diagram_claims) r.diagram = &diagram_->doc()->diagram();
    r.draft_diagram = seeded_row_ >= 0 && !diagram_claims && !diagram_->doc()->diagram().nodes.empty();
    // The drawn diagram's checks come from the Diagram step's worker (empty while it runs).
    if (diagram_claims) r.diagram_checks = diagram_->checks_panel()->checks().value_or(causal::DiagramChecks{});
    r.title = tr("Audit of %1").arg(QFileInfo(source_->source()).fileName());
    r.data_change = data_change_;
    if ((r.database = source_->database_record()))
        r.title = tr("Audit of %1").arg(QString::fromStdString(r.database->table.empty() ? r.database->database
                                                                                         : r.database->table));
    use(r);
    return Ok{};
}

Status MainWindow::export_memo_to(const QString& path) {
    // The memo's facts carry the data file's digest: wait for the worker's, as a save does.
    if (auto st = wait_for_data_digest(); !st) {
        Error e = st.error();
        e.message = "cannot record the data file's digest: " + e.message + " (" + e.file + ")";
        e.file = path.toStdString();
        return e;
    }
    Status written = Ok{};
    if (auto st = with_memo_request([&](const MemoRequest& r) { written = export_memo(r, path); }); !st) {
        Error e = st.error();
        e.file = path.toStdString();
        return e;
    }
    return written;
}

QImage MainWindow::memo_preview_image(int width_px) const {
    QImage page;
    (void)with_memo_request([&](const MemoRequest& r) { page = memo_preview(r, width_px); });
    return page;
}

void MainWindow::export_memo_dialog() {
    if (!scan_->scan_result()) {
        QMessageBox::information(this, tr("Memo"), tr("The PDF memo needs a finished scan: run one first."));
        return;
    }
    QSettings s;
    QString path = QFileDialog::getSaveFileName(
        this, tr("Save memo"), QDir(s.value("memo/last_dir").toString()).filePath(audit_name() + tr("-memo.pdf")),
        tr("PDF document (*.pdf)"));
    if (path.isEmpty()) return;
    if (!path.endsWith(QLatin1String(".pdf"), Qt::CaseInsensitive)) path += QStringLiteral(".pdf");
    s.setValue("memo/last_dir", QFileInfo(path).absolutePath());
    const Status st = export_memo_to(path);
    if (!st) QMessageBox::warning(this, tr("Memo"), QString::fromStdString(st.error().to_string()));
    else statusBar()->showMessage(tr("Memo written to %1").arg(path), 8000);
}

Result<project::Project> MainWindow::current_project() const {
    if (source_->kind() != SourceKind::File && source_->kind() != SourceKind::Database)
        return make_error("open a data file first: a project records the file, never the rows");
    // Start from the opened project, so what the workbench does not edit (memo settings, other
    // diagrams, trend checks, memo choices) survives a save.
    project::Project p = base_ ? *base_ : project::Project{};
    const std::string data = source_->source().toStdString();
    p.data = project::DataSource{};
    if ((p.data.database = source_->database_record())) {
        // A database source: its record (masked connection, table or query, rows, query time)
        // stands in for the file's path, size and digest.
    } else {
        p.data.path = data;
        const QFileInfo info(source_->source());
        p.data.size = std::uint64_t(info.size());
        // The digest as the worker computed it for this version of the file; empty until then
        // (save_project_to and the memo wait for it; autosave writes again when it arrives).
        p.data.sha256 = data_digest().value_or(std::string());
    }
    p.data.rows = source_->table()->rows;
    for (const Column& c : source_->table()->columns) p.data.columns.push_back(c.name);
    const LoadOptions o = source_->options();
    p.data.count_column = o.count_column.toStdString();
    if (!o.missing_markers.isEmpty()) {
        p.data.missing_markers.clear();
        for (const QString& m : o.missing_markers) p.data.missing_markers.push_back(m.toStdString());
    }
    p.data.type_overrides = o.type_overrides;
    p.data.sheet = o.sheet.toStdString();
    p.data.decimal = o.decimal;
    const QuestionSpec q = last_question_.outcome.isEmpty() ? question_->spec() : last_question_;
    static_cast<project::AuditSpec&>(p) = audit_spec(q, p);
    p.memo.detail = memo_->detail().toStdString();
    // The diagram is the audit's once the reviewer confirmed it or changed anything in it (an
    // untouched starting diagram is not saved: it holds nothing the reviewer drew).
    if (seeded_row_ >= 0 && (diagram_->doc()->confirmed() || diagram_->undo_stack()->count() > 0)) {
        const std::string name = !p.active_diagram.empty() ? p.active_diagram
                                 : p.diagrams.empty()      ? std::string("as drawn")
                                                           : p.diagrams.front().name;
        bool replaced = false;
        for (auto& d : p.diagrams)
            if (d.name == name && !replaced) {
                d.diagram = diagram_->doc()->diagram();
                replaced = true;
            }
        if (!replaced) p.diagrams.push_back({name, diagram_->doc()->diagram()});
    }
    // Every finding's class (so `foldline run` can tell what changed) and the reviewer's
    // decision and note; reviews of findings this scan did not produce are kept.
    for (const FindingView& f : model_->findings()) {
        std::vector<std::string> strata;
        for (const QString& s : f.strata) strata.push_back(s.toStdString());
        const project::FindingKey key = finding_key(f, strata);
        project::FindingReview& r = p.review_for(key);
        r.saved_class = f.cls;
        r.decision = f.decision;
        r.note = f.note.toStdString();
        r.applied_from = f.applied_from.toStdString();
    }
    return p;
}

std::optional<std::string> MainWindow::data_digest() const {
    if (source_->kind() != SourceKind::File) return std::nullopt;
    const QFileInfo info(source_->source());
    if (digest_.sha256.empty() || digest_.path != source_->source() || digest_.size != info.size() ||
        digest_.modified != info.lastModified())
        return std::nullopt;
    return digest_.sha256;
}

void MainWindow::start_digest() {
    if (source_->kind() != SourceKind::File || data_digest()) return;
    if (digest_job_->running()) {
        digest_again_ = true;  // hashing an older file or version: this one follows
        return;
    }
    const QFileInfo info(source_->source());
    auto run = std::make_shared<DigestRun>();
    run->of = {source_->source(), info.size(), info.lastModified(), {}};
    digest_run_ = run;
    digest_error_.reset();
    const std::string path = source_->source().toStdString();
    digest_job_->start([run, path](const Work&) { run->sha256 = sha256_file(path); });
}

void MainWindow::digest_finished() {
    auto run = std::move(digest_run_);
    if (run && run->sha256) {
        if (run->sha256->ok()) {
            digest_ = run->of;
            digest_.sha256 = run->sha256->value();
        } else if (run->of.path == source_->source()) {
            digest_error_ = run->sha256->error();
        }
    }
    if (digest_again_ || (!data_digest() && !digest_error_)) {
        // The file changed (or another was loaded) while it was hashed: hash what is there now.
        digest_again_ = false;
        start_digest();
        if (digest_job_->running()) return;
    }
    check_data_change();
    if (data_digest() && recovery_lacks_digest_) autosave_->mark_changed();
    emit data_digest_done();
}

Status MainWindow::wait_for_data_digest() {
    if (source_->kind() != SourceKind::File || data_digest()) return Ok{};
    start_digest();
    if (digest_job_->running()) {
        statusBar()->showMessage(tr("Computing the data file's digest…"));
        QEventLoop loop;
        connect(this, &MainWindow::data_digest_done, &loop, &QEventLoop::quit);
        while (digest_job_->running() || (!data_digest() && !digest_error_ && digest_run_))
            loop.exec(QEventLoop::ExcludeUserInputEvents);
        statusBar()->clearMessage();
    }
    if (auto h = data_digest(); h) return Ok{};
    if (digest_error_) return *digest_error_;
    return make_error("the data file's digest could not be computed", source_->source().toStdString());
}

void MainWindow::check_data_change() {
    if (!saved_data_ || saved_data_->database || !source_->table()) return;
    if (source_->kind() != SourceKind::File || source_->source() != QString::fromStdString(saved_data_->path)) return;
    const auto h = data_digest();
    if (!h) return;  // the worker is still hashing; digest_finished calls again
    const auto change = project::compare_data(*saved_data_, *h, std::uint64_t(QFileInfo(source_->source()).size()),
                                              source_->table().get());
    saved_data_.reset();
    if (change.changed) {
        data_change_ = QString::fromStdString(change.message);
        statusBar()->showMessage(tr("Warning: %1.").arg(data_change_), 15000);
    }
}

Status MainWindow::save_project_to(const QString& path) {
    if (auto st = wait_for_data_digest(); !st) {
        Error e = st.error();
        e.message = "cannot record the data file's digest: " + e.message + " (" + e.file + ")";
        e.file = path.toStdString();
        return e;
    }
    auto p = current_project();
    if (!p) {
        Error e = p.error();
        e.file = path.toStdString();
        return e;
    }
    if (auto st = project::save_project(*p, path.toStdString()); !st) return st;
    base_ = std::move(*p);
    project_path_ = path;
    autosave_->set_project_file(path);
    autosave_->discard();  // saved cleanly: nothing left to recover
    set_unsaved(false);
    add_recent_audit(path);
    return Ok{};
}

Status MainWindow::open_project(const QString& path) {
    auto p = project::load_project(path.toStdString());
    if (!p) return p.error();
    open_project_document(*p, path);
    add_recent_audit(path);
    return Ok{};
}

void MainWindow::open_project_document(const project::Project& project, const QString& path) {
    pending_ = std::make_shared<PendingProject>();
    pending_->project = project;
    pending_->path = path;
    base_ = project;
    memo_->set_detail(QString::fromStdString(project.memo.detail));
    project_path_ = path;
    data_change_.clear();
    saved_data_ = project.data;
    autosave_->set_project_file(path);
    const project::DataSource& d = pending_->project.data;
    LoadOptions o;
    o.count_column = QString::fromStdString(d.count_column);
    for (const auto& m : d.missing_markers) o.missing_markers << QString::fromStdString(m);
    o.type_overrides = d.type_overrides;
    o.sheet = QString::fromStdString(d.sheet);
    o.decimal = d.decimal;
    go_to(Source);
    source_->open_path(QString::fromStdString(d.path), o);
}

std::optional<RecoveryChoice> MainWindow::check_recovery() {
    auto offer = find_recovery(autosave_->folder(), autosave_->path());
    if (!offer) return std::nullopt;
    const RecoveryChoice c = prompt_ ? prompt_(*offer) : RecoveryChoice::Later;
    if (c == RecoveryChoice::Discard) {
        QFile::remove(offer->path);
        statusBar()->showMessage(tr("Discarded the kept copy of the unsaved audit"), 8000);
    } else if (c == RecoveryChoice::Restore) {
        // The copy becomes this session's recovery file before anything else happens, so a
        // failed or interrupted restore loses nothing.
        if (!autosave_->adopt(offer->path))
            statusBar()->showMessage(autosave_->last_error(), 8000);
        open_project_document(offer->project, offer->project_file);
        if (pending_) pending_->recovered = true;
        autosave_->mark_changed();
        statusBar()->showMessage(tr("Restoring the unsaved audit…"), 8000);
    }
    return c;
}

void MainWindow::restore_pending() {
    auto pending = pending_;
    const project::Project& p = pending->project;
    if (!pending->scanned) {
        // The data is in: ask the saved question. Whether the data changed since the save is
        // told when the worker has the file's digest (check_data_change), maybe already now.
        check_data_change();
        const QuestionSpec q = question_spec(p);
        question_->set_spec(q);
        pending->scanned = true;
        if (!start_scan()) pending_.reset();
        return;
    }
    pending_.reset();
    // Findings are back: restore decisions and notes by key, then the diagram.
    for (int i = 0; i < model_->size(); ++i) {
        const FindingView* f = model_->at(i);
        std::vector<std::string> strata;
        for (const QString& s : f->strata) strata.push_back(s.toStdString());
        const project::FindingKey key = finding_key(*f, strata);
        if (const project::FindingReview* r = p.review(key))
            model_->set_review(i, r->decision, QString::fromStdString(r->note), QString::fromStdString(r->applied_from));
    }
    // Re-select so the detail panel shows the restored decision.
    findings_->list()->selectionModel()->setCurrentIndex(QModelIndex(), QItemSelectionModel::Clear);
    findings_->select_top();
    QString diagram_problem;
    if (const causal::Diagram* d = p.diagram()) {
        seed_diagram_for(findings_->selected());
        if (auto st = diagram_->doc()->replace(*d); !st) diagram_problem = QString::fromStdString(st.error().message);
        diagram_->undo_stack()->clear();
    }
    QString done = pending->path.isEmpty() ? tr("Restored the unsaved audit") : tr("Opened %1").arg(pending->path);
    if (!diagram_problem.isEmpty()) done += tr(". The saved diagram was not restored: %1").arg(diagram_problem);
    if (!data_change_.isEmpty()) done += tr(". Warning: %1.").arg(data_change_);
    statusBar()->showMessage(done, data_change_.isEmpty() ? 8000 : 0);
    // Opening replayed the audit's own settings: nothing is unsaved, unless it came from a
    // recovery copy.
    set_unsaved(pending->recovered);
}

void MainWindow::set_unsaved(bool unsaved) {
    unsaved_ = unsaved;
    if (!project_path_.isEmpty()) setWindowTitle(tr("Foldline — %1[*]").arg(QFileInfo(project_path_).fileName()));
    setWindowModified(unsaved);
}

bool MainWindow::save_project_now() {
    if (project_path_.isEmpty()) {
        save_project_dialog();
        return !unsaved_;
    }
    const Status st = save_project_to(project_path_);
    if (!st) {
        QMessageBox::warning(this, tr("Save audit"), QString::fromStdString(st.error().to_string()));
        return false;
    }
    statusBar()->showMessage(tr("Saved %1").arg(project_path_), 8000);
    return true;
}

QString MainWindow::audit_name() const {
    // The audit's own file name when it has one, else the data file's, else a plain word.
    if (!project_path_.isEmpty()) return QFileInfo(project_path_).completeBaseName();
    if (source_->kind() == SourceKind::File) return QFileInfo(source_->source()).completeBaseName();
    return tr("audit");
}

void MainWindow::save_project_dialog() {
    QSettings s;
    const QString dir = project_path_.isEmpty() ? s.value("project/last_dir").toString() : QFileInfo(project_path_).absolutePath();
    QString path = QFileDialog::getSaveFileName(this, tr("Save audit"), QDir(dir).filePath(audit_name() + QStringLiteral(".foldline")),
                                                tr("Foldline audit (*.foldline)"));
    if (path.isEmpty()) return;
    if (!path.endsWith(QLatin1String(".foldline"))) path += QStringLiteral(".foldline");
    s.setValue("project/last_dir", QFileInfo(path).absolutePath());
    const Status st = save_project_to(path);
    if (!st) QMessageBox::warning(this, tr("Save audit"), QString::fromStdString(st.error().to_string()));
    else statusBar()->showMessage(tr("Saved %1").arg(path), 8000);
}

void MainWindow::open_project_dialog() {
    QSettings s;
    const QString path = QFileDialog::getOpenFileName(this, tr("Open audit"), s.value("project/last_dir").toString(),
                                                      tr("Foldline audit (*.foldline);;All files (*)"));
    if (path.isEmpty()) return;
    s.setValue("project/last_dir", QFileInfo(path).absolutePath());
    const Status st = open_project(path);
    if (!st) QMessageBox::warning(this, tr("Open audit"), QString::fromStdString(st.error().to_string()));
}

namespace {
constexpr const char* kRecentAudits = "recent/audits";
}  // namespace

QStringList MainWindow::recent_audits() const { return QSettings().value(kRecentAudits).toStringList(); }

void MainWindow::add_recent_audit(const QString& path) {
    const QString abs = QFileInfo(path).absoluteFilePath();
    QStringList recent = recent_audits();
    recent.removeAll(abs);
    recent.prepend(abs);
    while (recent.size() > 10) recent.removeLast();
    QSettings().setValue(kRecentAudits, recent);
    rebuild_recent_menu();
}

void MainWindow::rebuild_recent_menu() {
    if (!recent_menu_) return;
    recent_menu_->clear();
    // Audits opened or saved first (what a reviewer comes back to), then data files.
    const QStringList audits = recent_audits();
    for (const QString& r : audits)
        connect(recent_menu_->addAction(tr("Audit: %1  (%2)").arg(QFileInfo(r).fileName(), r)), &QAction::triggered, this,
                [this, r] {
                    const Status st = open_project(r);
                    if (!st) QMessageBox::warning(this, tr("Open audit"), QString::fromStdString(st.error().to_string()));
                });
    if (!audits.isEmpty()) recent_menu_->addSeparator();
    const QStringList recent = source_->recent_files();
    for (const QString& r : recent)
        connect(recent_menu_->addAction(QFileInfo(r).fileName() + QStringLiteral("  (") + r + QLatin1Char(')')),
                &QAction::triggered, this, [this, r] {
                    go_to(Source);
                    source_->open_path(r);
                });
    if (recent.isEmpty()) recent_menu_->addAction(tr("(none)"))->setEnabled(false);
    recent_menu_->addSeparator();
    connect(recent_menu_->addAction(tr("Clear list")), &QAction::triggered, this, [this] {
        QSettings().remove(kRecentAudits);
        source_->clear_recent_files();  // rebuilds the menu
    });
}

void MainWindow::save_layout() const {
    QSettings s;
    s.beginGroup("layout");
    s.setValue("geometry", saveGeometry());
    s.setValue("state", saveState());
    for (QSplitter* sp : findChildren<QSplitter*>())
        if (!sp->objectName().isEmpty()) s.setValue("splitter/" + sp->objectName(), sp->saveState());
    s.endGroup();
}

void MainWindow::restore_layout() {
    QSettings s;
    s.beginGroup("layout");
    if (!restoreGeometry(s.value("geometry").toByteArray())) resize(1360, 860);
    restoreState(s.value("state").toByteArray());
    for (QSplitter* sp : findChildren<QSplitter*>())
        if (!sp->objectName().isEmpty()) sp->restoreState(s.value("splitter/" + sp->objectName()).toByteArray());
    s.endGroup();
}

void MainWindow::closeEvent(QCloseEvent* e) {
    // Nothing a reviewer typed or drew is discarded without asking. Until they choose, the
    // recovery copy stays on disk; a process that dies here leaves it for the next start.
    if (unsaved_ && current_project()) {
        const CloseChoice c = close_prompt_ ? close_prompt_() : [this] {
            QMessageBox box(QMessageBox::Warning, tr("Close the audit"),
                            tr("The audit has changes that are not saved."), QMessageBox::NoButton, this);
            box.setInformativeText(tr("Save them to the audit file, discard them, or go back to the audit?"));
            box.setStandardButtons(QMessageBox::Save | QMessageBox::Discard | QMessageBox::Cancel);
            box.setDefaultButton(QMessageBox::Save);
            box.setEscapeButton(QMessageBox::Cancel);
            const int b = box.exec();
            return b == QMessageBox::Save ? CloseChoice::Save
                   : b == QMessageBox::Discard ? CloseChoice::Discard
                                               : CloseChoice::Cancel;
        }();
        if (c == CloseChoice::Cancel || (c == CloseChoice::Save && !save_project_now())) {
            e->ignore();
            return;
        }
    }
    save_layout();
    scan_->cancel();
    autosave_->discard();  // saved, chosen to discard, or nothing changed: nothing to recover
    QMainWindow::closeEvent(e);
}

void MainWindow::dragEnterEvent(QDragEnterEvent* e) {
    if (e->mimeData()->hasUrls() && !e->mimeData()->urls().isEmpty() && e->mimeData()->urls().first().isLocalFile())
        e->acceptProposedAction();
}

void MainWindow::dropEvent(QDropEvent* e) {
    const auto urls = e->mimeData()->urls();
    if (urls.isEmpty() || !urls.first().isLocalFile()) return;
    e->acceptProposedAction();
    open_file(urls.first().toLocalFile());
}

void MainWindow::open_file(const QString& path) {
    if (path.endsWith(QStringLiteral(".foldline"), Qt::CaseInsensitive)) {
        if (auto st = open_project(path); !st)
            QMessageBox::warning(this, tr("Open audit"), QString::fromStdString(st.error().to_string()));
        return;
    }
    go_to(Source);
    source_->open_path(path);
}

}  // namespace foldline::ui
