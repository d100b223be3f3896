// Absurd values are refused with a located error before anything is written, instead of
// becoming a deck of inf, 0 or billions of elements. Runs the real binary with --analytic.
#include <catch2/catch.hpp>

#include <string>

#include "run_command.h"

using rungs::testing::run_rungs;

namespace {

rungs::testing::CommandResult emit(const std::string& description) {
  return run_rungs("emit --analytic - -o -", description);
}

const std::string kDrive = "drive x step 0V to 1V rise=1ns source=50ohm\nload y 50ohm\n";

}  // namespace

TEST_CASE("a value that overflows or underflows once its prefix is applied is refused",
          "[cli][limits]") {
  // 1e307 megaseconds is past the largest double; the check comes after the unit is applied.
  const auto overflow = emit("line a x -> y ideal z0=50ohm delay=1e307Ms\n" + kDrive);
  CHECK(overflow.exit_code == 2);
  CHECK(overflow.out.empty());
  CHECK(overflow.err.rfind("<stdin>:1:36: error: '1e307Ms' is inf in SI units", 0) == 0);
  // A denormal impedance would give an infinite section capacitance.
  const auto denormal = emit("line a x -> y ideal z0=1e-320ohm delay=1ns\n" + kDrive);
  CHECK(denormal.exit_code == 2);
  CHECK(denormal.err.rfind("<stdin>:1:24: error: '1e-320ohm'", 0) == 0);
  const auto voltage =
      emit("line a x -> y ideal z0=50ohm delay=1ns\ndrive x step 0V to 1e308MV rise=1ns\n"
           "load y 50ohm\n");
  CHECK(voltage.exit_code == 2);
  CHECK(voltage.err.rfind("<stdin>:2:20: error: '1e308MV'", 0) == 0);
  // Zero stays a value (a 0 V low level).
  CHECK(emit("line a x -> y ideal z0=50ohm delay=1ns\n" + kDrive).exit_code == 0);
}

TEST_CASE("derived figures a simulator cannot take are refused at the line", "[cli][limits]") {
  // Each given value is in range; the section capacitance delay/z0 = 1e51 F is not.
  const auto capacitance = emit("line a x -> y ideal z0=1e-25ohm delay=1e26s sections=10\n" +
                                kDrive + "set window 1us\n");
  CHECK(capacitance.exit_code == 2);
  CHECK(capacitance.err.find("<stdin>:1:6: error: a section of line a would have a capacitance "
                             "of 1e+50 F") != std::string::npos);
  // A 64 GB deck is refused before a byte of it is written, pointed at the line to change.
  const auto huge =
      emit("line a x -> y ideal z0=50ohm delay=1ns\nline b y -> z ideal z0=50ohm delay=1ns "
           "sections=1e9\ndrive x step 0V to 1V rise=1ns source=50ohm\nload z 50ohm\n");
  CHECK(huge.exit_code == 2);
  CHECK(huge.out.empty());
  CHECK(huge.err.find("<stdin>:2:6: error: the deck would hold") != std::string::npos);
  CHECK(huge.err.find("(2000000001 in line b)") != std::string::npos);
  // The analytic count's cap is an error now, not a silent 10,000,000.
  const auto capped = emit(
      "line c x -> y ideal z0=50ohm delay=1us\ndrive x step 0V to 1V rise=1ps source=50ohm\n"
      "load y 50ohm\n");
  CHECK(capped.exit_code == 2);
  CHECK(capped.err.find("line c would need more than 10000000 sections") != std::string::npos);
}

TEST_CASE("a description with no line is an error, not a deck of .tran 0 0 0 0",
          "[cli][limits]") {
  const auto empty = emit("");
  CHECK(empty.exit_code == 2);
  CHECK(empty.out.empty());
  CHECK(empty.err.rfind("<stdin>:1:1: error: the description has no line", 0) == 0);
  const auto comment = emit("# only a comment\nset tolerance 1%\n");
  CHECK(comment.exit_code == 2);
  CHECK(comment.err.find("nothing written") != std::string::npos);
}

TEST_CASE("nested brackets and long chains in a load are bounded", "[cli][limits]") {
  const std::string line = "line a x -> y ideal z0=50ohm delay=1ns\n"
                           "drive x step 0V to 1V rise=1ns source=50ohm\n";
  // 16 levels: parsed once (each level tripled the work before: over 20 s).
  const std::string sixteen = "load y " + std::string(16, '(') + "50ohm" + std::string(16, ')');
  CHECK(emit(line + sixteen + "\n").exit_code == 0);
  // 100,000 open brackets overflowed the stack (SIGSEGV); now a located error at the 65th.
  const auto deep = emit(line + "load y " + std::string(100000, '(') + "50ohm\n");
  CHECK(deep.exit_code == 2);
  CHECK(deep.err.rfind("<stdin>:3:72: error: brackets nested deeper than 64 levels", 0) == 0);
  // A chain past the stated number of values is an error, not minutes and gigabytes.
  std::string chain = "load y 1ohm";
  for (int i = 0; i < 300; ++i) chain += " + 1ohm";
  const auto longer = emit(line + chain + "\n");
  CHECK(longer.exit_code == 2);
  CHECK(longer.err.find("256") != std::string::npos);
}
