#pragma once
// Error policy: bad input (a file, a case, an option) throws InputError with a message that names
// what and where (file:line, JSON path or option) and the rule broken; `main` turns it into exit
// code 2. A solver that does not converge is not an error: it reports that in its summary.
#include <stdexcept>
#include <string>

namespace fulmar {

class InputError : public std::runtime_error {
 public:
  explicit InputError(const std::string& message) : std::runtime_error(message) {}
};

}  // namespace fulmar
