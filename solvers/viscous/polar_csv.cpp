#include "solvers/viscous/polar_csv.h"

#include <cmath>
#include <sstream>

namespace fulmar::viscous {
namespace {

void number(std::ostringstream& out, double v) {
  if (std::isfinite(v)) out << v;
}

std::string text(const std::string& s) {
  if (s.find_first_of(",\"\r\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) q += c == '"' ? std::string("\"\"") : std::string(1, c);
  return q + "\"";
}

}  // namespace

PolarCsvRow polar_csv_row(const ViscousResult& r, double re, double mach) {
  PolarCsvRow row;
  row.re = re;
  row.mach = mach;
  row.alpha = r.alpha;
  row.cl = r.cl;
  row.cd = r.cd;
  row.cd_friction = r.cd_friction;
  row.cd_pressure = r.cd_pressure;
  row.cm = r.cm;
  row.transition_upper = r.transition_upper;
  row.transition_lower = r.transition_lower;
  row.converged = r.converged;
  row.iterations = r.iterations;
  return row;
}

std::string polar_csv(const std::vector<PolarCsvRow>& rows) {
  std::ostringstream csv;
  csv.precision(10);
  csv << "re,mach,alpha,cl,cd,cd_friction,cd_pressure,cm,transition_upper,transition_lower,"
         "converged,iterations,section,condition\n";
  for (const PolarCsvRow& r : rows) {
    for (double v : {r.re, r.mach, r.alpha, r.cl, r.cd, r.cd_friction, r.cd_pressure, r.cm,
                     r.transition_upper, r.transition_lower}) {
      number(csv, v);
      csv << ',';
    }
    csv << (r.converged ? 1 : 0) << ',' << r.iterations << ',' << text(r.section) << ','
        << text(r.condition) << '\n';
  }
  return csv.str();
}

}  // namespace fulmar::viscous
