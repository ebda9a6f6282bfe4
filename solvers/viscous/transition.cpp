#include "solvers/viscous/transition.h"

#include <cmath>
#include <sstream>

#include "common/error.h"

namespace fulmar::viscous {

double n_crit_from_turbulence(double tu) {
  if (!(tu > 0.0 && tu < 0.1)) {
    std::ostringstream msg;
    msg << "free-stream turbulence " << tu << " must be a fraction in (0, 0.1) for Mack's "
        << "N_crit correlation";
    throw InputError(msg.str());
  }
  return -8.43 - 2.4 * std::log(tu);
}

}  // namespace fulmar::viscous
