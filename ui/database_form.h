#pragma once
// The "connect to a database" form of the Source step: a connection string, the password as an
// environment variable's name or typed into a masked field (never saved, cleared after each
// use), and a table or a read-only query. It checks the request (ui/engine.h) and asks the page
// to count; the page runs the query with progress and cancel. Only the connection string
// (without a password), the variable's name and the table or query are remembered.
#include "ui/engine.h"

#include <QWidget>

class QComboBox;
class QLabel;
class QLineEdit;
class QPlainTextEdit;
class QPushButton;

namespace foldline::ui {

class DatabaseForm : public QWidget {
    Q_OBJECT
public:
    explicit DatabaseForm(QWidget* parent = nullptr);

    /// The request the fields describe (the password included, for this call only).
    DatabaseRequest request() const;
    /// While a query runs the count button is disabled.
    void set_busy(bool busy);
    /// Problems shown for the last attempt; empty when it was sent.
    QString problems() const;

    QLineEdit* connection_field() const { return connection_; }
    QLineEdit* password_field() const { return password_; }
    QLineEdit* password_env_field() const { return password_env_; }
    QComboBox* kind_field() const { return kind_; }
    QLineEdit* table_field() const { return table_; }
    QPlainTextEdit* query_field() const { return query_; }
    QPushButton* count_button() const { return count_; }

signals:
    /// A checked request: the page counts it in the database.
    void count_requested(const foldline::ui::DatabaseRequest& request);

public slots:
    /// Checks the fields; on success remembers the non-secret ones, emits count_requested and
    /// clears the password field; otherwise lists the problems.
    void submit();

private:
    void show_kind();

    QLineEdit *connection_, *password_, *password_env_, *table_;
    QComboBox* kind_;
    QPlainTextEdit* query_;
    QPushButton* count_;
    QLabel *problems_, *table_label_, *query_label_;
};

}  // namespace foldline::ui
