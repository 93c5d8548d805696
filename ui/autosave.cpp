#include "ui/autosave.h"

#include <nlohmann/json.hpp>

#include <QCoreApplication>
#include <QDir>
#include <QFile>
#include <QFileInfo>
#include <QSaveFile>
#include <QStandardPaths>

namespace foldline::ui {

namespace {

using nlohmann::json;

constexpr const char* kSuffix = ".foldline-recovery";

std::string utf8(const QString& s) { return s.toStdString(); }
QString qs(const std::string& s) { return QString::fromStdString(s); }

// The lock beside a recovery file: held by the session that writes it.
QString lock_path(const QString& recovery) { return recovery + QStringLiteral(".lock"); }

}  // namespace

std::string recovery_text(const project::Project& p, const QString& project_file, const QString& anchor,
                          const QDateTime& written) {
    json doc = json::object();
    doc["format"] = kRecoveryFormat;
    doc["version"] = 1;
    doc["project_file"] = utf8(project_file);
    doc["anchor"] = utf8(anchor);
    doc["written"] = utf8(written.toUTC().toString(Qt::ISODateWithMs));
    doc["project"] = json::parse(project::project_to_json_text(p, utf8(anchor)));
    return doc.dump(2) + "\n";
}

Result<RecoveryOffer> read_recovery(const QString& path) {
    QFile f(path);
    if (!f.open(QIODevice::ReadOnly)) return make_error("cannot open the recovery file", utf8(path));
    const QByteArray bytes = f.readAll();
    const json doc = json::parse(bytes.constData(), bytes.constData() + bytes.size(), nullptr, false);
    if (!doc.is_object() || doc.value("format", std::string()) != kRecoveryFormat)
        return make_error("not a Foldline recovery file (damaged or another format)", utf8(path));
    if (!doc.contains("version") || !doc["version"].is_number_integer() || doc["version"].get<int>() != 1)
        return make_error("a recovery file from another Foldline version", utf8(path));
    const auto text = [&](const char* key) {
        auto it = doc.find(key);
        return it != doc.end() && it->is_string() ? qs(it->get<std::string>()) : QString();
    };
    auto it = doc.find("project");
    if (it == doc.end() || !it->is_object()) return make_error("the recovery file holds no audit", utf8(path));
    RecoveryOffer offer;
    offer.path = path;
    offer.project_file = text("project_file");
    offer.written = QDateTime::fromString(text("written"), Qt::ISODateWithMs);
    if (!offer.written.isValid()) offer.written = QFileInfo(path).lastModified();
    const QString anchor = text("anchor").isEmpty() ? path : text("anchor");
    auto p = project::parse_project(it->dump(), utf8(anchor));
    if (!p) {
        Error e = p.error();
        e.file = utf8(path);
        return e;
    }
    offer.project = std::move(*p);
    return offer;
}

QString default_recovery_folder() {
    return QStandardPaths::writableLocation(QStandardPaths::AppDataLocation) + QStringLiteral("/recovery");
}

std::optional<RecoveryOffer> find_recovery(const QString& folder, const QString& own) {
    QDir dir(folder);
    if (!dir.exists()) return std::nullopt;
    std::optional<RecoveryOffer> best;
    const auto files = dir.entryInfoList({QStringLiteral("*") + kSuffix}, QDir::Files, QDir::Time);
    for (const QFileInfo& fi : files) {
        const QString path = fi.absoluteFilePath();
        if (!own.isEmpty() && QFileInfo(own).absoluteFilePath() == path) continue;
        // A running session holds its file's lock; a crashed one left a stale lock that
        // QLockFile takes over (it checks whether the recorded process still lives).
        QLockFile lock(lock_path(path));
        lock.setStaleLockTime(0);
        if (!lock.tryLock(0)) continue;
        auto offer = read_recovery(path);
        const bool stale =
            !offer || (!offer->project_file.isEmpty() && QFileInfo::exists(offer->project_file) &&
                       QFileInfo(offer->project_file).lastModified() >= fi.lastModified());
        if (stale) {
            // Unreadable, or the project was saved after it: nothing to recover.
            QFile::remove(path);
            lock.unlock();
            continue;
        }
        lock.unlock();
        if (!best || offer->written > best->written) best = std::move(*offer);
    }
    return best;
}

Autosave::Autosave(Provider provider, QObject* parent)
    : QObject(parent), provider_(std::move(provider)), folder_(default_recovery_folder()) {
    timer_.setSingleShot(true);
    timer_.setInterval(30000);
    connect(&timer_, &QTimer::timeout, this, &Autosave::write_now);
    file_name_ = QStringLiteral("audit-%1-%2%3")
                     .arg(QDateTime::currentDateTimeUtc().toString(QStringLiteral("yyyyMMdd-HHmmss-zzz")))
                     .arg(QCoreApplication::applicationPid())
                     .arg(QLatin1String(kSuffix));
}

Autosave::~Autosave() {
    // Destroyed without a clean close (a window deleted by its owner): keep what was written,
    // but release the lock so the next start can offer it.
    if (lock_) lock_->unlock();
}

void Autosave::set_folder(const QString& wanted) {
    const QString folder = wanted.isEmpty() ? default_recovery_folder() : wanted;
    if (folder == folder_) return;
    if (QFileInfo::exists(path())) {
        QFile::remove(path());
        if (lock_) lock_->unlock();
        lock_.reset();
    }
    folder_ = folder;
}

void Autosave::set_interval(int ms) { timer_.setInterval(ms > 0 ? ms : 0); }

QString Autosave::path() const { return QDir(folder_).filePath(file_name_); }

void Autosave::mark_changed() {
    dirty_ = true;
    if (!timer_.isActive()) timer_.start();
}

bool Autosave::write_now() {
    timer_.stop();
    if (!dirty_) return true;
    const std::optional<project::Project> p = provider_ ? provider_() : std::nullopt;
    if (!p) return true;  // nothing worth recovering yet; keep the change pending
    if (!ensure_folder_and_lock()) return false;
    const QString anchor = project_file_.isEmpty() ? path() : project_file_;
    const std::string text = recovery_text(*p, project_file_, anchor, QDateTime::currentDateTimeUtc());
    QSaveFile f(path());
    if (!f.open(QIODevice::WriteOnly) || f.write(text.data(), qint64(text.size())) != qint64(text.size()) ||
        !f.commit()) {
        error_ = tr("cannot write the recovery file %1: %2").arg(path(), f.errorString());
        emit failed(error_);
        return false;
    }
    error_.clear();
    dirty_ = false;
    emit written(path());
    return true;
}

bool Autosave::ensure_folder_and_lock() {
    if (!QDir().mkpath(folder_)) {
        error_ = tr("cannot create the recovery folder %1").arg(folder_);
        emit failed(error_);
        return false;
    }
    if (!lock_) {
        lock_ = std::make_unique<QLockFile>(lock_path(path()));
        lock_->setStaleLockTime(0);
        if (!lock_->tryLock(0)) lock_.reset();  // still write: recovery matters more than the lock
    }
    return true;
}

bool Autosave::adopt(const QString& recovery) {
    if (!ensure_folder_and_lock()) return false;
    if (QFileInfo(recovery).absoluteFilePath() == QFileInfo(path()).absoluteFilePath()) return true;
    QFile::remove(path());
    if (!QFile::rename(recovery, path())) {
        error_ = tr("cannot take over the recovery file %1").arg(recovery);
        return false;
    }
    return true;
}

void Autosave::discard() {
    timer_.stop();
    dirty_ = false;
    QFile::remove(path());
    if (lock_) lock_->unlock();
    lock_.reset();
}

}  // namespace foldline::ui
