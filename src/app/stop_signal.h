#pragma once
// Overnight runs stop cleanly on Ctrl-C or SIGTERM: while a StopOnSignal lives, those signals set
// a flag that the long-running loop polls (it then writes its best result and returns); the
// previous handlers come back when it goes out of scope, also when the run throws.
#include <atomic>
#include <csignal>

namespace fulmar::app {

class StopOnSignal {
 public:
  StopOnSignal();   // clears the flag and installs the handlers
  ~StopOnSignal();  // restores the previous handlers
  StopOnSignal(const StopOnSignal&) = delete;
  StopOnSignal& operator=(const StopOnSignal&) = delete;

  // The flag to hand to the run (RunOptions::stop, StudyRunOptions::stop).
  const std::atomic<bool>* flag() const;

 private:
  void (*previous_int_)(int);
  void (*previous_term_)(int);
};

}  // namespace fulmar::app
