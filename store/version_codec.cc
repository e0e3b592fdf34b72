#include "store/version_codec.h"

#include <charconv>
#include <cstdint>

namespace chute {

namespace {

std::string FormatDouble(double v) {
  char buf[32];
  auto r = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, r.ptr);
}

// LEB128 varints (common practice; as in Protocol Buffers).
void PutVarint(uint64_t v, std::string* out) {
  while (v >= 0x80) {
    out->push_back(static_cast<char>((v & 0x7f) | 0x80));
    v >>= 7;
  }
  out->push_back(static_cast<char>(v));
}

bool GetVarint(std::string_view* in, uint64_t* v) {
  *v = 0;
  for (int shift = 0; shift < 64 && !in->empty(); shift += 7) {
    auto byte = static_cast<unsigned char>(in->front());
    in->remove_prefix(1);
    *v |= static_cast<uint64_t>(byte & 0x7f) << shift;
    if ((byte & 0x80) == 0) return true;
  }
  return false;
}

}  // namespace

// A snapshot's members: (ledger id, queue id) sorted by ledger id, as
// varint(id - previous id) varint(queue id).
std::string EncodeMembers(const std::vector<std::pair<int64_t, int64_t>>& members) {
  std::string out;
  int64_t last = 0;
  for (const auto& [id, queue] : members) {
    PutVarint(static_cast<uint64_t>(id - last), &out);
    PutVarint(static_cast<uint64_t>(queue), &out);
    last = id;
  }
  return out;
}

bool DecodeMembers(std::string_view blob, std::vector<std::pair<int64_t, int64_t>>* out) {
  out->clear();
  int64_t last = 0;
  while (!blob.empty()) {
    uint64_t delta = 0, queue = 0;
    if (!GetVarint(&blob, &delta) || !GetVarint(&blob, &queue) || delta == 0 ||
        delta > static_cast<uint64_t>(INT64_MAX - last) || queue > INT64_MAX) {
      return false;
    }
    last += static_cast<int64_t>(delta);
    out->emplace_back(last, static_cast<int64_t>(queue));
  }
  return true;
}

// The header of a version: its settings and queues, one per line:
//   s <key> <value>
//   q <id> <retired 0|1> <hand-set prior or -> <name>
std::string EncodeHeader(const StoreSettings& settings, const std::vector<VersionQueue>& queues) {
  std::string out;
  for (const auto& [key, value] : EncodeSettings(settings)) {
    out += "s " + key + " " + value + "\n";
  }
  for (const VersionQueue& q : queues) {
    out += "q " + std::to_string(q.id) + (q.retired ? " 1 " : " 0 ") +
           (q.set_prior ? FormatDouble(*q.set_prior) : "-") + " " + q.name + "\n";
  }
  return out;
}

bool DecodeHeader(std::string_view text, StoreSettings* settings,
                  std::vector<VersionQueue>* queues) {
  std::vector<std::pair<std::string, std::string>> rows;
  queues->clear();
  while (!text.empty()) {
    size_t nl = text.find('\n');
    if (nl == std::string_view::npos) return false;
    std::string_view line = text.substr(0, nl);
    text.remove_prefix(nl + 1);
    auto field = [&line]() {
      size_t sp = line.find(' ');
      std::string_view f = line.substr(0, sp);
      line.remove_prefix(sp == std::string_view::npos ? line.size() : sp + 1);
      return f;
    };
    std::string_view kind = field();
    if (kind == "s") {
      std::string_view key = field();
      rows.emplace_back(std::string(key), std::string(line));
    } else if (kind == "q") {
      VersionQueue q;
      std::string_view id = field(), retired = field(), prior = field();
      if (std::from_chars(id.data(), id.data() + id.size(), q.id).ec != std::errc()) return false;
      q.retired = retired == "1";
      if (prior != "-") {
        double p = 0;
        if (std::from_chars(prior.data(), prior.data() + prior.size(), p).ec != std::errc()) {
          return false;
        }
        q.set_prior = p;
      }
      q.name = std::string(line);
      queues->push_back(std::move(q));
    } else {
      return false;
    }
  }
  std::string why;
  return DecodeSettings(rows, settings, &why);
}

}  // namespace chute
