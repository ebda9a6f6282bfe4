#include "app/stop_signal.h"

namespace fulmar::app {
namespace {

std::atomic<bool> g_stop_requested{false};

extern "C" void request_stop(int /*signal*/) {
  g_stop_requested.store(true);
}

}  // namespace

StopOnSignal::StopOnSignal() {
  g_stop_requested.store(false);
  previous_int_ = std::signal(SIGINT, request_stop);
  previous_term_ = std::signal(SIGTERM, request_stop);
}

StopOnSignal::~StopOnSignal() {
  std::signal(SIGINT, previous_int_);
  std::signal(SIGTERM, previous_term_);
}

const std::atomic<bool>* StopOnSignal::flag() const {
  return &g_stop_requested;
}

}  // namespace fulmar::app
