/* Runs a command and reports what the kernel accounted to it when it ended
 * (wait4, POSIX getrusage semantics): CPU time in user and system mode of the
 * process and all its threads, and its peak resident set size. For
 * `npm run bench`: CPU time of a child process, not wall time.
 * Usage: rusage COMMAND [ARGS...]  -> the command's own output, then one line
 *        on stderr: "rusage: USER_SECONDS SYSTEM_SECONDS MAXRSS_KIB EXIT_STATUS" */
#include <stdio.h>
#include <stdlib.h>
#include <sys/resource.h>
#include <sys/time.h>
#include <sys/types.h>
#include <sys/wait.h>
#include <unistd.h>

int main(int argc, char **argv) {
  if (argc < 2) {
    fprintf(stderr, "usage: rusage COMMAND [ARGS...]\n");
    return 2;
  }
  pid_t pid = fork();
  if (pid < 0) {
    perror("fork");
    return 2;
  }
  if (pid == 0) {
    execvp(argv[1], argv + 1);
    perror("exec");
    _exit(127);
  }
  int status = 0;
  struct rusage ru;
  if (wait4(pid, &status, 0, &ru) < 0) {
    perror("wait4");
    return 2;
  }
  int code = WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
  fprintf(stderr, "rusage: %ld.%06ld %ld.%06ld %ld %d\n", (long)ru.ru_utime.tv_sec, (long)ru.ru_utime.tv_usec, (long)ru.ru_stime.tv_sec,
          (long)ru.ru_stime.tv_usec, ru.ru_maxrss, code);
  return 0;
}
