#include "run_program.hpp"

#include <fcntl.h>
#include <spawn.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>

extern char** environ;

namespace protonflow::e2e {
namespace {

// A temporary file that is removed when it goes out of scope. Files rather than pipes: the child
// can write any amount to both streams without the parent having to poll.
class TemporaryFile {
 public:
  TemporaryFile() {
    std::string pattern = (std::filesystem::temp_directory_path() / "protonflow-e2e-XXXXXX").string();
    descriptor_ = mkstemp(pattern.data());
    if (descriptor_ < 0) {
      throw std::runtime_error(std::string("mkstemp: ") + std::strerror(errno));
    }
    path_ = pattern;
  }
  ~TemporaryFile() {
    close(descriptor_);
    std::filesystem::remove(path_);
  }
  TemporaryFile(const TemporaryFile&) = delete;
  TemporaryFile& operator=(const TemporaryFile&) = delete;

  int descriptor() const noexcept { return descriptor_; }
  std::string contents() const {
    std::ifstream stream(path_, std::ios::binary);
    std::ostringstream text;
    text << stream.rdbuf();
    return text.str();
  }

 private:
  int descriptor_ = -1;
  std::filesystem::path path_;
};

class SpawnActions {
 public:
  SpawnActions() { posix_spawn_file_actions_init(&actions_); }
  ~SpawnActions() { posix_spawn_file_actions_destroy(&actions_); }
  SpawnActions(const SpawnActions&) = delete;
  SpawnActions& operator=(const SpawnActions&) = delete;
  posix_spawn_file_actions_t* get() noexcept { return &actions_; }

 private:
  posix_spawn_file_actions_t actions_;
};

}  // namespace

ProgramRun run_program(const std::string& program, const std::vector<std::string>& arguments) {
  const TemporaryFile out;
  const TemporaryFile err;
  SpawnActions actions;
  posix_spawn_file_actions_addopen(actions.get(), STDIN_FILENO, "/dev/null", O_RDONLY, 0);
  posix_spawn_file_actions_adddup2(actions.get(), out.descriptor(), STDOUT_FILENO);
  posix_spawn_file_actions_adddup2(actions.get(), err.descriptor(), STDERR_FILENO);

  std::vector<std::string> words{program};
  words.insert(words.end(), arguments.begin(), arguments.end());
  std::vector<char*> argv;
  for (std::string& word : words) {
    argv.push_back(word.data());
  }
  argv.push_back(nullptr);

  pid_t child = 0;
  const int spawn_error = posix_spawn(&child, program.c_str(), actions.get(), nullptr, argv.data(), environ);
  if (spawn_error != 0) {
    throw std::runtime_error("cannot start " + program + ": " + std::strerror(spawn_error));
  }
  int status = 0;
  while (waitpid(child, &status, 0) < 0) {
    if (errno != EINTR) {
      throw std::runtime_error(std::string("waitpid: ") + std::strerror(errno));
    }
  }
  ProgramRun run;
  if (WIFEXITED(status)) {
    run.exit_code = WEXITSTATUS(status);
  } else if (WIFSIGNALED(status)) {
    run.exit_code = -WTERMSIG(status);
  }
  run.out = out.contents();
  run.err = err.contents();
  return run;
}

}  // namespace protonflow::e2e
