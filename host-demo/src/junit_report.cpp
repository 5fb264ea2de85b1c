#include "junit_report.hpp"

#include <fmt/format.h>

namespace protonflow::host {

std::string xml_escaped(std::string_view text) {
  std::string escaped;
  escaped.reserve(text.size());
  for (const char c : text) {
    switch (c) {
      case '&': escaped += "&amp;"; break;
      case '<': escaped += "&lt;"; break;
      case '>': escaped += "&gt;"; break;
      case '"': escaped += "&quot;"; break;
      case '\'': escaped += "&apos;"; break;
      default: {
        const auto byte = static_cast<unsigned char>(c);
        escaped += (byte < 0x20 && c != '\t' && c != '\n' && c != '\r') ? '?' : c;
      }
    }
  }
  return escaped;
}

namespace {

std::string failure_text(const Difference& d) {
  std::string text = fmt::format("expected {}, got {}", d.expected, d.actual);
  if (!d.difference.empty()) text += fmt::format(", difference {}", d.difference);
  if (!d.allowed.empty()) text += fmt::format(", allowed {}", d.allowed);
  if (!d.note.empty()) text += fmt::format(" ({})", d.note);
  return text;
}

}  // namespace

std::string junit_xml(const Comparison& comparison, std::string_view suite_name, std::string_view expect_file) {
  const std::string classname = xml_escaped(expect_file);
  const std::size_t tests = comparison.matched.size() + comparison.differences.size();
  std::string xml = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n";
  xml += fmt::format("<testsuites tests=\"{0}\" failures=\"{1}\">\n"
                     "  <testsuite name=\"{2}\" tests=\"{0}\" failures=\"{1}\" errors=\"0\" skipped=\"0\">\n",
                     tests, comparison.differences.size(), xml_escaped(suite_name));
  for (const std::string& path : comparison.matched) {
    xml += fmt::format("    <testcase name=\"{}\" classname=\"{}\"/>\n", xml_escaped(path), classname);
  }
  for (const Difference& d : comparison.differences) {
    const std::string text = xml_escaped(failure_text(d));
    xml += fmt::format("    <testcase name=\"{}\" classname=\"{}\">\n"
                       "      <failure message=\"{}\" type=\"differs\">{}</failure>\n"
                       "    </testcase>\n",
                       xml_escaped(d.path), classname, text, text);
  }
  xml += "  </testsuite>\n</testsuites>\n";
  return xml;
}

}  // namespace protonflow::host
