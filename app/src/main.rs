//! Entry point of the `aggrade` binary: parse the command line, then run a headless command or
//! open the window.

use clap::Parser;

fn main() -> std::process::ExitCode {
    let cli = aggrade::cli::Cli::parse();
    aggrade::cli::main(cli)
}
