// rungs: lumped-ladder SPICE netlists for transmission lines.
#include "9_cli/commands.h"

int main(int argc, char** argv) { return rungs::cli::run(argc, argv); }
