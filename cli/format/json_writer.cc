#include "cli/format/json_writer.h"

#include <cmath>

#include "cli/format/number.h"
#include "cli/read/utf8.h"

namespace chute {

void JsonWriter::Separate() {
  if (after_key_) {
    after_key_ = false;
    return;
  }
  if (!first_.empty()) {
    if (!first_.back()) out_ += ',';
    first_.back() = false;
  }
}

JsonWriter& JsonWriter::BeginObject() {
  Separate();
  out_ += '{';
  first_.push_back(true);
  return *this;
}
JsonWriter& JsonWriter::EndObject() {
  out_ += '}';
  first_.pop_back();
  return *this;
}
JsonWriter& JsonWriter::BeginArray() {
  Separate();
  out_ += '[';
  first_.push_back(true);
  return *this;
}
JsonWriter& JsonWriter::EndArray() {
  out_ += ']';
  first_.pop_back();
  return *this;
}

JsonWriter& JsonWriter::Key(std::string_view key) {
  String(key);
  out_ += ':';
  after_key_ = true;
  return *this;
}

JsonWriter& JsonWriter::String(std::string_view s) {
  Separate();
  std::string valid;
  if (!IsValidUtf8(s)) {
    ToValidUtf8(s, &valid);
    s = valid;
  }
  static const char kHex[] = "0123456789abcdef";
  out_ += '"';
  for (char ch : s) {
    auto c = static_cast<unsigned char>(ch);
    switch (c) {
      case '"': out_ += "\\\""; break;
      case '\\': out_ += "\\\\"; break;
      case '\n': out_ += "\\n"; break;
      case '\r': out_ += "\\r"; break;
      case '\t': out_ += "\\t"; break;
      default:
        if (c < 0x20 || c == 0x7F) {
          out_ += "\\u00";
          out_ += kHex[c >> 4];
          out_ += kHex[c & 15];
        } else {
          out_ += ch;
        }
    }
  }
  out_ += '"';
  return *this;
}

JsonWriter& JsonWriter::Number(double v) {
  Separate();
  out_ += std::isfinite(v) ? FormatShortest(v) : "null";
  return *this;
}
JsonWriter& JsonWriter::Int(int64_t v) {
  Separate();
  out_ += std::to_string(v);
  return *this;
}
JsonWriter& JsonWriter::Bool(bool v) {
  Separate();
  out_ += v ? "true" : "false";
  return *this;
}
JsonWriter& JsonWriter::Null() {
  Separate();
  out_ += "null";
  return *this;
}

JsonWriter& JsonWriter::Raw(std::string_view json) {
  Separate();
  out_ += json;
  return *this;
}

std::string JsonWriter::Take() {
  std::string s = std::move(out_);
  out_.clear();
  first_.clear();
  after_key_ = false;
  return s;
}

}  // namespace chute
