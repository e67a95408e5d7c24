//! The `knuckle` command: a thin shell over the library (see `knuckle::cli`).

fn main() {
    std::process::exit(knuckle::cli::run(std::env::args_os().collect()));
}
