// chute forget and chute correct, end to end: exactness against stores built
// without the change, erasure checked in the raw bytes of the store files,
// naming documents, and corrections files with every kind of bad line.
#include <gtest/gtest.h>
#include <sqlite3.h>

#include <cctype>
#include <filesystem>
#include <map>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "cli/read/sha256.h"
#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

class ForgetCorrectTest : public ::testing::Test {
 protected:
  RunResult Chute(std::vector<std::string> args,
                  const std::string& input = "") {
    return RunChute(args, dir_.path(), input);
  }
  void Init(const std::string& db) {
    RunResult r = Chute({"init", "--db", db});
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  // A small harbour: three queues, a few letters each, in ROOT/<queue>/.
  void WriteTree(const std::string& root) {
    dir_.Write(root + "/berths/b1.txt",
               "berth booking for the vessel Aurora, pier 4");
    dir_.Write(root + "/berths/b2.txt",
               "please reserve a berth at pier 2 for two nights");
    dir_.Write(root + "/berths/b3.txt",
               "berth reservation cancelled, vessel delayed");
    dir_.Write(root + "/billing/i1.txt",
               "invoice 4471 unpaid, harbour dues for March");
    dir_.Write(root + "/billing/i2.txt",
               "refund of the berth deposit, invoice attached");
    dir_.Write(root + "/billing/i3.txt",
               "dues statement and late fee on the invoice");
    dir_.Write(root + "/marina/m1.txt",
               "mooring buoy for a sailing yacht, marina pontoon");
    dir_.Write(root + "/marina/m2.txt",
               "pontoon electricity at the marina is out");
  }
  std::string Route(const std::string& db) {
    RunResult r = Chute(
        {"route", "--db", db, "inbox", "--format", "jsonl", "--top", "10"});
    EXPECT_EQ(r.exit_code, 0) << r.err;
    return WithoutModelVersion(r.out);
  }
  void WriteInbox() {
    dir_.Write("inbox/1.txt", "invoice for the berth at pier 4");
    dir_.Write("inbox/2.txt", "marina pontoon mooring for a yacht, dues");
    dir_.Write("inbox/3.txt", "vessel delayed, reservation of a berth");
  }
  std::vector<json> JsonLines(const std::string& out) {
    std::vector<json> rows;
    for (const std::string& line : Lines(out))
      rows.push_back(json::parse(line));
    return rows;
  }
  TempDir dir_;
};

// The document is planted with a unique word in its text and its file name;
// after forget, neither the store file nor its -wal or -shm file holds it.
TEST_F(ForgetCorrectTest, ForgetErasesThePlantedStringFromEveryStoreFile) {
  Init("s.db");
  WriteTree("l");
  const std::string planted = "zqxunique1234";
  dir_.Write("l/billing/" + planted + "-letter.txt",
             "invoice query from " + planted + " about harbour dues");
  RunResult learn = Chute({"learn", "--db", "s.db", "--tree", "l"});
  ASSERT_EQ(learn.exit_code, 0) << learn.err;
  const std::string db = dir_.path() + "/s.db";
  // A second connection, open throughout, for the -shm and -wal files to
  // be searched while they exist.
  sqlite3* raw = nullptr;
  ASSERT_EQ(sqlite3_open_v2(db.c_str(), &raw, SQLITE_OPEN_READWRITE, nullptr),
            SQLITE_OK);
  ASSERT_EQ(sqlite3_exec(raw, "SELECT COUNT(*) FROM ledger", nullptr, nullptr,
                         nullptr),
            SQLITE_OK);
  // The store keeps the letter's text compressed: the compressed blob is
  // looked for as well as the plain string.
  std::string packed;
  {
    sqlite3_stmt* st = nullptr;
    ASSERT_EQ(sqlite3_prepare_v2(raw, "SELECT text FROM ledger WHERE source LIKE ?", -1, &st,
                                 nullptr),
              SQLITE_OK);
    const std::string like = "%" + planted + "%";
    sqlite3_bind_text(st, 1, like.c_str(), -1, SQLITE_TRANSIENT);
    ASSERT_EQ(sqlite3_step(st), SQLITE_ROW);
    packed.assign(static_cast<const char*>(sqlite3_column_blob(st, 0)),
                  static_cast<size_t>(sqlite3_column_bytes(st, 0)));
    sqlite3_finalize(st);
  }
  ASSERT_FALSE(packed.empty()) << "the store keeps text by default";
  auto found = [&] {
    std::string where;
    for (const char* suffix : {"", "-wal", "-shm"}) {
      const std::string bytes = ReadBytes(db + suffix);
      if (bytes.find(planted) != std::string::npos)
        where += "[s.db" + std::string(suffix) + "]";
      if (bytes.find(packed) != std::string::npos)
        where += "[text in s.db" + std::string(suffix) + "]";
    }
    return where;
  };
  ASSERT_NE(found().find("[text in s.db"), std::string::npos)
      << "the test must first see the text it looks for";

  RunResult r =
      Chute({"forget", "--db", "s.db", "l/billing/" + planted + "-letter.txt",
             "--by", "records-office"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("by records-office"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("forgot 1 documents"), std::string::npos) << r.out;
  EXPECT_EQ(found(), "");
  // SQLite may already have removed the -wal file when chute closed; if it
  // is there, it was truncated. (StoreChangesTest checks the log while the
  // forgetting connection is still open.)
  if (std::filesystem::exists(db + "-wal")) {
    EXPECT_EQ(std::filesystem::file_size(db + "-wal"), 0u);
  }
  sqlite3_close_v2(raw);
  EXPECT_EQ(found(), "");
}

TEST_F(ForgetCorrectTest, ForgetRoutesLikeAStoreThatNeverLearnedTheDocument) {
  WriteTree("all");
  WriteTree("without");
  std::filesystem::remove(dir_.path() + "/without/billing/i2.txt");
  std::filesystem::remove(dir_.path() + "/without/marina/m2.txt");
  WriteInbox();
  for (const char* name : {"all", "without"}) {
    Init(std::string(name) + ".db");
    RunResult r =
        Chute({"learn", "--db", std::string(name) + ".db", "--tree", name});
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  const std::string before = Route("all.db");
  // One by path, one by a digest prefix.
  const std::string m2 =
      Sha256Hex(ReadBytes(dir_.path() + "/all/marina/m2.txt"));
  RunResult r = Chute({"forget", "--db", "all.db", "all/billing/i2.txt",
                       m2.substr(0, 10), "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<json> rows = JsonLines(r.out);
  ASSERT_EQ(rows.size(), 2u);
  EXPECT_EQ(rows[0]["document"], "all/billing/i2.txt");
  EXPECT_EQ(rows[0]["queue"], "billing");
  EXPECT_EQ(rows[0]["outcome"], "forgotten");
  EXPECT_TRUE(rows[0]["reason"].is_null());
  EXPECT_EQ(rows[1]["digest"], m2);
  EXPECT_EQ(rows[1]["queue"], "marina");
  const std::string after = Route("all.db");
  EXPECT_NE(after, before);
  EXPECT_EQ(after, Route("without.db"));  // every posterior, to the last digit
  RunResult qa = Chute({"queues", "--db", "all.db", "--format", "jsonl"});
  RunResult qw = Chute({"queues", "--db", "without.db", "--format", "jsonl"});
  EXPECT_EQ(qa.out, qw.out);
}

TEST_F(ForgetCorrectTest,
       ForgetReportsUnknownAndAmbiguousNamesWithoutGuessing) {
  Init("s.db");
  // Two documents whose digests share their first 8 hex digits, found by
  // counting up (a birthday search over 32 bits: some 10^5 tries).
  std::map<std::string, std::string> by_prefix;
  std::string a, b;
  for (int i = 0; a.empty(); ++i) {
    std::string text = "berth note " + std::to_string(i);
    auto [it, inserted] = by_prefix.emplace(Sha256Hex(text).substr(0, 8), text);
    if (!inserted) {
      a = it->second;
      b = text;
    }
  }
  dir_.Write("l/berths/a.txt", a);
  dir_.Write("l/berths/b.txt", b);
  dir_.Write("l/billing/c.txt", "invoice");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  const std::string prefix = Sha256Hex(a).substr(0, 8);

  RunResult none =
      Chute({"forget", "--db", "s.db", "nothing-here.txt", prefix});
  EXPECT_EQ(none.exit_code, 1);  // nothing forgotten
  EXPECT_NE(none.err.find("nothing-here.txt: no such file"), std::string::npos)
      << none.err;
  EXPECT_NE(none.err.find("matches several learned documents"),
            std::string::npos)
      << none.err;

  RunResult some = Chute({"forget", "--db", "s.db", prefix, "l/billing/c.txt",
                          "l/billing/c.txt", "--format", "jsonl"});
  EXPECT_EQ(some.exit_code, 3);  // forgotten, but one name refused
  std::vector<json> rows = JsonLines(some.out);
  ASSERT_EQ(rows.size(), 3u);
  EXPECT_EQ(rows[0]["outcome"], "refused");
  EXPECT_TRUE(rows[0]["digest"].is_null());
  EXPECT_EQ(rows[1]["outcome"], "forgotten");
  EXPECT_EQ(rows[2]["outcome"], "duplicate");
  // Both berth documents are still learned; a longer prefix picks one.
  RunResult q = Chute({"queues", "--db", "s.db", "--format", "jsonl"});
  EXPECT_EQ(JsonLines(q.out).at(0)["documents"], 2);
  RunResult one = Chute({"forget", "--db", "s.db", Sha256Hex(b).substr(0, 20)});
  EXPECT_EQ(one.exit_code, 0) << one.err;
}

TEST_F(ForgetCorrectTest, ForgetFallsBackToTheStoredPathOfAChangedFile) {
  Init("s.db");
  WriteTree("l");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  dir_.Write("l/marina/m1.txt", "edited since it was learned");
  RunResult r =
      Chute({"forget", "--db", "s.db", "l/marina/m1.txt", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_EQ(JsonLines(r.out).at(0)["queue"], "marina");
}

TEST_F(ForgetCorrectTest,
       LearningAKnownDocumentUnderAnotherQueueIsACorrection) {
  WriteTree("l");
  WriteInbox();
  Init("s.db");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult r = Chute({"learn", "--db", "s.db", "--queue", "marina",
                       "l/berths/b2.txt", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  json row = JsonLines(r.out).at(0);
  EXPECT_EQ(row["outcome"], "corrected");
  EXPECT_NE(row["reason"].get<std::string>().find("'berths'"),
            std::string::npos);
  // The same model as learning b2 under marina from the start.
  WriteTree("right");
  std::filesystem::create_directories(dir_.path() + "/right/marina");
  std::filesystem::rename(dir_.path() + "/right/berths/b2.txt",
                          dir_.path() + "/right/marina/b2.txt");
  Init("right.db");
  ASSERT_EQ(Chute({"learn", "--db", "right.db", "--tree", "right"}).exit_code,
            0);
  EXPECT_EQ(Route("s.db"), Route("right.db"));
}

TEST_F(ForgetCorrectTest, CorrectionsFileMovesCountsExactly) {
  WriteTree("l");
  WriteInbox();
  Init("s.db");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  const std::string before = Route("s.db");
  const std::string i2 =
      Sha256Hex(ReadBytes(dir_.path() + "/l/billing/i2.txt"));
  dir_.Write("fixes/today.csv", "path,queue\n../l/berths/b3.txt,marina\n" +
                                    i2.substr(0, 12) +
                                    ",berths\n../l/marina/m1.txt,marina\n");
  RunResult r =
      Chute({"correct", "--db", "s.db", "fixes/today.csv", "--by", "j.moreau"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("corrected 2 documents"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("1 already in their queue"), std::string::npos) << r.out;
  EXPECT_NE(r.out.find("by j.moreau"), std::string::npos) << r.out;
  EXPECT_NE(Route("s.db"), before);

  WriteTree("right");
  std::filesystem::rename(dir_.path() + "/right/berths/b3.txt",
                          dir_.path() + "/right/marina/b3.txt");
  std::filesystem::rename(dir_.path() + "/right/billing/i2.txt",
                          dir_.path() + "/right/berths/i2.txt");
  Init("right.db");
  ASSERT_EQ(Chute({"learn", "--db", "right.db", "--tree", "right"}).exit_code,
            0);
  EXPECT_EQ(Route("s.db"), Route("right.db"));
}

TEST_F(ForgetCorrectTest, CorrectionsFileWithBomCrlfQuotesAndBadLines) {
  Init("s.db");
  // Two documents with the same 8-digit digest prefix (see above).
  std::map<std::string, std::string> by_prefix;
  std::string a, b;
  for (int i = 0; a.empty(); ++i) {
    std::string text = "pier note " + std::to_string(i);
    auto [it, inserted] = by_prefix.emplace(Sha256Hex(text).substr(0, 8), text);
    if (!inserted) {
      a = it->second;
      b = text;
    }
  }
  dir_.Write("l/berths/a.txt", a);
  dir_.Write("l/berths/b.txt", b);
  dir_.Write("l/berths/pier, north.txt", "berth at the north pier");
  dir_.Write("l/billing/c.txt", "invoice for dues");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  dir_.Write("new/letter.txt", "a yacht asks for a marina pontoon");
  const std::string prefix = Sha256Hex(a).substr(0, 8);
  const std::string csv =
      "\xEF\xBB\xBF"
      "document,queue\r\n"                        // line 1: BOM, CRLF
      "\"l/berths/pier, north.txt\",billing\r\n"  // 2: quoted, with a comma
      + prefix +
      ",billing\r\n"                   // 3: ambiguous prefix
      "l/billing/c.txt,marina\r\n"     // 4: unknown queue
      "l/billing/c.txt\r\n"            // 5: missing queue field
      "\"new/letter.txt\",berths\r\n"  // 6: unknown, file exists: learned
      "gone.txt,berths\r\n";           // 7: unknown, no file
  dir_.Write("fixes.csv", csv);
  RunResult r =
      Chute({"correct", "--db", "s.db", "fixes.csv", "--format", "jsonl"});
  EXPECT_EQ(r.exit_code, 3) << r.err;
  std::vector<json> rows = JsonLines(r.out);
  ASSERT_EQ(rows.size(), 6u) << r.out;
  EXPECT_EQ(rows[0]["document"], "l/berths/pier, north.txt");
  EXPECT_EQ(rows[0]["from"], "berths");
  EXPECT_EQ(rows[0]["to"], "billing");
  EXPECT_EQ(rows[0]["outcome"], "corrected");
  EXPECT_EQ(rows[1]["outcome"], "refused");
  EXPECT_EQ(rows[2]["outcome"], "refused");
  EXPECT_EQ(rows[3]["outcome"], "refused");
  EXPECT_EQ(rows[4]["outcome"], "learned");
  EXPECT_TRUE(rows[4]["from"].is_null());
  EXPECT_EQ(rows[4]["to"], "berths");
  EXPECT_EQ(rows[5]["outcome"], "refused");
  for (const char* line : {"line 3: ", "line 4: ", "line 5: ", "line 7: "}) {
    EXPECT_NE(r.err.find(std::string("fixes.csv: ") + line), std::string::npos)
        << line << r.err;
  }
  EXPECT_NE(r.err.find("matches several learned documents"), std::string::npos);
  EXPECT_NE(r.err.find("--create-queues"), std::string::npos);
  EXPECT_NE(r.err.find("no queue"), std::string::npos);
  std::map<std::string, int> docs;
  for (const json& q :
       JsonLines(Chute({"queues", "--db", "s.db", "--format", "jsonl"}).out)) {
    docs[q["queue"]] = q["documents"];
  }
  EXPECT_EQ(docs, (std::map<std::string, int>{{"berths", 3}, {"billing", 2}}));

  // With --create-queues the marina line is applied.
  dir_.Write("more.csv", "document,queue\nl/billing/c.txt,marina\n");
  RunResult more =
      Chute({"correct", "--db", "s.db", "more.csv", "--create-queues"});
  EXPECT_EQ(more.exit_code, 0) << more.err;
  EXPECT_NE(more.out.find("marina"), std::string::npos) << more.out;

  // A header without the queue column: the whole file fails, naming line 1.
  dir_.Write("bad.csv",
             "\xEF\xBB\xBF"
             "document,team\r\nl/billing/c.txt,billing\r\n");
  RunResult bad = Chute({"correct", "--db", "s.db", "bad.csv"});
  EXPECT_EQ(bad.exit_code, 1);
  EXPECT_NE(bad.err.find("bad.csv: line 1: the header has no 'queue' column"),
            std::string::npos)
      << bad.err;
}

// The versions the store has made: a change that is refused as a whole
// makes none.
int64_t VersionCount(const std::string& db) {
  sqlite3* raw = nullptr;
  int64_t count = -1;
  if (sqlite3_open_v2(db.c_str(), &raw, SQLITE_OPEN_READONLY, nullptr) ==
      SQLITE_OK) {
    sqlite3_stmt* st = nullptr;
    if (sqlite3_prepare_v2(raw, "SELECT COUNT(*) FROM versions", -1, &st,
                           nullptr) == SQLITE_OK &&
        sqlite3_step(st) == SQLITE_ROW) {
      count = sqlite3_column_int64(st, 0);
    }
    sqlite3_finalize(st);
  }
  sqlite3_close_v2(raw);
  return count;
}

// Files that cannot be read as a corrections file fail whole, exit 1,
// naming the file (and the line where there is one), and change nothing.
TEST_F(ForgetCorrectTest, CorrectionsFileThatCannotBeUsedChangesNothing) {
  WriteTree("l");
  WriteInbox();
  Init("s.db");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  const std::string routed = Route("s.db");
  const int64_t versions = VersionCount(dir_.path() + "/s.db");
  ASSERT_GT(versions, 0);
  const std::vector<std::pair<std::string, std::string>> files = {
      {"", "empty.csv: empty; expected a header"},
      {"\xEF\xBB\xBF", "empty.csv: empty; expected a header"},
      {"document,queue\r\n\"l/berths/b1.txt,marina\r\nl/marina/"
       "m1.txt,berths\r\n",
       "empty.csv: line 3: a quoted field is never closed"},
      {"queue,team\nmarina,l/berths/b1.txt\n",
       "empty.csv: line 1: the header has no 'document' (or 'path') column"},
  };
  for (const auto& [bytes, message] : files) {
    dir_.Write("empty.csv", bytes);
    RunResult r = Chute({"correct", "--db", "s.db", "empty.csv"});
    EXPECT_EQ(r.exit_code, 1) << bytes;
    EXPECT_NE(r.err.find(message), std::string::npos) << bytes << r.err;
    EXPECT_EQ(Lines(r.err).size(), 1u) << r.err;
  }
  RunResult missing = Chute({"correct", "--db", "s.db", "nowhere.csv"});
  EXPECT_EQ(missing.exit_code, 1);
  EXPECT_NE(missing.err.find("nowhere.csv: no such file"), std::string::npos)
      << missing.err;
  // A header and nothing else: done, nothing to do.
  dir_.Write("header.csv", "path,queue\r\n");
  EXPECT_EQ(Chute({"correct", "--db", "s.db", "header.csv"}).exit_code, 0);
  EXPECT_EQ(VersionCount(dir_.path() + "/s.db"), versions);
  EXPECT_EQ(Route("s.db"), routed);
}

// Lines a reviewer's spreadsheet may well produce: columns in another order
// and an extra one, a record spanning lines, a blank line, doubled quotes,
// digest prefixes too short or in capitals, and queue names that can never
// be folders even with --create-queues. Bad lines are refused by their own
// line number; the good ones are applied.
TEST_F(ForgetCorrectTest, CorrectionsFileLinesAreJudgedOneByOne) {
  WriteTree("l");
  Init("s.db");
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  const std::string b1 = Sha256Hex(ReadBytes(dir_.path() + "/l/berths/b1.txt"));
  const std::string i1 =
      Sha256Hex(ReadBytes(dir_.path() + "/l/billing/i1.txt"));
  std::string upper = i1.substr(0, 16);
  for (char& c : upper) c = static_cast<char>(std::toupper(c));
  dir_.Write("l/odd \"name\".txt", "mooring at the marina pontoon");
  const std::vector<std::string> records = {
      "note,queue,document",                       // line 1
      "moved by hand,marina,\"l/berths/b2.txt\"",  // 2
      "\"two\nlines\",marina,l/berths/b3.txt",     // 3-4
      "",                                          // 5: blank
      "too short,berths," + b1.substr(0, 7),       // 6
      "capitals,berths," + upper,                  // 7
      "quotes,marina,\"l/odd \"\"name\"\".txt\"",  // 8: learned
      "reserved,_review,l/marina/m1.txt",          // 9
      "separator,a/b,l/marina/m2.txt",             // 10
      "dots,..,l/marina/m2.txt",                   // 11
      "new queue,customs,l/marina/m2.txt"};        // 12
  std::string csv;
  for (const std::string& record : records) csv += record + "\n";
  dir_.Write("fixes.csv", csv);
  RunResult r = Chute({"correct", "--db", "s.db", "fixes.csv",
                       "--create-queues", "--format", "jsonl"});
  EXPECT_EQ(r.exit_code, 3) << r.err;
  std::vector<json> rows = JsonLines(r.out);
  ASSERT_EQ(rows.size(), 9u) << r.out;
  const std::vector<std::string> outcomes = {
      "corrected", "corrected", "refused", "corrected", "learned",
      "refused",   "refused",   "refused", "corrected"};
  for (size_t i = 0; i < outcomes.size(); ++i) {
    EXPECT_EQ(rows[i]["outcome"], outcomes[i]) << i << ": " << rows[i];
  }
  EXPECT_EQ(rows[4]["document"], "l/odd \"name\".txt");
  EXPECT_EQ(rows[3]["digest"], i1);
  for (const char* line : {"fixes.csv: line 6: ", "fixes.csv: line 9: ",
                           "fixes.csv: line 10: ", "fixes.csv: line 11: "}) {
    EXPECT_NE(r.err.find(line), std::string::npos) << line << r.err;
  }
  EXPECT_EQ(Lines(r.err).size(), 4u) << r.err;
  EXPECT_NE(r.err.find("at least 8 hex digits"), std::string::npos) << r.err;
  EXPECT_NE(r.err.find("reserved"), std::string::npos) << r.err;
  std::map<std::string, int> docs;
  for (const json& q :
       JsonLines(Chute({"queues", "--db", "s.db", "--format", "jsonl"}).out)) {
    docs[q["queue"]] = q["documents"];
  }
  // berths: b1 stays, i1 came; billing: i2, i3; marina: m1, b2, b3 and the
  // new letter; customs: m2.
  EXPECT_EQ(docs,
            (std::map<std::string, int>{
                {"berths", 2}, {"billing", 2}, {"customs", 1}, {"marina", 4}}));
}

}  // namespace
}  // namespace chute::testing
