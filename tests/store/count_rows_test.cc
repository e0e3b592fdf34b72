// Tests of count_rows and count_after (store/count_rows.h) on a bare SQLite
// connection with a table like the store's counts.
#include "store/count_rows.h"

#include <gtest/gtest.h>
#include <sqlite3.h>

#include <map>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "store/sqlite.h"

namespace chute {
namespace {

class CountRowsTest : public testing::Test {
 protected:
  void SetUp() override {
    sqlite3* raw = nullptr;
    ASSERT_EQ(sqlite3_open(":memory:", &raw), SQLITE_OK);
    db_.reset(raw);
    ASSERT_TRUE(RegisterCountRows(db_.get()).ok());
    ASSERT_TRUE(sql::Exec(db_.get(),
                          "CREATE TABLE counts (term_id INTEGER NOT NULL, queue_id INTEGER "
                          "NOT NULL, n INTEGER NOT NULL CHECK (n > 0), "
                          "PRIMARY KEY (term_id, queue_id)) WITHOUT ROWID")
                    .ok());
  }

  std::map<std::pair<int64_t, int64_t>, int64_t> Table() {
    std::map<std::pair<int64_t, int64_t>, int64_t> out;
    sql::Statement st(db_.get(), "SELECT term_id, queue_id, n FROM counts");
    while (st.Step() == SQLITE_ROW) out[{st.ColumnInt(0), st.ColumnInt(1)}] = st.ColumnInt(2);
    return out;
  }

  Status Insert(const std::vector<CountRow>& rows) {
    sql::Statement st(db_.get(),
                      "INSERT INTO counts(term_id, queue_id, n) "
                      "SELECT term_id, queue_id, n FROM count_rows(?) WHERE true "
                      "ON CONFLICT(term_id, queue_id) DO UPDATE SET n = excluded.n");
    EXPECT_TRUE(st.ok()) << st.error();
    BindCountRows(st.handle(), 1, &rows);
    return st.Run();
  }

  sql::DbHandle db_;
};

TEST_F(CountRowsTest, OneStatementWritesEveryRowAndReplacesCounts) {
  ASSERT_TRUE(Insert({{1, 1, 5}, {1, 2, 3}, {7, 1, 9}}).ok());
  ASSERT_TRUE(Insert({{1, 2, 4}, {8, 3, 1}}).ok());
  const std::map<std::pair<int64_t, int64_t>, int64_t> want = {
      {{1, 1}, 5}, {{1, 2}, 4}, {{7, 1}, 9}, {{8, 3}, 1}};
  EXPECT_EQ(Table(), want);
  ASSERT_TRUE(Insert({}).ok());  // no rows: nothing happens
  EXPECT_EQ(Table(), want);
}

TEST_F(CountRowsTest, TermRowsGiveIdsAndTextsToOneStatement) {
  ASSERT_TRUE(sql::Exec(db_.get(), "CREATE TABLE terms (id INTEGER PRIMARY KEY, text TEXT NOT "
                                   "NULL UNIQUE)")
                  .ok());
  const std::string long_term(300, 'x');
  const std::vector<TermRow> rows = {{5, "berth"}, {6, "d\xc3\xa9p\xc3\xb4t"}, {9, long_term}};
  sql::Statement st(db_.get(), "INSERT INTO terms(id, text) SELECT id, text FROM term_rows(?)");
  ASSERT_TRUE(st.ok()) << st.error();
  BindTermRows(st.handle(), 1, &rows);
  ASSERT_TRUE(st.Run().ok());
  sql::Statement read(db_.get(), "SELECT id, text FROM terms ORDER BY id");
  std::vector<std::pair<int64_t, std::string>> got;
  while (read.Step() == SQLITE_ROW) got.emplace_back(read.ColumnInt(0), read.ColumnText(1));
  EXPECT_EQ(got, (std::vector<std::pair<int64_t, std::string>>{
                     {5, "berth"}, {6, "d\xc3\xa9p\xc3\xb4t"}, {9, long_term}}));
}

TEST_F(CountRowsTest, WithoutItsArgumentTheTableIsRefused) {
  sql::Statement st(db_.get(), "SELECT * FROM count_rows");
  EXPECT_FALSE(st.ok());
}

TEST_F(CountRowsTest, CountAfterChangesTheRowsItNamesInOnePass) {
  ASSERT_TRUE(Insert({{1, 1, 5}, {1, 2, 3}, {2, 1, 2}, {3, 1, 1}, {4, 2, 6}}).ok());
  // +2 to (1,1), -3 to (1,2) (it ends), +1 to (2,2) (no row: not met in the
  // pass), -1 to (4,2).
  const std::vector<CountRow> deltas = {{1, 1, 2}, {1, 2, -3}, {2, 2, 1}, {4, 2, -1}};
  std::vector<int64_t> before(deltas.size(), 0);
  std::vector<uint8_t> seen(deltas.size(), 0);
  CountChanges changes{&deltas, &before, &seen};
  sql::Statement st(db_.get(),
                    "UPDATE counts SET n = count_after(?1, term_id, queue_id, n) "
                    "WHERE term_id BETWEEN ?2 AND ?3 AND "
                    "count_after(?1, term_id, queue_id, n) NOT IN (0, n)");
  ASSERT_TRUE(st.ok()) << st.error();
  BindCountChanges(st.handle(), 1, &changes);
  st.Bind(2, int64_t{1}).Bind(3, int64_t{4});
  ASSERT_TRUE(st.Run().ok());
  EXPECT_EQ(changes.negative, -1);
  EXPECT_EQ(before, (std::vector<int64_t>{5, 3, 0, 6}));
  EXPECT_EQ(seen, (std::vector<uint8_t>{1, 1, 0, 1}));
  // The row that reaches zero is left for the caller to delete.
  const std::map<std::pair<int64_t, int64_t>, int64_t> want = {
      {{1, 1}, 7}, {{1, 2}, 3}, {{2, 1}, 2}, {{3, 1}, 1}, {{4, 2}, 5}};
  EXPECT_EQ(Table(), want);
}

TEST_F(CountRowsTest, CountAfterFindsRowsInAnyOrderAndNotesANegativeResult) {
  ASSERT_TRUE(Insert({{1, 1, 5}, {2, 1, 1}, {3, 1, 4}, {9, 9, 2}}).ok());
  const std::vector<CountRow> deltas = {{1, 1, 1}, {2, 1, -2}, {3, 1, 1}, {9, 9, 3}};
  std::vector<int64_t> before(deltas.size(), 0);
  std::vector<uint8_t> seen(deltas.size(), 0);
  CountChanges changes{&deltas, &before, &seen};
  // Backwards through the table, so that each row lies behind the last one
  // found.
  sql::Statement st(db_.get(),
                    "SELECT count_after(?1, term_id, queue_id, n) FROM counts "
                    "ORDER BY term_id DESC, queue_id DESC");
  ASSERT_TRUE(st.ok()) << st.error();
  BindCountChanges(st.handle(), 1, &changes);
  std::vector<int64_t> got;
  while (st.Step() == SQLITE_ROW) got.push_back(st.ColumnInt(0));
  EXPECT_EQ(got, (std::vector<int64_t>{5, 5, 1, 6}));  // (2,1) is kept at 1
  EXPECT_EQ(changes.negative, 1);
  EXPECT_EQ(before, (std::vector<int64_t>{5, 1, 4, 2}));
}

TEST_F(CountRowsTest, CountAfterWithoutItsChangesIsAnError) {
  sql::Statement st(db_.get(), "SELECT count_after(NULL, 1, 1, 1)");
  ASSERT_TRUE(st.ok());
  EXPECT_EQ(st.Step(), SQLITE_ERROR);
}

}  // namespace
}  // namespace chute
