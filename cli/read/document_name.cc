#include "cli/read/document_name.h"

#include <sys/stat.h>

#include <cctype>
#include <filesystem>

namespace chute {

namespace {

bool IsHex(const std::string& s) {
  for (unsigned char c : s) {
    if (!std::isxdigit(c)) return false;
  }
  return true;
}

std::string Lower(std::string s) {
  for (char& c : s)
    c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

}  // namespace

void NameDocument(const std::string& arg, const std::string& folder,
                  const ReadOptions& options, NamedDocument* out) {
  *out = NamedDocument();
  out->path = !folder.empty() && !arg.empty() && arg.front() != '/'
                  ? folder + "/" + arg
                  : arg;
  struct stat st;
  if (!arg.empty() && ::stat(out->path.c_str(), &st) == 0 &&
      S_ISREG(st.st_mode)) {
    out->is_file = true;
    out->read_status = ReadDocument(out->path, options, &out->document);
    if (out->read_status.ok()) out->name.digest = out->document.digest;
  }
  // The ledger stores absolute, normalised paths (SourcePath in
  // cli/common_options.h does the same).
  std::error_code ec;
  auto abs = std::filesystem::absolute(out->path, ec);
  if (!arg.empty())
    out->name.source = ec ? out->path : abs.lexically_normal().string();
  if (arg.size() >= kMinDigestPrefix && arg.size() <= 64 && IsHex(arg)) {
    out->name.prefix = Lower(arg);
  }
}

std::string UnknownReason(const std::string& arg, const NamedDocument& named) {
  if (named.is_file)
    return "no learned document has this file's digest or path";
  if (!named.name.prefix.empty()) {
    return "no such file, and no learned document has this path or digest "
           "prefix";
  }
  if (!arg.empty() && arg.size() < kMinDigestPrefix && IsHex(arg)) {
    return "no such file (a digest prefix needs at least " +
           std::to_string(kMinDigestPrefix) + " hex digits)";
  }
  return "no such file, and no learned document has this path";
}

std::string ShortDigest(const std::string& digest) {
  return digest.substr(0, 12);
}

}  // namespace chute
