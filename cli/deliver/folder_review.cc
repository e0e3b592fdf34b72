#include "cli/deliver/folder_review.h"

#include <algorithm>
#include <filesystem>
#include <map>
#include <optional>
#include <set>
#include <system_error>

#include "store/queue_name.h"
#include "store/text_codec.h"

namespace chute {

namespace {

namespace fs = std::filesystem;

struct FoundFile {
  std::string path;    // absolute: root/<folder>/<name>
  std::string folder;  // a queue folder's name, or kReviewFolder
  std::string name;
  bool claimed = false;  // the known place of some decision
  bool taken = false;    // found to be a decision's document
  std::optional<std::string> digest;  // once read
};

// The files directly inside root's queue folders and its review folder,
// by path.
Status ScanRoot(const std::string& root, std::vector<FoundFile>* files,
                std::vector<std::string>* problems) {
  std::error_code ec;
  fs::directory_iterator top(root, ec);
  if (ec) return Status::IoError(root + ": cannot list the folder: " + ec.message());
  for (const fs::directory_entry& folder : top) {
    const std::string name = folder.path().filename().string();
    if (name.empty() || name[0] == '.') continue;
    if (name[0] == '_' && name != kReviewFolder) continue;
    const fs::file_status st = folder.symlink_status(ec);
    if (ec) {
      problems->push_back(folder.path().string() + ": " + ec.message());
      continue;
    }
    if (fs::is_symlink(st)) {
      problems->push_back(folder.path().string() +
                          ": a symbolic link, not followed; its documents are not looked at");
      continue;
    }
    if (!fs::is_directory(st)) continue;
    fs::directory_iterator inside(folder.path(), ec);
    if (ec) {
      problems->push_back(folder.path().string() + ": cannot list the folder: " + ec.message());
      continue;
    }
    for (const fs::directory_entry& file : inside) {
      const std::string file_name = file.path().filename().string();
      if (file_name.empty() || file_name[0] == '.') continue;
      const fs::file_status fst = file.symlink_status(ec);
      if (ec || !fs::is_regular_file(fst)) continue;
      FoundFile found;
      found.path = file.path().string();
      found.folder = name;
      found.name = file_name;
      files->push_back(std::move(found));
    }
  }
  std::sort(files->begin(), files->end(),
            [](const FoundFile& a, const FoundFile& b) { return a.path < b.path; });
  return Status::Ok();
}

std::string BaseName(const std::string& path) {
  const size_t slash = path.rfind('/');
  return slash == std::string::npos ? path : path.substr(slash + 1);
}

// Where the last learned review found the document, else its destination.
const std::string& KnownPlace(const DecisionRecord& d) {
  return d.review != ReviewKind::kNone && !d.reviewed_path.empty() ? d.reviewed_path
                                                                   : d.destination;
}

// The queue the document counted under before this review: the last
// learned review's, else chute's choice.
const std::string& PreviousQueue(const DecisionRecord& d) {
  return d.review != ReviewKind::kNone && !d.reviewed_queue.empty() ? d.reviewed_queue : d.queue;
}

class Planner {
 public:
  Planner(Store* store, const std::string& root, const FolderReviewOptions& options,
          Tokenizer* tokenizer, FolderReview* out)
      : store_(store), root_(root), options_(options), tokenizer_(tokenizer), out_(out) {}

  Status Run() {
    std::vector<QueueInfo> queues;
    if (Status s = store_->ListQueues(&queues, Store::TermTally::kWithout); !s.ok()) return s;
    for (const QueueInfo& q : queues) {
      if (!q.retired) active_.insert(q.name);
    }
    const std::string prefix = root_ + "/";
    DecisionQuery query;
    query.delivered_only = true;
    Status s = store_->ReadDecisions(query, [&](const DecisionRecord& d) {
      if (d.destination.compare(0, prefix.size(), prefix) == 0) decisions_.push_back(d);
      return Status::Ok();
    });
    if (!s.ok()) return s;
    if (Status scan = ScanRoot(root_, &files_, &out_->problems); !scan.ok()) return scan;
    for (size_t f = 0; f < files_.size(); ++f) file_at_.emplace(files_[f].path, f);

    // The latest decision with a known place claims the file there.
    std::map<std::string, size_t> claimant;
    for (size_t i = 0; i < decisions_.size(); ++i) claimant[KnownPlace(decisions_[i])] = i;
    std::vector<std::optional<size_t>> found(decisions_.size());
    std::vector<size_t> unresolved;
    for (size_t i = 0; i < decisions_.size(); ++i) {
      const std::string& place = KnownPlace(decisions_[i]);
      auto f = file_at_.find(place);
      if (f != file_at_.end() && claimant[place] == i) {
        files_[f->second].claimed = true;
        found[i] = f->second;
      }
    }
    for (size_t i = 0; i < decisions_.size(); ++i) {
      if (!found[i]) unresolved.push_back(i);
    }
    // By name: the same file name in another folder, with the same content.
    std::multimap<std::string, size_t> by_name;
    for (size_t f = 0; f < files_.size(); ++f) {
      if (!files_[f].claimed) by_name.emplace(files_[f].name, f);
    }
    for (size_t i : unresolved) {
      const DecisionRecord& d = decisions_[i];
      auto [begin, end] = by_name.equal_range(BaseName(KnownPlace(d)));
      for (auto it = begin; it != end; ++it) {
        FoundFile& f = files_[it->second];
        if (!f.taken && DigestOf(&f) == d.digest) {
          f.taken = true;
          found[i] = it->second;
          break;
        }
      }
    }
    // By digest: renamed files among those at no known place.
    std::multimap<std::string, size_t> by_digest;
    bool indexed = false;
    for (size_t i : unresolved) {
      if (found[i]) continue;
      if (!indexed) {
        for (size_t f = 0; f < files_.size(); ++f) {
          if (files_[f].claimed || files_[f].taken) continue;
          const std::string& digest = DigestOf(&files_[f]);
          if (!digest.empty()) by_digest.emplace(digest, f);
        }
        indexed = true;
      }
      auto [begin, end] = by_digest.equal_range(decisions_[i].digest);
      for (auto it = begin; it != end; ++it) {
        if (!files_[it->second].taken) {
          files_[it->second].taken = true;
          found[i] = it->second;
          break;
        }
      }
    }
    for (size_t i = 0; i < decisions_.size(); ++i) Review(decisions_[i], found[i]);
    return Status::Ok();
  }

 private:
  // The digest of a file's bytes ("" when it cannot be read), computed once.
  const std::string& DigestOf(FoundFile* f) {
    if (!f->digest) {
      Document doc;
      f->digest = ReadDocument(f->path, ReadOptions{options_.max_bytes}, &doc).ok()
                      ? doc.digest
                      : std::string();
    }
    return *f->digest;
  }

  void Skip(const DecisionRecord& d, const std::string& path, std::string reason,
            bool refused = false) {
    FolderReviewItem item;
    item.decision_id = d.id;
    item.digest = d.digest;
    item.chosen = d.queue;
    item.queue = d.queue;
    item.path = path;
    item.reason = std::move(reason);
    item.refused = refused;
    out_->items.push_back(std::move(item));
  }

  // Whether documents in `folder` may be learned under its name; reports a
  // folder that may not, once.
  bool IsQueueFolder(const std::string& folder, std::string* why) {
    if (active_.contains(folder)) return true;
    Status valid = ValidateQueueName(folder);
    if (valid.ok() && options_.create_queues) return true;
    *why = !valid.ok() ? "'" + folder + "' is not a valid queue name: " + valid.message()
                       : "'" + folder + "' is not a queue (add --create-queues to create it)";
    if (reported_.insert(folder).second) out_->problems.push_back(root_ + "/" + folder + ": " + *why);
    return false;
  }

  void Review(const DecisionRecord& d, std::optional<size_t> at) {
    if (!at) {
      ++out_->gone;
      return;
    }
    const FoundFile& f = files_[*at];
    const bool at_place = f.path == KnownPlace(d);
    if (at_place) {
      if (d.review != ReviewKind::kNone) {
        ++out_->unchanged;
      } else if (d.held != HeldReason::kNone) {
        Skip(d, f.path,
             "held for review (" + std::string(HeldName(d.held)) + "); not moved out of " +
                 kReviewFolder + " yet");
      } else if (!options_.confirm_before.empty() && d.time <= options_.confirm_before &&
                 f.folder == d.queue) {
        Learn(d, f, d.queue, ReviewKind::kLeft, FolderReviewOutcome::kConfirmed);
      } else {
        ++out_->waiting;
      }
      return;
    }
    if (f.folder == kReviewFolder) {
      Skip(d, f.path, std::string("found back in ") + kReviewFolder + "; nothing to learn");
      return;
    }
    std::string why;
    if (!IsQueueFolder(f.folder, &why)) {
      Skip(d, f.path, why, true);
      return;
    }
    Learn(d, f, f.folder, ReviewKind::kMoved,
          f.folder == PreviousQueue(d) ? FolderReviewOutcome::kConfirmed
                                       : FolderReviewOutcome::kCorrected);
  }

  void Learn(const DecisionRecord& d, const FoundFile& f, const std::string& queue,
             ReviewKind kind, FolderReviewOutcome outcome) {
    Document doc;
    if (Status r = ReadDocument(f.path, ReadOptions{options_.max_bytes}, &doc); !r.ok()) {
      Skip(d, f.path, r.message(), true);
      return;
    }
    if (doc.digest != d.digest) {
      Skip(d, f.path, "its content changed since chute delivered it; not learned");
      return;
    }
    auto known = learned_queue_.find(doc.digest);
    if (known != learned_queue_.end() && known->second != queue) {
      Skip(d, f.path,
           "the same content as another document learned under '" + known->second +
               "' in this run; not learned twice");
      return;
    }
    if (known == learned_queue_.end()) {
      terms_.clear();
      tokenizer_->Tokenize(doc.text, &terms_);
      if (terms_.empty()) {
        Skip(d, f.path, "no terms to learn (empty, or nothing but spaces and punctuation)", true);
        return;
      }
      std::string packed;
      if (store_->settings().keep_text) {
        if (Status p = codec_.Pack(doc.text, &packed); !p.ok()) {
          Skip(d, f.path, p.message(), true);
          return;
        }
      }
      out_->batch.Add(doc.digest, queue, f.path, terms_, std::move(packed));
      learned_queue_.emplace(doc.digest, queue);
    }
    out_->marks.push_back({d.id, kind, queue, f.path});
    FolderReviewItem item;
    item.decision_id = d.id;
    item.digest = d.digest;
    item.chosen = d.queue;
    item.queue = queue;
    item.path = f.path;
    item.outcome = outcome;
    item.kind = kind;
    out_->items.push_back(std::move(item));
  }

  Store* store_;
  const std::string& root_;
  const FolderReviewOptions& options_;
  Tokenizer* tokenizer_;
  FolderReview* out_;
  std::set<std::string> active_;
  std::vector<DecisionRecord> decisions_;
  std::vector<FoundFile> files_;
  std::map<std::string, size_t> file_at_;
  std::set<std::string> reported_;
  std::map<std::string, std::string> learned_queue_;  // digest -> queue, this run
  std::vector<std::string> terms_;
  TextCodec codec_;
};

}  // namespace

Status PlanFolderReview(Store* store, const std::string& root, const FolderReviewOptions& options,
                        Tokenizer* tokenizer, FolderReview* out) {
  *out = FolderReview();
  return Planner(store, root, options, tokenizer, out).Run();
}

}  // namespace chute
