#include "qftplan/core/atomic_file.hpp"

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
  std::filesystem::path p(path_);
  // A symbolic link is written through: the file it names is replaced, the link stays.
  std::error_code ec;
  if (std::filesystem::is_symlink(std::filesystem::symlink_status(p, ec))) {
    const auto resolved = std::filesystem::weakly_canonical(p, ec);
    if (!ec) p = resolved;
  }
  target_ = p.string();
  struct stat st {};
  const bool exists = ::stat(target_.c_str(), &st) == 0;
  if (exists && S_ISDIR(st.st_mode)) {
    errno = EISDIR;
    throw io_error("cannot write", path_);
  }
  if (exists && !S_ISREG(st.st_mode)) {
    // A device, pipe or socket (/dev/null, a FIFO): there is nothing to rename onto; write to it.
    file_ = std::fopen(target_.c_str(), "wb");
    if (!file_) throw io_error("cannot open", path_);
    return;
  }
  const auto dir = p.has_parent_path() ? p.parent_path() : std::filesystem::path(".");
  std::string templ = (dir / ("." + p.filename().string() + ".tmp-XXXXXX")).string();
  std::vector<char> buf(templ.begin(), templ.end());
  buf.push_back('\0');
  const int fd = ::mkstemp(buf.data());
  if (fd < 0) throw io_error("cannot create a temporary file beside it", path_);
  temp_ = buf.data();
  // The mode of the file it replaces, or of a new file under the umask (mkstemp makes 0600).
  mode_t mode = 0;
  if (exists) {
    mode = st.st_mode & 07777;
  } else {
    const mode_t mask = ::umask(0);
    ::umask(mask);
    mode = 0666 & ~mask;
  }
  ::fchmod(fd, mode);
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
  // Devices and pipes may not sync (EINVAL, EROFS); files must.
  if (::fsync(::fileno(file_)) != 0 && errno != EINVAL && errno != EROFS && !temp_.empty())
    throw io_error("write failed", path_);
  const int rc = std::fclose(file_);
  file_ = nullptr;
  if (rc != 0) throw io_error("write failed", path_);
}

void AtomicFile::commit() {
  flush();
  if (committed_) return;
  if (!temp_.empty() && std::rename(temp_.c_str(), target_.c_str()) != 0)
    throw io_error("cannot rename the finished file into place", path_);
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
