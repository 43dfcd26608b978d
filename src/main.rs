//! The `tinct` binary: a thin shell over the library. With no command it opens the editor.

use std::process::ExitCode;

use clap::Parser;
use tinct::cli::{Cli, Command, exit, run};

fn main() -> ExitCode {
    let cli = Cli::parse();
    match cli.command {
        None => editor(None),
        Some(Command::Open { file }) => editor(Some(file)),
        Some(command) => run(command),
    }
}

#[cfg(feature = "gui")]
fn editor(path: Option<std::path::PathBuf>) -> ExitCode {
    match tinct::ui::run(path) {
        Ok(()) => ExitCode::from(exit::OK),
        Err(e) => {
            eprintln!("tinct: {e:#}");
            ExitCode::from(exit::BAD_INPUT)
        }
    }
}

#[cfg(not(feature = "gui"))]
fn editor(path: Option<std::path::PathBuf>) -> ExitCode {
    let _ = path;
    eprintln!(
        "tinct: this build has no editor window (it was built without the `gui` feature); \
         use `tinct analyse FILE` or `tinct convert IN OUT` (see `tinct --help`)"
    );
    ExitCode::from(exit::BAD_INPUT)
}
