// A small streaming writer of JSON (RFC 8259) values into a string: one
// JSON Lines record (jsonlines.org) is one top-level object followed by '\n'.
// Strings that are not well-formed UTF-8 have their bad bytes replaced by
// U+FFFD; numbers use the shortest round-trip form; non-finite numbers,
// which JSON cannot hold, are written as null.
#ifndef CHUTE_CLI_FORMAT_JSON_WRITER_H_
#define CHUTE_CLI_FORMAT_JSON_WRITER_H_

#include <cstdint>
#include <string>
#include <string_view>
#include <vector>

namespace chute {

class JsonWriter {
 public:
  JsonWriter& BeginObject();
  JsonWriter& EndObject();
  JsonWriter& BeginArray();
  JsonWriter& EndArray();
  JsonWriter& Key(std::string_view key);
  JsonWriter& String(std::string_view s);
  JsonWriter& Number(double v);
  JsonWriter& Int(int64_t v);
  JsonWriter& Bool(bool v);
  JsonWriter& Null();
  // A value already encoded as JSON, written as it is.
  // REQUIRES: json is one valid JSON value (chute's own, never user input).
  JsonWriter& Raw(std::string_view json);
  // null for an empty string (an absent value), else the string.
  JsonWriter& StringOrNull(std::string_view s) { return s.empty() ? Null() : String(s); }

  // The text written so far; Take() also clears the writer.
  const std::string& str() const { return out_; }
  std::string Take();

 private:
  void Separate();  // a comma before a value or key that is not the first

  std::string out_;
  std::vector<bool> first_;  // per open container: nothing written yet
  bool after_key_ = false;
};

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_JSON_WRITER_H_
