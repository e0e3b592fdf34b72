// Helpers shared by the store tests: a temporary folder removed at the end
// of each test, small file helpers, and a raw SQLite connection for looking
// at a store from outside (tests may use SQL; the program keeps it in
// store/).
#ifndef CHUTE_TESTS_STORE_TEST_FILES_H_
#define CHUTE_TESTS_STORE_TEST_FILES_H_

#include <gtest/gtest.h>
#include <sqlite3.h>
#include <stdlib.h>

#include <cstdint>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <memory>
#include <set>
#include <string>
#include <string_view>

namespace chute::testing_files {

// A fresh folder under the test temporary folder, removed with everything
// in it when the object goes.
class TempDir {
 public:
  TempDir() {
    std::string tmpl = ::testing::TempDir() + "chute-store-test-XXXXXX";
    if (::mkdtemp(tmpl.data()) == nullptr) {
      ADD_FAILURE() << "mkdtemp failed for " << tmpl;
    }
    path_ = tmpl;
  }
  ~TempDir() {
    std::error_code ec;
    std::filesystem::remove_all(path_, ec);
  }
  TempDir(const TempDir&) = delete;  // owns the folder
  TempDir& operator=(const TempDir&) = delete;

  const std::string& path() const { return path_; }
  std::string File(std::string_view name) const {
    return path_ + "/" + std::string(name);
  }
  // Names of the entries in the folder.
  std::set<std::string> Entries() const {
    std::set<std::string> names;
    for (const auto& e : std::filesystem::directory_iterator(path_)) {
      names.insert(e.path().filename().string());
    }
    return names;
  }

 private:
  std::string path_;
};

inline void WriteFile(const std::string& path, std::string_view bytes) {
  std::ofstream out(path, std::ios::binary);
  out.write(bytes.data(), static_cast<std::streamsize>(bytes.size()));
  ASSERT_TRUE(out.good()) << path;
}

inline std::string ReadFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return std::string(std::istreambuf_iterator<char>(in), {});
}

// A 64-hex-digit digest made from a number (the store does not check that
// it is a real SHA-256).
inline std::string NumberedDigest(unsigned n) {
  char buf[65];
  std::snprintf(buf, sizeof buf, "%064x", n);
  return buf;
}

// An SQLite connection opened directly, outside chute's Store.
struct DbCloser {
  void operator()(sqlite3* db) const { sqlite3_close_v2(db); }
};
using Db = std::unique_ptr<sqlite3, DbCloser>;

inline Db OpenRaw(const std::string& path, int flags) {
  sqlite3* raw = nullptr;
  int rc = sqlite3_open_v2(path.c_str(), &raw, flags, nullptr);
  Db db(raw);
  EXPECT_EQ(rc, SQLITE_OK) << path << ": " << sqlite3_errstr(rc);
  return db;
}

// Runs SQL that needs no parameters; fails the test on error.
inline void ExecRaw(sqlite3* db, const std::string& sql) {
  char* error = nullptr;
  int rc = sqlite3_exec(db, sql.c_str(), nullptr, nullptr, &error);
  EXPECT_EQ(rc, SQLITE_OK) << sql << ": " << (error ? error : "");
  sqlite3_free(error);
}

// The first column of the first row of a query, as text ("" when no row).
inline std::string QueryText(sqlite3* db, const std::string& sql) {
  sqlite3_stmt* st = nullptr;
  std::string out;
  if (sqlite3_prepare_v2(db, sql.c_str(), -1, &st, nullptr) != SQLITE_OK) {
    ADD_FAILURE() << sql << ": " << sqlite3_errmsg(db);
    return out;
  }
  if (sqlite3_step(st) == SQLITE_ROW) {
    const unsigned char* text = sqlite3_column_text(st, 0);
    if (text != nullptr) out = reinterpret_cast<const char*>(text);
  }
  sqlite3_finalize(st);
  return out;
}

inline int64_t QueryInt(sqlite3* db, const std::string& sql) {
  const std::string text = QueryText(db, sql);
  if (text.empty()) {
    ADD_FAILURE() << sql << ": no value";
    return -1;
  }
  return std::stoll(text);
}

}  // namespace chute::testing_files

#endif  // CHUTE_TESTS_STORE_TEST_FILES_H_
