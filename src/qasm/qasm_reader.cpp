// OpenQASM 2 / 3 reader: a hand-written scanner over the whole buffer (no regex, no stream per
// token), because a 1024-qubit QFT in native gates is over a million lines. Its parts:
// qasm_value (exact arithmetic on angles), qasm_lexer (tokens and comments), qasm_expression
// (angle expressions), qasm_statements and qasm_gate_calls (statements), qasm_builtin_gates.
// This file holds the entry points and the top-level loop.

#include <algorithm>
#include <cerrno>
#include <cstdint>
#include <cstring>

#include <fcntl.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>

#include "qasm_statement_reader.hpp"

namespace qftplan {

namespace qasm_detail {

namespace {

// A hint only: lets the kernel back a big buffer with 2 MiB pages.
void advise_huge_pages(void* p, std::size_t bytes) {
#ifdef MADV_HUGEPAGE
  constexpr std::uintptr_t kHuge = std::uintptr_t{2} << 20;
  const auto b = (reinterpret_cast<std::uintptr_t>(p) + kHuge - 1) & ~(kHuge - 1);
  const auto e = (reinterpret_cast<std::uintptr_t>(p) + bytes) & ~(kHuge - 1);
  if (e > b) ::madvise(reinterpret_cast<void*>(b), e - b, MADV_HUGEPAGE);
#else
  (void)p;
  (void)bytes;
#endif
}

}  // namespace

QasmProgram StatementReader::run() {
  // Skip a UTF-8 byte order mark.
  if (end_ - p_ >= 3 && std::memcmp(p_, "\xEF\xBB\xBF", 3) == 0) p_ += 3, line_start_ = p_;
  // About one gate per 16 bytes of text at most; reserving up front avoids regrowth copies, and
  // huge pages cut the page faults of first touch (most of the time on big files).
  if (!stream_) {
    prog_.gates.reserve(static_cast<std::size_t>((end_ - begin_) / 16));
    prog_.gate_lines.reserve(prog_.gates.capacity());
    advise_huge_pages(prog_.gates.data(), prog_.gates.capacity() * sizeof(Gate));
    advise_huge_pages(prog_.gate_lines.data(), prog_.gate_lines.capacity() * sizeof(int));
  }
  released_ = begin_;
  for (;;) {
    skip_ws();
    if (p_ >= end_) break;
    statement();
    if (stream_) release_read_pages();
  }
  prog_.version = version_ == 0 ? 3 : version_;
  prog_.qubit_count = std::max(qubit_total_, max_physical_ + 1);
  prog_.device_name = std::move(header_.device_name);
  prog_.placement = std::move(header_.placement);
  prog_.final_placement = std::move(header_.final_placement);
  prog_.transform = std::move(header_.transform);
  prog_.inexact_angle = std::move(inexact_angle_);
  return std::move(prog_);
}

QasmProgram StatementReader::header_program() const {
  QasmProgram h;
  h.version = version_ == 0 ? 3 : version_;
  h.device_name = header_.device_name;
  h.placement = header_.placement;
  h.final_placement = header_.final_placement;
  h.transform = header_.transform;
  return h;
}

void StatementReader::release_read_pages() {
  // Every 64 MiB of text: the pages wholly behind the read position are dropped from memory (a
  // user gate's body read again later is simply faulted back in from the file).
  constexpr std::ptrdiff_t kStep = std::ptrdiff_t{64} << 20;
  if (p_ - released_ < kStep) return;
  const auto page = static_cast<std::uintptr_t>(::sysconf(_SC_PAGESIZE));
  const auto from = reinterpret_cast<std::uintptr_t>(released_) & ~(page - 1);
  const auto to = reinterpret_cast<std::uintptr_t>(p_) & ~(page - 1);
  if (to > from) ::madvise(reinterpret_cast<void*>(from), to - from, MADV_DONTNEED);
  released_ = p_;
}

}  // namespace qasm_detail

QasmProgram parse_qasm(const std::string& text, const std::string& source, const std::atomic<bool>* interrupt) {
  qasm_detail::StatementReader r(text.data(), text.size(), source, interrupt);
  return r.run();
}

namespace {

// Maps the file at `path` and runs a reader over it; `populate` reads every page in up front (fast
// for a program kept whole), a streaming read leaves pages to be faulted in and released in turn.
QasmProgram read_mapped(const std::string& path, const std::atomic<bool>* interrupt, QasmGateStream* stream) {
  const int fd = ::open(path.c_str(), O_RDONLY | O_CLOEXEC);
  if (fd < 0) throw InputError(path, 0, 0, std::string("cannot open file: ") + std::strerror(errno));
  struct stat st {};
  if (::fstat(fd, &st) != 0 || !S_ISREG(st.st_mode)) {
    ::close(fd);
    throw InputError(path, 0, 0, "cannot read file: not a regular file");
  }
  const auto size = static_cast<std::size_t>(st.st_size);
  if (size == 0) {
    ::close(fd);
    qasm_detail::StatementReader r("", 0, path, interrupt, stream);
    return r.run();
  }
  void* map = ::mmap(nullptr, size, PROT_READ, MAP_PRIVATE | (stream ? 0 : MAP_POPULATE), fd, 0);
  ::close(fd);
  if (map == MAP_FAILED) throw InputError(path, 0, 0, std::string("cannot read file: ") + std::strerror(errno));
  struct Unmap {
    void* p;
    std::size_t n;
    ~Unmap() { ::munmap(p, n); }
  } unmap{map, size};
  if (stream) ::madvise(map, size, MADV_SEQUENTIAL);
  qasm_detail::StatementReader r(static_cast<const char*>(map), size, path, interrupt, stream);
  return r.run();
}

}  // namespace

QasmProgram load_qasm_file(const std::string& path, const std::atomic<bool>* interrupt) {
  // Map the file instead of copying it: big circuits are tens of megabytes.
  return read_mapped(path, interrupt, nullptr);
}

QasmProgram stream_qasm_file(const std::string& path, QasmGateStream& stream, const std::atomic<bool>* interrupt) {
  return read_mapped(path, interrupt, &stream);
}

}  // namespace qftplan
