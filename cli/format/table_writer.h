// Tables for a person at a terminal: a header, aligned columns, numbers
// right-aligned. Widths count terminal cells (East Asian wide characters
// take two, UAX #11); control characters in cells are shown as '?', so a
// file name cannot break the layout.
#ifndef CHUTE_CLI_FORMAT_TABLE_WRITER_H_
#define CHUTE_CLI_FORMAT_TABLE_WRITER_H_

#include <string>
#include <vector>

namespace chute {

class TableWriter {
 public:
  enum class Align { kLeft, kRight };
  struct Column {
    std::string title;
    Align align = Align::kLeft;
  };

  explicit TableWriter(std::vector<Column> columns) : columns_(std::move(columns)) {}

  // REQUIRES: cells.size() == number of columns.
  void AddRow(std::vector<std::string> cells);
  // The whole table, each line ending in '\n'.
  std::string Render() const;

 private:
  std::vector<Column> columns_;
  std::vector<std::vector<std::string>> rows_;
};

}  // namespace chute

#endif  // CHUTE_CLI_FORMAT_TABLE_WRITER_H_
