// chute promote: the candidate replaces the current model when the
// promotion gate finds it not worse on held-out documents (cli/promotion.h).
#include <CLI/CLI.hpp>
#include <charconv>

#include "cli/command.h"
#include "cli/common_options.h"
#include "cli/exit_code.h"
#include "cli/format/json_writer.h"
#include "cli/format/number.h"
#include "cli/format/table_writer.h"
#include "cli/promotion.h"
#include "cli/recount.h"

namespace chute {

namespace {

struct PromoteOptions {
  std::string db;
  std::string by;
  double margin = 0.01;
  bool force = false;
  bool show = false;
  std::string hold_out;
  size_t threads = 1;
  OutputFormat format = OutputFormat::kTable;
};

std::string Figure(const std::optional<double>& v) {
  return v ? FormatFixed(*v, 3) : "-";
}

void PrintCandidate(const Candidate& c) {
  Print("candidate from " + c.kind + ", made " + c.made + " by " + c.by +
        " from version " + std::to_string(c.base_version) + "; settings " +
        SettingsJson(c.settings) + "; " + std::to_string(c.moves.size()) +
        " corrections of its own\n");
  if (!c.details.empty())
    Print("the gate refused it last time: " + c.details + "\n");
}

void PrintTable(const GateReport& r, double margin) {
  PrintCandidate(r.candidate);
  Print("held out: " + std::to_string(r.held_out) + " of " +
        std::to_string(r.pool) + " " + r.held_out_from +
        (r.held_out_from == "corrections"
             ? ""
             : " (too few corrections to hold out; fewer than " +
                   std::to_string(kMinCorrections) + ")") +
        ", taken out of both models\n");
  TableWriter table({{"queue"},
                     {"held out", TableWriter::Align::kRight},
                     {"recall now", TableWriter::Align::kRight},
                     {"recall candidate", TableWriter::Align::kRight},
                     {"verdict"}});
  for (const GateQueue& q : r.queues) {
    table.AddRow({q.queue, std::to_string(q.held_out), Figure(q.recall_current),
                  Figure(q.recall_candidate),
                  q.blocks ? "blocks: recall lower by more than " +
                                 FormatShortest(margin)
                           : ""});
  }
  Print(table.Render());
  Print("macro-F1 now " + Figure(r.macro_f1_current) + ", candidate " +
        Figure(r.macro_f1_candidate) +
        (r.macro_f1_blocks
             ? " (blocks: lower by more than " + FormatShortest(margin) + ")"
             : "") +
        "\n");
  if (r.passed) {
    Print("promoted: version " + std::to_string(r.made.version) + "\n");
  } else if (r.promoted) {
    Print("promoted by --force although the gate refused it: version " +
          std::to_string(r.made.version) + "\n");
  } else {
    Print(
        "not promoted: the candidate is worse than the current model by more "
        "than " +
        FormatShortest(margin) + "; it stays, with these figures\n");
  }
}

int RunPromote(const PromoteOptions& o) {
  GateOptions gate;
  gate.margin = o.margin;
  gate.force = o.force;
  gate.threads = o.threads;
  gate.change = ChangeInfo{NowRfc3339(), o.by};
  if (!o.hold_out.empty()) {
    double v = 0;
    auto r = std::from_chars(o.hold_out.data(),
                             o.hold_out.data() + o.hold_out.size(), v);
    if (r.ec != std::errc() || r.ptr != o.hold_out.data() + o.hold_out.size() ||
        !(v > 0) ||
        (v > 1 && v != static_cast<double>(static_cast<int64_t>(v)))) {
      Report("promote",
             "--hold-out takes a number of documents (1, 2, ...) or a share (0 "
             "< share <= 1)");
      return kExitUsage;
    }
    if (v < 1 || o.hold_out.find('.') != std::string::npos) {
      gate.hold_out_share = v;
    } else {
      gate.hold_out = static_cast<int64_t>(v);
    }
  }
  std::unique_ptr<Store> store;
  if (!OpenStoreOrReport("promote", o.db, &store)) return kExitFailed;
  if (o.show) {
    std::optional<Candidate> c;
    if (Status s = store->LoadCandidate(&c); !s.ok()) {
      Report("promote", s.message());
      return kExitFailed;
    }
    if (!c) {
      Print("there is no candidate\n");
    } else {
      PrintCandidate(*c);
    }
    return kExitDone;
  }
  GateReport report;
  Status s = RunPromotion(store.get(), gate, &report);
  if (!s.ok()) {
    Report("promote", s.message() + "; nothing was changed");
    return kExitFailed;
  }
  if (o.format == OutputFormat::kJsonl) {
    std::string line = GateJson(report, o.margin);
    line.pop_back();  // the closing brace: the version follows
    Print(line + ",\"version\":" +
          (report.promoted ? std::to_string(report.made.version)
                           : std::string("null")) +
          "}\n");
  } else {
    PrintTable(report, o.margin);
  }
  return report.promoted ? kExitDone : kExitGateRefused;
}

}  // namespace

CommandRun SetupPromote(CLI::App* cmd) {
  auto o = std::make_shared<PromoteOptions>();
  AddDbOption(cmd, &o->db);
  AddByOption(cmd, &o->by);
  AddThreadsOption(cmd, &o->threads);
  cmd->add_option("--if-not-worse-by", o->margin,
                  "the margin: promote when macro-F1 and every queue's recall "
                  "are not lower "
                  "than the current model's by more than this (default 0.01)")
      ->check(CLI::Range(0.0, 1.0))
      ->type_name("MARGIN");
  cmd->add_flag("--force", o->force,
                "promote even when the gate refuses (the figures are kept)");
  cmd->add_option("--hold-out", o->hold_out,
                  "how many of the newest corrections to hold out: a number, "
                  "or a share such as "
                  "0.2 (default: 20%, at least 10)")
      ->type_name("N|SHARE");
  cmd->add_flag("--show", o->show, "print the candidate and change nothing");
  AddChoiceOption<OutputFormat>(
      cmd, "--format", &o->format,
      {{"table", OutputFormat::kTable}, {"jsonl", OutputFormat::kJsonl}},
      "table (default) or jsonl: one object with the figures");
  cmd->footer(
      R"(The candidate (from 'rebuild --candidate' or 'correct --candidate') and the
current model are both evaluated on the same held-out documents: the newest
corrections, each taken out of both models exactly, each labelled with the
queue its newest correction put it in. The candidate is promoted when its
macro-F1 is not lower by more than the margin and no queue's recall is lower
by more than the margin. Exit status 4 when the gate refuses.

Examples:
  chute promote
  chute promote --if-not-worse-by 0.02 --hold-out 50
  chute promote --force)");
  return [o] { return RunPromote(*o); };
}

}  // namespace chute
