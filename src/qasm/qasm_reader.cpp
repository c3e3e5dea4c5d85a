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
  prog_.gates.reserve(static_cast<std::size_t>((end_ - begin_) / 16));
  prog_.gate_lines.reserve(prog_.gates.capacity());
  advise_huge_pages(prog_.gates.data(), prog_.gates.capacity() * sizeof(Gate));
  advise_huge_pages(prog_.gate_lines.data(), prog_.gate_lines.capacity() * sizeof(int));
  for (;;) {
    skip_ws();
    if (p_ >= end_) break;
    statement();
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

}  // namespace qasm_detail

QasmProgram parse_qasm(const std::string& text, const std::string& source, const std::atomic<bool>* interrupt) {
  qasm_detail::StatementReader r(text.data(), text.size(), source, interrupt);
  return r.run();
}

QasmProgram load_qasm_file(const std::string& path, const std::atomic<bool>* interrupt) {
  // Map the file instead of copying it: big circuits are tens of megabytes.
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
    return parse_qasm(std::string(), path, interrupt);
  }
  void* map = ::mmap(nullptr, size, PROT_READ, MAP_PRIVATE | MAP_POPULATE, fd, 0);
  ::close(fd);
  if (map == MAP_FAILED) throw InputError(path, 0, 0, std::string("cannot read file: ") + std::strerror(errno));
  struct Unmap {
    void* p;
    std::size_t n;
    ~Unmap() { ::munmap(p, n); }
  } unmap{map, size};
  qasm_detail::StatementReader r(static_cast<const char*>(map), size, path, interrupt);
  return r.run();
}

}  // namespace qftplan
