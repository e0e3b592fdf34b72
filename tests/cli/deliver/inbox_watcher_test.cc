#include "cli/deliver/inbox_watcher.h"

#include <fcntl.h>
#include <gtest/gtest.h>
#include <signal.h>
#include <sys/stat.h>
#include <unistd.h>

#include <chrono>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <map>
#include <set>
#include <string>
#include <thread>
#include <vector>

namespace chute {
namespace {

namespace fs = std::filesystem;
using std::chrono::milliseconds;
using Clock = std::chrono::steady_clock;

// Short intervals, so that scans and second looks happen within a test.
constexpr milliseconds kSettle{300};
constexpr milliseconds kRescan{400};

class InboxWatcherTest : public ::testing::Test {
 protected:
  void SetUp() override {
    std::string tmpl = (fs::temp_directory_path() / "chute-watch-XXXXXX").string();
    ASSERT_NE(::mkdtemp(tmpl.data()), nullptr);
    root_ = tmpl;
    inbox_ = root_ / "inbox";
    outside_ = root_ / "outside";
    fs::create_directory(inbox_);
    fs::create_directory(outside_);
  }
  void TearDown() override { fs::remove_all(root_); }

  void Open(bool recursive = false, StopRequest* stop = nullptr,
            milliseconds rescan = milliseconds(60'000)) {
    InboxWatchOptions o;
    o.folder = inbox_.string();
    o.recursive = recursive;
    o.rescan_interval = rescan;
    o.settle_time = kSettle;
    o.stop = stop;
    Status s = InboxWatcher::Open(o, &watcher_);
    ASSERT_TRUE(s.ok()) << s.message();
  }

  // Everything handed out (relative paths) and reported within `wait`.
  std::vector<std::string> Collect(milliseconds wait, std::vector<WalkProblem>* problems = nullptr) {
    std::vector<std::string> got;
    const Clock::time_point end = Clock::now() + wait;
    for (;;) {
      auto left = std::chrono::duration_cast<milliseconds>(end - Clock::now());
      if (left.count() <= 0) break;
      std::vector<InputFile> files;
      std::vector<WalkProblem> found;
      bool stopped = false;
      Status s = watcher_->Next(&files, &found, &stopped, left);
      EXPECT_TRUE(s.ok()) << s.message();
      if (!s.ok() || stopped) break;
      for (const InputFile& f : files) {
        EXPECT_EQ(f.path, (inbox_ / f.relative).string());
        got.push_back(f.relative);
      }
      if (problems != nullptr) problems->insert(problems->end(), found.begin(), found.end());
    }
    return got;
  }

  // The first batch handed out, waiting at most `wait`.
  std::vector<std::string> NextBatch(milliseconds wait) {
    std::vector<InputFile> files;
    std::vector<WalkProblem> problems;
    bool stopped = false;
    Status s = watcher_->Next(&files, &problems, &stopped, wait);
    EXPECT_TRUE(s.ok()) << s.message();
    std::vector<std::string> got;
    for (const InputFile& f : files) got.push_back(f.relative);
    return got;
  }

  static void Write(const fs::path& p, const std::string& text) {
    std::ofstream out(p, std::ios::binary);
    out << text;
  }

  fs::path root_, inbox_, outside_;
  std::unique_ptr<InboxWatcher> watcher_;
};

using Names = std::vector<std::string>;

TEST_F(InboxWatcherTest, AFileClosedAfterWritingIsHandedOutOnce) {
  Open(false, nullptr, kRescan);
  Write(inbox_ / "letter.txt", "harbour dues");
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"letter.txt"});
  // Rescans see it unchanged: not again.
  EXPECT_EQ(Collect(3 * kRescan), Names{});
  // Written again: handed out again.
  Write(inbox_ / "letter.txt", "harbour dues, second notice");
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"letter.txt"});
  EXPECT_EQ(watcher_->stats().handed_out, 2);
}

TEST_F(InboxWatcherTest, AHardLinkMadeToAFileHandedOutDoesNotHandItOutAgain) {
  Open(false, nullptr, kRescan);
  Write(inbox_ / "linked.txt", "delivered by a hard link");
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"linked.txt"});
  // What `watch --link` does: the inode's ctime changes, its bytes do not.
  fs::create_hard_link(inbox_ / "linked.txt", outside_ / "linked.txt");
  EXPECT_EQ(Collect(3 * kRescan + kSettle), Names{});
}

TEST_F(InboxWatcherTest, AFileMovedInIsHandedOut) {
  Open();
  Write(outside_ / "permit.txt", "berth permit");
  fs::rename(outside_ / "permit.txt", inbox_ / "permit.txt");
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"permit.txt"});
}

TEST_F(InboxWatcherTest, DotNamesAreSkippedUntilRenamed) {
  Open(false, nullptr, kRescan);
  Write(inbox_ / ".part-1", "half of a lett");
  Write(inbox_ / ".chute-tmp-abc", "chute's own");
  fs::create_directory(inbox_ / ".hidden");
  Write(inbox_ / ".hidden" / "x.txt", "in a hidden folder");
  EXPECT_EQ(Collect(2 * kRescan + kSettle), Names{});
  fs::rename(inbox_ / ".part-1", inbox_ / "letter.txt");
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"letter.txt"});
}

TEST_F(InboxWatcherTest, SymbolicLinksAreReportedOnceAndNotFollowed) {
  Write(outside_ / "target.txt", "not in the inbox");
  Open(false, nullptr, kRescan);
  fs::create_symlink(outside_ / "target.txt", inbox_ / "link.txt");
  fs::create_directory_symlink(outside_, inbox_ / "linked-folder");
  std::vector<WalkProblem> problems;
  EXPECT_EQ(Collect(3 * kRescan + kSettle, &problems), Names{});
  std::multiset<std::string> reported;
  for (const WalkProblem& p : problems) {
    reported.insert(fs::path(p.path).filename().string());
    EXPECT_EQ(p.reason, "symbolic link, not followed");
  }
  EXPECT_EQ(reported, (std::multiset<std::string>{"link.txt", "linked-folder"}));
  // A link moved in is not followed either.
  fs::create_symlink(outside_ / "target.txt", outside_ / "link2.txt");
  fs::rename(outside_ / "link2.txt", inbox_ / "link2.txt");
  problems.clear();
  EXPECT_EQ(Collect(milliseconds(500), &problems), Names{});
  ASSERT_EQ(problems.size(), 1u);
  EXPECT_EQ(fs::path(problems[0].path).filename(), "link2.txt");
}

TEST_F(InboxWatcherTest, AFileStillOpenForWritingWaitsForItsClose) {
  Open(false, nullptr, kRescan);
  int fd = ::open((inbox_ / "slow.txt").c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  ASSERT_GE(fd, 0);
  ASSERT_EQ(::write(fd, "first half, ", 12), 12);
  // Rescans and second looks pass while it stays open and unchanged.
  EXPECT_EQ(Collect(3 * kRescan + 2 * kSettle), Names{});
  ASSERT_EQ(::write(fd, "second half", 11), 11);
  ::close(fd);
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"slow.txt"});
  EXPECT_EQ(fs::file_size(inbox_ / "slow.txt"), 23u);
}

TEST_F(InboxWatcherTest, AFileFoundByAScanIsHandedOutWhenItStaysUnchanged) {
  // Written before the watch: no event will ever say it is complete.
  Write(inbox_ / "old.txt", "waiting since yesterday");
  Open();
  const Clock::time_point t0 = Clock::now();
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"old.txt"});
  EXPECT_GE(Clock::now() - t0, kSettle);
}

TEST_F(InboxWatcherTest, AFileThatChangesBetweenTwoLooksWaitsAgain) {
  Write(inbox_ / "remote.txt", "written by another machine");
  Open();
  // Its mtime changes without an event inotify reports here (touch makes
  // IN_ATTRIB, which is not watched), as a write on a network filesystem.
  const Clock::time_point t0 = Clock::now();
  std::thread toucher([&] {
    std::this_thread::sleep_for(kSettle / 2);
    struct timespec times[2] = {{0, UTIME_NOW}, {0, UTIME_NOW}};
    ::utimensat(AT_FDCWD, (inbox_ / "remote.txt").c_str(), times, 0);
  });
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"remote.txt"});
  toucher.join();
  // The first look at t0, the change at settle/2, seen at the second look
  // (settle); unchanged at the third (2 settle).
  EXPECT_GE(Clock::now() - t0, 2 * kSettle);
}

TEST_F(InboxWatcherTest, ARemovedFileIsNotHandedOut) {
  Write(inbox_ / "gone.txt", "here for a moment");
  Open();
  fs::remove(inbox_ / "gone.txt");
  EXPECT_EQ(Collect(3 * kSettle), Names{});
}

TEST_F(InboxWatcherTest, FoldersBelowAreOnlyWatchedWhenRecursive) {
  fs::create_directory(inbox_ / "sub");
  Open(false);
  Write(inbox_ / "sub" / "a.txt", "below");
  Write(inbox_ / "top.txt", "at the top");
  EXPECT_EQ(Collect(2 * kSettle), Names{"top.txt"});
}

TEST_F(InboxWatcherTest, AFolderCreatedLaterIsWatchedAndScanned) {
  Open(true);
  fs::create_directory(inbox_ / "day1");
  Write(inbox_ / "day1" / "a.txt", "first");
  // A deep tree made at once: files may land before their folder's watch.
  fs::create_directories(inbox_ / "day2" / "x" / "y");
  Write(inbox_ / "day2" / "x" / "y" / "b.txt", "deep");
  std::set<std::string> got;
  for (const std::string& n : Collect(3 * kSettle)) EXPECT_TRUE(got.insert(n).second) << n;
  EXPECT_EQ(got, (std::set<std::string>{"day1/a.txt", "day2/x/y/b.txt"}));
  // Written after the watches exist: by event.
  Write(inbox_ / "day2" / "x" / "c.txt", "later");
  EXPECT_EQ(NextBatch(milliseconds(5000)), Names{"day2/x/c.txt"});
}

TEST_F(InboxWatcherTest, AFolderMovedAwayOrRenamedKeepsPathsRight) {
  fs::create_directory(inbox_ / "sub");
  Open(true);
  fs::rename(inbox_ / "sub", outside_ / "sub");
  Write(outside_ / "sub" / "not-mine.txt", "elsewhere now");
  EXPECT_EQ(Collect(2 * kSettle), Names{});
  fs::rename(outside_ / "sub", inbox_ / "back");
  // Moved in with a file already inside: found by the folder's scan.
  Write(inbox_ / "back" / "new.txt", "after the move");
  std::set<std::string> got;
  for (const std::string& n : Collect(3 * kSettle)) got.insert(n);
  EXPECT_EQ(got, (std::set<std::string>{"back/not-mine.txt", "back/new.txt"}));
}

TEST_F(InboxWatcherTest, ALostEventQueueIsMadeGoodByARescan) {
  // Fill the kernel's event queue past its limit while nobody reads: small
  // writes to files in turn make one IN_MODIFY each (the kernel merges an
  // event only with the one before it, which is another file's); the
  // closes that say the files are complete are then lost.
  long limit = 0;
  std::ifstream("/proc/sys/fs/inotify/max_queued_events") >> limit;
  if (limit <= 0 || limit > 1'000'000) GTEST_SKIP() << "max_queued_events is " << limit;
  Open();
  EXPECT_EQ(Collect(milliseconds(50)), Names{});  // the first scan: nothing there
  constexpr int kFiles = 64;
  std::vector<int> fds;
  for (int i = 0; i < kFiles; ++i) {
    fds.push_back(::open((inbox_ / ("f" + std::to_string(i))).c_str(),
                         O_WRONLY | O_CREAT | O_TRUNC, 0644));
    ASSERT_GE(fds.back(), 0);
  }
  const long rounds = limit / kFiles + 2;
  for (long r = 0; r < rounds; ++r) {
    for (int fd : fds) ASSERT_EQ(::write(fd, "x", 1), 1);
  }
  for (int fd : fds) ::close(fd);
  std::map<std::string, int> seen;
  const Clock::time_point end = Clock::now() + milliseconds(20'000);
  while (static_cast<int>(seen.size()) < kFiles && Clock::now() < end) {
    for (const std::string& name : NextBatch(milliseconds(1000))) ++seen[name];
  }
  EXPECT_GE(watcher_->stats().overflows, 1);
  EXPECT_GE(watcher_->stats().scans, 2);
  EXPECT_EQ(static_cast<int>(seen.size()), kFiles);
  for (const auto& [name, count] : seen) {
    EXPECT_EQ(count, 1) << name;
    EXPECT_EQ(fs::file_size(inbox_ / name), static_cast<uintmax_t>(rounds)) << name;
  }
  EXPECT_EQ(Collect(2 * kSettle), Names{});
}

TEST_F(InboxWatcherTest, ARescanSoonFindsFilesNoEventReported) {
  Open(false, nullptr, milliseconds(60'000));
  EXPECT_EQ(Collect(kSettle), Names{});  // the first scan: nothing there
  // A hard link makes IN_CREATE only (not watched): no close, no move.
  Write(outside_ / "linked.txt", "linked in");
  fs::create_hard_link(outside_ / "linked.txt", inbox_ / "linked.txt");
  EXPECT_EQ(Collect(2 * kSettle), Names{});
  watcher_->RescanSoon();
  EXPECT_EQ(Collect(3 * kSettle), Names{"linked.txt"});
}

TEST_F(InboxWatcherTest, AStopRequestEndsTheWait) {
  std::unique_ptr<StopRequest> stop;
  ASSERT_TRUE(StopRequest::Create(false, &stop).ok());
  Open(false, stop.get());
  std::thread asker([&] {
    std::this_thread::sleep_for(milliseconds(100));
    stop->Request();
  });
  std::vector<InputFile> files;
  std::vector<WalkProblem> problems;
  bool stopped = false;
  ASSERT_TRUE(watcher_->Next(&files, &problems, &stopped).ok());
  asker.join();
  EXPECT_TRUE(stopped);
  EXPECT_TRUE(files.empty());
  EXPECT_TRUE(stop->Requested());
  EXPECT_EQ(stop->signal(), 0);
}

TEST_F(InboxWatcherTest, SigtermEndsTheWaitWithoutEndingTheProcess) {
  std::unique_ptr<StopRequest> stop;
  ASSERT_TRUE(StopRequest::Create(true, &stop).ok());
  Open(false, stop.get());
  // Started after Create: the thread inherits the blocked signals, so the
  // process-directed SIGTERM stays pending for the signalfd.
  std::thread sender([] {
    std::this_thread::sleep_for(milliseconds(100));
    ::kill(::getpid(), SIGTERM);
  });
  std::vector<InputFile> files;
  std::vector<WalkProblem> problems;
  bool stopped = false;
  ASSERT_TRUE(watcher_->Next(&files, &problems, &stopped).ok());
  sender.join();
  EXPECT_TRUE(stopped);
  EXPECT_EQ(stop->signal(), SIGTERM);
  // A ready file is left for the next run: Next stops first.
  Write(inbox_ / "late.txt", "after the stop");
  files.clear();
  ASSERT_TRUE(watcher_->Next(&files, &problems, &stopped).ok());
  EXPECT_TRUE(stopped);
  EXPECT_TRUE(files.empty());
}

TEST_F(InboxWatcherTest, AMissingInboxIsRefused) {
  InboxWatchOptions o;
  o.folder = (root_ / "nowhere").string();
  std::unique_ptr<InboxWatcher> w;
  Status s = InboxWatcher::Open(o, &w);
  EXPECT_EQ(s.code(), Status::Code::kNotFound);
  EXPECT_NE(s.message().find("nowhere"), std::string::npos);
}

TEST_F(InboxWatcherTest, TheInboxRemovedEndsTheWatchWithAnError) {
  Open();
  fs::rename(inbox_, root_ / "inbox-moved");
  std::vector<InputFile> files;
  std::vector<WalkProblem> problems;
  bool stopped = false;
  Status s = watcher_->Next(&files, &problems, &stopped, milliseconds(5000));
  EXPECT_FALSE(s.ok());
  EXPECT_NE(s.message().find("moved away"), std::string::npos) << s.message();
}

}  // namespace
}  // namespace chute
