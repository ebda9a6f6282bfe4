#include "cad/writers.h"

#include <algorithm>
#include <cctype>
#include <iomanip>
#include <sstream>
#include <vector>

#include "cad/writer_parts.h"

namespace fulmar::cad {

using detail::ascii;
using detail::closed_curve;

// --------------------------------------------------------------------------------------------
// IGES 5.3. Fixed 80-column records: columns 1-72 data, 73 the section letter, 74-80 the
// sequence number. Parameter records use columns 1-64 for data and 65-72 for the pointer back to
// the entity's directory entry.

namespace {

std::string hollerith(const std::string& text) {
  const std::string a = ascii(text);
  return std::to_string(a.size()) + "H" + a;
}

std::string iges_record(const std::string& data, char section, int sequence) {
  std::ostringstream s;
  s << std::left << std::setw(72) << data.substr(0, 72) << section << std::right << std::setw(7)
    << sequence << "\n";
  return s.str();
}

std::string field8(const std::string& v) {
  std::ostringstream s;
  s << std::right << std::setw(8) << v.substr(0, 8);
  return s.str();
}
std::string field8(int v) {
  return field8(std::to_string(v));
}

// Packs tokens (each followed by its delimiter) into lines of at most `width` characters.
std::vector<std::string> pack(const std::vector<std::string>& tokens, size_t width, char delimiter,
                              char terminator) {
  std::vector<std::string> lines;
  std::string line;
  for (size_t i = 0; i < tokens.size(); ++i) {
    const std::string t = tokens[i] + (i + 1 == tokens.size() ? terminator : delimiter);
    if (!line.empty() && line.size() + t.size() > width) {
      lines.push_back(line);
      line.clear();
    }
    line += t;
  }
  if (!line.empty()) lines.push_back(line);
  return lines;
}

// "YYYY-MM-DDTHH:MM:SS" -> IGES "YYYYMMDD.HHNNSS".
std::string iges_date(const std::string& ts) {
  std::string digits;
  for (char c : ts) {
    if (c >= '0' && c <= '9') digits += c;
  }
  digits.resize(14, '0');
  return digits.substr(0, 8) + "." + digits.substr(8, 6);
}

}  // namespace

std::string iges_text(const CadDrawing& d) {
  std::string out;
  // Start section: human-readable description.
  std::ostringstream desc;
  desc << "fulmar wing section " << ascii(d.name) << ", chord " << d.placement.chord << " "
       << to_string(d.placement.units) << ", twist " << d.placement.twist_deg
       << " deg (nose up +) about x/c " << d.placement.pivot
       << ", in the plane z = " << d.placement.offset.z() << " " << to_string(d.placement.units)
       << ".";
  std::vector<std::string> start_lines;
  {
    const std::string text = desc.str();
    for (size_t i = 0; i < text.size(); i += 72) start_lines.push_back(text.substr(i, 72));
  }
  int seq = 0;
  for (const std::string& l : start_lines) out += iges_record(l, 'S', ++seq);
  const int s_count = seq;

  // Global section (IGES 5.3 section 2.2.4, parameters 1..25).
  int unit_flag = 2;  // 1 inches, 2 millimetres, 6 metres
  std::string unit_name = "MM";
  if (d.placement.units == LengthUnit::in) {
    unit_flag = 1;
    unit_name = "INCH";
  } else if (d.placement.units == LengthUnit::m) {
    unit_flag = 6;
    unit_name = "M";
  }
  double max_coordinate = 0.0;
  for (const BSplineCurve& c : d.curves) {
    max_coordinate = std::max(max_coordinate, c.control.cwiseAbs().maxCoeff());
  }
  const std::string date = iges_date(d.timestamp);
  const std::vector<std::string> global = {"1H,",
                                           "1H;",
                                           hollerith("fulmar section " + d.name),
                                           hollerith(d.file_name),
                                           hollerith("fulmar " FULMAR_VERSION),
                                           hollerith("fulmar IGES writer"),
                                           "32",
                                           "38",
                                           "6",
                                           "308",
                                           "15",
                                           hollerith("fulmar section " + d.name),
                                           "1.",
                                           std::to_string(unit_flag),
                                           hollerith(unit_name),
                                           "1",
                                           format_real(d.placement.chord * 0.001),
                                           hollerith(date),
                                           format_real(d.resolution),
                                           format_real(max_coordinate),
                                           hollerith("fulmar"),
                                           "",
                                           "11",
                                           "0",
                                           hollerith(date)};
  int g_count = 0;
  for (const std::string& l : pack(global, 72, ',', ';')) out += iges_record(l, 'G', ++g_count);

  // Parameter data first (the directory needs the line counts), then the directory.
  std::vector<std::vector<std::string>> params;
  for (const BSplineCurve& c : d.curves) {
    const int n = c.control_count();
    std::vector<std::string> t = {"126",
                                  std::to_string(n - 1),
                                  std::to_string(c.degree),
                                  "1",                          // planar
                                  closed_curve(c) ? "1" : "0",  // closed
                                  "1",                          // polynomial (all weights equal)
                                  "0"};                         // not periodic
    for (Eigen::Index k = 0; k < c.knots.size(); ++k) t.push_back(format_real(c.knots(k)));
    for (int k = 0; k < n; ++k) t.push_back("1.");
    for (int k = 0; k < n; ++k) {
      for (int j = 0; j < 3; ++j) t.push_back(format_real(c.control(k, j)));
    }
    t.push_back(format_real(c.first_parameter()));
    t.push_back(format_real(c.last_parameter()));
    t.insert(t.end(), {"0.", "0.", "1."});  // unit normal of the plane
    params.push_back(t);
  }
  std::string directory;
  std::string parameter;
  int p_seq = 0;
  for (size_t e = 0; e < params.size(); ++e) {
    const int de = static_cast<int>(2 * e + 1);
    const std::vector<std::string> lines = pack(params[e], 64, ',', ';');
    const int first_p = p_seq + 1;
    for (const std::string& l : lines) {
      std::ostringstream s;
      s << std::left << std::setw(64) << l << std::right << std::setw(8) << de;
      parameter += iges_record(s.str(), 'P', ++p_seq);
    }
    const std::string label = e < d.curve_names.size() ? ascii(d.curve_names[e]) : "CURVE";
    std::string label8 = label.substr(0, 8);
    for (char& ch : label8) ch = static_cast<char>(std::toupper(static_cast<unsigned char>(ch)));
    directory += iges_record(field8(126) + field8(first_p) + field8(0) + field8(0) + field8(0) +
                                 field8(0) + field8(0) + field8(0) + "00000000",
                             'D', de);
    directory += iges_record(field8(126) + field8(0) + field8(0) +
                                 field8(static_cast<int>(lines.size())) + field8(0) + field8("") +
                                 field8("") + field8(label8) + field8(static_cast<int>(e + 1)),
                             'D', de + 1);
  }
  out += directory + parameter;
  std::ostringstream term;
  term << "S" << std::setw(7) << s_count << "G" << std::setw(7) << g_count << "D" << std::setw(7)
       << 2 * params.size() << "P" << std::setw(7) << p_seq;
  out += iges_record(term.str(), 'T', 1);
  return out;
}

}  // namespace fulmar::cad
