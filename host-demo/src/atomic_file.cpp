#include "atomic_file.hpp"

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <cerrno>
#include <cstdio>
#include <cstring>
#include <string>

#include <fmt/format.h>

namespace protonflow::host {
namespace {

std::string reason() { return std::strerror(errno); }

// Closes and removes the temporary file unless it was renamed into place.
class TemporaryFile {
 public:
  explicit TemporaryFile(const std::filesystem::path& target) {
    const std::filesystem::path directory = target.has_parent_path() ? target.parent_path() : ".";
    // Hidden and named after the target, so a crash leaves an orphan that says what it was.
    name_ = (directory / fmt::format(".{}.tmp-XXXXXX", target.filename().string())).string();
    descriptor_ = mkstemp(name_.data());
    if (descriptor_ < 0) {
      throw FileWriteError(fmt::format("cannot create a temporary file in {}: {}", directory.string(), reason()));
    }
  }
  TemporaryFile(const TemporaryFile&) = delete;
  TemporaryFile& operator=(const TemporaryFile&) = delete;
  ~TemporaryFile() {
    if (descriptor_ >= 0) close(descriptor_);
    if (!renamed_) unlink(name_.c_str());
  }

  int descriptor() const noexcept { return descriptor_; }
  const std::string& name() const noexcept { return name_; }

  void close_file() {
    const int descriptor = descriptor_;
    descriptor_ = -1;
    if (close(descriptor) != 0) throw FileWriteError(fmt::format("cannot close {}: {}", name_, reason()));
  }
  void mark_renamed() noexcept { renamed_ = true; }

 private:
  std::string name_;
  int descriptor_ = -1;
  bool renamed_ = false;
};

mode_t permissions_for(const std::filesystem::path& file) {
  struct stat existing {};
  if (stat(file.c_str(), &existing) == 0) return existing.st_mode & 07777;
  const mode_t mask = umask(0);  // umask can only be read by setting it; put it straight back
  umask(mask);
  return 0666 & ~mask;
}

}  // namespace

void write_file_atomically(const std::filesystem::path& file, std::string_view contents) {
  TemporaryFile temporary(file);
  std::size_t written = 0;
  while (written < contents.size()) {
    const ssize_t n = write(temporary.descriptor(), contents.data() + written, contents.size() - written);
    if (n < 0) {
      if (errno == EINTR) continue;
      throw FileWriteError(fmt::format("cannot write {}: {}", temporary.name(), reason()));
    }
    written += static_cast<std::size_t>(n);
  }
  if (fchmod(temporary.descriptor(), permissions_for(file)) != 0) {
    throw FileWriteError(fmt::format("cannot set the permissions of {}: {}", temporary.name(), reason()));
  }
  // The data must be on disk before the rename makes it the file, or a crash could leave an empty one.
  if (fsync(temporary.descriptor()) != 0) {
    throw FileWriteError(fmt::format("cannot flush {} to disk: {}", temporary.name(), reason()));
  }
  temporary.close_file();
  if (std::rename(temporary.name().c_str(), file.c_str()) != 0) {
    throw FileWriteError(fmt::format("cannot rename {} to {}: {}", temporary.name(), file.string(), reason()));
  }
  temporary.mark_renamed();
  // And the rename itself must reach the disk: flush the directory entry.
  const std::filesystem::path directory = file.has_parent_path() ? file.parent_path() : ".";
  const int directory_descriptor = open(directory.c_str(), O_RDONLY | O_DIRECTORY);
  if (directory_descriptor >= 0) {
    fsync(directory_descriptor);  // best effort: some file systems refuse fsync on a directory
    close(directory_descriptor);
  }
}

}  // namespace protonflow::host
