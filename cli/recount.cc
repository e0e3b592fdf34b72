#include "cli/recount.h"

#include <algorithm>
#include <chrono>
#include <memory>
#include <optional>
#include <vector>

#include "cli/parallel.h"

namespace chute {

namespace {

// Tokenizes a batch of texts on `threads` threads into docs (same order).
Status RecountBatch(const std::vector<std::pair<int64_t, std::string>>& texts,
                    std::vector<std::unique_ptr<Tokenizer>>& tokenizers,
                    std::vector<RecountedDocument>* docs) {
  docs->assign(texts.size(), RecountedDocument());
  std::vector<Status> status(texts.size());
  ParallelFor(texts.size(), tokenizers.size(), [&](size_t i, size_t worker) {
    (*docs)[i].ledger_id = texts[i].first;
    status[i] = RecountText(tokenizers[worker].get(), texts[i].second, &(*docs)[i]);
  });
  for (const Status& s : status) {
    if (!s.ok()) return s;
  }
  return Status::Ok();
}

std::vector<std::unique_ptr<Tokenizer>> MakeTokenizers(const TokenizerOptions& options,
                                                       size_t threads) {
  std::vector<std::unique_ptr<Tokenizer>> out;
  for (size_t t = 0; t < std::max<size_t>(1, threads); ++t) {
    out.push_back(std::make_unique<Tokenizer>(options));
  }
  return out;
}

// Recounts the ledger documents that have no recount yet, reading through
// `store` and writing through `writer` (which may be the same).
Status CatchUp(Store* store, Store* writer, std::vector<std::unique_ptr<Tokenizer>>& tokenizers,
               size_t batch, RebuildOutcome* out) {
  std::vector<int64_t> missing;
  Status s = store->UnrecountedDocuments(&missing);
  std::vector<std::pair<int64_t, std::string>> texts;
  std::vector<RecountedDocument> docs;
  for (size_t start = 0; s.ok() && start < missing.size(); start += batch) {
    const std::vector<int64_t> ids(
        missing.begin() + static_cast<ptrdiff_t>(start),
        missing.begin() + static_cast<ptrdiff_t>(std::min(missing.size(), start + batch)));
    texts.clear();
    s = store->ReadTextsOf(ids, [&](int64_t id, const std::optional<std::string>& text) {
      if (!text) {
        return Status::InvalidArgument(
            "a document learned since the recount began has no kept text");
      }
      texts.emplace_back(id, *text);
      return Status::Ok();
    });
    if (s.ok()) s = RecountBatch(texts, tokenizers, &docs);
    if (s.ok()) s = writer->WriteRecounted(docs);
    if (s.ok()) {
      out->recounted += static_cast<int64_t>(docs.size());
      ++out->batches;
    }
  }
  return s;
}

// Recounts every ledger document in batches, written through a second
// connection while the first reads one snapshot of the ledger; then the
// documents learned meanwhile.
Status RecountLedger(Store* store, const RebuildRequest& request,
                     std::vector<std::unique_ptr<Tokenizer>>& tokenizers, RebuildOutcome* out) {
  std::unique_ptr<Store> writer;
  Status s = Store::Open(store->path(), &writer);
  if (!s.ok()) return s;
  std::vector<std::pair<int64_t, std::string>> texts;
  std::vector<RecountedDocument> docs;
  auto flush = [&]() -> Status {
    if (texts.empty()) return Status::Ok();
    Status r = RecountBatch(texts, tokenizers, &docs);
    if (r.ok()) r = writer->WriteRecounted(docs);
    if (!r.ok()) return r;
    out->recounted += static_cast<int64_t>(docs.size());
    ++out->batches;
    texts.clear();
    return Status::Ok();
  };
  s = store->ReadLedgerTexts([&](const LedgerText& entry) -> Status {
    if (!entry.text) {
      return Status::InvalidArgument("document " + entry.digest.substr(0, 12) +
                                     " has no kept text");
    }
    texts.emplace_back(entry.ledger_id, *entry.text);
    return texts.size() >= request.batch ? flush() : Status::Ok();
  });
  if (s.ok()) s = flush();
  if (!s.ok()) return s;
  // Documents learned while the ledger was read.
  return CatchUp(store, writer.get(), tokenizers, request.batch, out);
}

}  // namespace

Status CatchUpRecount(Store* store, size_t threads) {
  std::optional<RecountInfo> info;
  Status s = store->LoadRecount(&info);
  if (!s.ok() || !info) return s;
  auto tokenizers = MakeTokenizers(info->settings.tokenizer, threads);
  RebuildOutcome ignored;
  return CatchUp(store, store, tokenizers, kRecountBatch, &ignored);
}

Status RecountText(Tokenizer* tokenizer, const std::string& text, RecountedDocument* doc) {
  std::vector<std::string> terms;
  tokenizer->Tokenize(text, &terms);
  doc->terms.clear();
  doc->tokens = static_cast<int64_t>(terms.size());
  if (terms.empty()) {
    return Status::InvalidArgument("ledger entry " + std::to_string(doc->ledger_id) +
                                   " has no term under the new settings");
  }
  std::sort(terms.begin(), terms.end());
  for (std::string& t : terms) {
    if (!doc->terms.empty() && doc->terms.back().first == t) {
      ++doc->terms.back().second;
    } else {
      doc->terms.emplace_back(std::move(t), 1);
    }
  }
  return Status::Ok();
}

void WriteSettings(const StoreSettings& settings, JsonWriter* w) {
  w->BeginObject();
  for (const auto& [key, value] : EncodeSettings(settings)) {
    w->Key(key);
    if (key == "alpha" || key == "min_length" || key == "max_length") {
      w->Number(std::stod(value));
    } else {
      w->String(value);
    }
  }
  w->EndObject();
}

std::string SettingsJson(const StoreSettings& settings) {
  JsonWriter w;
  WriteSettings(settings, &w);
  return w.Take();
}

Status Rebuild(Store* store, const RebuildRequest& request, RebuildOutcome* out) {
  *out = RebuildOutcome();
  out->tokenizing_changed = !SameTokenizing(request.target, store->settings());
  const std::string details = "{\"settings\":" + SettingsJson(request.target) + "}";
  if (!out->tokenizing_changed) {
    if (request.candidate) {
      return store->SaveRebuildCandidate(request.target, request.change,
                                         &out->replaced_candidate);
    }
    // A rebuild also replaces any candidate.
    std::optional<Candidate> old;
    if (Status s = store->LoadCandidate(&old); !s.ok()) return s;
    out->replaced_candidate = old.has_value();
    Status s = store->ChangeModelSettings(request.target, "rebuild", request.change, details,
                                          &out->made);
    if (s.ok() && old) s = store->DiscardRecount();
    return s;
  }
  int64_t documents = 0, without_text = 0;
  if (Status s = store->CountKeptTexts(&documents, &without_text); !s.ok()) return s;
  if (without_text > 0) {
    return Status::InvalidArgument(
        std::to_string(without_text) + " of " + std::to_string(documents) +
        " learned documents have no kept text (" +
        (store->settings().keep_text ? "purged, or learned while the store kept none"
                                     : "the store keeps none: init --keep-text off") +
        "); without it only --alpha and --prior can change; nothing was changed");
  }
  int64_t base = 0;
  Status s = store->BeginRecount(request.target, request.change, &base, &out->replaced_candidate);
  if (!s.ok()) return s;
  auto tokenizers = MakeTokenizers(request.target.tokenizer, request.threads);
  s = RecountLedger(store, request, tokenizers, out);
  if (s.ok() && request.candidate) {
    bool again = false;
    s = store->SaveRebuildCandidate(request.target, request.change, &again);
  } else if (s.ok()) {
    Tokenizer& tokenizer = *tokenizers[0];
    const auto start = std::chrono::steady_clock::now();
    s = store->SwapRecount(
        "rebuild", request.change, details,
        [&](const std::string& text, RecountedDocument* doc) {
          return RecountText(&tokenizer, text, doc);
        },
        &out->swap);
    out->swap_seconds =
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start).count();
    out->made = out->swap.made;
  }
  if (!s.ok()) store->DiscardRecount();  // the side tables of a rebuild that failed
  return s;
}

}  // namespace chute
