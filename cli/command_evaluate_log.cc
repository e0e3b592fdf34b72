// chute evaluate --from-log: per-queue precision from the audit sample of
// the decision log, with the counts of what was held and reviewed.
#include "classify/production_figures.h"
#include "cli/common_options.h"
#include "cli/evaluate_from_log.h"
#include "cli/exit_code.h"
#include "cli/format/production_report.h"
#include "cli/format/report_files.h"
#include "cli/logged_decisions.h"

namespace chute {

namespace {

constexpr char kCommand[] = "evaluate";

std::string FileName(const std::string& path) {
  const size_t slash = path.rfind('/');
  return slash == std::string::npos ? path : path.substr(slash + 1);
}

}  // namespace

int RunEvaluateFromLog(const EvaluateFromLogOptions& o) {
  std::unique_ptr<Store> store;
  std::string since;
  std::vector<LoggedDecision> decisions;
  if (int rc = LoadDecisionLog(kCommand, o.db, o.since, &store, &since, &decisions);
      rc != kExitDone) {
    return rc;
  }
  ProductionReport r;
  r.store = FileName(store->path());
  r.since = since;
  r.generated_at = NowRfc3339();
  r.chute_version = CHUTE_VERSION;
  r.figures = ComputeProductionFigures(decisions, r.z);

  ReportFiles files;
  files.json_path = o.json;
  if (!o.json.empty()) files.json = ProductionJson(r);
  files.html_path = o.html;
  if (!o.html.empty()) files.html = ProductionHtml(r);
  files.csv_dir = o.csv;
  if (!o.csv.empty()) files.csv_files = ProductionCsvFiles(r);
  if (Status s = WriteReportFiles(files); !s.ok()) {
    Report(kCommand, s.message());
    return kExitFailed;
  }
  Print(ProductionSummary(r));
  if (!o.json.empty()) Print("report written: " + o.json + "\n");
  if (!o.csv.empty()) Print("CSV files written to: " + o.csv + "\n");
  if (!o.html.empty()) Print("HTML report written: " + o.html + "\n");
  return kExitDone;
}

}  // namespace chute
