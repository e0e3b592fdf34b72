// correct --from-folders, evaluate --from-log and drift, end to end: the
// built binary on a store whose decision log is seeded through the Store
// API (as route --into writes it), with files moved as reviewers would.
#include <gtest/gtest.h>

#include <filesystem>
#include <memory>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "classify/wilson_interval.h"
#include "cli/read/document_reader.h"
#include "store/store.h"
#include "tests/e2e/chute_runner.h"

namespace chute::testing {
namespace {

namespace fs = std::filesystem;
using nlohmann::json;

class ReviewLogTest : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_.Write("learn/permits/p1.txt", "building permit for a garage extension");
    dir_.Write("learn/permits/p2.txt", "permit to build a porch and a fence");
    dir_.Write("learn/claims/c1.txt", "insurance claim for storm damage to the roof");
    ASSERT_EQ(Chute({"init", "--db", "s.db"}).exit_code, 0);
    RunResult learned = Chute({"learn", "--db", "s.db", "--tree", "learn"});
    ASSERT_EQ(learned.exit_code, 0) << learned.err;
    fs::create_directory(dir_.path() + "/routed");
    root_ = fs::canonical(dir_.path() + "/routed").string();
  }

  RunResult Chute(std::vector<std::string> args) { return RunChute(args, dir_.path()); }

  struct Seed {
    std::string name, text, queue;
    HeldReason held = HeldReason::kNone;
    std::string time = "2026-11-30T08:00:00Z";
    double confidence = 0.9;
    int64_t terms = 10, unknown = 1;
  };

  // Writes each document where route --into puts it and logs it delivered.
  void Deliver(const std::vector<Seed>& seeds) {
    std::unique_ptr<Store> store;
    ASSERT_TRUE(Store::Open(dir_.path() + "/s.db", &store).ok());
    std::vector<DecisionRecord> records;
    for (const Seed& s : seeds) {
      const std::string folder = s.held == HeldReason::kNone ? s.queue : "_review";
      const std::string path = root_ + "/" + folder + "/" + s.name;
      dir_.Write("routed/" + folder + "/" + s.name, s.text);
      Document doc;
      ASSERT_TRUE(ReadDocument(path, ReadOptions{}, &doc).ok());
      DecisionRecord r;
      r.digest = doc.digest;
      r.source = dir_.path() + "/inbox/" + s.name;
      r.destination = path;
      r.queue = s.queue;
      r.confidence = s.confidence;
      r.runner_up = s.queue == "permits" ? "claims" : "permits";
      r.runner_up_posterior = 1 - s.confidence;
      r.held = s.held;
      r.model_version = 2;
      r.time = s.time;
      r.by = "route";
      r.terms = s.terms;
      r.unknown_terms = s.unknown;
      records.push_back(r);
    }
    ASSERT_TRUE(store->LogIntended(&records).ok());
    std::vector<int64_t> ids;
    for (const DecisionRecord& r : records) ids.push_back(r.id);
    ASSERT_TRUE(store->MarkDelivered(ids).ok());
  }

  void Move(const std::string& from, const std::string& to) {
    fs::create_directories(fs::path(root_ + "/" + to).parent_path());
    fs::rename(root_ + "/" + from, root_ + "/" + to);
  }

  // The scenario: six decisions; reviewers move four files.
  void ReviewScenario() {
    Deliver({{"routed.txt", "permit for a garden shed", "permits"},
             {"audit-right.txt", "permit for a new garage", "permits", HeldReason::kAudit},
             {"audit-wrong.txt", "hail damage claim, roof", "permits", HeldReason::kAudit},
             {"audit-open.txt", "claim for water damage", "claims", HeldReason::kAudit},
             {"held.txt", "storm claim, unclear", "claims", HeldReason::kThreshold,
              "2026-12-01T08:00:00Z", 0.55, 8, 4},
             {"wrong.txt", "claim for a broken window", "permits", HeldReason::kNone,
              "2026-12-01T09:00:00Z", 0.7, 6, 3}});
    Move("_review/audit-right.txt", "permits/audit-right.txt");
    Move("_review/audit-wrong.txt", "claims/audit-wrong.txt");
    Move("_review/held.txt", "claims/held.txt");
    Move("permits/wrong.txt", "claims/window.txt");  // renamed too
  }

  TempDir dir_;
  std::string root_;
};

TEST_F(ReviewLogTest, CorrectFromFoldersLearnsEachMoveOnceAsOneVersion) {
  ReviewScenario();
  RunResult dry = Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--dry-run"});
  ASSERT_EQ(dry.exit_code, 0) << dry.err;
  EXPECT_NE(dry.out.find("nothing was changed"), std::string::npos) << dry.out;

  RunResult r = Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--by", "nightly",
                       "--format", "jsonl"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  std::vector<json> rows;
  for (const std::string& line : Lines(r.out)) rows.push_back(json::parse(line));
  ASSERT_EQ(rows.size(), 3u) << r.out;
  // claims: audit-wrong, held moved out of review into its guess (confirmed),
  // wrong.txt renamed into claims; the open audit document skipped.
  EXPECT_EQ(rows[0], json::parse(R"({"queue":"claims","corrected":2,"confirmed":1,"skipped":1})"));
  EXPECT_EQ(rows[1], json::parse(R"({"queue":"permits","corrected":0,"confirmed":1,"skipped":0})"));
  EXPECT_EQ(rows[2], json::parse(R"({"queue":null,"corrected":2,"confirmed":2,"skipped":1})"));

  RunResult versions = Chute({"versions", "--db", "s.db", "--format", "jsonl"});
  ASSERT_EQ(versions.exit_code, 0) << versions.err;
  const std::vector<std::string> lines = Lines(versions.out);
  const json last = json::parse(lines.back());
  EXPECT_EQ(last["command"], "correct");
  EXPECT_EQ(last["by"], "nightly");
  const size_t count = lines.size();

  // Nothing new: no version, nothing learned, the open audit still skipped.
  RunResult again = Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--format",
                           "csv"});
  ASSERT_EQ(again.exit_code, 0) << again.err;
  EXPECT_EQ(again.out,
            "queue,corrected,confirmed,skipped\r\nclaims,0,0,1\r\n,0,0,1\r\n");
  EXPECT_EQ(Lines(Chute({"versions", "--db", "s.db", "--format", "jsonl"}).out).size(), count);
}

TEST_F(ReviewLogTest, CorrectFromFoldersReportsFoldersThatAreNotQueues) {
  Deliver({{"t.txt", "tender for road works", "permits"}});
  Move("permits/t.txt", "tenders/t.txt");
  RunResult r = Chute({"correct", "--db", "s.db", "--from-folders", "routed"});
  EXPECT_EQ(r.exit_code, 1) << r.out;  // the only document refused: nothing changed
  EXPECT_NE(r.err.find("'tenders' is not a queue (add --create-queues"), std::string::npos)
      << r.err;
  RunResult created =
      Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--create-queues"});
  EXPECT_EQ(created.exit_code, 0) << created.err;
  RunResult queues = Chute({"queues", "--db", "s.db", "--format", "jsonl"});
  EXPECT_NE(queues.out.find("\"tenders\""), std::string::npos) << queues.out;

  EXPECT_EQ(Chute({"correct", "--db", "s.db", "--from-folders", "missing"}).exit_code, 1);
  EXPECT_EQ(Chute({"correct", "--db", "s.db", "--confirm-after", "1d"}).exit_code, 2);
  EXPECT_EQ(Chute({"correct", "--db", "s.db", "--from-folders", "routed", "--confirm-after",
                   "soon"})
                .exit_code,
            2);
}

TEST_F(ReviewLogTest, EvaluateFromLogGivesAuditPrecisionWithItsInterval) {
  ReviewScenario();
  ASSERT_EQ(Chute({"correct", "--db", "s.db", "--from-folders", "routed"}).exit_code, 0);
  RunResult r = Chute({"evaluate", "--db", "s.db", "--from-log", "--json", "p.json", "--csv",
                       "p-csv", "--html", "p.html"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  EXPECT_NE(r.out.find("Of 2 audited decisions for permits, 1 was right: precision 0.50"),
            std::string::npos)
      << r.out;
  const json j = json::parse(ReadBytes(dir_.path() + "/p.json"));
  EXPECT_EQ(j["method"], "log");
  const json& t = j["total"];
  EXPECT_EQ(t["decisions"], 6);
  EXPECT_EQ(t["routed"], 2);
  EXPECT_EQ(t["held_threshold"], 1);
  EXPECT_EQ(t["audit_drawn"], 3);
  EXPECT_EQ(t["audit_reviewed"], 2);
  EXPECT_EQ(t["audit_correct"], 1);
  EXPECT_EQ(t["audit_unknown"], 1);
  EXPECT_EQ(t["corrections"], 1);
  EXPECT_EQ(t["held_confirmed"], 1);
  ASSERT_EQ(j["per_queue"].size(), 2u);
  const json& claims = j["per_queue"][0];
  EXPECT_EQ(claims["queue"], "claims");
  EXPECT_TRUE(claims["precision"].is_null());  // its one audit document is unreviewed
  const json& permits = j["per_queue"][1];
  EXPECT_EQ(permits["queue"], "permits");
  EXPECT_EQ(permits["precision"], 0.5);
  EXPECT_EQ(permits["precision_low"].get<double>(), WilsonInterval(1, 2)->low);
  EXPECT_EQ(permits["precision_high"].get<double>(), WilsonInterval(1, 2)->high);
  const std::string csv = ReadBytes(dir_.path() + "/p-csv/per_queue.csv");
  EXPECT_EQ(csv.substr(0, csv.find("\r\n")),
            "queue,decisions,routed,held_threshold,held_no_terms,held_min_documents,"
            "audit_drawn,audit_reviewed,audit_correct,audit_unknown,corrections,"
            "held_confirmed,left_confirmed,precision,precision_low,precision_high");
  EXPECT_NE(ReadBytes(dir_.path() + "/p.html").find("Production figures"), std::string::npos);

  // Since a time after every decision: nothing to evaluate.
  EXPECT_EQ(Chute({"evaluate", "--db", "s.db", "--from-log", "--since", "0m"}).exit_code, 1);
  EXPECT_EQ(Chute({"evaluate", "--db", "s.db", "--from-log", "--folds", "3"}).exit_code, 2);
  EXPECT_EQ(Chute({"evaluate", "--db", "s.db", "--since", "7d"}).exit_code, 2);
}

// Days 2026-11-30 (4 decisions) and 2026-12-01 (2), learned mix permits 2
// of 3, claims 1 of 3. 11-30: permits 3 of 4 (0.75), claims 0.25, held 3
// of 4, confidence 0.9, unknown 4/40 = 0.1. 12-01: permits 0.5, claims
// 0.5, held 1 of 2, confidence (0.55 + 0.7) / 2 = 0.625, unknown 7/14 = 0.5.
// Period: held 4/6, confidence (3.6 + 1.25) / 6, unknown 11/54.
TEST_F(ReviewLogTest, DriftPrintsEachDayBesideItsBaselines) {
  ReviewScenario();
  RunResult r = Chute({"drift", "--db", "s.db", "--since", "2026-11-01T00:00:00Z", "--format",
                       "jsonl", "--change", "0.2", "--min-decisions", "2"});
  ASSERT_EQ(r.exit_code, 0) << r.err;
  const std::vector<std::string> lines = Lines(r.out);
  ASSERT_EQ(lines.size(), 2u) << r.out;
  const json first = json::parse(lines[0]);
  const json second = json::parse(lines[1]);
  EXPECT_EQ(first["date"], "2026-11-30");
  EXPECT_EQ(first["decisions"], 4);
  EXPECT_EQ(first["held_share"], 0.75);
  EXPECT_DOUBLE_EQ(first["held_share_baseline"].get<double>(), 4.0 / 6.0);
  EXPECT_DOUBLE_EQ(first["mean_confidence"].get<double>(), 0.9);
  EXPECT_DOUBLE_EQ(first["unknown_share"].get<double>(), 0.1);
  EXPECT_DOUBLE_EQ(first["unknown_share_baseline"].get<double>(), 11.0 / 54.0);
  EXPECT_EQ(first["queues"][0]["queue"], "claims");
  EXPECT_EQ(first["queues"][0]["share"], 0.25);
  EXPECT_DOUBLE_EQ(first["queues"][0]["learned_share"].get<double>(), 1.0 / 3.0);
  EXPECT_EQ(first["changes"].size(), 0u);
  EXPECT_EQ(second["date"], "2026-12-01");
  EXPECT_DOUBLE_EQ(second["mean_confidence"].get<double>(), 0.625);
  EXPECT_DOUBLE_EQ(second["unknown_share"].get<double>(), 0.5);
  // 0.5 against 11/54 = 0.204: moved by more than 0.2.
  ASSERT_EQ(second["changes"].size(), 1u);
  EXPECT_EQ(second["changes"][0],
            "On 2026-12-01, 50.0% of terms were unknown to the model, against 20.4% over the "
            "period.");

  RunResult table = Chute({"drift", "--db", "s.db", "--since", "2026-11-01T00:00:00Z",
                           "--change", "0.2", "--min-decisions", "2"});
  ASSERT_EQ(table.exit_code, 0) << table.err;
  EXPECT_NE(table.out.find("On 2026-12-01, 50.0% of terms were unknown"), std::string::npos);
  RunResult csv = Chute({"drift", "--db", "s.db", "--since", "2026-11-01T00:00:00Z", "--format",
                         "csv"});
  ASSERT_EQ(csv.exit_code, 0) << csv.err;
  EXPECT_EQ(Lines(csv.out)[0], "date,decisions,figure,queue,value,baseline,moved");
  EXPECT_EQ(Lines(csv.out).size(), 1u + 2 * 5);  // 2 days x (2 queues + 3 figures)
  EXPECT_EQ(Chute({"drift", "--db", "s.db", "--since", "soon"}).exit_code, 2);
}

}  // namespace
}  // namespace chute::testing
