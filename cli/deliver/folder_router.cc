#include "cli/deliver/folder_router.h"

#include <sys/stat.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <map>
#include <mutex>
#include <optional>
#include <thread>
#include <unordered_map>
#include <unordered_set>
#include <utility>

#include "classify/model.h"
#include "cli/common_options.h"
#include "cli/deliver/file_delivery.h"
#include "cli/parallel.h"
#include "cli/read/document_reader.h"
#include "tokenize/tokenizer.h"

namespace chute {

namespace {

// SplitMix64's output function (G. L. Steele, D. Lea, C. H. Flood, "Fast
// Splittable Pseudorandom Number Generators", OOPSLA 2014; the constants
// as in S. Vigna's splitmix64.c, recalled from memory). Used as a hash
// that spreads every input bit over the output.
uint64_t SplitMix64(uint64_t x) {
  x += 0x9e3779b97f4a7c15ULL;
  x = (x ^ (x >> 30)) * 0xbf58476d1ce4e5b9ULL;
  x = (x ^ (x >> 27)) * 0x94d049bb133111ebULL;
  return x ^ (x >> 31);
}

// The first 8 bytes of a lowercase hex digest as a number (0 when the
// digest is shorter or not hex: never for chute's own digests).
uint64_t DigestPrefix(const std::string& digest) {
  uint64_t v = 0;
  for (size_t i = 0; i < 16 && i < digest.size(); ++i) {
    const char c = digest[i];
    const uint64_t d = c >= '0' && c <= '9'   ? static_cast<uint64_t>(c - '0')
                       : c >= 'a' && c <= 'f' ? static_cast<uint64_t>(c - 'a' + 10)
                                              : 0;
    v = (v << 4) | d;
  }
  return v;
}

// Whether a document is drawn for the audit sample: a uniform number in
// [0, 1) made from the seed and the document's digest is below the share.
// The same seed and document always draw the same.
bool DrawnForAudit(uint64_t seed, const std::string& digest, double share) {
  if (share <= 0) return false;
  const uint64_t h = SplitMix64(seed ^ SplitMix64(DigestPrefix(digest)));
  const double u = static_cast<double>(h >> 11) * 0x1.0p-53;  // 53 random bits
  return u < share;
}

std::string BaseName(const std::string& path) {
  std::string p = path;
  while (p.size() > 1 && p.back() == '/') p.pop_back();
  const size_t slash = p.rfind('/');
  return slash == std::string::npos ? p : p.substr(slash + 1);
}

// One input's work, done by the reading threads (no store access there).
struct Slot {
  std::string absolute;  // the source, absolute (lexical)
  // From lstat before reading: what an unreadable file is remembered by.
  bool stat_ok = false;
  int stat_errno = 0;
  bool regular = false, symlink = false;
  int64_t size = 0, mtime_ns = 0;
  // Remembered as unreadable before and unchanged since: not read.
  std::optional<UnreadableFile> known_unreadable;
  bool was_unreadable = false;  // remembered before (changed since)
  bool read = false;            // ReadDocument was called
  Status status;
  Document doc;
  std::vector<std::string> terms;
  DocumentRows rows;
  int64_t unknown = 0;
  Decision decision;
};

// Documents logged in one transaction, delivered, then marked delivered in
// one: several parallel windows, so that the two commits, each of which
// waits for the disk, are paid once per batch rather than once per window.
constexpr size_t kDeliveryBatch = 8 * kParallelWindow;

// The batch size: kDeliveryBatch, or for tests the environment variable
// CHUTE_TEST_DELIVERY_BATCH (1 to 4096), so that a test of a few hundred
// documents has several batches in flight.
size_t DeliveryBatch() {
  const char* v = std::getenv("CHUTE_TEST_DELIVERY_BATCH");
  if (v == nullptr || *v == '\0') return kDeliveryBatch;
  char* end = nullptr;
  const long n = std::strtol(v, &end, 10);
  return *end == '\0' && n >= 1 && n <= 4096 ? static_cast<size_t>(n) : kDeliveryBatch;
}

}  // namespace

struct FolderRouter::State {
  Store* store = nullptr;
  FolderRouteOptions options;
  std::string root;  // DEST, absolute and symlink-free
  bool root_missing = false;  // a dry run into a DEST not made yet
  std::filesystem::path cwd;  // the working folder, read when Route begins
  size_t batch_size = kDeliveryBatch;  // DeliveryBatch()
  std::optional<Model> model;
  VersionInfo version;
  StoreSettings settings;
  std::unordered_map<std::string, QueuePolicy> policies;  // by queue name
  std::vector<std::unique_ptr<Tokenizer>> tokenizers;     // one per worker
  // Unreadable files by absolute path, read once at Open and kept up to
  // date by this router; the reading threads look up, the store thread
  // writes, under the mutex.
  std::mutex unreadable_mutex;
  std::unordered_map<std::string, UnreadableFile> unreadable;
  // Destinations chosen in this router's Route calls but perhaps not yet
  // made: two documents of the same name never aim at one path.
  std::unordered_set<std::string> claimed;
  // The claims of the batch being delivered meanwhile (Route): read by
  // Choose, changed only between batches.
  std::unordered_set<std::string> claimed_in_flight;

  Status LoadModel();
  Status LoadPolicies();
  Status FinishPending(FolderRouteTally* tally,
                       const std::function<void(const RoutedDocument&)>& report);
  Status Choose(const std::string& folder, const std::string& name, std::string* dest);
  void Prepare(const InputFile& f, Slot* slot, size_t worker);
  HeldReason Hold(const Decision& d) const;
};

Status FolderRouter::State::LoadModel() {
  ModelCounts counts;
  VersionInfo v;
  if (Status s = store->LoadModelCounts(&counts, &v); !s.ok()) return s;
  StoreSettings st = store->settings();
  Model m = Model::Build(counts, st.model);
  if (m.queue_count() == 0) {
    return Status::InvalidArgument(store->path() +
                                   ": has learned no documents yet; run 'chute learn' first");
  }
  model.emplace(std::move(m));
  version = v;
  settings = st;
  tokenizers.clear();
  const size_t threads = std::max<size_t>(1, options.threads);
  for (size_t w = 0; w < threads; ++w) {
    tokenizers.push_back(std::make_unique<Tokenizer>(settings.tokenizer));
  }
  return Status::Ok();
}

Status FolderRouter::State::LoadPolicies() {
  std::vector<QueuePolicy> list;
  if (Status s = store->QueuePolicies(&list); !s.ok()) return s;
  policies.clear();
  for (QueuePolicy& p : list) policies.emplace(p.name, std::move(p));
  return Status::Ok();
}

Status FolderRouter::State::Choose(const std::string& folder, const std::string& name,
                                   std::string* dest) {
  if (root_missing) {
    // A dry run into a DEST that does not exist yet: every name is free
    // but the ones this run already gave.
    for (int64_t n = 1;; ++n) {
      const std::string numbered = NumberedName(name, n, 255);
      if (numbered.empty()) return Status::InvalidArgument(name + ": no free name");
      *dest = root + "/" + folder + "/" + numbered;
      if (claimed_in_flight.count(*dest) == 0 && claimed.insert(*dest).second) {
        return Status::Ok();
      }
    }
  }
  // The common case first, with one lstat: the name is free and its own
  // (not shortened). ChooseDestination, seven system calls, decides every
  // other case; Deliver refuses a queue folder that is a symbolic link
  // either way.
  if (NumberedName(name, 1, 255) == name) {
    std::string path = root + "/" + folder + "/" + name;
    struct stat st;
    if (::lstat(path.c_str(), &st) != 0 && errno == ENOENT && claimed.count(path) == 0 &&
        claimed_in_flight.count(path) == 0) {
      claimed.insert(path);
      *dest = std::move(path);
      return Status::Ok();
    }
  }
  if (Status s = ChooseDestination(root, folder, name, dest); !s.ok()) return s;
  // Another document of this window already aims at that name: the next
  // numbered names, as Deliver would try them (NAME_MAX 255 bytes: Linux's
  // file systems; recalled from memory).
  for (int64_t n = 2; claimed.count(*dest) > 0 || claimed_in_flight.count(*dest) > 0; ++n) {
    const std::string numbered = NumberedName(name, n, 255);
    if (numbered.empty()) break;  // names ran out: Deliver picks a free one
    if (Status s = ChooseDestination(root, folder, numbered, dest); !s.ok()) return s;
  }
  claimed.insert(*dest);
  return Status::Ok();
}

void FolderRouter::State::Prepare(const InputFile& f, Slot* slot, size_t worker) {
  // Reset field by field: the buffers of the slot's text, terms and rows
  // are kept for the next document (freeing them each time costs).
  slot->stat_ok = false;
  slot->stat_errno = 0;
  slot->regular = slot->symlink = false;
  slot->size = slot->mtime_ns = 0;
  slot->known_unreadable.reset();
  slot->was_unreadable = false;
  slot->read = false;
  slot->status = Status::Ok();
  slot->doc.digest.clear();
  slot->doc.replaced = 0;
  slot->terms.clear();
  slot->unknown = 0;
  // As SourcePath (std::filesystem::absolute, lexically), with the
  // working folder read once per Route.
  const std::filesystem::path given(f.path);
  slot->absolute =
      (given.is_absolute() ? given : cwd / given).lexically_normal().string();
  struct stat st;
  if (::lstat(f.path.c_str(), &st) != 0) {
    slot->stat_errno = errno;
    return;
  }
  slot->stat_ok = true;
  slot->regular = S_ISREG(st.st_mode);
  slot->symlink = S_ISLNK(st.st_mode);
  slot->size = static_cast<int64_t>(st.st_size);
  slot->mtime_ns = static_cast<int64_t>(st.st_mtim.tv_sec) * 1000000000 + st.st_mtim.tv_nsec;
  if (!slot->regular) return;
  {
    std::lock_guard<std::mutex> lock(unreadable_mutex);
    auto it = unreadable.find(slot->absolute);
    if (it != unreadable.end()) {
      if (it->second.size == slot->size && it->second.mtime_ns == slot->mtime_ns &&
          it->second.set_aside.empty()) {
        slot->known_unreadable = it->second;
        return;
      }
      slot->was_unreadable = true;
    }
  }
  slot->read = true;
  slot->status = ReadDocument(f.path, ReadOptions{options.max_bytes}, &slot->doc);
  if (!slot->status.ok()) return;
  tokenizers[worker]->Tokenize(slot->doc.text, &slot->terms);
  model->ToRows(slot->terms, &slot->rows, &slot->unknown);
  slot->decision = model->Decide(slot->rows, slot->unknown);
}

HeldReason FolderRouter::State::Hold(const Decision& d) const {
  if (d.no_terms()) return HeldReason::kNoTerms;
  const QueueCounts& q = model->queues()[d.ranked.front().queue];
  std::optional<double> threshold = options.hold_below;
  auto it = policies.find(q.name);
  if (it != policies.end()) {
    if (it->second.min_documents && q.documents < *it->second.min_documents) {
      return HeldReason::kMinDocuments;
    }
    if (!threshold) threshold = it->second.threshold;
  }
  if (threshold && d.ranked.front().posterior < *threshold) return HeldReason::kThreshold;
  return HeldReason::kNone;
}

Status FolderRouter::State::FinishPending(
    FolderRouteTally* tally, const std::function<void(const RoutedDocument&)>& report) {
  std::vector<DecisionRecord> pending;
  if (Status s = store->PendingDeliveries(&pending); !s.ok()) return s;
  std::vector<int64_t> done, lost;
  std::vector<RoutedDocument> reports;
  for (DecisionRecord& r : pending) {
    RoutedDocument doc;
    doc.path = r.source;
    PendingState state = PendingState::kNotStarted;
    Delivered out;
    Status s = chute::FinishPending(r.source, r.destination, r.mode, r.digest, &state, &out);
    if (!s.ok()) {
      doc.outcome = RoutedDocument::Outcome::kFailed;
      doc.reason = "could not finish the delivery an earlier run began (to " + r.destination +
                   "): " + s.message() + "; tried again on the next run";
      ++tally->failed;
    } else if (state == PendingState::kLost) {
      doc.outcome = RoutedDocument::Outcome::kFailed;
      doc.reason = "an earlier run's delivery to " + r.destination +
                   " was found in neither place: moved or deleted by someone else; its log row "
                   "is dropped";
      lost.push_back(r.id);
      ++tally->failed;
    } else {
      if (!out.destination.empty() && out.destination != r.destination) {
        if (Status d = store->SetDestination(r.id, out.destination); !d.ok()) return d;
        r.destination = out.destination;
      }
      r.delivered = true;
      doc.outcome = RoutedDocument::Outcome::kDelivered;
      doc.reason = "finished the delivery an earlier run began";
      done.push_back(r.id);
      ++tally->finished_pending;
    }
    doc.record = std::move(r);
    reports.push_back(std::move(doc));
  }
  if (!done.empty()) {
    if (Status s = store->MarkDelivered(done); !s.ok()) return s;
  }
  if (!lost.empty()) {
    if (Status s = store->DropIntended(lost); !s.ok()) return s;
  }
  if (report) {
    for (const RoutedDocument& d : reports) report(d);
  }
  return Status::Ok();
}

FolderRouter::FolderRouter() : state_(std::make_unique<State>()) {}
FolderRouter::~FolderRouter() = default;

int64_t FolderRouter::model_version() const { return state_->version.version; }
const std::string& FolderRouter::fingerprint() const { return state_->version.fingerprint; }
const std::string& FolderRouter::root() const { return state_->root; }

Status FolderRouter::Open(Store* store, const FolderRouteOptions& options,
                          std::unique_ptr<FolderRouter>* out, FolderRouteTally* tally,
                          const std::function<void(const RoutedDocument&)>& report) {
  if (!(options.audit_share >= 0 && options.audit_share <= 1)) {
    return Status::InvalidArgument("the audit share must lie between 0 and 1");
  }
  if (options.hold_below && !(*options.hold_below >= 0 && *options.hold_below <= 1)) {
    return Status::InvalidArgument("the threshold must lie between 0 and 1");
  }
  std::unique_ptr<FolderRouter> router(new FolderRouter());
  State& st = *router->state_;
  st.store = store;
  st.options = options;
  st.batch_size = DeliveryBatch();
  if (options.dry_run) {
    // A dry run creates nothing: a DEST that does not exist yet is shown
    // where it would be.
    std::error_code ec;
    if (std::filesystem::exists(options.into, ec)) {
      if (Status s = PrepareDestinationRoot(options.into, false, &st.root); !s.ok()) return s;
    } else {
      st.root = SourcePath(options.into);
      st.root_missing = true;
    }
  } else if (Status s = PrepareDestinationRoot(options.into, true, &st.root); !s.ok()) {
    return s;
  }
  if (Status s = st.LoadModel(); !s.ok()) return s;
  if (Status s = st.LoadPolicies(); !s.ok()) return s;
  std::vector<UnreadableFile> unreadable;
  if (Status s = store->ListUnreadable(&unreadable); !s.ok()) return s;
  for (UnreadableFile& u : unreadable) {
    // A remembered file that someone has since removed is forgotten (one
    // set aside keeps its row: where it went).
    struct stat gone;
    if (!options.dry_run && u.set_aside.empty() && ::lstat(u.path.c_str(), &gone) != 0 &&
        errno == ENOENT) {
      if (Status s = store->ForgetUnreadable(u.path); !s.ok()) return s;
      continue;
    }
    st.unreadable.emplace(u.path, std::move(u));
  }
  if (!options.dry_run) {
    if (Status s = st.FinishPending(tally, report); !s.ok()) return s;
    int64_t removed = 0;
    if (Status s = CleanTemporaryFiles(st.root, &removed); !s.ok()) return s;
  }
  *out = std::move(router);
  return Status::Ok();
}

Status FolderRouter::ReloadIfChanged(bool* reloaded) {
  *reloaded = false;
  VersionInfo now;
  if (Status s = state_->store->CurrentVersion(&now); !s.ok()) return s;
  // Thresholds and minimums are not versions: read them every time.
  if (Status s = state_->LoadPolicies(); !s.ok()) return s;
  if (now.version == state_->version.version && now.fingerprint == state_->version.fingerprint) {
    return Status::Ok();
  }
  if (Status s = state_->LoadModel(); !s.ok()) return s;
  *reloaded = true;
  return Status::Ok();
}

Status FolderRouter::Route(const std::vector<InputFile>& files,
                           const std::function<void(const RoutedDocument&)>& report,
                           FolderRouteTally* tally) {
  State& st = *state_;
  const FolderRouteOptions& o = st.options;
  using Outcome = RoutedDocument::Outcome;
  std::vector<Slot> window(kParallelWindow);
  const size_t threads = st.tokenizers.size();
  // Digests delivered by copy or link in this call (the store answers for
  // earlier ones).
  std::unordered_set<std::string> copied;
  Status failure;
  st.claimed.clear();
  st.claimed_in_flight.clear();
  {
    std::error_code ec;
    st.cwd = std::filesystem::current_path(ec);
    if (ec) return Status::IoError("cannot read the working folder: " + ec.message());
  }

  // One input once decided, until its batch is logged and delivered.
  struct Decided {
    RoutedDocument doc;
    bool deliver = false;         // log, then deliver
    bool unreadable = false;      // remember (and set aside)
    bool was_unreadable = false;  // remembered before, readable now
    UnreadableFile file;          // what to remember of an unreadable one
  };
  std::vector<Decided> batch;

  auto fill = [&](size_t start, size_t count) {
    ParallelFor(count, threads, [&, start](size_t i, size_t worker) {
      st.Prepare(files[start + i], &window[i], worker);
    });
  };

  // Logs a batch's intended deliveries (one transaction), delivers them,
  // marks them delivered (one transaction), handles the unreadable ones,
  // then reports every input of the batch in order. Runs on the delivery
  // thread while the next batch is read and decided; touches no state the
  // deciding side changes meanwhile.
  auto deliver_batch = [&](std::vector<Decided>& group,
                           std::vector<std::string>* failed_copies) -> Status {
    std::vector<size_t> to_deliver;
    for (size_t i = 0; i < group.size(); ++i) {
      if (group[i].deliver) to_deliver.push_back(i);
    }
    if (!o.dry_run && !to_deliver.empty()) {
      // The intended destinations are committed before any file moves.
      std::vector<DecisionRecord> records;
      records.reserve(to_deliver.size());
      for (size_t i : to_deliver) records.push_back(group[i].doc.record);
      if (Status s = st.store->LogIntended(&records); !s.ok()) return s;
      std::vector<int64_t> delivered, dropped;
      for (size_t k = 0; k < to_deliver.size(); ++k) {
        RoutedDocument& d = group[to_deliver[k]].doc;
        d.record.id = records[k].id;
        Delivered out;
        Status s = Deliver(d.record.source, d.record.destination, o.mode, &out);
        if (!s.ok()) {
          d.outcome = Outcome::kFailed;
          d.reason = ReasonOf(s, d.record.source);
          dropped.push_back(d.record.id);
          failed_copies->push_back(d.record.digest);
          continue;
        }
        if (out.destination != d.record.destination) {
          if (Status u = st.store->SetDestination(d.record.id, out.destination); !u.ok()) {
            return u;
          }
          d.record.destination = out.destination;
        }
        d.record.delivered = true;
        delivered.push_back(d.record.id);
      }
      if (Status s = st.store->MarkDelivered(delivered); !s.ok()) return s;
      if (Status s = st.store->DropIntended(dropped); !s.ok()) return s;
      // A file remembered as unreadable that now was read is forgotten.
      for (size_t i : to_deliver) {
        const Decided& d = group[i];
        if (d.was_unreadable && d.doc.outcome == Outcome::kDelivered) {
          if (Status s = st.store->ForgetUnreadable(d.doc.record.source); !s.ok()) return s;
          std::lock_guard<std::mutex> lock(st.unreadable_mutex);
          st.unreadable.erase(d.doc.record.source);
        }
      }
    }

    // Unreadable documents: remembered (so that they are not read again
    // until they change) and, with set_aside, moved to DEST/_unreadable/.
    for (Decided& u : group) {
      if (!u.unreadable) continue;
      RoutedDocument& d = u.doc;
      if (!o.dry_run && !d.record.destination.empty()) {  // to set aside
        Delivered out;
        Status s = Deliver(u.file.path, d.record.destination, DeliveryMode::kMove, &out);
        if (s.ok()) {
          d.record.destination = out.destination;
          u.file.set_aside = out.destination;
        } else {
          d.record.destination.clear();
          d.reason += "; could not be set aside: " + ReasonOf(s, u.file.path);
        }
      }
      if (o.dry_run) continue;
      if (Status s = st.store->RememberUnreadable(u.file); !s.ok()) return s;
      std::lock_guard<std::mutex> lock(st.unreadable_mutex);
      st.unreadable[u.file.path] = u.file;
    }

    for (const Decided& decided : group) {
      const RoutedDocument& d = decided.doc;
      switch (d.outcome) {
        case Outcome::kDelivered:
        case Outcome::kWouldDeliver:
          ++tally->delivered;
          if (d.record.held == HeldReason::kAudit) {
            ++tally->audit;
          } else if (d.record.held != HeldReason::kNone) {
            ++tally->held;
          }
          break;
        case Outcome::kSkipped:
          ++tally->skipped;
          break;
        case Outcome::kUnreadable:
          ++tally->unreadable;
          break;
        case Outcome::kFailed:
          ++tally->failed;
          break;
      }
      if (report) report(d);
    }
    return Status::Ok();
  };

  // The batch in flight on the delivery thread, one at a time.
  std::vector<Decided> flying;
  std::vector<std::string> flying_failed_copies;
  Status flying_status;
  std::thread flight;
  struct JoinFlight {
    std::thread& t;
    ~JoinFlight() {
      if (t.joinable()) t.join();
    }
  } join_flight{flight};
  // Waits for the batch in flight. Its files now hold their names, so its
  // claims are dropped (a dry run made no file: its claims stay).
  auto land = [&]() -> Status {
    if (flight.joinable()) flight.join();
    for (const std::string& d : flying_failed_copies) copied.erase(d);
    flying_failed_copies.clear();
    flying.clear();
    if (!o.dry_run) st.claimed_in_flight.clear();
    return flying_status;
  };
  // Sends the decided batch to the delivery thread once the one before
  // it has landed.
  auto launch = [&]() -> Status {
    if (Status s = land(); !s.ok()) return s;
    flying = std::move(batch);
    batch.clear();
    if (!o.dry_run) {
      st.claimed_in_flight = std::move(st.claimed);
      st.claimed.clear();
    }
    flight = std::thread([&] {
      try {
        flying_status = deliver_batch(flying, &flying_failed_copies);
      } catch (const std::exception& e) {
        flying_status = Status::IoError(std::string("delivering: ") + e.what());
      }
    });
    return Status::Ok();
  };

  auto consume = [&](size_t start, size_t count) -> bool {
    const std::string now = NowRfc3339();
    // Digests to ask the store about (--copy/--link without --again).
    std::vector<std::string> digests;
    for (size_t i = 0; i < count; ++i) {
      if (window[i].read && window[i].status.ok()) digests.push_back(window[i].doc.digest);
    }
    std::unordered_set<std::string> delivered_before;
    if (o.mode != DeliveryMode::kMove && !o.again && !digests.empty()) {
      std::vector<std::string> found;
      Status s = land();  // the store is used by one thread at a time
      if (s.ok()) s = st.store->DeliveredCopies(digests, &found);
      if (!s.ok()) {
        failure = s;
        return false;
      }
      delivered_before.insert(found.begin(), found.end());
    }

    for (size_t i = 0; i < count; ++i) {
      const InputFile& f = files[start + i];
      Slot& slot = window[i];
      batch.emplace_back();
      Decided& decided = batch.back();
      RoutedDocument& d = decided.doc;
      d.path = f.path;
      d.record.source = slot.absolute;
      if (!slot.stat_ok) {
        d.outcome = Outcome::kFailed;
        d.reason = slot.stat_errno == ENOENT ? "no longer there (moved or deleted meanwhile)"
                                             : std::strerror(slot.stat_errno);
        continue;
      }
      if (slot.symlink) {
        d.outcome = Outcome::kFailed;
        d.reason = "a symbolic link; chute delivers only regular files and never follows links";
        continue;
      }
      if (!slot.regular) {
        d.outcome = Outcome::kFailed;
        d.reason = "not a regular file";
        continue;
      }
      if (slot.known_unreadable && !o.set_aside) {
        d.outcome = Outcome::kSkipped;
        d.reason = "unreadable (" + slot.known_unreadable->reason + "), unchanged since " +
                   slot.known_unreadable->first_seen;
        continue;
      }
      if (slot.known_unreadable || !slot.status.ok()) {
        // Unreadable now, or remembered earlier and now to be set aside.
        d.outcome = Outcome::kUnreadable;
        d.reason = slot.known_unreadable ? slot.known_unreadable->reason
                                         : ReasonOf(slot.status, f.path);
        decided.unreadable = true;
        UnreadableFile& u = decided.file;
        u.path = slot.absolute;
        u.size = slot.size;
        u.mtime_ns = slot.mtime_ns;
        u.digest = slot.doc.digest;  // empty unless the reader got that far
        u.reason = d.reason;
        u.first_seen = now;
        if (slot.known_unreadable) {
          u.digest = slot.known_unreadable->digest;
          u.first_seen = slot.known_unreadable->first_seen;
        }
        if (o.set_aside) {
          if (Status s = st.Choose(kUnreadableFolder, BaseName(f.path), &d.record.destination);
              !s.ok()) {
            d.record.destination.clear();
            d.reason += "; could not be set aside: " + s.message();
          }
        }
        continue;
      }
      const Decision& dec = slot.decision;
      const Model& model = *st.model;
      DecisionRecord& r = d.record;
      r.digest = slot.doc.digest;
      r.queue = model.queues()[dec.ranked.front().queue].name;
      r.confidence = dec.ranked.front().posterior;
      if (dec.ranked.size() > 1) {
        r.runner_up = model.queues()[dec.ranked[1].queue].name;
        r.runner_up_posterior = dec.ranked[1].posterior;
      }
      r.held = st.Hold(dec);
      if (r.held == HeldReason::kNone && DrawnForAudit(o.audit_seed, r.digest, o.audit_share)) {
        r.held = HeldReason::kAudit;
      }
      r.model_version = st.version.version;
      r.time = now;
      r.by = o.by;
      r.mode = o.mode;
      r.terms = static_cast<int64_t>(slot.terms.size());
      r.unknown_terms = slot.unknown;
      if (slot.doc.replaced > 0) {
        d.reason = std::to_string(slot.doc.replaced) + " invalid UTF-8 sequences replaced by U+FFFD";
      }
      if (o.mode != DeliveryMode::kMove && !o.again &&
          (delivered_before.count(r.digest) > 0 || copied.count(r.digest) > 0)) {
        d.outcome = Outcome::kSkipped;
        d.reason = std::string("delivered before (by ") + std::string(DeliveryModeName(o.mode)) +
                   "); --again delivers it again";
        continue;
      }
      const std::string folder = r.held == HeldReason::kNone ? r.queue : kReviewFolder;
      if (Status s = st.Choose(folder, BaseName(f.path), &r.destination); !s.ok()) {
        d.outcome = Outcome::kFailed;
        d.reason = s.message();
        continue;
      }
      if (o.mode != DeliveryMode::kMove) copied.insert(r.digest);
      d.outcome = o.dry_run ? Outcome::kWouldDeliver : Outcome::kDelivered;
      decided.deliver = true;
      decided.was_unreadable = slot.was_unreadable;
    }
    // Each commit of the store waits for the disk (synchronous = FULL), so
    // several windows share one logging transaction and one marking one;
    // the batch is delivered while the next is read and decided.
    if (batch.size() >= st.batch_size || start + count == files.size()) {
      if (Status s = launch(); !s.ok()) {
        failure = s;
        return false;
      }
    }
    return true;
  };

  // Each window is read and decided by every worker, then consumed on this
  // thread; the delivery thread works meanwhile. Reading the next window
  // while consuming this one (PipelineWindows) was measured slower here: a
  // third busy thread on top of the workers and the delivery thread left
  // the cores less used (1.41 against 1.65 CPUs on 2 cores, 3,837 bench
  // documents), and consuming a window takes a small part of reading it.
  for (size_t start = 0; start < files.size(); start += kParallelWindow) {
    const size_t count = std::min(kParallelWindow, files.size() - start);
    fill(start, count);
    if (!consume(start, count)) break;
  }
  if (Status s = land(); failure.ok()) failure = s;
  return failure;
}

}  // namespace chute
