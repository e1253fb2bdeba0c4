// Which files are medload stores, and opening one that this user may only read.
#include <fcntl.h>
#include <sqlite3.h>
#include <sys/stat.h>
#include <unistd.h>

#include <algorithm>
#include <array>
#include <cerrno>
#include <cstring>

#include "medload/store/store.h"
#include "store/sqlite.h"

namespace medload {
namespace {

// The 16 bytes every SQLite database file starts with. Source: SQLite, "Database File
// Format", section 1.3 (the database header).
constexpr std::string_view kSqliteHeader{"SQLite format 3\0", 16};

// "file:" URI of a path, with the characters a URI gives a meaning escaped. Source: SQLite,
// "Uniform Resource Identifiers" (URI filenames), and RFC 3986 percent-encoding.
std::string FileUri(const std::string& path) {
  static constexpr char kHex[] = "0123456789ABCDEF";
  std::string uri = "file:";
  for (const char c : path) {
    const auto byte = static_cast<unsigned char>(c);
    if (c == '%' || c == '?' || c == '#' || byte < 0x20 || byte >= 0x7F) {
      uri += '%';
      uri += kHex[byte >> 4];
      uri += kHex[byte & 0xF];
    } else {
      uri += c;
    }
  }
  return uri;
}

// Size in bytes of the file at `path`, or -1 when it cannot be examined.
long long FileSize(const std::string& path) {
  struct stat info {};
  return ::stat(path.c_str(), &info) == 0 ? static_cast<long long>(info.st_size) : -1;
}

Result<long> CountOf(sqlite3* db, const char* sql) {
  Result<Statement> stmt = Statement::Prepare(db, sql);
  if (!stmt.ok()) return stmt.status();
  Result<bool> row = stmt->Step();
  if (!row.ok()) return row.status();
  return *row ? static_cast<long>(stmt->ColumnInt(0)) : 0L;
}

Result<sqlite3*> OpenUri(const std::string& uri, int busy_timeout_ms) {
  sqlite3* db = nullptr;
  const int flags = SQLITE_OPEN_READONLY | SQLITE_OPEN_URI | SQLITE_OPEN_NOMUTEX;
  if (sqlite3_open_v2(uri.c_str(), &db, flags, nullptr) != SQLITE_OK) {
    std::string reason = db != nullptr ? sqlite3_errmsg(db) : "out of memory";
    sqlite3_close(db);
    return Status::Input(reason);
  }
  sqlite3_busy_timeout(db, busy_timeout_ms);
  return db;
}

}  // namespace

Status Store::CheckStoreFile(const std::string& path, bool must_exist) {
  const long long size = FileSize(path);
  if (size < 0) return Status::Ok();  // missing: created, or refused, by the caller
  if (size == 0) {
    if (!must_exist) return Status::Ok();  // an empty file becomes a new store on import
    return Status::Input("\"" + path + "\" is an empty file, not a medload store: import data into it first, or give --db the path of a store");
  }
  std::array<char, 16> header{};
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) return Status::Input("cannot read the store \"" + path + "\" (" + std::strerror(errno) + ")");
  const ssize_t got = ::read(fd, header.data(), header.size());
  ::close(fd);
  if (got != static_cast<ssize_t>(header.size()) || std::string_view(header.data(), header.size()) != kSqliteHeader) {
    return Status::Input("\"" + path + "\" is not a medload store: it is not a SQLite database (give --db the path of a store made by 'medload import')");
  }
  return Status::Ok();
}

Status Store::CheckIdentity(bool must_exist) const {
  const auto cannot_use = [&](const Status& status) {
    return Status::Input("cannot use the store \"" + path_ + "\": " + status.message());
  };
  Result<long> tables = CountOf(db_, "SELECT COUNT(*) FROM sqlite_master WHERE type = 'table'");
  if (!tables.ok()) return cannot_use(tables.status());
  Result<long> ours = CountOf(db_, "SELECT COUNT(*) FROM sqlite_master WHERE type = 'table' AND name = 'import_runs'");
  if (!ours.ok()) return cannot_use(ours.status());
  Result<int> version = SchemaVersion();
  if (!version.ok()) return cannot_use(version.status());
  if (*ours == 1 && *version >= 1) return Status::Ok();
  if (*tables == 0 && *version == 0) {
    if (!must_exist) return Status::Ok();  // a new store
    return Status::Input("\"" + path_ + "\" is an empty SQLite database, not a medload store: import data into it first, or give --db the path of a store");
  }
  return Status::Input("\"" + path_ + "\" is a SQLite database without medload's tables (another program's file?); give --db the path of a store made by 'medload import'");
}

Result<Store> Store::OpenReadOnly(const std::string& path, const StoreOptions& options) {
  Result<sqlite3*> db = OpenUri(FileUri(path) + "?mode=ro", options.busy_timeout_ms);
  if (!db.ok()) return Status::Input("cannot open the store \"" + path + "\" read-only: " + db.status().message());
  Store store(*db, path);
  store.read_only_ = true;
  store.busy_timeout_ms_ = options.busy_timeout_ms;
  store.max_dispensings_ = std::max<size_t>(1, options.max_dispensings_per_patient);
  Status identity = store.CheckIdentity(true);
  const int error = sqlite3_errcode(store.db_) & 0xff;
  if (!identity.ok() && (error == SQLITE_CANTOPEN || error == SQLITE_READONLY)) {
    // WAL readers need the -shm file (SQLite says "cannot open" or "read-only": it cannot
    // make one); when its folder cannot be written, the file is read as immutable, which
    // is sound only while no -wal file holds changes.
    if (FileSize(path + "-wal") > 0) {
      return Status::Input("cannot read the store \"" + path + "\": its folder cannot be written, and \"" + path +
                           "-wal\" holds changes not yet in the store; open it once with write access (any read "
                           "command does) and try again");
    }
    db = OpenUri(FileUri(path) + "?immutable=1", options.busy_timeout_ms);
    if (!db.ok()) return Status::Input("cannot open the store \"" + path + "\" read-only: " + db.status().message());
    store = Store(*db, path);
    store.read_only_ = true;
    store.busy_timeout_ms_ = options.busy_timeout_ms;
    store.max_dispensings_ = std::max<size_t>(1, options.max_dispensings_per_patient);
    identity = store.CheckIdentity(true);
  }
  if (!identity.ok()) return identity;
  Result<int> version = store.SchemaVersion();
  if (!version.ok()) return version.status();
  if (*version != kStoreSchemaVersion) {
    return Status::Input("the store \"" + path + "\" has schema version " + std::to_string(*version) +
                         " and can only be read here; this medload reads version " +
                         std::to_string(kStoreSchemaVersion) + ": open it once with write access to upgrade it");
  }
  if (Status status = SetPageCache(store.db_, false); !status.ok()) return status;
  if (Status status = SetMemoryMap(store.db_, true); !status.ok()) return status;
  return store;
}

}  // namespace medload
