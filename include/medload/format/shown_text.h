// Text from data or the command line made safe to show on a terminal or in mail: control
// characters (C0, DEL, C1) and the Unicode characters that change the direction of text
// (bidi controls such as U+202E) are written as visible escapes (\x1b, \u202E), so that
// no escape sequence, carriage return or reordering reaches the reader. It does not
// escape for HTML, CSV or JSON (see format/output.h and format/json_text.h).
#pragma once

#include <cstddef>
#include <memory>
#include <optional>
#include <ostream>
#include <streambuf>
#include <string>
#include <string_view>

namespace medload {

// `text` with every control character, bidi control and invalid UTF-8 byte escaped:
// bytes below 0x20 and 0x7F as "\x1b" (two lower-case hex digits), C1 controls and bidi
// controls as "\u202E" (four upper-case hex digits), invalid UTF-8 bytes as "\xff". With
// `keep_lines`, line feeds and tabs are kept (for multi-line text); otherwise they are
// escaped too (for one-line values: a name, a file name, a mail header).
std::string ShownText(std::string_view text, bool keep_lines = false);

// True when ShownText(text, false) would change `text`.
bool NeedsShowing(std::string_view text);

// The first character of `text` that an identifier must not hold: a control character
// (C0 including tab, CR and LF, DEL, C1) or a bidi control, as "\x0a" or "\u202E";
// nullopt when there is none (invalid UTF-8 is left to the readers).
std::optional<std::string> HiddenCharacterIn(std::string_view text);

// A stream buffer that passes everything written to it on to `out` through ShownText
// with keep_lines: for whole text outputs and diagnostics. Holds at most one line (or an
// incomplete UTF-8 sequence) until a line end, a flush or its destruction.
class ShownTextBuffer : public std::streambuf {
 public:
  // REQUIRES: `out` outlives this buffer.
  explicit ShownTextBuffer(std::streambuf* out) : out_(out) {}
  ~ShownTextBuffer() override;
  ShownTextBuffer(const ShownTextBuffer&) = delete;
  ShownTextBuffer& operator=(const ShownTextBuffer&) = delete;

 protected:
  int_type overflow(int_type ch) override;
  std::streamsize xsputn(const char* data, std::streamsize size) override;
  int sync() override;

 private:
  // Passes on `pending_` up to its last line end (all of it when `all`, but for an
  // incomplete UTF-8 sequence at its end unless `flush_partial`).
  bool Forward(bool all, bool flush_partial);

  std::streambuf* out_;
  std::string pending_;
};

}  // namespace medload
