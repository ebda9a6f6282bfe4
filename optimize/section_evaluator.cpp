#include "optimize/section_evaluator.h"

namespace fulmar::optimize {

using nlohmann::json;

json to_json(const PointResult& p) {
  return json{{"converged", p.converged},
              {"reason", p.reason},
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
}

PointResult point_from_json(const json& j) {
  PointResult p;
  p.converged = j.at("converged").get<bool>();
  p.reason = j.at("reason").get<std::string>();
  p.residual = j.at("residual").get<double>();
  p.iterations = j.at("iterations").get<int>();
  p.alpha_deg = j.at("alpha").get<double>();
  p.cl = j.at("cl").get<double>();
  p.cd = j.at("cd").get<double>();
  p.cd_friction = j.at("cd_friction").get<double>();
  p.cd_pressure = j.at("cd_pressure").get<double>();
  p.cm = j.at("cm").get<double>();
  p.transition_upper = j.at("transition_upper").get<double>();
  p.transition_lower = j.at("transition_lower").get<double>();
  return p;
}

json to_json(const ClMaxResult& c) {
  return json{
      {"found", c.found}, {"reason", c.reason}, {"cl_max", c.cl_max}, {"alpha", c.alpha_deg}};
}

ClMaxResult cl_max_from_json(const json& j) {
  ClMaxResult c;
  c.found = j.at("found").get<bool>();
  c.reason = j.at("reason").get<std::string>();
  c.cl_max = j.at("cl_max").get<double>();
  c.alpha_deg = j.at("alpha").get<double>();
  return c;
}

}  // namespace fulmar::optimize
