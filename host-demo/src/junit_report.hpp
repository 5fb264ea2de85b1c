// The comparison of `protonflow check` as a JUnit XML report, so that a continuous-integration
// server shows every compared quantity as a test case and every differing one as a failure. Format:
// docs/flowsheet-format.md, "JUnit report".
#pragma once

#include <string>
#include <string_view>

#include "expectations.hpp"

namespace protonflow::host {

// One <testsuite> named suite_name (the flowsheet file) holding a <testcase> per compared quantity
// (name: its path; classname: the expectations file), a <failure> in each that differs, with the
// expected and actual values, the difference and what was allowed.
std::string junit_xml(const Comparison& comparison, std::string_view suite_name, std::string_view expect_file);

// Text made safe for an XML attribute or element: & < > " ' escaped, characters XML 1.0 forbids
// (control characters other than tab, line feed, carriage return) replaced by '?'.
std::string xml_escaped(std::string_view text);

}  // namespace protonflow::host
