#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

using nlohmann::json;

json to_json(const PointResult& p) {
  json j{{"converged", p.converged()},
         {"residual", p.residual},
         {"iterations", p.iterations},
         {"alpha", p.alpha_deg},
         {"cl", p.cl},
         {"cd", p.cd},
         {"cd_friction", p.cd_friction},
         {"cd_pressure", p.cd_pressure},
         {"cm", p.cm},
         {"transition_upper", p.transition_upper},
         {"transition_lower", p.transition_lower}};
  j.update(to_json(static_cast<const Outcome&>(p)));
  return j;
}

json to_json(const ClMaxResult& c) {
  json j{{"found", c.found()}, {"cl_max", c.cl_max}, {"alpha", c.alpha_deg}};
  j.update(to_json(static_cast<const Outcome&>(c)));
  return j;
}

}  // namespace fulmar::optimize
