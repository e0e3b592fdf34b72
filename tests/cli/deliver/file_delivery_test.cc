// Tests of file delivery (cli/deliver/file_delivery.h) on real files: a
// folder below the test's working folder (the build tree) and, for the
// cross-filesystem path, one on /dev/shm (a tmpfs).
#include "cli/deliver/file_delivery.h"

#include <fcntl.h>
#include <stdlib.h>
#include <sys/stat.h>
#include <unistd.h>

#include <gtest/gtest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>
#include <string>
#include <vector>

#include "cli/read/sha256.h"
#include "cli/read/utf8.h"

namespace chute {
namespace {

namespace fs = std::filesystem;

void WriteFile(const std::string& path, const std::string& bytes) {
  std::ofstream out(path, std::ios::binary | std::ios::trunc);
  out << bytes;
  out.close();
  ASSERT_TRUE(out.good()) << path;
}

std::string ReadFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream all;
  all << in.rdbuf();
  return all.str();
}

// True when something (a file, a folder, a link even dangling) has the name.
bool Exists(const std::string& path) {
  struct stat st;
  return ::lstat(path.c_str(), &st) == 0;
}

struct stat Lstat(const std::string& path) {
  struct stat st {};
  EXPECT_EQ(::lstat(path.c_str(), &st), 0) << path;
  return st;
}

// The names in a folder, sorted; empty when it does not exist.
std::vector<std::string> Names(const std::string& dir) {
  std::vector<std::string> names;
  std::error_code ec;
  for (const auto& e : fs::directory_iterator(dir, ec)) {
    names.push_back(e.path().filename().string());
  }
  std::sort(names.begin(), names.end());
  return names;
}

bool HasTemporary(const std::string& dir) {
  for (const std::string& n : Names(dir)) {
    if (n.rfind(kTempPrefix, 0) == 0) return true;
  }
  return false;
}

// Sets CHUTE_TEST_FORCE_COPY=1 for its lifetime.
class ForceCopy {
 public:
  ForceCopy() { ::setenv("CHUTE_TEST_FORCE_COPY", "1", 1); }
  ~ForceCopy() { ::unsetenv("CHUTE_TEST_FORCE_COPY"); }
};

// Sets CHUTE_TEST_NO_RENAMEAT2=1 for its lifetime: the link() + unlink()
// fallback of filesystems without RENAME_NOREPLACE.
class NoRenameat2 {
 public:
  NoRenameat2() { ::setenv("CHUTE_TEST_NO_RENAMEAT2", "1", 1); }
  ~NoRenameat2() { ::unsetenv("CHUTE_TEST_NO_RENAMEAT2"); }
};

// A fresh folder with inbox/ and routed/ (the destination root) in it.
class FileDeliveryTest : public ::testing::Test {
 protected:
  void SetUp() override {
    ::unsetenv("CHUTE_TEST_FORCE_COPY");
    ::unsetenv("CHUTE_TEST_NO_RENAMEAT2");
    std::string pattern = (fs::current_path() / "file_delivery_test.XXXXXX").string();
    ASSERT_NE(::mkdtemp(pattern.data()), nullptr);
    top_ = pattern;
    inbox_ = top_ + "/inbox";
    fs::create_directories(inbox_);
    ASSERT_TRUE(PrepareDestinationRoot(top_ + "/routed", true, &root_).ok());
  }
  void TearDown() override {
    std::error_code ec;
    fs::remove_all(top_, ec);
    if (!shm_.empty()) fs::remove_all(shm_, ec);
  }

  // A folder on /dev/shm, or "" when /dev/shm is missing or is on the same
  // filesystem as the test folder.
  std::string ShmFolder() {
    struct stat shm, here;
    if (::stat("/dev/shm", &shm) != 0 || !S_ISDIR(shm.st_mode)) return "";
    if (::stat(top_.c_str(), &here) != 0 || shm.st_dev == here.st_dev) return "";
    std::string pattern = "/dev/shm/chute_delivery_test.XXXXXX";
    if (::mkdtemp(pattern.data()) == nullptr) return "";
    shm_ = pattern;
    return shm_;
  }

  std::string Inbox(const std::string& name, const std::string& bytes) {
    const std::string path = inbox_ + "/" + name;
    WriteFile(path, bytes);
    return path;
  }

  std::string Choose(const std::string& folder, const std::string& name) {
    std::string destination;
    Status s = ChooseDestination(root_, folder, name, &destination);
    EXPECT_TRUE(s.ok()) << s.message();
    return destination;
  }

  // Delivers source under its own name into folder; the destination.
  std::string DeliverInto(const std::string& source, const std::string& folder,
                          DeliveryMode mode, Delivered* out = nullptr) {
    Delivered d;
    const std::string name = fs::path(source).filename().string();
    Status s = Deliver(source, Choose(folder, name), mode, &d);
    EXPECT_TRUE(s.ok()) << s.message();
    if (out != nullptr) *out = d;
    return d.destination;
  }

  std::string top_, inbox_, root_, shm_;
};

// --- Names ---

TEST(NumberedNameTest, SuffixGoesBeforeTheLastExtension) {
  EXPECT_EQ(NumberedName("report.pdf", 1, 255), "report.pdf");
  EXPECT_EQ(NumberedName("report.pdf", 2, 255), "report-2.pdf");
  EXPECT_EQ(NumberedName("report.pdf", 3, 255), "report-3.pdf");
  EXPECT_EQ(NumberedName("report.pdf", 12, 255), "report-12.pdf");
  EXPECT_EQ(NumberedName("a.tar.gz", 2, 255), "a.tar-2.gz");
  EXPECT_EQ(NumberedName("my letter.txt", 2, 255), "my letter-2.txt");
  EXPECT_EQ(NumberedName("a.", 2, 255), "a-2.");
}

TEST(NumberedNameTest, NoExtensionOrOnlyALeadingDotPutsTheSuffixAtTheEnd) {
  EXPECT_EQ(NumberedName("README", 2, 255), "README-2");
  EXPECT_EQ(NumberedName(".notes", 2, 255), ".notes-2");
  EXPECT_EQ(NumberedName(".notes.txt", 2, 255), ".notes-2.txt");
  EXPECT_EQ(NumberedName("-rf", 2, 255), "-rf-2");
}

TEST(NumberedNameTest, LongNamesAreShortenedBeforeTheExtension) {
  const std::string name = std::string(251, 'x') + ".txt";  // 255 bytes
  EXPECT_EQ(NumberedName(name, 1, 255), name);
  EXPECT_EQ(NumberedName(name, 2, 255), std::string(249, 'x') + "-2.txt");
  EXPECT_EQ(NumberedName(name, 10, 255), std::string(248, 'x') + "-10.txt");
  // A filesystem with shorter names: even the first name is shortened.
  EXPECT_EQ(NumberedName("report.pdf", 1, 8), "repo.pdf");
}

TEST(NumberedNameTest, ShorteningKeepsWholeUtf8Sequences) {
  std::string stem;
  for (int i = 0; i < 125; ++i) stem += "\xC3\xA9";  // é, 2 bytes each
  const std::string name = stem + ".txt";            // 254 bytes
  const std::string second = NumberedName(name, 2, 255);
  // 249 bytes of room for the stem: 124 whole é (248 bytes).
  EXPECT_EQ(second, stem.substr(0, 248) + "-2.txt");
  EXPECT_TRUE(IsValidUtf8(second));
  // A 3-byte sequence (€) at the cut: the whole sequence goes.
  const std::string euro = std::string(248, 'a') + "\xE2\x82\xAC" + ".txt";  // 255
  EXPECT_EQ(NumberedName(euro, 2, 255), std::string(248, 'a') + "-2.txt");
}

TEST(NumberedNameTest, NonUtf8NamesAreCutAtAnyByte) {
  const std::string name = std::string(251, '\xFF') + ".txt";
  const std::string second = NumberedName(name, 2, 255);
  EXPECT_EQ(second, std::string(249, '\xFF') + "-2.txt");
  // Invalid UTF-8 elsewhere: é's bytes may be split, the length is exact.
  std::string mixed = "\xFF";
  for (int i = 0; i < 125; ++i) mixed += "\xC3\xA9";
  mixed += ".txt";  // 255 bytes
  EXPECT_EQ(NumberedName(mixed, 2, 255).size(), 255u);
  EXPECT_EQ(NumberedName(mixed, 2, 255), mixed.substr(0, 249) + "-2.txt");
}

TEST(NumberedNameTest, AnExtensionTooLongToKeepIsCutWithTheName) {
  const std::string name = "a." + std::string(253, 'e');  // 255 bytes
  EXPECT_EQ(NumberedName(name, 2, 255), name.substr(0, 253) + "-2");
}

// --- The destination root and the choice of a name ---

TEST_F(FileDeliveryTest, PrepareDestinationRootCreatesAndResolves) {
  std::string absolute;
  const std::string nested = top_ + "/a/b/c";
  ASSERT_TRUE(PrepareDestinationRoot(nested, true, &absolute).ok());
  EXPECT_TRUE(fs::is_directory(nested));
  EXPECT_EQ(absolute, fs::canonical(nested).string());

  // A root reached through a symbolic link: its real path.
  fs::create_directory_symlink(nested, top_ + "/alias");
  ASSERT_TRUE(PrepareDestinationRoot(top_ + "/alias", false, &absolute).ok());
  EXPECT_EQ(absolute, fs::canonical(nested).string());

  Status missing = PrepareDestinationRoot(top_ + "/missing", false, &absolute);
  EXPECT_EQ(missing.code(), Status::Code::kNotFound);
  EXPECT_FALSE(Exists(top_ + "/missing"));

  WriteFile(top_ + "/plain", "x");
  Status file = PrepareDestinationRoot(top_ + "/plain", false, &absolute);
  EXPECT_EQ(file.code(), Status::Code::kInvalidArgument) << file.message();
}

TEST_F(FileDeliveryTest, ChooseDestinationCreatesNothing) {
  EXPECT_EQ(Choose("permits", "a.txt"), root_ + "/permits/a.txt");
  EXPECT_FALSE(Exists(root_ + "/permits"));
  fs::create_directory(root_ + "/permits");
  WriteFile(root_ + "/permits/a.txt", "taken");
  WriteFile(root_ + "/permits/a-2.txt", "taken");
  EXPECT_EQ(Choose("permits", "a.txt"), root_ + "/permits/a-3.txt");
  EXPECT_EQ(Names(root_ + "/permits"), (std::vector<std::string>{"a-2.txt", "a.txt"}));
}

TEST_F(FileDeliveryTest, ChooseDestinationRefusesFolderAndFileNamesWithSlashes) {
  std::string d;
  EXPECT_EQ(ChooseDestination(root_, "../up", "a.txt", &d).code(),
            Status::Code::kInvalidArgument);
  EXPECT_EQ(ChooseDestination(root_, "..", "a.txt", &d).code(),
            Status::Code::kInvalidArgument);
  EXPECT_EQ(ChooseDestination(root_, "q", "x/a.txt", &d).code(),
            Status::Code::kInvalidArgument);
  EXPECT_EQ(ChooseDestination(root_, "q", "", &d).code(), Status::Code::kInvalidArgument);
}

// --- Moving, copying, linking on one filesystem ---

TEST_F(FileDeliveryTest, MoveOnOneFilesystemRenamesTheFile) {
  const std::string source = Inbox("letter.txt", "dear permits office");
  const ino_t inode = Lstat(source).st_ino;
  Delivered d;
  const std::string dest = DeliverInto(source, "permits", DeliveryMode::kMove, &d);
  EXPECT_EQ(dest, root_ + "/permits/letter.txt");
  EXPECT_FALSE(d.crossed_filesystems);
  EXPECT_FALSE(Exists(source));
  EXPECT_EQ(ReadFile(dest), "dear permits office");
  EXPECT_EQ(Lstat(dest).st_ino, inode);  // renamed, not copied
  EXPECT_EQ(Lstat(root_ + "/permits").st_mode & S_IFMT, static_cast<mode_t>(S_IFDIR));
}

TEST_F(FileDeliveryTest, TakenNamesGetNumbersAndAreNeverOverwritten) {
  fs::create_directory(root_ + "/permits");
  WriteFile(root_ + "/permits/a.txt", "already here");
  fs::create_directories(inbox_ + "/one");
  fs::create_directories(inbox_ + "/two");
  WriteFile(inbox_ + "/one/a.txt", "first");
  WriteFile(inbox_ + "/two/a.txt", "second");
  EXPECT_EQ(DeliverInto(inbox_ + "/one/a.txt", "permits", DeliveryMode::kMove),
            root_ + "/permits/a-2.txt");
  EXPECT_EQ(DeliverInto(inbox_ + "/two/a.txt", "permits", DeliveryMode::kMove),
            root_ + "/permits/a-3.txt");
  EXPECT_EQ(ReadFile(root_ + "/permits/a.txt"), "already here");
  EXPECT_EQ(ReadFile(root_ + "/permits/a-2.txt"), "first");
  EXPECT_EQ(ReadFile(root_ + "/permits/a-3.txt"), "second");

  // Extensions: the suffix goes before the last one.
  WriteFile(root_ + "/permits/b.tar.gz", "x");
  EXPECT_EQ(DeliverInto(Inbox("b.tar.gz", "y"), "permits", DeliveryMode::kMove),
            root_ + "/permits/b.tar-2.gz");
  WriteFile(root_ + "/permits/NOTES", "x");
  EXPECT_EQ(DeliverInto(Inbox("NOTES", "y"), "permits", DeliveryMode::kMove),
            root_ + "/permits/NOTES-2");
}

TEST_F(FileDeliveryTest, ANameTakenAfterTheChoiceIsNotOverwritten) {
  const std::string source = Inbox("a.txt", "mine");
  const std::string wanted = Choose("permits", "a.txt");
  fs::create_directory(root_ + "/permits");
  WriteFile(wanted, "someone else's");  // taken between choice and delivery
  for (DeliveryMode mode : {DeliveryMode::kCopy, DeliveryMode::kLink, DeliveryMode::kMove}) {
    Delivered d;
    Status s = Deliver(source, wanted, mode, &d);
    ASSERT_TRUE(s.ok()) << s.message();
    EXPECT_NE(d.destination, wanted);
    EXPECT_EQ(ReadFile(d.destination), "mine");
    EXPECT_EQ(ReadFile(wanted), "someone else's");
  }
  EXPECT_EQ(Names(root_ + "/permits"),
            (std::vector<std::string>{"a-2.txt", "a-3.txt", "a-4.txt", "a.txt"}));
}

TEST_F(FileDeliveryTest, ADanglingLinkUnderTheNameIsNotWrittenThrough) {
  fs::create_directory(root_ + "/permits");
  const std::string target = top_ + "/outside.txt";
  fs::create_symlink(target, root_ + "/permits/a.txt");
  {
    ForceCopy force;  // the copy path too
    EXPECT_EQ(DeliverInto(Inbox("a.txt", "mine"), "permits", DeliveryMode::kMove),
              root_ + "/permits/a-2.txt");
  }
  EXPECT_EQ(DeliverInto(Inbox("a.txt", "mine too"), "permits", DeliveryMode::kMove),
            root_ + "/permits/a-3.txt");
  EXPECT_FALSE(Exists(target));
  EXPECT_TRUE(fs::is_symlink(root_ + "/permits/a.txt"));
}

TEST_F(FileDeliveryTest, CopyKeepsTheSourceAndItsTimes) {
  const std::string source = Inbox("letter.txt", "keep me");
  const struct timespec times[2] = {{1700000000, 123456789}, {1600000000, 987654321}};
  ASSERT_EQ(::utimensat(AT_FDCWD, source.c_str(), times, 0), 0);
  Delivered d;
  const std::string dest = DeliverInto(source, "permits", DeliveryMode::kCopy, &d);
  EXPECT_FALSE(d.crossed_filesystems);
  EXPECT_EQ(ReadFile(source), "keep me");
  EXPECT_EQ(ReadFile(dest), "keep me");
  EXPECT_NE(Lstat(dest).st_ino, Lstat(source).st_ino);
  EXPECT_EQ(Lstat(dest).st_mtim.tv_sec, 1600000000);
  EXPECT_EQ(Lstat(dest).st_mtim.tv_nsec, 987654321);
  EXPECT_FALSE(HasTemporary(root_ + "/permits"));
}

TEST_F(FileDeliveryTest, LinkMakesTheSameInode) {
  const std::string source = Inbox("letter.txt", "linked");
  Delivered d;
  const std::string dest = DeliverInto(source, "permits", DeliveryMode::kLink, &d);
  EXPECT_TRUE(Exists(source));
  EXPECT_EQ(Lstat(dest).st_ino, Lstat(source).st_ino);
  EXPECT_EQ(Lstat(dest).st_nlink, 2u);
  EXPECT_FALSE(d.crossed_filesystems);
}

TEST_F(FileDeliveryTest, ForcedCopyTakesTheCopyPathOnOneFilesystem) {
  ForceCopy force;
  const std::string source = Inbox("letter.txt", "copied then removed");
  const ino_t inode = Lstat(source).st_ino;
  Delivered d;
  const std::string dest = DeliverInto(source, "permits", DeliveryMode::kMove, &d);
  EXPECT_TRUE(d.crossed_filesystems);
  EXPECT_FALSE(Exists(source));
  EXPECT_EQ(ReadFile(dest), "copied then removed");
  EXPECT_NE(Lstat(dest).st_ino, inode);  // new bytes, not a rename
  EXPECT_FALSE(HasTemporary(root_ + "/permits"));
}

TEST_F(FileDeliveryTest, TheLinkFallbackNeverOverwritesEither) {
  NoRenameat2 fallback;
  fs::create_directory(root_ + "/permits");
  WriteFile(root_ + "/permits/a.txt", "already here");
  const std::string source = Inbox("a.txt", "moved by link and unlink");
  const ino_t inode = Lstat(source).st_ino;
  Delivered d;
  EXPECT_EQ(DeliverInto(source, "permits", DeliveryMode::kMove, &d),
            root_ + "/permits/a-2.txt");
  EXPECT_FALSE(d.crossed_filesystems);
  EXPECT_FALSE(Exists(source));
  EXPECT_EQ(Lstat(root_ + "/permits/a-2.txt").st_ino, inode);
  EXPECT_EQ(Lstat(root_ + "/permits/a-2.txt").st_nlink, 1u);
  EXPECT_EQ(ReadFile(root_ + "/permits/a.txt"), "already here");

  // The copy path's temporary file takes its name the same way.
  ForceCopy force;
  EXPECT_EQ(DeliverInto(Inbox("a.txt", "copied"), "permits", DeliveryMode::kMove, &d),
            root_ + "/permits/a-3.txt");
  EXPECT_TRUE(d.crossed_filesystems);
  EXPECT_EQ(ReadFile(root_ + "/permits/a-3.txt"), "copied");
  EXPECT_EQ(ReadFile(root_ + "/permits/a.txt"), "already here");
  EXPECT_FALSE(HasTemporary(root_ + "/permits"));
}

// --- Across filesystems ---

// The sources on /dev/shm (a tmpfs), the destination below the build
// folder: two filesystems, asserted by their st_dev.
class AcrossFilesystemsTest : public FileDeliveryTest {
 protected:
  void SetUp() override {
    FileDeliveryTest::SetUp();
    if (HasFatalFailure()) return;
    shm = ShmFolder();
    if (shm.empty()) {
      GTEST_SKIP() << "no second filesystem: /dev/shm is missing or on the same "
                      "filesystem as the build folder";
    }
    ASSERT_NE(Lstat(shm).st_dev, Lstat(root_).st_dev);
  }
  std::string shm;
};

TEST_F(AcrossFilesystemsTest, MoveCopiesAndRemovesTheSource) {

  // 1 MiB + 17 bytes of seeded random bytes: more than one read buffer.
  std::mt19937 rng(20261202);
  std::string bytes(1048576 + 17, '\0');
  for (char& c : bytes) c = static_cast<char>(rng() & 0xFF);
  const std::string source = shm + "/big.bin";
  WriteFile(source, bytes);
  const struct timespec times[2] = {{1700000000, 0}, {1650000000, 5}};
  ASSERT_EQ(::utimensat(AT_FDCWD, source.c_str(), times, 0), 0);

  Delivered d;
  const std::string dest = DeliverInto(source, "permits", DeliveryMode::kMove, &d);
  EXPECT_TRUE(d.crossed_filesystems);
  EXPECT_FALSE(Exists(source));
  EXPECT_EQ(Sha256Hex(ReadFile(dest)), Sha256Hex(bytes));
  EXPECT_EQ(Lstat(dest).st_size, static_cast<off_t>(bytes.size()));
  EXPECT_EQ(Lstat(dest).st_mtim.tv_sec, 1650000000);
  EXPECT_FALSE(HasTemporary(root_ + "/permits"));

  // A taken name across filesystems: the next one, nothing overwritten.
  WriteFile(shm + "/big.bin", "another");
  EXPECT_EQ(DeliverInto(shm + "/big.bin", "permits", DeliveryMode::kMove),
            root_ + "/permits/big-2.bin");
  EXPECT_EQ(Sha256Hex(ReadFile(dest)), Sha256Hex(bytes));
  EXPECT_EQ(ReadFile(root_ + "/permits/big-2.bin"), "another");
  EXPECT_FALSE(Exists(shm + "/big.bin"));
  EXPECT_FALSE(HasTemporary(root_ + "/permits"));
}

TEST_F(AcrossFilesystemsTest, CopyKeepsTheSource) {
  const std::string source = shm + "/a.txt";
  WriteFile(source, "across");
  Delivered d;
  const std::string dest = DeliverInto(source, "permits", DeliveryMode::kCopy, &d);
  EXPECT_EQ(ReadFile(source), "across");
  EXPECT_EQ(ReadFile(dest), "across");
  EXPECT_FALSE(d.crossed_filesystems);
}

TEST_F(AcrossFilesystemsTest, LinkIsRefused) {
  const std::string source = shm + "/a.txt";
  WriteFile(source, "stay");
  Delivered d;
  Status s = Deliver(source, Choose("permits", "a.txt"), DeliveryMode::kLink, &d);
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_NE(s.message().find("another filesystem"), std::string::npos) << s.message();
  EXPECT_NE(s.message().find(source), std::string::npos) << s.message();
  EXPECT_EQ(s.message().find('\n'), std::string::npos);
  EXPECT_EQ(ReadFile(source), "stay");
  EXPECT_TRUE(Names(root_ + "/permits").empty());
}

// --- Hostile names and links ---

TEST_F(FileDeliveryTest, HostileNamesAreKept) {
  std::string utf8_long;
  for (int i = 0; i < 125; ++i) utf8_long += "\xC3\xA9";
  utf8_long += ".txt";  // 254 bytes
  const std::vector<std::string> names = {
      "my letter.txt", "line\nbreak.txt", "-rf", "--help.txt",
      std::string(251, 'n') + ".txt",  // 255 bytes
      utf8_long, "\xFF\xFE latin-1 \xE9.txt", " leading space", "trailing.",
  };
  for (bool force : {false, true}) {
    if (force) ::setenv("CHUTE_TEST_FORCE_COPY", "1", 1);
    const std::string folder = force ? "copied" : "renamed";
    for (const std::string& name : names) {
      const std::string source = Inbox(name, "bytes of " + name);
      Delivered d;
      EXPECT_EQ(DeliverInto(source, folder, DeliveryMode::kMove, &d),
                root_ + "/" + folder + "/" + name);
      EXPECT_EQ(d.crossed_filesystems, force);
      EXPECT_FALSE(Exists(source));
      EXPECT_EQ(ReadFile(root_ + "/" + folder + "/" + name), "bytes of " + name);
    }
    ::unsetenv("CHUTE_TEST_FORCE_COPY");
    EXPECT_EQ(Names(root_ + "/" + folder).size(), names.size());
  }
}

TEST_F(FileDeliveryTest, A255ByteNameThatIsTakenIsShortenedToFit) {
  const std::string name = std::string(251, 'n') + ".txt";
  std::string utf8_name;
  for (int i = 0; i < 125; ++i) utf8_name += "\xC3\xA9";
  utf8_name += ".txt";
  const std::string latin1 = std::string(251, '\xE9') + ".txt";  // not UTF-8
  for (const std::string& n : {name, utf8_name, latin1}) {
    fs::create_directories(root_ + "/permits");
    WriteFile(root_ + "/permits/" + n, "first");
    const std::string dest = DeliverInto(Inbox(n, "second"), "permits", DeliveryMode::kMove);
    const std::string got = fs::path(dest).filename().string();
    EXPECT_LE(got.size(), 255u);
    EXPECT_EQ(got, NumberedName(n, 2, 255));
    EXPECT_EQ(got.substr(got.size() - 6), "-2.txt");
    EXPECT_EQ(IsValidUtf8(got), IsValidUtf8(n));
    EXPECT_EQ(ReadFile(dest), "second");
    EXPECT_EQ(ReadFile(root_ + "/permits/" + n), "first");
  }
}

TEST_F(FileDeliveryTest, ASymbolicLinkAsSourceIsRefused) {
  const std::string target = top_ + "/target.txt";
  WriteFile(target, "not mine to move");
  const std::string link = inbox_ + "/link.txt";
  fs::create_symlink(target, link);
  for (DeliveryMode mode : {DeliveryMode::kMove, DeliveryMode::kCopy, DeliveryMode::kLink}) {
    Delivered d;
    Status s = Deliver(link, Choose("permits", "link.txt"), mode, &d);
    EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
    EXPECT_NE(s.message().find("symbolic link"), std::string::npos) << s.message();
  }
  {
    ForceCopy force;
    Delivered d;
    EXPECT_FALSE(Deliver(link, Choose("permits", "link.txt"), DeliveryMode::kMove, &d).ok());
  }
  EXPECT_TRUE(fs::is_symlink(link));
  EXPECT_EQ(ReadFile(target), "not mine to move");
  EXPECT_TRUE(Names(root_ + "/permits").empty());
}

TEST_F(FileDeliveryTest, AQueueFolderReplacedByALinkIsRefused) {
  const std::string elsewhere = top_ + "/elsewhere";
  fs::create_directory(elsewhere);
  fs::create_directory_symlink(elsewhere, root_ + "/permits");
  const std::string source = Inbox("a.txt", "stays");

  std::string d;
  Status chosen = ChooseDestination(root_, "permits", "a.txt", &d);
  EXPECT_EQ(chosen.code(), Status::Code::kInvalidArgument);
  EXPECT_EQ(chosen.message(), root_ + "/permits is a symbolic link; refusing to deliver there");

  for (DeliveryMode mode : {DeliveryMode::kMove, DeliveryMode::kCopy, DeliveryMode::kLink}) {
    Delivered out;
    Status s = Deliver(source, root_ + "/permits/a.txt", mode, &out);
    EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
    EXPECT_EQ(s.message(), root_ + "/permits is a symbolic link; refusing to deliver there");
  }
  EXPECT_TRUE(Names(elsewhere).empty());
  EXPECT_EQ(ReadFile(source), "stays");

  // A file where the folder should be: refused too.
  WriteFile(root_ + "/billing", "not a folder");
  Delivered out;
  Status s = Deliver(source, root_ + "/billing/a.txt", DeliveryMode::kMove, &out);
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_NE(s.message().find("not a folder"), std::string::npos) << s.message();
  EXPECT_EQ(ReadFile(root_ + "/billing"), "not a folder");
  EXPECT_EQ(ReadFile(source), "stays");
}

TEST_F(FileDeliveryTest, AMissingSourceIsNotFound) {
  Delivered d;
  Status s = Deliver(inbox_ + "/gone.txt", Choose("permits", "gone.txt"), DeliveryMode::kMove,
                     &d);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  EXPECT_NE(s.message().find(inbox_ + "/gone.txt"), std::string::npos);
  fs::create_directory(inbox_ + "/sub");
  s = Deliver(inbox_ + "/sub", Choose("permits", "sub"), DeliveryMode::kMove, &d);
  EXPECT_EQ(s.code(), Status::Code::kInvalidArgument);
  EXPECT_TRUE(fs::is_directory(inbox_ + "/sub"));
}

// --- Finishing a logged delivery after a crash ---

class FinishPendingTest : public FileDeliveryTest {
 protected:
  void SetUp() override {
    FileDeliveryTest::SetUp();
    fs::create_directory(root_ + "/permits");
    source_ = Inbox("a.txt", kBytes);
    destination_ = root_ + "/permits/a.txt";
    digest_ = Sha256Hex(kBytes);
  }

  PendingState Finish(DeliveryMode mode, Delivered* out) {
    PendingState state = PendingState::kLost;
    Status s = FinishPending(source_, destination_, mode, digest_, &state, out);
    EXPECT_TRUE(s.ok()) << s.message();
    return state;
  }

  static constexpr const char* kBytes = "the document's bytes";
  std::string source_, destination_, digest_;
};

TEST_F(FinishPendingTest, SourceOnlyIsDeliveredNow) {
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kNotStarted);
  EXPECT_EQ(d.destination, destination_);
  EXPECT_FALSE(Exists(source_));
  EXPECT_EQ(ReadFile(destination_), kBytes);
}

TEST_F(FinishPendingTest, DestinationOnlyIsDone) {
  ASSERT_EQ(::rename(source_.c_str(), destination_.c_str()), 0);
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kDone);
  EXPECT_EQ(d.destination, destination_);
  EXPECT_EQ(ReadFile(destination_), kBytes);
  EXPECT_EQ(Names(root_ + "/permits"), (std::vector<std::string>{"a.txt"}));
}

TEST_F(FinishPendingTest, BothAfterALinkRemovesTheSource) {
  // A crash between link() and unlink() of the fallback.
  ASSERT_EQ(::link(source_.c_str(), destination_.c_str()), 0);
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kBothThere);
  EXPECT_FALSE(Exists(source_));
  EXPECT_EQ(ReadFile(destination_), kBytes);
  EXPECT_EQ(Lstat(destination_).st_nlink, 1u);
}

TEST_F(FinishPendingTest, BothAfterACopyRemovesTheSource) {
  // A crash after the copy got its name, before the source was removed.
  WriteFile(destination_, kBytes);
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kBothThere);
  EXPECT_FALSE(Exists(source_));
  EXPECT_EQ(ReadFile(destination_), kBytes);
}

TEST_F(FinishPendingTest, ADifferentFileAtTheDestinationIsLeftAndTheSourceDeliveredBeside) {
  WriteFile(destination_, "someone else's document");
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kNotStarted);
  EXPECT_EQ(d.destination, root_ + "/permits/a-2.txt");
  EXPECT_EQ(ReadFile(d.destination), kBytes);
  EXPECT_EQ(ReadFile(destination_), "someone else's document");
  EXPECT_FALSE(Exists(source_));
}

TEST_F(FinishPendingTest, NeitherIsLost) {
  ASSERT_EQ(::unlink(source_.c_str()), 0);
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kLost);
  EXPECT_TRUE(Names(root_ + "/permits").empty());
}

TEST_F(FinishPendingTest, ANewFileAtTheSourcePathIsNotTakenForTheDocument) {
  WriteFile(source_, "a newer document with the same name");
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kLost);
  EXPECT_EQ(ReadFile(source_), "a newer document with the same name");
  EXPECT_TRUE(Names(root_ + "/permits").empty());

  // Delivered before, and a new file at the source: done, the new file
  // stays for the next run.
  WriteFile(destination_, kBytes);
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kDone);
  EXPECT_EQ(ReadFile(source_), "a newer document with the same name");
}

TEST_F(FinishPendingTest, CopyAndLinkKeepTheSource) {
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kCopy, &d), PendingState::kNotStarted);
  EXPECT_EQ(ReadFile(source_), kBytes);
  EXPECT_EQ(ReadFile(destination_), kBytes);
  EXPECT_EQ(Finish(DeliveryMode::kCopy, &d), PendingState::kDone);
  EXPECT_EQ(ReadFile(source_), kBytes);
  ASSERT_EQ(::unlink(destination_.c_str()), 0);
  EXPECT_EQ(Finish(DeliveryMode::kLink, &d), PendingState::kNotStarted);
  EXPECT_EQ(Lstat(destination_).st_ino, Lstat(source_).st_ino);
  EXPECT_EQ(Finish(DeliveryMode::kLink, &d), PendingState::kDone);
  EXPECT_TRUE(Exists(source_));
}

TEST_F(FinishPendingTest, ASymbolicLinkAtTheDestinationIsNotTheDocument) {
  const std::string copy = top_ + "/copy.txt";
  WriteFile(copy, kBytes);  // the right bytes, behind a link
  fs::create_symlink(copy, destination_);
  Delivered d;
  EXPECT_EQ(Finish(DeliveryMode::kMove, &d), PendingState::kNotStarted);
  EXPECT_EQ(d.destination, root_ + "/permits/a-2.txt");
  EXPECT_TRUE(fs::is_symlink(destination_));
  EXPECT_EQ(ReadFile(copy), kBytes);
}

// --- Temporary files left by a crash ---

TEST_F(FileDeliveryTest, CleanTemporaryFilesRemovesOnlyChutesTemporaryFiles) {
  const std::string q = root_ + "/permits";
  const std::string r = root_ + "/_review";
  fs::create_directory(q);
  fs::create_directory(r);
  WriteFile(q + "/.chute-tmp-0123456789abcdef", "half");
  WriteFile(r + "/.chute-tmp-fedcba9876543210", "half");
  WriteFile(q + "/a.txt", "keep");
  WriteFile(q + "/.chute-tmpx", "keep: not the prefix");
  WriteFile(q + "/.hidden", "keep");
  WriteFile(q + "/chute-tmp-1", "keep");
  fs::create_directory(q + "/.chute-tmp-folder");  // not a file: kept
  WriteFile(root_ + "/.chute-tmp-in-root", "keep: not in a folder below");
  // A linked folder below the root is not followed.
  const std::string elsewhere = top_ + "/elsewhere";
  fs::create_directory(elsewhere);
  WriteFile(elsewhere + "/.chute-tmp-outside", "keep");
  fs::create_directory_symlink(elsewhere, root_ + "/linked");

  int64_t removed = -1;
  Status s = CleanTemporaryFiles(root_, &removed);
  ASSERT_TRUE(s.ok()) << s.message();
  EXPECT_EQ(removed, 2);
  EXPECT_EQ(Names(q), (std::vector<std::string>{".chute-tmp-folder", ".chute-tmpx", ".hidden",
                                                "a.txt", "chute-tmp-1"}));
  EXPECT_TRUE(Names(r).empty());
  EXPECT_TRUE(Exists(root_ + "/.chute-tmp-in-root"));
  EXPECT_TRUE(Exists(elsewhere + "/.chute-tmp-outside"));

  EXPECT_TRUE(CleanTemporaryFiles(root_, &removed).ok());
  EXPECT_EQ(removed, 0);
}

}  // namespace
}  // namespace chute
