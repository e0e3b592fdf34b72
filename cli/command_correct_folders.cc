// chute correct --from-folders: the summary of what reviewers did in the
// destination folders, learned as one version "correct".
#include <filesystem>
#include <map>
#include <system_error>

#include "cli/correct_from_folders.h"
#include "cli/deliver/folder_review.h"
#include "cli/exit_code.h"
#include "cli/format/csv_writer.h"
#include "cli/format/json_writer.h"
#include "cli/format/table_writer.h"
#include "cli/older_than.h"

namespace chute {

namespace {

constexpr char kCommand[] = "correct";

struct Tally {
  int64_t corrected = 0, confirmed = 0, skipped = 0;
};

void PrintSummary(const std::map<std::string, Tally>& per_queue, const Tally& total,
                  const FolderReview& review, const CorrectFromFoldersOptions& o) {
  if (o.format == OutputFormat::kTable) {
    TableWriter table({{"queue"},
                       {"corrected", TableWriter::Align::kRight},
                       {"confirmed", TableWriter::Align::kRight},
                       {"skipped", TableWriter::Align::kRight}});
    for (const auto& [queue, t] : per_queue) {
      table.AddRow({queue, std::to_string(t.corrected), std::to_string(t.confirmed),
                    std::to_string(t.skipped)});
    }
    table.AddRow({"total", std::to_string(total.corrected), std::to_string(total.confirmed),
                  std::to_string(total.skipped)});
    Print(table.Render());
    Print(std::string(o.dry_run ? "would learn " : "learned ") +
          std::to_string(total.corrected + total.confirmed) + " documents (" +
          std::to_string(total.corrected) + " corrected, " + std::to_string(total.confirmed) +
          " confirmed); skipped " + std::to_string(total.skipped) + "; " +
          std::to_string(review.waiting) + " waiting where chute put them; " +
          std::to_string(review.unchanged) + " where the last review found them; " +
          std::to_string(review.gone) + " no longer in " + o.dest +
          (o.dry_run ? "; dry run: nothing was changed" : "; by " + o.by) + "\n");
    return;
  }
  // One row per queue, then the total with queue null (JSON) or empty (CSV).
  auto row = [&](const std::string& queue, const Tally& t) {
    if (o.format == OutputFormat::kJsonl) {
      JsonWriter w;
      w.BeginObject().Key("queue").StringOrNull(queue);
      w.Key("corrected").Int(t.corrected).Key("confirmed").Int(t.confirmed);
      w.Key("skipped").Int(t.skipped);
      Print(w.EndObject().Take() + "\n");
    } else {
      Print(CsvRecordLine({queue, std::to_string(t.corrected), std::to_string(t.confirmed),
                           std::to_string(t.skipped)}));
    }
  };
  if (o.format == OutputFormat::kCsv) {
    Print(CsvRecordLine({"queue", "corrected", "confirmed", "skipped"}));
  }
  for (const auto& [queue, t] : per_queue) row(queue, t);
  row("", total);
}

}  // namespace

int RunCorrectFromFolders(const CorrectFromFoldersOptions& o) {
  std::string confirm_before;
  if (!o.confirm_after.empty()) {
    std::string why;
    if (!ParseOlderThan(o.confirm_after, std::time(nullptr), &confirm_before, &why)) {
      Report(kCommand, "--confirm-after: " + why);
      return kExitUsage;
    }
  }
  std::error_code ec;
  const std::filesystem::path root = std::filesystem::canonical(o.dest, ec);
  if (ec || !std::filesystem::is_directory(root, ec)) {
    Report(kCommand, o.dest + ": " + (ec ? ec.message() : std::string("not a folder")) +
                         "; nothing was changed");
    return kExitFailed;
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport(kCommand, o.db, &store)) return kExitFailed;
  Tokenizer tokenizer(store->settings().tokenizer);
  FolderReviewOptions options;
  options.confirm_before = confirm_before;
  options.create_queues = o.create_queues;
  options.max_bytes = o.max_bytes;
  FolderReview review;
  if (Status s = PlanFolderReview(store.get(), root.string(), options, &tokenizer, &review);
      !s.ok()) {
    Report(kCommand, s.message() + "; nothing was changed");
    return kExitFailed;
  }
  for (const std::string& p : review.problems) Report(kCommand, p);
  std::map<std::string, Tally> per_queue;
  Tally total;
  int64_t refused = 0;
  for (const FolderReviewItem& item : review.items) {
    Tally& t = per_queue[item.queue];
    switch (item.outcome) {
      case FolderReviewOutcome::kCorrected:
        ++t.corrected, ++total.corrected;
        break;
      case FolderReviewOutcome::kConfirmed:
        ++t.confirmed, ++total.confirmed;
        break;
      case FolderReviewOutcome::kSkipped:
        ++t.skipped, ++total.skipped;
        if (item.refused) {
          ++refused;
          Report(kCommand, item.path + ": " + item.reason);
        }
        break;
    }
  }
  if (!o.dry_run && !review.batch.empty()) {
    LearnResult result;
    if (Status s = store->LearnReviewed(review.batch, review.marks,
                                        ChangeInfo{NowRfc3339(), o.by}, &result);
        !s.ok()) {
      Report(kCommand, s.message() + "; nothing was changed");
      return kExitFailed;
    }
  }
  PrintSummary(per_queue, total, review, o);
  return BatchExit(total.corrected + total.confirmed + review.waiting + review.unchanged,
                   refused);
}

}  // namespace chute
