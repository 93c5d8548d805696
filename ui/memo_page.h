#pragma once
// Step 6, Memo: a readable preview of the audit so far — the data, the question, the findings
// with the reviewer's decisions and notes, and the caution.
#include <QWidget>

class QTextBrowser;

namespace foldline::ui {

class FindingsModel;
struct QuestionSpec;

class MemoPage : public QWidget {
    Q_OBJECT
public:
    MemoPage(FindingsModel* model, QWidget* parent = nullptr);
    /// Rebuilds the preview from the current source, question and findings.
    void refresh(const QString& source, const QuestionSpec* question);
    QString html() const;

signals:
    void export_requested();

private:
    FindingsModel* model_;
    QTextBrowser* text_;
};

}  // namespace foldline::ui
