// chute watch: routes the files of an inbox folder into queue folders as
// they arrive (cli/deliver/inbox_watcher.h says when a file is complete;
// cli/deliver/folder_router.h delivers and logs it), until SIGTERM or
// SIGINT, then finishes the document in hand and exits 0.
#include <CLI/CLI.hpp>

#include <chrono>
#include <csignal>
#include <cstdio>
#include <filesystem>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/delivery_options.h"
#include "cli/deliver/folder_router.h"
#include "cli/deliver/inbox_watcher.h"
#include "cli/deliver/stop_request.h"
#include "cli/exit_code.h"
#include "cli/format/decision_lines.h"
#include "cli/parallel.h"
#include "cli/read/document_reader.h"

namespace chute {

namespace {

// Files routed between two looks at the stop request and the model's
// version: one window of the router (cli/parallel.h), so that a group costs
// the router what a window of a batch `route --into` costs (its log
// transactions, its parallel reading). A stop waits for the group in hand:
// on ordinary documents well under a second.
constexpr size_t kWatchGroup = kParallelWindow;

struct WatchOptions {
  std::string db;
  std::string inbox;
  DeliveryChoices d;
  bool recursive = false;
  OutputFormat format = OutputFormat::kJsonl;
  size_t threads = 1;
  int64_t max_bytes = kDefaultMaxBytes;
  double rescan_seconds = 60;  // full scans of the inbox
  double settle_seconds = 2;   // unchanged this long on a scan: complete
};

std::chrono::milliseconds Millis(double seconds) {
  return std::chrono::milliseconds(static_cast<int64_t>(seconds * 1000 + 0.5));
}

int RunWatch(const WatchOptions& o) {
  if (std::string why = ModeProblem(o.d); !why.empty()) {
    Report("watch", why);
    return kExitUsage;
  }
  std::error_code ec;
  if (!std::filesystem::is_directory(o.inbox, ec)) {
    // Failed, not a usage error: under a service manager the folder may
    // be on a filesystem not mounted yet, and a restart may find it.
    Report("watch", o.inbox + ": " +
                        (std::filesystem::exists(o.inbox, ec) ? "not a folder" : "no such folder"));
    return kExitFailed;
  }
  if (LiesInside(o.d.into, o.inbox)) {
    Report("watch", "--into " + o.d.into + " lies inside the inbox " + o.inbox +
                        ": its documents would be routed again; choose a DEST outside it");
    return kExitUsage;
  }
  // Before any thread starts (the router's workers inherit the blocked
  // signals; cli/deliver/stop_request.h).
  std::unique_ptr<StopRequest> stop;
  Status s = StopRequest::Create(true, &stop);
  if (!s.ok()) {
    Report("watch", s.message());
    return kExitFailed;
  }

  FolderRouteOptions fo;
  ToFolderRouteOptions(o.d, &fo);
  fo.threads = o.threads;
  fo.max_bytes = o.max_bytes;

  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("watch", o.db, &store)) return kExitFailed;

  // One line per decision, flushed at once so that a pipe sees it when it
  // is made; everything else goes to stderr.
  if (o.format == OutputFormat::kCsv) {
    Print(DecisionCsvHeader());
    std::fflush(stdout);
  }
  auto report = [&](const RoutedDocument& d) {
    using Outcome = RoutedDocument::Outcome;
    switch (d.outcome) {
      case Outcome::kDelivered:
      case Outcome::kWouldDeliver:
        if (!d.reason.empty()) Report("watch", d.path + ": " + d.reason);
        Print(o.format == OutputFormat::kCsv ? DecisionCsvLine(d.record)
                                             : DecisionJsonLine(d.record));
        std::fflush(stdout);
        break;
      case Outcome::kSkipped:
        break;  // counted in the summary
      case Outcome::kUnreadable:
        Report("watch", d.path + ": " + d.reason +
                            (d.record.destination.empty() ? ""
                                                          : "; set aside at " + d.record.destination));
        break;
      case Outcome::kFailed:
        Report("watch", d.path + ": " + d.reason);
        break;
    }
  };

  FolderRouteTally tally;
  std::unique_ptr<FolderRouter> router;
  s = FolderRouter::Open(store.get(), fo, &router, &tally, report);
  if (!s.ok()) {
    Report("watch", s.message());
    return kExitFailed;
  }
  InboxWatchOptions wo;
  wo.folder = o.inbox;
  wo.recursive = o.recursive;
  wo.rescan_interval = Millis(o.rescan_seconds);
  wo.settle_time = Millis(o.settle_seconds);
  wo.stop = stop.get();
  std::unique_ptr<InboxWatcher> watcher;
  s = InboxWatcher::Open(wo, &watcher);
  if (!s.ok()) {
    Report("watch", s.message());
    return kExitFailed;
  }
  std::string start = "watching " + o.inbox + (o.recursive ? " and the folders below it" : "") +
                      ", delivering into " + router->root() + " with model version " +
                      std::to_string(router->model_version());
  if (o.d.audit_share > 0) start += "; audit seed " + std::to_string(fo.audit_seed);
  if (tally.finished_pending > 0) {
    start += "; " + std::to_string(tally.finished_pending) +
             " deliveries of an interrupted run finished";
  }
  Report("watch", start + "; SIGTERM or SIGINT stops");

  std::vector<InputFile> files, group;
  std::vector<WalkProblem> problems;
  bool stopped = false;
  while (!stopped) {
    files.clear();
    problems.clear();
    s = watcher->Next(&files, &problems, &stopped);
    if (!s.ok()) break;
    for (const WalkProblem& p : problems) Report("watch", p.path + ": " + p.reason);
    for (size_t at = 0; at < files.size() && s.ok(); at += kWatchGroup) {
      if (stop->Requested()) {
        stopped = true;  // the rest stay in the inbox for the next run
        break;
      }
      const int64_t was = router->model_version();
      bool reloaded = false;
      s = router->ReloadIfChanged(&reloaded);
      if (!s.ok()) break;
      if (reloaded) {
        Report("watch", "model version " + std::to_string(router->model_version()) +
                            " loaded (was " + std::to_string(was) + ")");
      }
      const size_t end = std::min(files.size(), at + kWatchGroup);
      group.assign(files.begin() + static_cast<std::ptrdiff_t>(at),
                   files.begin() + static_cast<std::ptrdiff_t>(end));
      s = router->Route(group, report, &tally);
    }
  }
  std::string summary = "delivered " + std::to_string(tally.delivered) + " (held for review " +
                        std::to_string(tally.held) + ", audit " + std::to_string(tally.audit) +
                        "), skipped " + std::to_string(tally.skipped) + ", unreadable " +
                        std::to_string(tally.unreadable) + ", failed " +
                        std::to_string(tally.failed);
  if (!s.ok()) {
    Report("watch", s.message());
    Report("watch", "stopped by the failure above; " + summary);
    return kExitFailed;
  }
  const int sig = stop->signal();
  Report("watch", std::string("stopped") +
                      (sig == SIGTERM ? " by SIGTERM" : sig == SIGINT ? " by SIGINT" : "") +
                      "; " + summary);
  return kExitDone;
}

}  // namespace

CommandRun SetupWatch(CLI::App* cmd) {
  auto o = std::make_shared<WatchOptions>();
  AddDbOption(cmd, &o->db);
  cmd->add_option("inbox", o->inbox, "the folder to watch")->required();
  cmd->add_option("--into", o->d.into,
                  "DEST: deliver each document into DEST/<queue>/ (unsure ones into "
                  "DEST/_review/) and log the decision")
      ->type_name("DEST")
      ->required();
  AddDeliveryOptions(cmd, &o->d, "");
  cmd->add_flag("--recursive", o->recursive, "watch the folders below the inbox too");
  AddChoiceOption<OutputFormat>(cmd, "--format", &o->format,
                                {{"jsonl", OutputFormat::kJsonl}, {"csv", OutputFormat::kCsv}},
                                "one line per decision: jsonl (default) or csv");
  AddThreadsOption(cmd, &o->threads);
  AddMaxBytesOption(cmd, &o->max_bytes);
  cmd->add_option("--rescan", o->rescan_seconds,
                  "SECONDS between full scans of the inbox, which find what no event "
                  "reported (default 60)")
      ->check(CLI::Range(0.05, 86400.0))
      ->type_name("SECONDS");
  cmd->add_option("--settle", o->settle_seconds,
                  "SECONDS a file found by a scan must stay unchanged to count as complete "
                  "(default 2)")
      ->check(CLI::Range(0.0, 3600.0))
      ->type_name("SECONDS");
  cmd->footer(R"(A file is routed once it is complete: closed after writing, moved into the
inbox, or found by a scan and unchanged for --settle seconds (no writer
seen holding it open). Names beginning with '.' are skipped: write under
such a name and rename at the end. Symbolic links are not followed.
A newer model version (learn, correct, promote, rollback) is picked up
without a restart. SIGTERM or SIGINT: the document in hand is finished,
then chute exits 0. One line per decision on stdout (the fields of
'chute log'); status lines on stderr.

Examples:
  chute watch inbox/ --into routed/ --move
  chute watch inbox/ --into routed/ --move --hold-below 0.9 --audit-share 0.02
  chute watch inbox/ --into routed/ --copy --recursive --format csv)");
  return [o] { return RunWatch(*o); };
}

}  // namespace chute
