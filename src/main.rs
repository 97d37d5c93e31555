fn main() {
    std::process::exit(lobecast::cli::main());
}
