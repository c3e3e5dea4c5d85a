#include "qftplan/atomic_file.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstring>
#include <filesystem>
#include <stdexcept>
#include <vector>

namespace qftplan {

namespace {
std::runtime_error io_error(const std::string& what, const std::string& path) {
  return std::runtime_error(path + ": " + what + ": " + std::strerror(errno));
}
}  // namespace

AtomicFile::AtomicFile(std::string path) : path_(std::move(path)) {
  const std::filesystem::path p(path_);
  if (std::filesystem::is_directory(p)) {
    errno = EISDIR;
    throw io_error("cannot write", path_);
  }
  const auto dir = p.has_parent_path() ? p.parent_path() : std::filesystem::path(".");
  std::string templ = (dir / ("." + p.filename().string() + ".tmp-XXXXXX")).string();
  std::vector<char> buf(templ.begin(), templ.end());
  buf.push_back('\0');
  const int fd = ::mkstemp(buf.data());
  if (fd < 0) throw io_error("cannot create a temporary file beside it", path_);
  temp_ = buf.data();
  ::fchmod(fd, 0644);
  file_ = ::fdopen(fd, "wb");
  if (!file_) {
    ::close(fd);
    ::unlink(temp_.c_str());
    throw io_error("cannot open", path_);
  }
  std::setvbuf(file_, nullptr, _IOFBF, 1 << 20);
}

AtomicFile::~AtomicFile() {
  if (file_) std::fclose(file_);
  if (!committed_ && !temp_.empty()) ::unlink(temp_.c_str());
}

void AtomicFile::write(std::string_view text) {
  if (!file_) throw std::logic_error(path_ + ": write after flush");
  if (std::fwrite(text.data(), 1, text.size(), file_) != text.size()) throw io_error("write failed", path_);
}

void AtomicFile::flush() {
  if (!file_) return;
  if (std::fflush(file_) != 0) throw io_error("write failed", path_);
  if (::fsync(::fileno(file_)) != 0 && errno != EINVAL) throw io_error("write failed", path_);
  const int rc = std::fclose(file_);
  file_ = nullptr;
  if (rc != 0) throw io_error("write failed", path_);
}

void AtomicFile::commit() {
  flush();
  if (committed_) return;
  if (std::rename(temp_.c_str(), path_.c_str()) != 0) throw io_error("cannot rename the finished file into place", path_);
  committed_ = true;
}

void StdoutOutput::write(std::string_view text) {
  if (std::fwrite(text.data(), 1, text.size(), stdout) != text.size()) throw std::runtime_error("write to standard output failed");
}

void write_file_atomically(const std::string& path, std::string_view text) {
  AtomicFile f(path);
  f.write(text);
  f.commit();
}

}  // namespace qftplan
