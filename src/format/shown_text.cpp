#include "medload/format/shown_text.h"

#include <cstdint>

namespace medload {
namespace {

constexpr char kHex[] = "0123456789abcdef";
constexpr char kUpperHex[] = "0123456789ABCDEF";

void AppendByteEscape(std::string& out, unsigned char byte) {
  out += "\\x";
  out += kHex[byte >> 4];
  out += kHex[byte & 0xF];
}

void AppendCodePointEscape(std::string& out, uint32_t code_point) {
  out += "\\u";
  for (int shift = 12; shift >= 0; shift -= 4) out += kUpperHex[(code_point >> shift) & 0xF];
}

// Bidi controls: U+061C ARABIC LETTER MARK, U+200E/F LEFT-TO-RIGHT/RIGHT-TO-LEFT MARK,
// U+202A-U+202E embeddings and overrides, U+2066-U+2069 isolates. Source: Unicode Standard
// Annex #9, "Unicode Bidirectional Algorithm", table 4 (explicit formatting characters)
// and section 2.6 (implicit marks).
bool IsBidiControl(uint32_t c) {
  return c == 0x061C || c == 0x200E || c == 0x200F || (c >= 0x202A && c <= 0x202E) ||
         (c >= 0x2066 && c <= 0x2069);
}

// The code point of the well-formed UTF-8 sequence at text[i] and its length, or length 0.
uint32_t DecodeAt(std::string_view text, size_t i, size_t& length) {
  const auto byte = [&](size_t k) { return static_cast<unsigned char>(text[k]); };
  const unsigned char lead = byte(i);
  length = 0;
  uint32_t value = 0;
  size_t size = 0;
  if (lead >= 0xC2 && lead <= 0xDF) size = 2, value = lead & 0x1F;
  else if (lead >= 0xE0 && lead <= 0xEF) size = 3, value = lead & 0x0F;
  else if (lead >= 0xF0 && lead <= 0xF4) size = 4, value = lead & 0x07;
  else return 0;
  if (i + size > text.size()) return 0;
  for (size_t k = 1; k < size; ++k) {
    if ((byte(i + k) & 0xC0) != 0x80) return 0;
    value = (value << 6) | (byte(i + k) & 0x3F);
  }
  const bool overlong = (size == 3 && value < 0x800) || (size == 4 && value < 0x10000);
  if (overlong || value > 0x10FFFF || (value >= 0xD800 && value <= 0xDFFF)) return 0;
  length = size;
  return value;
}

bool HiddenCodePoint(uint32_t c) { return (c >= 0x80 && c <= 0x9F) || IsBidiControl(c); }

// Length of the incomplete UTF-8 sequence that ends `text` (0 when it ends whole).
size_t IncompleteTail(std::string_view text) {
  for (size_t back = 1; back <= 3 && back <= text.size(); ++back) {
    const auto byte = static_cast<unsigned char>(text[text.size() - back]);
    if ((byte & 0xC0) == 0x80) continue;  // a continuation byte: look further back
    const size_t need = byte >= 0xF0 ? 4 : byte >= 0xE0 ? 3 : byte >= 0xC0 ? 2 : 1;
    return need > back ? back : 0;
  }
  return 0;
}

}  // namespace

std::string ShownText(std::string_view text, bool keep_lines) {
  std::string out;
  out.reserve(text.size());
  for (size_t i = 0; i < text.size();) {
    const auto byte = static_cast<unsigned char>(text[i]);
    if (byte < 0x80) {
      const bool kept_space = keep_lines && (byte == '\n' || byte == '\t');
      if ((byte < 0x20 && !kept_space) || byte == 0x7F) AppendByteEscape(out, byte);
      else out += static_cast<char>(byte);
      ++i;
      continue;
    }
    size_t length = 0;
    const uint32_t code_point = DecodeAt(text, i, length);
    if (length == 0) {
      AppendByteEscape(out, byte);
      ++i;
    } else if (HiddenCodePoint(code_point)) {
      AppendCodePointEscape(out, code_point);
      i += length;
    } else {
      out.append(text.substr(i, length));
      i += length;
    }
  }
  return out;
}

bool NeedsShowing(std::string_view text) {
  for (size_t i = 0; i < text.size();) {
    const auto byte = static_cast<unsigned char>(text[i]);
    if (byte < 0x20 || byte == 0x7F) return true;
    if (byte < 0x80) {
      ++i;
      continue;
    }
    size_t length = 0;
    const uint32_t code_point = DecodeAt(text, i, length);
    if (length == 0 || HiddenCodePoint(code_point)) return true;
    i += length;
  }
  return false;
}

std::optional<std::string> HiddenCharacterIn(std::string_view text) {
  // Printable ASCII throughout (nearly every identifier): nothing to decode. Without an
  // early exit, so that the compiler can test many bytes at once.
  unsigned char other = 0;
  for (const char c : text) {
    const auto byte = static_cast<unsigned char>(c);
    other |= static_cast<unsigned char>((byte < 0x20) | (byte >= 0x7F));
  }
  if (other == 0) return std::nullopt;
  for (size_t i = 0; i < text.size();) {
    const auto byte = static_cast<unsigned char>(text[i]);
    if (byte < 0x80) {
      if (byte < 0x20 || byte == 0x7F) return ShownText(text.substr(i, 1));
      ++i;
      continue;
    }
    size_t length = 0;
    const uint32_t code_point = DecodeAt(text, i, length);
    if (length == 0) {
      ++i;
      continue;
    }
    if (HiddenCodePoint(code_point)) return ShownText(text.substr(i, length));
    i += length;
  }
  return std::nullopt;
}

ShownTextBuffer::~ShownTextBuffer() {
  Forward(true, true);
  out_->pubsync();
}

bool ShownTextBuffer::Forward(bool all, bool flush_partial) {
  size_t end = pending_.size();
  if (!all) {
    const size_t line_end = pending_.rfind('\n');
    if (line_end == std::string::npos) return true;
    end = line_end + 1;
  } else if (!flush_partial) {
    end -= IncompleteTail(pending_);
  }
  if (end == 0) return true;
  const std::string shown = ShownText(std::string_view(pending_).substr(0, end), true);
  pending_.erase(0, end);
  const auto size = static_cast<std::streamsize>(shown.size());
  return out_->sputn(shown.data(), size) == size;
}

ShownTextBuffer::int_type ShownTextBuffer::overflow(int_type ch) {
  if (traits_type::eq_int_type(ch, traits_type::eof())) return traits_type::not_eof(ch);
  pending_ += traits_type::to_char_type(ch);
  if (ch == '\n' && !Forward(false, false)) return traits_type::eof();
  return ch;
}

std::streamsize ShownTextBuffer::xsputn(const char* data, std::streamsize size) {
  pending_.append(data, static_cast<size_t>(size));
  if (!Forward(false, false)) return 0;
  return size;
}

int ShownTextBuffer::sync() {
  if (!Forward(true, false)) return -1;
  return out_->pubsync();
}

}  // namespace medload
