#include "ui/database_form.h"

#include <QComboBox>
#include <QFormLayout>
#include <QLabel>
#include <QLineEdit>
#include <QPlainTextEdit>
#include <QPushButton>
#include <QSettings>
#include <QVBoxLayout>

namespace foldline::ui {

namespace {
const char* kConnectionKey = "database/connection";
const char* kPasswordEnvKey = "database/password_env";
const char* kKindKey = "database/kind";
const char* kTableKey = "database/table";
const char* kQueryKey = "database/query";
}  // namespace

DatabaseForm::DatabaseForm(QWidget* parent) : QWidget(parent) {
    QSettings settings;
    connection_ = new QLineEdit(settings.value(kConnectionKey).toString());
    connection_->setObjectName(QStringLiteral("db_connection"));
    connection_->setPlaceholderText(tr("DSN=warehouse;  or  Driver=...;Server=...;Database=...;Uid=...;"));
    connection_->setToolTip(tr("ODBC connection string without the password (odbcinst -q -d lists the drivers installed)"));
    password_ = new QLineEdit;
    password_->setObjectName(QStringLiteral("db_password"));
    password_->setEchoMode(QLineEdit::Password);
    password_->setPlaceholderText(tr("typed here it is used once and never saved"));
    password_env_ = new QLineEdit(settings.value(kPasswordEnvKey).toString());
    password_env_->setObjectName(QStringLiteral("db_password_env"));
    password_env_->setPlaceholderText(tr("or the name of an environment variable, e.g. WAREHOUSE_PASSWORD"));
    kind_ = new QComboBox;
    kind_->setObjectName(QStringLiteral("db_kind"));
    kind_->addItem(tr("A table"), QStringLiteral("table"));
    kind_->addItem(tr("A read-only query"), QStringLiteral("query"));
    kind_->setCurrentIndex(settings.value(kKindKey).toString() == QLatin1String("query") ? 1 : 0);
    table_ = new QLineEdit(settings.value(kTableKey).toString());
    table_->setObjectName(QStringLiteral("db_table"));
    table_->setPlaceholderText(tr("schema.table"));
    query_ = new QPlainTextEdit(settings.value(kQueryKey).toString());
    query_->setObjectName(QStringLiteral("db_query"));
    query_->setPlaceholderText(tr("SELECT ... (one statement; it is only ever read from)"));
    count_ = new QPushButton(tr("Count in the database"));
    count_->setObjectName(QStringLiteral("db_count"));
    count_->setToolTip(tr("The counting runs inside the database; only the counts come back"));
    connect(count_, &QPushButton::clicked, this, &DatabaseForm::submit);
    connect(kind_, &QComboBox::currentIndexChanged, this, [this](int) { show_kind(); });
    problems_ = new QLabel;
    problems_->setObjectName(QStringLiteral("db_problems"));
    problems_->setWordWrap(true);
    problems_->hide();

    auto* form = new QFormLayout;
    form->addRow(tr("Connection"), connection_);
    form->addRow(tr("Password"), password_);
    form->addRow(tr("Password variable"), password_env_);
    form->addRow(tr("Source"), kind_);
    table_label_ = new QLabel(tr("Table"));
    query_label_ = new QLabel(tr("Query"));
    form->addRow(table_label_, table_);
    form->addRow(query_label_, query_);
    auto* lay = new QVBoxLayout(this);
    lay->addLayout(form);
    lay->addWidget(count_, 0, Qt::AlignLeft);
    lay->addWidget(problems_);
    lay->addStretch(1);
    show_kind();
    if (!database_available()) {
        count_->setEnabled(false);
        problems_->setText(tr("This build has no database support (it needs unixODBC)."));
        problems_->show();
    }
}

void DatabaseForm::show_kind() {
    const bool query = kind_->currentData().toString() == QLatin1String("query");
    table_->setVisible(!query);
    table_label_->setVisible(!query);
    query_->setVisible(query);
    query_label_->setVisible(query);
}

DatabaseRequest DatabaseForm::request() const {
    DatabaseRequest r;
    r.connection = connection_->text().trimmed();
    r.password = password_->text();
    r.password_env = password_env_->text().trimmed();
    if (kind_->currentData().toString() == QLatin1String("query")) r.query = query_->toPlainText().trimmed();
    else r.table = table_->text().trimmed();
    return r;
}

void DatabaseForm::set_busy(bool busy) { count_->setEnabled(!busy && database_available()); }

QString DatabaseForm::problems() const { return problems_->isHidden() ? QString() : problems_->text(); }

void DatabaseForm::submit() {
    const DatabaseRequest r = request();
    const QStringList problems = check_database_request(r);
    if (!problems.isEmpty()) {
        problems_->setText(problems.join(QLatin1Char('\n')));
        problems_->show();
        return;
    }
    problems_->hide();
    problems_->clear();
    // Only what holds no secret is remembered (a password never reaches the connection field:
    // check_database_request refuses one there).
    QSettings settings;
    settings.setValue(kConnectionKey, masked_connection(r.connection));
    settings.setValue(kPasswordEnvKey, r.password_env);
    settings.setValue(kKindKey, kind_->currentData().toString());
    settings.setValue(kTableKey, table_->text().trimmed());
    settings.setValue(kQueryKey, query_->toPlainText().trimmed());
    password_->clear();
    emit count_requested(r);
}

}  // namespace foldline::ui
