// The readers' chunked input: the next chunk of a stream into a reused buffer. Private to
// input/; it does not split lines or records.
#pragma once

#include <cstddef>
#include <istream>
#include <vector>

namespace medload {

// Reads up to chunk.size() bytes of `in` into `chunk` and returns how many were read
// (0 at the end of the stream, which sets `eof`). A failed read sets `read_failed`.
inline size_t ReadChunk(std::istream& in, std::vector<char>& chunk, bool& eof, bool& read_failed) {
  in.read(chunk.data(), static_cast<std::streamsize>(chunk.size()));
  const auto got = static_cast<size_t>(in.gcount());
  if (in.bad()) read_failed = true;
  if (got == 0) eof = true;
  return got;
}

}  // namespace medload
