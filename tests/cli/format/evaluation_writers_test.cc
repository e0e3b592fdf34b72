// The writers of chute evaluate's reports, on a report made by hand.
#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "classify/evaluation.h"
#include "cli/format/atomic_file.h"
#include "cli/format/evaluation_csv.h"
#include "cli/format/evaluation_html.h"
#include "cli/format/evaluation_json.h"
#include "cli/format/evaluation_text.h"
#include "cli/format/html_escape.h"

namespace chute {
namespace {

// Two queues; nothing is routed to "b", so its precision is undefined.
EvaluationReport SmallReport(std::optional<double> target) {
  EvaluationReport r;
  r.method = EvaluationMethod::kHoldout;
  r.holdout = "h/";
  r.store = "s.db";
  r.generated_at = "2026-12-02T00:00:00Z";
  r.chute_version = "test";
  for (uint32_t truth : {0u, 0u, 1u}) {
    Prediction p;
    p.truth = truth;
    p.predicted = 0;
    p.confidence = 0.75;
    p.probabilities = {0.75, 0.25};
    r.predictions.push_back(p);
    r.documents.push_back("doc" + std::to_string(r.documents.size()));
  }
  r.evaluation = Evaluate({"a", "b <&>"}, r.predictions, {target});
  r.warnings = {"a warning"};
  return r;
}

TEST(EvaluationWritersTest, JsonWritesUndefinedFiguresAsNull) {
  const auto j = nlohmann::json::parse(EvaluationJson(SmallReport(std::nullopt)));
  EXPECT_EQ(j["method"], "holdout");
  EXPECT_EQ(j["holdout"], "h/");
  EXPECT_TRUE(j["per_queue"][1]["precision"].is_null());
  EXPECT_EQ(j["per_queue"][1]["recall"], 0);
  EXPECT_EQ(j["macro_left_out"]["precision"], 1);
  EXPECT_TRUE(j["recommended"].is_null());
  EXPECT_TRUE(j["reliability"][0]["accuracy"].is_null());
  EXPECT_TRUE(j["sweep"][80]["accuracy"].is_null());
  EXPECT_EQ(j["sweep"][80]["documents"], 0);
  EXPECT_EQ(j["confusion"]["matrix"], nlohmann::json::parse("[[2,0],[1,0]]"));
  EXPECT_EQ(j["predictions"][2]["truth"], "b <&>");
  EXPECT_FALSE(j.contains("fold_summary"));
  EXPECT_EQ(j["warnings"][0], "a warning");
}

TEST(EvaluationWritersTest, CsvWritesUndefinedFiguresAsEmptyFields) {
  const auto files = EvaluationCsvFiles(SmallReport(0.5));
  ASSERT_EQ(files.size(), 5u);
  EXPECT_EQ(files[0].first, "per_queue.csv");
  EXPECT_EQ(files[0].second,
            "queue,precision,recall,f1,support\r\n"
            "a,0.6666666666666666,1,0.8,2\r\n"
            "b <&>,,0,0,1\r\n");
  EXPECT_EQ(files[1].second, "truth,a,b <&>\r\na,2,0\r\nb <&>,1,0\r\n");
  EXPECT_EQ(files[4].second.substr(0, files[4].second.find('\r')),
            "document,truth,queue,confidence");
}

TEST(EvaluationWritersTest, SummarySaysNaAndTheRecommendation) {
  const std::string s = EvaluationSummary(SmallReport(0.5));
  EXPECT_NE(s.find("n/a"), std::string::npos);
  EXPECT_NE(s.find("1 queue left out of the precision averages"), std::string::npos) << s;
  EXPECT_NE(s.find("To reach accuracy 0.5"), std::string::npos) << s;
  // 0.75 is the only confidence: every t up to 0.75 routes all 3, 2 right
  // (0.667 >= 0.5), and no t above routes any, so every document can be
  // routed automatically.
  EXPECT_NE(s.find("at any confidence (threshold 0.00: every document)"), std::string::npos)
      << s;
}

TEST(EvaluationWritersTest, HtmlEscapesEveryString) {
  EXPECT_EQ(HtmlEscape("a<b>&\"c\"'d'"), "a&lt;b&gt;&amp;&quot;c&quot;&#39;d&#39;");
  EXPECT_EQ(HtmlEscape(std::string("x\x01y", 3)), "x\xEF\xBF\xBDy");
  EXPECT_EQ(HtmlEscape("\xFF"), "\xEF\xBF\xBD");
  const std::string page = EvaluationHtml(SmallReport(0.5));
  EXPECT_EQ(page.find("b <&>"), std::string::npos);
  EXPECT_NE(page.find("b &lt;&amp;&gt;"), std::string::npos);
  EXPECT_EQ(page.find("<script"), std::string::npos);
  EXPECT_EQ(page.rfind("<!DOCTYPE html>", 0), 0u);
}

class AtomicFileTest : public ::testing::Test {
 protected:
  void SetUp() override {
    char tmpl[] = "/tmp/chute-atomic-XXXXXX";
    ASSERT_NE(::mkdtemp(tmpl), nullptr);
    dir_ = tmpl;
  }
  void TearDown() override { std::filesystem::remove_all(dir_); }
  std::vector<std::string> Names() const {
    std::vector<std::string> out;
    for (const auto& e : std::filesystem::directory_iterator(dir_)) {
      out.push_back(e.path().filename().string());
    }
    std::sort(out.begin(), out.end());
    return out;
  }
  std::string dir_;
};

TEST_F(AtomicFileTest, WritesWholeFileAndLeavesNoTemporaryFile) {
  ASSERT_TRUE(WriteFileAtomically(dir_ + "/r.json", "first").ok());
  ASSERT_TRUE(WriteFileAtomically(dir_ + "/r.json", "second, longer").ok());
  std::ifstream in(dir_ + "/r.json");
  std::stringstream s;
  s << in.rdbuf();
  EXPECT_EQ(s.str(), "second, longer");
  EXPECT_EQ(Names(), std::vector<std::string>{"r.json"});
  EXPECT_EQ(std::filesystem::status(dir_ + "/r.json").permissions() &
                std::filesystem::perms::all,
            std::filesystem::perms::owner_read | std::filesystem::perms::owner_write);
}

TEST_F(AtomicFileTest, FailureLeavesTheTargetAsItWasAndNoTemporaryFile) {
  std::filesystem::create_directory(dir_ + "/taken");  // rename onto a folder fails
  const Status s = WriteFileAtomically(dir_ + "/taken", "content");
  EXPECT_FALSE(s.ok());
  EXPECT_NE(s.message().find("taken"), std::string::npos) << s.message();
  EXPECT_TRUE(std::filesystem::is_directory(dir_ + "/taken"));
  EXPECT_EQ(Names(), std::vector<std::string>{"taken"});
  EXPECT_FALSE(WriteFileAtomically(dir_ + "/no/such/folder/r.json", "x").ok());
}

}  // namespace
}  // namespace chute
