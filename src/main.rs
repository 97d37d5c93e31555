//! The lobecast command line: parse, run, print the error, exit. The library
//! (`lobecast`) holds the science; `cli` turns its enums and errors into flags and
//! exit codes.

mod cli;

fn main() {
    std::process::exit(cli::main());
}
