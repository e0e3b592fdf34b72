// Errors as values. Returned by store/ and the readers in cli/read/; the
// message is one line that names the file and the reason.
#ifndef CHUTE_STORE_STATUS_H_
#define CHUTE_STORE_STATUS_H_

#include <string>
#include <utility>

namespace chute {

class Status {
 public:
  enum class Code {
    kOk,
    kNotFound,         // a file, queue or document that does not exist
    kInvalidArgument,  // bad input: a name, a value, a file's content
    kCorruption,       // a store or file that is not what it claims to be
    kIoError,          // the operating system or SQLite failed
    kBusy,             // the store stayed locked past the busy timeout
  };

  Status() = default;
  static Status Ok() { return Status(); }
  static Status NotFound(std::string m) { return {Code::kNotFound, std::move(m)}; }
  static Status InvalidArgument(std::string m) {
    return {Code::kInvalidArgument, std::move(m)};
  }
  static Status Corruption(std::string m) { return {Code::kCorruption, std::move(m)}; }
  static Status IoError(std::string m) { return {Code::kIoError, std::move(m)}; }
  static Status Busy(std::string m) { return {Code::kBusy, std::move(m)}; }

  bool ok() const { return code_ == Code::kOk; }
  Code code() const { return code_; }
  const std::string& message() const { return message_; }

 private:
  Status(Code code, std::string message)
      : code_(code), message_(std::move(message)) {}

  Code code_ = Code::kOk;
  std::string message_;
};

}  // namespace chute

#endif  // CHUTE_STORE_STATUS_H_
