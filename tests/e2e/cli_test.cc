// End-to-end tests: the built binary, driven in temporary folders.
#include <gtest/gtest.h>
#include <sys/stat.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>

#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

using nlohmann::json;

class CliTest : public ::testing::Test {
 protected:
  RunResult Chute(std::vector<std::string> args, const std::string& input = "") {
    return RunChute(args, dir_.path(), input);
  }
  void InitStore(std::vector<std::string> extra = {}) {
    std::vector<std::string> args = {"init", "--db", "s.db"};
    args.insert(args.end(), extra.begin(), extra.end());
    RunResult r = Chute(args);
    ASSERT_EQ(r.exit_code, 0) << r.err;
  }
  // Manning et al. (2008), Example 13.1, as files.
  void WriteExample131() {
    dir_.Write("l/china/1.txt", "Chinese Beijing Chinese");
    dir_.Write("l/china/2.txt", "Chinese Chinese Shanghai");
    dir_.Write("l/china/3.txt", "Chinese Macao");
    dir_.Write("l/japan/4.txt", "Tokyo Japan Chinese");
    dir_.Write("d5.txt", "Chinese Chinese Chinese Tokyo Japan");
  }
  static bool OneLine(const std::string& s) {
    return !s.empty() && s.find('\n') == s.size() - 1;
  }
  TempDir dir_;
};

// Manning, Raghavan & Schütze, Introduction to Information Retrieval (2008),
// ch. 13, Example 13.1, through the built binary: d5 goes to China with
// posterior (81/268912) / (81/268912 + 8/59049).
TEST_F(CliTest, Example131ThroughTheBinary) {
  InitStore();
  WriteExample131();
  RunResult learn = Chute({"learn", "--db", "s.db", "--tree", "l"});
  ASSERT_EQ(learn.exit_code, 0) << learn.err;
  RunResult r = Chute({"route", "--db", "s.db", "d5.txt", "--format", "jsonl", "--top", "2"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  json j = json::parse(Lines(r.out).at(0));
  EXPECT_EQ(j["file"], "d5.txt");
  EXPECT_EQ(j["queue"], "china");
  EXPECT_EQ(j["no_terms"], false);
  const double c = 81.0 / 268912.0, n = 8.0 / 59049.0;
  EXPECT_NEAR(j["confidence"].get<double>(), c / (c + n), 1e-14);
  ASSERT_EQ(j["top"].size(), 2u);
  EXPECT_EQ(j["top"][0]["queue"], "china");
  EXPECT_EQ(j["top"][1]["queue"], "japan");
  EXPECT_NEAR(j["top"][1]["log_posterior"].get<double>(), std::log(n / (c + n)), 1e-13);
}

TEST_F(CliTest, RouteCsvHasTheDocumentedHeader) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult r = Chute({"route", "--db", "s.db", "d5.txt", "--format", "csv"});
  ASSERT_EQ(r.exit_code, 0);
  auto lines = Lines(r.out);
  ASSERT_EQ(lines.size(), 2u);
  EXPECT_EQ(lines[0],
            "file,queue,confidence,runner_up,runner_up_posterior,model_version,fingerprint");
  EXPECT_EQ(lines[1].rfind("d5.txt,china,0.689", 0), 0u) << lines[1];
}

TEST_F(CliTest, NumbersReadBackToTheSameDouble) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult r = Chute({"route", "--db", "s.db", "d5.txt", "--format", "jsonl"});
  json j = json::parse(Lines(r.out).at(0));
  double p = j["confidence"].get<double>();
  const double c = 81.0 / 268912.0, n = 8.0 / 59049.0;
  // Shortest round-trip form: parsing gives back exactly the computed value,
  // which agrees with the exact fraction to the last few bits.
  EXPECT_NEAR(p, c / (c + n), 4e-16);
}

TEST_F(CliTest, LearnTwiceChangesNothingAndSaysSo) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult again = Chute({"learn", "--db", "s.db", "--tree", "l", "--format", "jsonl"});
  EXPECT_EQ(again.exit_code, 0);
  EXPECT_NE(again.err.find("already learned"), std::string::npos);
  for (const std::string& line : Lines(again.out)) {
    EXPECT_EQ(json::parse(line)["outcome"], "already_learned");
  }
  RunResult q = Chute({"queues", "--db", "s.db", "--format", "jsonl"});
  json china = json::parse(Lines(q.out).at(0));
  EXPECT_EQ(china["queue"], "china");
  EXPECT_EQ(china["documents"], 3);
  EXPECT_EQ(china["tokens"], 8);
}

TEST_F(CliTest, LearnFromCsvAndQueueGivesTheSameModelAsTree) {
  WriteExample131();
  dir_.Write("m/manifest.csv",
             "path,queue\r\n../l/china/1.txt,china\r\n\"../l/china/2.txt\",china\r\n"
             "../l/china/3.txt,china\r\n../l/japan/4.txt,japan\r\n");
  ASSERT_EQ(Chute({"init", "--db", "a.db"}).exit_code, 0);
  ASSERT_EQ(Chute({"init", "--db", "b.db"}).exit_code, 0);
  ASSERT_EQ(Chute({"init", "--db", "c.db"}).exit_code, 0);
  ASSERT_EQ(Chute({"learn", "--db", "a.db", "--tree", "l"}).exit_code, 0);
  RunResult csv = Chute({"learn", "--db", "b.db", "--csv", "m/manifest.csv"});
  ASSERT_EQ(csv.exit_code, 0) << csv.err;
  ASSERT_EQ(Chute({"learn", "--db", "c.db", "--queue", "china", "l/china"}).exit_code, 0);
  ASSERT_EQ(Chute({"learn", "--db", "c.db", "--queue", "japan", "-"}, "Tokyo Japan Chinese")
                .exit_code,
            0);
  auto route = [&](const char* db) {
    return WithoutModelVersion(Chute({"route", "--db", db, "d5.txt", "--format", "jsonl"}).out);
  };
  std::string a = route("a.db");
  EXPECT_EQ(a, route("b.db"));  // fingerprints included
  EXPECT_EQ(a, route("c.db"));
}

TEST_F(CliTest, StoreIsCreatedWithMode0600AndInitNeverOverwrites) {
  InitStore();
  struct stat st;
  ASSERT_EQ(stat((dir_.path() + "/s.db").c_str(), &st), 0);
  EXPECT_EQ(st.st_mode & 0777, 0600u);
  RunResult again = Chute({"init", "--db", "s.db"});
  EXPECT_EQ(again.exit_code, 1);
  EXPECT_NE(again.err.find("s.db: already exists"), std::string::npos);
  EXPECT_TRUE(OneLine(again.err)) << again.err;
}

TEST_F(CliTest, SettingsAreStoredAndShown) {
  InitStore({"--alpha", "0.25", "--prior", "uniform", "--bigrams", "on", "--numbers", "fold",
             "--min-length", "2", "--max-length", "30"});
  RunResult r = Chute({"queues", "--db", "s.db", "--settings", "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0);
  json j = json::parse(Lines(r.out).at(0));
  EXPECT_EQ(j["alpha"], 0.25);
  EXPECT_EQ(j["prior"], "uniform");
  EXPECT_EQ(j["bigrams"], true);
  EXPECT_EQ(j["numbers"], "fold");
  EXPECT_EQ(j["min_length"], 2);
  EXPECT_EQ(j["max_length"], 30);
  RunResult table = Chute({"queues", "--db", "s.db"});
  EXPECT_NE(table.out.find("alpha 0.25, prior uniform, bigrams on, numbers fold"),
            std::string::npos);
  // The settings shape the terms.
  dir_.Write("t.txt", "A big harbour at 2026");
  RunResult terms = Chute({"terms-of", "--db", "s.db", "t.txt"});
  EXPECT_EQ(terms.out, "big\nharbour\nat\n<num>\nbig harbour\nharbour at\nat <num>\n");
}

TEST_F(CliTest, HandSetPriorIsUsedAndSharedByTheRest) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  ASSERT_EQ(Chute({"queues", "--db", "s.db", "--set-prior", "japan", "0.5"}).exit_code, 0);
  RunResult q = Chute({"queues", "--db", "s.db", "--format", "jsonl"});
  auto lines = Lines(q.out);
  EXPECT_EQ(json::parse(lines[0])["prior"], 0.5);
  EXPECT_EQ(json::parse(lines[1])["prior"], 0.5);
  EXPECT_EQ(json::parse(lines[1])["prior_source"], "set");
  dir_.Write("x.txt", "Osaka");
  RunResult r = Chute({"route", "--db", "s.db", "x.txt", "--format", "jsonl"});
  EXPECT_NEAR(json::parse(Lines(r.out)[0])["confidence"].get<double>(), 0.5, 1e-15);
  RunResult bad = Chute({"queues", "--db", "s.db", "--set-prior", "china", "0.6"});
  EXPECT_EQ(bad.exit_code, 1);
  EXPECT_NE(bad.err.find("more than 1"), std::string::npos);
  RunResult nan = Chute({"queues", "--db", "s.db", "--set-prior", "china", "x"});
  EXPECT_EQ(nan.exit_code, 2);
  RunResult unknown = Chute({"queues", "--db", "s.db", "--set-prior", "nowhere", "0.1"});
  EXPECT_EQ(unknown.exit_code, 1);
  EXPECT_TRUE(OneLine(unknown.err));
}

// --- Bad input: each gets one line naming the file and the reason. ---

TEST_F(CliTest, MissingFileIsReportedAndFails) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult r = Chute({"route", "--db", "s.db", "nope.txt"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_EQ(r.err, "chute route: nope.txt: no such file or folder\n");
  RunResult some = Chute({"route", "--db", "s.db", "nope.txt", "d5.txt"});
  EXPECT_EQ(some.exit_code, 3);
}

TEST_F(CliTest, FolderOfBinaryFilesIsRefused) {
  InitStore();
  dir_.Write("bin/a.bin", std::string("PK\x03\x04\0\0data", 10));
  std::string text;
  while (text.size() < 9000) text += "harbour ";
  dir_.Write("bin/b.bin", text + std::string(1, '\0'));  // its NUL lies past 8 KiB
  RunResult r = Chute({"learn", "--db", "s.db", "--queue", "q", "bin"});
  EXPECT_EQ(r.exit_code, 3);  // b.bin is text by the rule: its NUL lies past 8 KiB
  EXPECT_NE(r.err.find("bin/a.bin: binary file (a NUL byte in its first 8 KiB)"),
            std::string::npos)
      << r.err;
  dir_.Write("bin2/c.bin", std::string("\0\1\2", 3));
  RunResult all = Chute({"learn", "--db", "s.db", "--queue", "q", "bin2"});
  EXPECT_EQ(all.exit_code, 1);
}

TEST_F(CliTest, EmptyFileIsSkippedByLearnAndRoutedOnThePrior) {
  InitStore();
  WriteExample131();
  dir_.Write("l/china/empty.txt", "");
  RunResult learn = Chute({"learn", "--db", "s.db", "--tree", "l"});
  EXPECT_EQ(learn.exit_code, 3);
  EXPECT_NE(learn.err.find("l/china/empty.txt: no terms to learn"), std::string::npos);
  RunResult q = Chute({"queues", "--db", "s.db", "--format", "jsonl"});
  EXPECT_EQ(json::parse(Lines(q.out)[0])["documents"], 3);  // the other four were learned
  dir_.Write("e.txt", "");
  RunResult r = Chute({"route", "--db", "s.db", "e.txt", "--format", "jsonl"});
  EXPECT_EQ(r.exit_code, 0);
  json j = json::parse(Lines(r.out)[0]);
  EXPECT_EQ(j["no_terms"], true);
  EXPECT_EQ(j["queue"], "china");
  EXPECT_NEAR(j["confidence"].get<double>(), 0.75, 1e-15);
}

TEST_F(CliTest, InvalidUtf8IsReplacedCountedAndReported) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  dir_.Write("bad.txt", "Chinese \xC3\x28 Tokyo \xFF\xFE Japan \xE2\x82");
  RunResult r = Chute({"route", "--db", "s.db", "bad.txt", "--format", "jsonl"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_NE(r.err.find("bad.txt: 4 invalid UTF-8 sequences replaced by U+FFFD"),
            std::string::npos)
      << r.err;
  EXPECT_EQ(json::parse(Lines(r.out)[0])["no_terms"], false);
  RunResult terms = Chute({"terms-of", "--db", "s.db", "bad.txt"});
  EXPECT_EQ(terms.out.substr(0, 8), "chinese\n");
}

TEST_F(CliTest, FileOverTheSizeLimitIsRefused) {
  InitStore();
  dir_.Write("big.txt", std::string(2000, 'a') + " harbour");
  dir_.Write("small.txt", "harbour pilot");
  RunResult r = Chute({"learn", "--db", "s.db", "--queue", "q", "--max-bytes", "1000",
                       "big.txt", "small.txt"});
  EXPECT_EQ(r.exit_code, 3);
  EXPECT_NE(r.err.find("big.txt: larger than the limit of 1000 bytes"), std::string::npos);
  RunResult stdin_big = Chute({"route", "--db", "s.db", "--max-bytes", "10", "-"},
                              std::string(100, 'a'));
  EXPECT_EQ(stdin_big.exit_code, 1);
  EXPECT_NE(stdin_big.err.find("-: larger than the limit"), std::string::npos);
}

TEST_F(CliTest, BadQueueNamesAreRefused) {
  InitStore();
  dir_.Write("a.txt", "harbour pilot");
  for (const std::string& name : std::vector<std::string>{"../x", "a/b", ".", "..", "_x", "", std::string("a\nb"),
                           std::string("a\x01"), std::string(101, 'q')}) {
    RunResult r = Chute({"learn", "--db", "s.db", "--queue", name, "a.txt"});
    EXPECT_NE(r.exit_code, 0) << name;
    EXPECT_TRUE(OneLine(r.err)) << r.err;
    EXPECT_NE(r.err.find("queue name"), std::string::npos) << r.err;
  }
  // In a tree, documents in a bad queue folder are refused, the rest learned.
  dir_.Write("t/_review/a.txt", "pilot");
  dir_.Write("t/marina/b.txt", "mooring");
  dir_.Write("t/loose.txt", "nothing");
  RunResult tree = Chute({"learn", "--db", "s.db", "--tree", "t"});
  EXPECT_EQ(tree.exit_code, 3);
  EXPECT_NE(tree.err.find("t/_review/a.txt: queue name '_review': names beginning with '_'"),
            std::string::npos)
      << tree.err;
  EXPECT_NE(tree.err.find("t/loose.txt: not inside a queue folder"), std::string::npos);
  EXPECT_EQ(Lines(Chute({"queues", "--db", "s.db", "--format", "csv"}).out).size(), 2u);
}

TEST_F(CliTest, ManifestWithMissingColumnOrMissingPathNamesTheLine) {
  InitStore();
  dir_.Write("a.txt", "harbour pilot");
  dir_.Write("nocol.csv", "path,team\na.txt,marina\n");
  RunResult r = Chute({"learn", "--db", "s.db", "--csv", "nocol.csv"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_EQ(r.err, "chute learn: nocol.csv: line 1: the header has no 'queue' column\n");
  dir_.Write("gone.csv", "path,queue\na.txt,marina\n\"multi\nline.txt\",marina\nmissing.txt,marina\n");
  RunResult g = Chute({"learn", "--db", "s.db", "--csv", "gone.csv"});
  EXPECT_EQ(g.exit_code, 3);
  EXPECT_NE(g.err.find("gone.csv: line 3: multi"), std::string::npos) << g.err;
  EXPECT_NE(g.err.find("gone.csv: line 5: missing.txt: no such file"), std::string::npos)
      << g.err;
  dir_.Write("open.csv", "path,queue\n\"a.txt,marina\n");
  EXPECT_EQ(Chute({"learn", "--db", "s.db", "--csv", "open.csv"}).exit_code, 1);
}

TEST_F(CliTest, CorruptedStoreIsRefused) {
  dir_.Write("junk.db", std::string(4096, 'j'));
  RunResult r = Chute({"queues", "--db", "junk.db"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_NE(r.err.find("junk.db: not a chute store"), std::string::npos) << r.err;
  EXPECT_TRUE(OneLine(r.err));
  // A real store with its first page damaged.
  InitStore();
  {
    std::fstream f(dir_.path() + "/s.db", std::ios::in | std::ios::out | std::ios::binary);
    f.seekp(0);
    f << "this is no longer SQLite at all";
  }
  RunResult damaged = Chute({"route", "--db", "s.db", "-"}, "text");
  EXPECT_EQ(damaged.exit_code, 1);
  EXPECT_NE(damaged.err.find("s.db: not a chute store"), std::string::npos) << damaged.err;
}

TEST_F(CliTest, StoreOfANewerSchemaIsRefused) {
  InitStore();
  // Bump user_version with the sqlite3 shell if present; else by the header
  // bytes (offset 60, big-endian: SQLite file format, §1.3 "The database header").
  {
    std::fstream f(dir_.path() + "/s.db", std::ios::in | std::ios::out | std::ios::binary);
    f.seekp(60);
    const char v[4] = {0, 0, 0x03, static_cast<char>(0xE7)};  // 999
    f.write(v, 4);
  }
  RunResult r = Chute({"queues", "--db", "s.db"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_NE(r.err.find("schema version 999, newer than this chute"), std::string::npos) << r.err;
}

TEST_F(CliTest, MissingStoreSaysHowToCreateOne) {
  RunResult r = Chute({"route", "--db", "none.db", "-"}, "x");
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_EQ(r.err, "chute route: none.db: no chute store here (create one with 'chute init')\n");
}

TEST_F(CliTest, UsageErrorsExitTwo) {
  EXPECT_EQ(Chute({}).exit_code, 2);
  EXPECT_EQ(Chute({"route", "--no-such-option"}).exit_code, 2);
  EXPECT_EQ(Chute({"init", "--alpha", "-1"}).exit_code, 2);
  EXPECT_EQ(Chute({"init", "--prior", "sometimes"}).exit_code, 2);
  EXPECT_EQ(Chute({"route", "--format", "xml", "x"}).exit_code, 2);
  RunResult typo = Chute({"lern"});
  EXPECT_EQ(typo.exit_code, 2);
  EXPECT_NE(typo.err.find("did you mean 'learn'?"), std::string::npos);
  RunResult help = Chute({"route", "--help"});
  EXPECT_EQ(help.exit_code, 0);
  EXPECT_NE(help.out.find("Examples:"), std::string::npos);
}

TEST_F(CliTest, FoldersAreWalkedInByteOrderSkippingDotNamesAndLinks) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  dir_.Write("in/b.txt", "Tokyo");
  dir_.Write("in/a/z.txt", "Chinese");
  dir_.Write("in/a.txt", "Japan");
  dir_.Write("in/.hidden.txt", "Chinese");
  dir_.Write("in/.git/x.txt", "Chinese");
  dir_.Write("in/B.txt", "Chinese");
  ASSERT_EQ(symlink((dir_.path() + "/d5.txt").c_str(), (dir_.path() + "/in/link.txt").c_str()), 0);
  RunResult r = Chute({"route", "--db", "s.db", "in", "--format", "csv"});
  EXPECT_EQ(r.exit_code, 3);
  EXPECT_NE(r.err.find("in/link.txt: symbolic link, not followed"), std::string::npos);
  auto lines = Lines(r.out);
  ASSERT_EQ(lines.size(), 5u);
  EXPECT_EQ(lines[1].substr(0, 9), "in/B.txt,");
  EXPECT_EQ(lines[2].substr(0, 9), "in/a.txt,");   // '.' (0x2E) sorts before '/' (0x2F)
  EXPECT_EQ(lines[3].substr(0, 11), "in/a/z.txt,");
  EXPECT_EQ(lines[4].substr(0, 9), "in/b.txt,");
}

// The demo corpus, learned and routed with one thread and with several:
// the store's counts and every decision are the same, in the same order.
TEST_F(CliTest, ThreadsChangeNothingButSpeed) {
  const std::string corpus = std::string(CHUTE_SOURCE_DIR) + "/corpora/port-authority";
  ASSERT_EQ(Chute({"init", "--db", "one.db"}).exit_code, 0);
  ASSERT_EQ(Chute({"init", "--db", "many.db"}).exit_code, 0);
  RunResult a = Chute({"learn", "--db", "one.db", "--threads", "1", "--tree",
                       corpus + "/labelled", "--format", "csv"});
  RunResult b = Chute({"learn", "--db", "many.db", "--threads", "5", "--tree",
                       corpus + "/labelled", "--format", "csv"});
  ASSERT_EQ(a.exit_code, 0) << a.err;
  ASSERT_EQ(b.exit_code, 0) << b.err;
  EXPECT_EQ(a.out, b.out);
  EXPECT_EQ(Chute({"queues", "--db", "one.db", "--format", "jsonl"}).out,
            Chute({"queues", "--db", "many.db", "--format", "jsonl"}).out);
  RunResult r1 = Chute({"route", "--db", "one.db", "--threads", "1", corpus + "/inbox",
                        "--format", "jsonl", "--top", "8"});
  RunResult r5 = Chute({"route", "--db", "many.db", "--threads", "5", corpus + "/inbox",
                        "--format", "jsonl", "--top", "8"});
  ASSERT_EQ(r1.exit_code, 0);
  EXPECT_EQ(Lines(r1.out).size(), 96u);
  EXPECT_EQ(r1.out, r5.out);
}

TEST_F(CliTest, RouteReadsStandardInput) {
  InitStore();
  WriteExample131();
  ASSERT_EQ(Chute({"learn", "--db", "s.db", "--tree", "l"}).exit_code, 0);
  RunResult r = Chute({"route", "--db", "s.db", "-", "--format", "jsonl"}, "Tokyo Japan");
  ASSERT_EQ(r.exit_code, 0);
  json j = json::parse(Lines(r.out)[0]);
  EXPECT_EQ(j["file"], "-");
  EXPECT_EQ(j["queue"], "japan");
}

TEST_F(CliTest, DbComesFromTheEnvironmentWhenNotGiven) {
  InitStore();
  WriteExample131();
  setenv("CHUTE_DB_FOR_TEST", "1", 1);
  // RunChute clears CHUTE_DB; the default is then ./chute.db.
  RunResult r = Chute({"queues"});
  EXPECT_EQ(r.exit_code, 1);
  EXPECT_NE(r.err.find("chute.db: no chute store here"), std::string::npos);
  ASSERT_EQ(Chute({"init"}).exit_code, 0);
  EXPECT_TRUE(std::filesystem::exists(dir_.path() + "/chute.db"));
}

}  // namespace
}  // namespace chute::testing
