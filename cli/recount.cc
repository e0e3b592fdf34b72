#include "cli/recount.h"

#include <algorithm>
#include <chrono>
#include <future>
#include <memory>
#include <optional>
#include <unordered_map>
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
    status[i] =
        RecountText(tokenizers[worker].get(), texts[i].second, &(*docs)[i]);
  });
  for (const Status& s : status) {
    if (!s.ok()) return s;
  }
  return Status::Ok();
}

std::vector<std::unique_ptr<Tokenizer>> MakeTokenizers(
    const TokenizerOptions& options, size_t threads) {
  std::vector<std::unique_ptr<Tokenizer>> out;
  for (size_t t = 0; t < std::max<size_t>(1, threads); ++t) {
    out.push_back(std::make_unique<Tokenizer>(options));
  }
  return out;
}

// Recounts the ledger documents that have no recount yet, reading through
// `store` and writing through `writer` (which may be the same).
Status CatchUp(Store* store, Store* writer,
               std::vector<std::unique_ptr<Tokenizer>>& tokenizers,
               size_t batch, RebuildOutcome* out) {
  std::vector<int64_t> missing;
  Status s = store->UnrecountedDocuments(&missing);
  std::vector<std::pair<int64_t, std::string>> texts;
  std::vector<RecountedDocument> docs;
  for (size_t start = 0; s.ok() && start < missing.size(); start += batch) {
    const std::vector<int64_t> ids(
        missing.begin() + static_cast<ptrdiff_t>(start),
        missing.begin() +
            static_cast<ptrdiff_t>(std::min(missing.size(), start + batch)));
    texts.clear();
    s = store->ReadTextsOf(
        ids, [&](int64_t id, const std::optional<std::string>& text) {
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
// documents learned meanwhile. A batch is written on a thread of its own
// while the next one is read and tokenized, so that the two overlap.
Status RecountLedger(Store* store, const RebuildRequest& request,
                     std::vector<std::unique_ptr<Tokenizer>>& tokenizers,
                     RebuildOutcome* out) {
  std::unique_ptr<Store> writer;
  Status s = Store::Open(store->path(), &writer);
  if (!s.ok()) return s;
  std::vector<std::pair<int64_t, std::string>> texts;
  std::vector<std::string> digests;  // of the texts, to name a document
  std::vector<RecountedDocument> docs;
  // The batch being written, and its writing (declared after `writer`, so
  // that a write still running is awaited before the connection closes).
  std::vector<RecountedDocument> written;
  std::future<Status> writing;
  auto await_write = [&]() -> Status {
    if (!writing.valid()) return Status::Ok();
    Status w = writing.get();
    if (w.ok()) {
      out->recounted += static_cast<int64_t>(written.size());
      ++out->batches;
    }
    return w;
  };
  auto flush = [&]() -> Status {
    if (texts.empty()) return Status::Ok();
    Status r = RecountBatch(texts, tokenizers, &docs);
    if (!r.ok()) {
      for (size_t i = 0; i < docs.size(); ++i) {
        if (docs[i].terms.empty()) {
          return Status::InvalidArgument(
              "document " + digests[i].substr(0, 12) +
              " would have no term under the new settings; "
              "nothing was changed");
        }
      }
      return r;
    }
    if (r = await_write(); !r.ok()) return r;
    written.swap(docs);
    writing = std::async(std::launch::async, [&writer, &written] {
      return writer->WriteRecounted(written);
    });
    texts.clear();
    digests.clear();
    return Status::Ok();
  };
  s = store->ReadLedgerTexts([&](const LedgerText& entry) -> Status {
    if (!entry.text) {
      return Status::InvalidArgument("document " + entry.digest.substr(0, 12) +
                                     " has no kept text");
    }
    texts.emplace_back(entry.ledger_id, *entry.text);
    digests.push_back(entry.digest);
    return texts.size() >= request.batch ? flush() : Status::Ok();
  });
  if (s.ok()) s = flush();
  if (Status w = await_write(); s.ok()) s = w;
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

Status RollbackAcrossTokenizing(Store* store, int64_t v,
                                const ChangeInfo& change, size_t threads,
                                RollbackResult* result) {
  VersionState state;
  Status s = store->LoadVersionState(v, &state);
  if (!s.ok()) return s;
  int64_t documents = 0, without_text = 0;
  if (s = store->CountKeptTexts(&documents, &without_text); !s.ok()) return s;
  if (without_text > 0) {
    return Status::InvalidArgument(
        "version " + std::to_string(v) +
        " tokenized with other settings, and " + std::to_string(without_text) +
        " of " + std::to_string(documents) +
        " learned documents have no kept text to recount; nothing was changed");
  }
  RebuildRequest request;
  request.target = state.settings;
  request.target.keep_text = store->settings().keep_text;
  request.threads = threads;
  request.change = change;
  int64_t base = 0;
  bool replaced = false;
  if (s = store->BeginRecount(request.target, change, &base, &replaced);
      !s.ok())
    return s;
  auto tokenizers = MakeTokenizers(request.target.tokenizer, threads);
  RebuildOutcome ignored;
  s = RecountLedger(store, request, tokenizers, &ignored);
  if (s.ok()) {
    Tokenizer& tokenizer = *tokenizers[0];
    s = store->RollbackWithRecount(
        v, change,
        [&](const std::string& text, RecountedDocument* doc) {
          return RecountText(&tokenizer, text, doc);
        },
        result);
  }
  if (!s.ok()) store->DiscardRecount();
  return s;
}

Status RecountedModelAtVersion(Store* store, int64_t v, size_t threads,
                               VersionInfo* info, StoreSettings* settings,
                               ModelCounts* out) {
  *out = ModelCounts();
  VersionState state;
  Status s = store->LoadVersionState(v, &state);
  if (!s.ok()) return s;
  std::vector<const VersionQueue*> live;
  for (const VersionQueue& q : state.queues) {
    if (!q.retired) live.push_back(&q);
  }
  std::sort(live.begin(), live.end(),
            [](const VersionQueue* a, const VersionQueue* b) {
              return a->name < b->name;
            });
  std::unordered_map<int64_t, size_t> column;
  for (const VersionQueue* q : live) {
    column[q->id] = out->queues.size();
    out->queues.push_back({q->name, 0, 0, q->set_prior});
  }
  const size_t nq = out->queues.size();
  std::unordered_map<int64_t, size_t> column_of_member;
  std::vector<int64_t> ids;
  for (const auto& [id, queue] : state.members) {
    auto c = column.find(queue);
    if (c == column.end()) {
      return Status::Corruption(
          store->path() + ": version " + std::to_string(v) +
          " counts a document in a queue its header does not list");
    }
    column_of_member[id] = c->second;
    ids.push_back(id);
  }
  auto tokenizers = MakeTokenizers(state.settings.tokenizer, threads);
  std::unordered_map<std::string, size_t> row_of;
  std::vector<std::string> terms;
  std::vector<int64_t> sums;
  std::vector<std::pair<int64_t, std::string>> texts;
  std::vector<RecountedDocument> docs;
  int64_t without_text = 0, read = 0;
  for (size_t start = 0; s.ok() && start < ids.size(); start += kRecountBatch) {
    const std::vector<int64_t> window(
        ids.begin() + static_cast<ptrdiff_t>(start),
        ids.begin() + static_cast<ptrdiff_t>(
                          std::min(ids.size(), start + kRecountBatch)));
    texts.clear();
    s = store->ReadTextsOf(
        window, [&](int64_t id, const std::optional<std::string>& text) {
          ++read;
          if (text) {
            texts.emplace_back(id, *text);
          } else {
            ++without_text;
          }
          return Status::Ok();
        });
    if (!s.ok() || without_text > 0) break;
    if (s = RecountBatch(texts, tokenizers, &docs); !s.ok()) break;
    for (RecountedDocument& d : docs) {
      const size_t col = column_of_member.at(d.ledger_id);
      ++out->queues[col].documents;
      out->queues[col].tokens += d.tokens;
      for (auto& [term, n] : d.terms) {
        auto [it, inserted] = row_of.emplace(std::move(term), terms.size());
        if (inserted) {
          terms.push_back(it->first);
          sums.resize(sums.size() + nq, 0);
        }
        sums[it->second * nq + col] += n;
      }
    }
  }
  if (!s.ok()) return s;
  if (without_text > 0 || read != static_cast<int64_t>(ids.size())) {
    return Status::InvalidArgument("version " + std::to_string(v) +
                                   " tokenized with other settings, and some "
                                   "of its documents have no kept text to "
                                   "recount (purged, or not kept)");
  }
  std::vector<size_t> order(terms.size());
  for (size_t i = 0; i < order.size(); ++i) order[i] = i;
  std::sort(order.begin(), order.end(),
            [&](size_t a, size_t b) { return terms[a] < terms[b]; });
  for (size_t r : order) {
    out->terms.push_back(std::move(terms[r]));
    out->counts.insert(out->counts.end(),
                       sums.begin() + static_cast<ptrdiff_t>(r * nq),
                       sums.begin() + static_cast<ptrdiff_t>((r + 1) * nq));
  }
  *info = state.info;
  *settings = state.settings;
  return Status::Ok();
}

Status RecountText(Tokenizer* tokenizer, const std::string& text,
                   RecountedDocument* doc) {
  std::vector<std::string> terms;
  tokenizer->Tokenize(text, &terms);
  doc->terms.clear();
  doc->tokens = static_cast<int64_t>(terms.size());
  if (terms.empty()) {
    return Status::InvalidArgument("ledger entry " +
                                   std::to_string(doc->ledger_id) +
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

Status Rebuild(Store* store, const RebuildRequest& request,
               RebuildOutcome* out) {
  *out = RebuildOutcome();
  out->tokenizing_changed = !SameTokenizing(request.target, store->settings());
  const std::string details =
      "{\"settings\":" + SettingsJson(request.target) + "}";
  if (!out->tokenizing_changed) {
    if (request.candidate) {
      return store->SaveRebuildCandidate(request.target, request.change,
                                         &out->replaced_candidate);
    }
    // A rebuild also replaces any candidate.
    std::optional<Candidate> old;
    if (Status s = store->LoadCandidate(&old); !s.ok()) return s;
    out->replaced_candidate = old.has_value();
    Status s = store->ChangeModelSettings(request.target, "rebuild",
                                          request.change, details, &out->made);
    if (s.ok() && old) s = store->DiscardRecount();
    return s;
  }
  int64_t documents = 0, without_text = 0;
  if (Status s = store->CountKeptTexts(&documents, &without_text); !s.ok())
    return s;
  if (without_text > 0) {
    return Status::InvalidArgument(
        std::to_string(without_text) + " of " + std::to_string(documents) +
        " learned documents have no kept text (" +
        (store->settings().keep_text
             ? "purged, or learned while the store kept none"
             : "the store keeps none: init --keep-text off") +
        "); without it only --alpha and --prior can change; nothing was "
        "changed");
  }
  int64_t base = 0;
  Status s = store->BeginRecount(request.target, request.change, &base,
                                 &out->replaced_candidate);
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
        std::chrono::duration<double>(std::chrono::steady_clock::now() - start)
            .count();
    out->made = out->swap.made;
  }
  if (!s.ok())
    store->DiscardRecount();  // the side tables of a rebuild that failed
  return s;
}

}  // namespace chute
