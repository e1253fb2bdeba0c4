// Runs the medload binary (MEDLOAD_BINARY) as a child process for the command-level tests:
// its exit code, standard output and standard error, with optional limits set in the
// child before it starts (a file size limit, an unprivileged user). Test code only.
#pragma once

#include <fcntl.h>
#include <signal.h>
#include <sys/resource.h>
#include <sys/wait.h>
#include <unistd.h>

#include <fstream>
#include <optional>
#include <sstream>
#include <string>
#include <vector>

namespace medload {

struct ProcessOptions {
  std::string folder;                     // working folder; stdout/stderr files go here
  std::optional<rlim_t> file_size_limit;  // RLIMIT_FSIZE in bytes, for "disk full"
  std::optional<uid_t> run_as;            // setuid in the child (when the tests run as root)
  std::string stdin_path = "/dev/null";
};

// Options for a run in `folder`.
inline ProcessOptions InFolder(std::string folder) {
  ProcessOptions options;
  options.folder = std::move(folder);
  return options;
}

struct ProcessResult {
  int exit_code = -1;  // -1 when killed by a signal
  int signal = 0;
  std::string out;
  std::string err;
};

inline std::string ReadWholeFile(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

// Starts medload with `args` (without the program name) and returns the child's pid.
// Standard output and error go to FOLDER/NAME.out and FOLDER/NAME.err.
inline pid_t StartMedload(const std::vector<std::string>& args, const ProcessOptions& options,
                          const std::string& name = "medload") {
  const std::string out = options.folder + "/" + name + ".out";
  const std::string err = options.folder + "/" + name + ".err";
  std::string program = MEDLOAD_BINARY;
  std::vector<std::string> copies = args;
  std::vector<char*> argv;
  argv.push_back(program.data());
  for (std::string& arg : copies) argv.push_back(arg.data());
  argv.push_back(nullptr);
  const pid_t child = fork();
  if (child != 0) return child;
  // In the child: only async-signal-safe calls until exec.
  const int in_fd = open(options.stdin_path.c_str(), O_RDONLY);
  const int out_fd = open(out.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  const int err_fd = open(err.c_str(), O_WRONLY | O_CREAT | O_TRUNC, 0644);
  if (in_fd < 0 || out_fd < 0 || err_fd < 0 || chdir(options.folder.c_str()) != 0) _exit(125);
  dup2(in_fd, 0);
  dup2(out_fd, 1);
  dup2(err_fd, 2);
  if (options.file_size_limit) {
    const rlimit limit{*options.file_size_limit, *options.file_size_limit};
    if (setrlimit(RLIMIT_FSIZE, &limit) != 0) _exit(125);
  }
  if (options.run_as && (setgid(*options.run_as) != 0 || setuid(*options.run_as) != 0)) _exit(125);
  execv(program.c_str(), argv.data());
  _exit(126);
}

// Waits for a child started by StartMedload and collects what it wrote.
inline ProcessResult WaitMedload(pid_t child, const ProcessOptions& options,
                                 const std::string& name = "medload") {
  ProcessResult result;
  int status = 0;
  while (waitpid(child, &status, 0) < 0) {
  }
  if (WIFEXITED(status)) result.exit_code = WEXITSTATUS(status);
  if (WIFSIGNALED(status)) result.signal = WTERMSIG(status);
  result.out = ReadWholeFile(options.folder + "/" + name + ".out");
  result.err = ReadWholeFile(options.folder + "/" + name + ".err");
  return result;
}

// Runs medload to the end.
inline ProcessResult RunMedload(const std::vector<std::string>& args, const ProcessOptions& options) {
  return WaitMedload(StartMedload(args, options), options);
}

}  // namespace medload
