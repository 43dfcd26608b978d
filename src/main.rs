//! The `tinct` binary: a thin shell over the library. With no command it opens the editor.

use std::process::ExitCode;

use clap::Parser;
use tinct::cli::{Cli, Command, run};

fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli.command {
        None => {
            eprintln!(
                "tinct: the editor window is not part of this version yet. Headless commands work now: \
                 `tinct analyse FILE`, `tinct convert IN OUT` (see `tinct --help`)."
            );
            ExitCode::from(tinct::cli::exit::BAD_INPUT)
        }
        Some(command @ Command::Open { .. }) => run(command),
        Some(command) => run(command),
    }
}
