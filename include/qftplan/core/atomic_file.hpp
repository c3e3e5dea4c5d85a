#pragma once
/// \file atomic_file.hpp
/// Output files that appear whole or not at all: written to a temporary in the same folder and
/// renamed into place on commit.

#include <cstdio>
#include <string>
#include <string_view>

namespace qftplan {

/// Somewhere to write text ("-" means standard output).
class TextOutput {
 public:
  virtual ~TextOutput() = default;
  virtual void write(std::string_view text) = 0;
};

/// A file written atomically. Destroying it without commit() removes the temporary, leaving any
/// existing file at `path` untouched. A symbolic link is followed (the file it names is replaced,
/// keeping its mode); a device or pipe at `path` (/dev/null, a FIFO) is written directly, since
/// there is nothing to rename onto. Throws std::runtime_error naming the path on I/O failure.
class AtomicFile final : public TextOutput {
 public:
  explicit AtomicFile(std::string path);
  ~AtomicFile() override;
  AtomicFile(const AtomicFile&) = delete;
  AtomicFile& operator=(const AtomicFile&) = delete;
  void write(std::string_view text) override;
  /// Flushes, syncs and closes the temporary: the step where a full disk shows. Lets a caller with
  /// several files finish them all before renaming any (no write() afterwards).
  void flush();
  /// Flushes (when not yet done) and renames the temporary onto the path.
  void commit();
  const std::string& path() const { return path_; }

 private:
  std::string path_;
  std::string target_;  // path_ with a symbolic link resolved
  std::string temp_;    // empty when writing directly to a device or pipe
  std::FILE* file_ = nullptr;
  bool committed_ = false;
};

/// Standard output.
class StdoutOutput final : public TextOutput {
 public:
  void write(std::string_view text) override;
};

/// Collects text in memory.
class StringOutput final : public TextOutput {
 public:
  void write(std::string_view text) override { text_.append(text); }
  const std::string& text() const { return text_; }

 private:
  std::string text_;
};

/// Writes a whole file atomically.
void write_file_atomically(const std::string& path, std::string_view text);

}  // namespace qftplan
