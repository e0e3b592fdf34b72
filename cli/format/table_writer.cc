#include "cli/format/table_writer.h"

#include <unicode/uchar.h>
#include <unicode/utf8.h>

#include <algorithm>

#include "cli/read/utf8.h"

namespace chute {

namespace {

// Cleans a cell for display and returns its width in terminal cells.
size_t Clean(std::string* cell) {
  std::string valid;
  if (!IsValidUtf8(*cell)) {
    ToValidUtf8(*cell, &valid);
    *cell = std::move(valid);
  }
  std::string out;
  size_t width = 0;
  const auto* s = reinterpret_cast<const uint8_t*>(cell->data());
  const auto n = static_cast<int32_t>(cell->size());
  int32_t i = 0;
  while (i < n) {
    int32_t start = i;
    UChar32 c;
    U8_NEXT(s, i, n, c);
    if (c < 0x20 || (c >= 0x7F && c < 0xA0)) {
      out += '?';
      ++width;
      continue;
    }
    out.append(*cell, static_cast<size_t>(start), static_cast<size_t>(i - start));
    int ea = u_getIntPropertyValue(c, UCHAR_EAST_ASIAN_WIDTH);
    if (u_getCombiningClass(c) > 0 || u_charType(c) == U_NON_SPACING_MARK) continue;
    width += (ea == U_EA_WIDE || ea == U_EA_FULLWIDTH) ? 2 : 1;
  }
  *cell = std::move(out);
  return width;
}

}  // namespace

void TableWriter::AddRow(std::vector<std::string> cells) { rows_.push_back(std::move(cells)); }

std::string TableWriter::Render() const {
  const size_t nc = columns_.size();
  std::vector<std::vector<std::string>> cells;
  std::vector<std::vector<size_t>> widths;
  std::vector<size_t> max_width(nc, 0);
  auto add = [&](std::vector<std::string> row) {
    std::vector<size_t> w(nc);
    for (size_t c = 0; c < nc; ++c) {
      w[c] = Clean(&row[c]);
      max_width[c] = std::max(max_width[c], w[c]);
    }
    cells.push_back(std::move(row));
    widths.push_back(std::move(w));
  };
  std::vector<std::string> header;
  for (const Column& col : columns_) header.push_back(col.title);
  add(header);
  for (const auto& row : rows_) add(row);

  std::string out;
  for (size_t r = 0; r < cells.size(); ++r) {
    std::string line;
    for (size_t c = 0; c < nc; ++c) {
      size_t pad = max_width[c] - widths[r][c];
      bool right = columns_[c].align == Align::kRight;
      if (c > 0) line += "  ";
      if (right) line.append(pad, ' ');
      line += cells[r][c];
      if (!right && c + 1 < nc) line.append(pad, ' ');
    }
    while (!line.empty() && line.back() == ' ') line.pop_back();
    out += line;
    out += '\n';
  }
  return out;
}

}  // namespace chute
