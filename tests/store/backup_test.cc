// Tests of BackupStore and RestoreStore (store/backup.h): the copy is a
// whole chute store, made 0600 and renamed into place; restore refuses what
// it must and otherwise gives back the store that was copied.
#include "store/backup.h"

#include <gtest/gtest.h>
#include <sys/stat.h>

#include <memory>
#include <string>

#include "store/check.h"
#include "store/store.h"
#include "tests/store/test_files.h"

namespace chute {
namespace {

using testing_files::ReadFile;
using testing_files::TempDir;
using testing_files::WriteFile;

std::string Digest(unsigned n) {
  char buf[65];
  std::snprintf(buf, sizeof buf, "%064x", n);
  return buf;
}

// Creates a store at path with `n` documents in two queues.
void MakeStore(const std::string& path, unsigned first, unsigned n) {
  std::unique_ptr<Store> store;
  ASSERT_TRUE(Store::Create(path, StoreSettings{}, &store).ok());
  LearnBatch batch;
  for (unsigned i = first; i < first + n; ++i) {
    batch.Add(Digest(i), i % 2 ? "permits" : "freight", "doc.txt",
              {"term" + std::to_string(i % 7), "shared"});
  }
  LearnResult result;
  ASSERT_TRUE(store->Learn(batch, {"2026-05-01T09:30:00Z", "tester"}, &result).ok());
}

int64_t Documents(const std::string& path) {
  std::unique_ptr<Store> store;
  Status s = Store::Open(path, &store);
  EXPECT_TRUE(s.ok()) << s.message();
  if (!s.ok()) return -1;
  std::vector<QueueInfo> queues;
  EXPECT_TRUE(store->ListQueues(&queues).ok());
  int64_t n = 0;
  for (const auto& q : queues) n += q.documents;
  return n;
}

mode_t Mode(const std::string& path) {
  struct stat st;
  EXPECT_EQ(::stat(path.c_str(), &st), 0) << path;
  return st.st_mode & 0777;
}

TEST(BackupTest, CopyIsAConsistentStoreWithMode0600AndNoTemporaryLeft) {
  TempDir dir;
  MakeStore(dir.File("a.db"), 0, 10);
  BackupResult r;
  Status s = BackupStore(dir.File("a.db"), dir.File("copy.db"), false, &r);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(r.documents, 10);
  EXPECT_EQ(r.queues, 2);
  EXPECT_GT(r.bytes, 0);
  EXPECT_EQ(Mode(dir.File("copy.db")), 0600u);
  CheckReport report;
  ASSERT_TRUE(CheckStore(dir.File("copy.db"), &report).ok());
  EXPECT_TRUE(report.consistent());
  EXPECT_EQ(report.documents, 10);
  for (const std::string& name : dir.Entries()) {
    EXPECT_EQ(name.find(".tmp-"), std::string::npos) << name;
  }
}

TEST(BackupTest, ExistingFileIsKeptWithoutReplace) {
  TempDir dir;
  MakeStore(dir.File("a.db"), 0, 4);
  WriteFile(dir.File("copy.db"), "yesterday");
  BackupResult r;
  Status s = BackupStore(dir.File("a.db"), dir.File("copy.db"), false, &r);
  EXPECT_FALSE(s.ok());
  EXPECT_NE(s.message().find("--force"), std::string::npos) << s.message();
  EXPECT_EQ(ReadFile(dir.File("copy.db")), "yesterday");
  ASSERT_TRUE(
      BackupStore(dir.File("a.db"), dir.File("copy.db"), true, &r).ok());
  EXPECT_EQ(Documents(dir.File("copy.db")), 4);
}

TEST(BackupTest, StoreIsNeverItsOwnBackup) {
  TempDir dir;
  MakeStore(dir.File("a.db"), 0, 4);
  BackupResult r;
  Status s = BackupStore(dir.File("a.db"), dir.File("a.db"), true, &r);
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_EQ(Documents(dir.File("a.db")), 4);
}

TEST(BackupTest, NotAStoreIsRefused) {
  TempDir dir;
  WriteFile(dir.File("a.db"), "plain words");
  BackupResult r;
  EXPECT_EQ(
      BackupStore(dir.File("a.db"), dir.File("copy.db"), false, &r).code(),
      Status::Code::kCorruption);
  EXPECT_EQ(dir.Entries(), std::set<std::string>{"a.db"});
}

TEST(RestoreTest, CreatesAMissingStoreWithMode0600) {
  TempDir dir;
  MakeStore(dir.File("a.db"), 0, 6);
  BackupResult b;
  ASSERT_TRUE(
      BackupStore(dir.File("a.db"), dir.File("copy.db"), false, &b).ok());
  RestoreResult r;
  Status s = RestoreStore(dir.File("copy.db"), dir.File("new.db"), false, &r);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_TRUE(r.created);
  EXPECT_EQ(r.documents, 6);
  EXPECT_EQ(Mode(dir.File("new.db")), 0600u);
  EXPECT_EQ(Documents(dir.File("new.db")), 6);
}

TEST(RestoreTest, StoreWithDocumentsIsReplacedOnlyWhenAsked) {
  TempDir dir;
  MakeStore(dir.File("a.db"), 0, 6);
  MakeStore(dir.File("b.db"), 100, 3);
  RestoreResult r;
  Status s = RestoreStore(dir.File("a.db"), dir.File("b.db"), false, &r);
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_NE(s.message().find("holds 3 learned documents"), std::string::npos)
      << s.message();
  EXPECT_EQ(Documents(dir.File("b.db")), 3);
  s = RestoreStore(dir.File("a.db"), dir.File("b.db"), true, &r);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_FALSE(r.created);
  EXPECT_EQ(r.documents_before, 3);
  EXPECT_EQ(Documents(dir.File("b.db")), 6);
  CheckReport report;
  ASSERT_TRUE(CheckStore(dir.File("b.db"), &report).ok());
  EXPECT_TRUE(report.consistent());
}

TEST(RestoreTest, EmptyStoreIsReplacedWithoutForce) {
  TempDir dir;
  MakeStore(dir.File("a.db"), 0, 6);
  std::unique_ptr<Store> empty;
  ASSERT_TRUE(Store::Create(dir.File("b.db"), StoreSettings{}, &empty).ok());
  empty.reset();
  RestoreResult r;
  Status s = RestoreStore(dir.File("a.db"), dir.File("b.db"), false, &r);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(Documents(dir.File("b.db")), 6);
}

TEST(RestoreTest, RefusesItselfAFileThatIsNotAStoreAndAMissingFile) {
  TempDir dir;
  MakeStore(dir.File("a.db"), 0, 2);
  WriteFile(dir.File("notes.txt"), "plain words");
  RestoreResult r;
  EXPECT_EQ(RestoreStore(dir.File("a.db"), dir.File("a.db"), true, &r).code(),
            Status::Code::kInvalidArgument);
  EXPECT_EQ(
      RestoreStore(dir.File("notes.txt"), dir.File("a.db"), true, &r).code(),
      Status::Code::kCorruption);
  EXPECT_EQ(
      RestoreStore(dir.File("none.db"), dir.File("a.db"), true, &r).code(),
      Status::Code::kNotFound);
  // Nor onto a file that is not a store: restore replaces only a store.
  EXPECT_EQ(
      RestoreStore(dir.File("a.db"), dir.File("notes.txt"), true, &r).code(),
      Status::Code::kCorruption);
  EXPECT_EQ(ReadFile(dir.File("notes.txt")), "plain words");
  EXPECT_EQ(Documents(dir.File("a.db")), 2);
}

}  // namespace
}  // namespace chute
