//! The `knuckle` command: a thin shell over the library (see `knuckle::cli`).

fn main() {
    restore_default_sigpipe();
    std::process::exit(knuckle::cli::run(std::env::args_os().collect()));
}

/// Rust starts programs with SIGPIPE ignored, so writing to a pipe whose
/// reader has gone (`knuckle check --json | head`) makes `println!` panic.
/// Command-line tools end quietly instead: restore the default action, which
/// ends the process without a message when the reader closes the pipe.
#[cfg(unix)]
fn restore_default_sigpipe() {
    // SAFETY: `signal` with SIG_DFL only resets the disposition of SIGPIPE;
    // it runs before any other thread exists and installs no handler code.
    unsafe {
        libc::signal(libc::SIGPIPE, libc::SIG_DFL);
    }
}

#[cfg(not(unix))]
fn restore_default_sigpipe() {}
