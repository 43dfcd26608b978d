//! The command line: thin commands over the library. Errors are mapped to exit codes here, once:
//! 0 success, 1 the analysis found problems (only with `--strict`), 2 bad input, 3 could not write output.

pub mod analyse;
pub mod colouring;
pub mod export;
pub mod import;
pub mod planarity;
pub mod relax;

use std::io::Write;
use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Parser, Subcommand, ValueEnum};

/// Tinct: colour maps with the fewest colours, and prove it.
#[derive(Parser, Debug)]
#[command(name = "tinct", version, about, long_about = None)]
pub struct Cli {
    #[command(subcommand)]
    pub command: Option<Command>,
}

/// A section of `tinct analyse` that can be asked for alone with `--only`.
#[derive(Copy, Clone, Debug, PartialEq, Eq, ValueEnum)]
pub enum Section {
    /// Regions, borders, groups, pins and the current colouring's problems.
    Rules,
    /// Planarity of the constraint graph, with a Kuratowski subgraph or an embedding as proof.
    Planarity,
    /// The fewest colours, whether three can do, and the proof when they cannot.
    Colouring,
}

/// How `tinct colour` evens out colour use.
#[derive(Copy, Clone, Debug, PartialEq, Eq, ValueEnum)]
pub enum BalanceArg {
    /// About as many regions per colour.
    Count,
    /// About as much area per colour.
    Area,
}

#[derive(Subcommand, Debug)]
pub enum Command {
    /// Open a project or graph file in the editor window.
    Open {
        /// The file to open (.tinct, .col, .edges; boundary files .geojson, .topojson, .shp, .gpkg, .fgb are imported).
        file: PathBuf,
    },
    /// Report on a map: regions, borders, rules, clashes and uncoloured regions.
    Analyse {
        /// The file to analyse (.tinct, .col, .edges, or a boundary file: .geojson, .json, .topojson, .shp, .gpkg, .fgb).
        file: PathBuf,
        /// Print machine-readable JSON on standard output (shape documented in the README).
        #[arg(long)]
        json: bool,
        /// Exit with status 1 when the analysis finds problems (clashes, uncoloured land, rule conflicts).
        #[arg(long)]
        strict: bool,
        /// Run only this part of the analysis.
        #[arg(long, value_enum)]
        only: Option<Section>,
        /// With `--json`: add the planar embedding (clockwise neighbours of every region).
        #[arg(long)]
        embedding: bool,
        /// Write the planarity certificate (Kuratowski subgraph or embedding) as JSON to FILE.
        #[arg(long, value_name = "FILE")]
        certificate_out: Option<PathBuf>,
        /// Stop the search for the fewest colours after this many seconds and report what is proven.
        #[arg(long, value_name = "SECS", default_value_t = 20.0)]
        time_limit: f64,
        /// Write the proofs to DIR: three-colours.cnf and .drat when three colours are impossible,
        /// N-colours.cnf and .drat for one colour fewer than the minimum (N = minimum - 1).
        #[arg(long, value_name = "DIR")]
        proof_out: Option<PathBuf>,
        /// How a boundary file is imported (ignored for projects and graph files).
        #[command(flatten)]
        geo: import::GeoArgs,
    },
    /// Colour a map with the fewest colours (honouring pins and groups) and write the coloured project.
    Colour {
        /// The file to colour (any file `analyse` reads).
        file: PathBuf,
        /// The project file to write (.tinct).
        #[arg(long)]
        out: PathBuf,
        /// Keep the current colours where possible, so an edited map changes as little as possible.
        #[arg(long)]
        keep_colours: bool,
        /// Even out colour use by region count or by area.
        #[arg(long, value_enum)]
        balance: Option<BalanceArg>,
        /// Stop the search after this many seconds and use the best colouring found.
        #[arg(long, value_name = "SECS", default_value_t = 20.0)]
        time_limit: f64,
        /// When the map needs more colours than the palette has, add the missing slots (each as
        /// distinct as possible from the palette's colours) instead of refusing.
        #[arg(long)]
        add_slots: bool,
        /// Colours that follow a hierarchy: a family of tints for each parent unit (neighbouring
        /// parents get different families), a tint for each region (neighbours within a parent
        /// get different tints). The parent is the attribute "parent" (see import's
        /// --parent-field), or FIELD, or FIELD:N for its first N characters. Replaces the palette
        /// with one of families.
        #[arg(long = "by-parent", value_name = "FIELD[:N]", num_args = 0..=1, default_missing_value = "parent", value_parser = import::parse_parent_key, conflicts_with_all = ["keep_colours", "balance", "add_slots"])]
        by_parent: Option<crate::doc::ParentKey>,
        /// How a boundary file is imported (ignored for projects and graph files).
        #[command(flatten)]
        geo: import::GeoArgs,
    },
    /// Find the fewest corner contacts, hand-made borders, short borders, group memberships or
    /// pins to drop so that a number of colours do, with evidence that no fewer would.
    Relax {
        /// The map (any file `analyse` reads).
        file: PathBuf,
        /// How many colours the map should take.
        #[arg(long)]
        colours: Option<u32>,
        /// Instead of --colours: the fewest borders to drop so that the borders can be drawn flat
        /// (without crossings). Only corner, manual and short borders are dropped for this.
        #[arg(long)]
        planar: bool,
        /// What may be dropped, comma-separated: corner, manual, short:LENGTH (m or km on maps in
        /// metres), group, pin.
        #[arg(long, default_value = "corner,manual,group")]
        allow: String,
        /// Weigh borders by length, so the shortest go first: a corner contact costs 1, the
        /// shortest shared border that may go 2, one n times as long about n + 1 (otherwise
        /// every relaxation costs 1).
        #[arg(long = "by-length")]
        by_length: bool,
        /// Print machine-readable JSON on standard output (shape documented in the README).
        #[arg(long)]
        json: bool,
        /// Stop after this many seconds and report the best answer and the bound proven so far.
        #[arg(long, value_name = "SECS", default_value_t = 60.0)]
        time_limit: f64,
        /// Apply the answer (one undoable edit) and write the project to --out.
        #[arg(long, requires = "out")]
        apply: bool,
        /// The project file to write with --apply (.tinct).
        #[arg(long)]
        out: Option<PathBuf>,
        /// How a boundary file is imported (ignored for projects and graph files).
        #[command(flatten)]
        geo: import::GeoArgs,
    },
    /// Import a boundary file (.geojson, .json, .topojson, .shp, .gpkg, .fgb) into a project file.
    Import {
        /// The boundary file to read.
        file: PathBuf,
        /// The project file to write (.tinct).
        #[arg(long)]
        out: PathBuf,
        #[command(flatten)]
        geo: import::GeoArgs,
    },
    /// Derive which regions of a boundary file border each other, with diagnostics.
    Adjacency {
        /// The boundary file to read (.geojson, .json, .topojson, .shp, .gpkg, .fgb).
        file: PathBuf,
        /// Print machine-readable JSON on standard output.
        #[arg(long)]
        json: bool,
        #[command(flatten)]
        geo: import::GeoArgs,
    },
    /// Export a map as SVG, PNG or PDF (for print), GeoJSON, GeoPackage or Shapefile (for GIS) or
    /// CSV (for spreadsheets).
    Export {
        /// The file to export (any file `analyse` reads; usually a coloured .tinct project).
        file: PathBuf,
        #[command(flatten)]
        args: Box<export::ExportArgs>,
        /// How a boundary file is imported (ignored for projects and graph files).
        #[command(flatten)]
        geo: import::GeoArgs,
    },
    /// Check that the palette's colours can be told apart where neighbours meet (normal vision,
    /// simulated colour-vision deficiencies, greyscale), and optionally reassign slots.
    Palette {
        /// The project to check.
        file: PathBuf,
        #[command(flatten)]
        args: export::PaletteArgs,
    },
    /// Convert between project and graph formats, chosen by the files' extensions.
    Convert {
        /// The file to read (.tinct, .col, .dimacs, .edges, or a boundary file to import).
        input: PathBuf,
        /// The file to write (.tinct, .col, .dimacs, .edges); graph formats receive the constraint graph.
        output: PathBuf,
        /// How a boundary file is imported (ignored for projects and graph files).
        #[command(flatten)]
        geo: import::GeoArgs,
    },
}

/// Exit statuses.
pub mod exit {
    pub const OK: u8 = 0;
    pub const PROBLEMS: u8 = 1;
    pub const BAD_INPUT: u8 = 2;
    pub const CANNOT_WRITE: u8 = 3;
}

/// A time limit in seconds, if it is a positive finite number.
fn seconds(value: f64) -> Result<std::time::Duration, Failure> {
    if value.is_finite() && value > 0.0 {
        Ok(std::time::Duration::from_secs_f64(value.min(1e9)))
    } else {
        Err(Failure::BadInput(anyhow::anyhow!(
            "--time-limit must be a positive number of seconds"
        )))
    }
}

/// What a command produced: text for standard output, lines for standard error (each printed
/// after `tinct: `), and whether the analysis found problems (for `--strict`).
#[derive(Debug, Default)]
pub struct Outcome {
    pub stdout: String,
    pub notes: Vec<String>,
    pub problems: bool,
}

impl Outcome {
    /// Only text for standard output.
    pub fn text(stdout: String) -> Outcome {
        Outcome {
            stdout,
            ..Outcome::default()
        }
    }
    /// Only lines for standard error.
    pub fn notes(notes: Vec<String>) -> Outcome {
        Outcome {
            notes,
            ..Outcome::default()
        }
    }
}

/// Why a command failed. [`run`] turns it into an exit status, in one place.
#[derive(Debug)]
pub enum Failure {
    /// The input cannot be used (exit status 2).
    BadInput(anyhow::Error),
    /// The output cannot be written (exit status 3).
    CannotWrite(anyhow::Error),
}

/// What every command returns.
pub type CommandResult = Result<Outcome, Failure>;

/// Marks an error as bad input or as a failed write.
pub trait OrFail<T> {
    fn bad_input(self) -> Result<T, Failure>;
    fn cannot_write(self) -> Result<T, Failure>;
}

impl<T, E: Into<anyhow::Error>> OrFail<T> for Result<T, E> {
    fn bad_input(self) -> Result<T, Failure> {
        self.map_err(|e| Failure::BadInput(e.into()))
    }
    fn cannot_write(self) -> Result<T, Failure> {
        self.map_err(|e| Failure::CannotWrite(e.into()))
    }
}

/// Loads any file a command reads (boundary files with the import options given).
fn load(file: &std::path::Path, geo: &import::GeoArgs) -> Result<crate::formats::Loaded, Failure> {
    crate::formats::load(file, &geo.options()).bad_input()
}

/// Saves in the format the extension names: a wrong extension is bad input, a failed write is not.
fn save(doc: &crate::doc::Document, path: &std::path::Path) -> Result<(), Failure> {
    crate::formats::save(doc, path).map_err(|e| {
        if e.is_write() {
            Failure::CannotWrite(e.into())
        } else {
            Failure::BadInput(e.into())
        }
    })
}

/// Runs a headless command: prints what it produced and maps failures to exit statuses
/// (0 success; 1 problems found, with `--strict`; 2 bad input; 3 output not written).
pub fn run(command: Command) -> ExitCode {
    let (code, failure) = match execute(command) {
        Ok(outcome) => {
            for note in &outcome.notes {
                eprintln!("tinct: {note}");
            }
            let mut stdout = std::io::stdout().lock();
            match stdout
                .write_all(outcome.stdout.as_bytes())
                .and_then(|_| stdout.flush())
            {
                Err(e) => (exit::CANNOT_WRITE, Some(anyhow::Error::from(e))),
                Ok(()) if outcome.problems => (exit::PROBLEMS, None),
                Ok(()) => (exit::OK, None),
            }
        }
        Err(Failure::BadInput(e)) => (exit::BAD_INPUT, Some(e)),
        Err(Failure::CannotWrite(e)) => (exit::CANNOT_WRITE, Some(e)),
    };
    if let Some(e) = failure {
        eprintln!("tinct: {e:#}");
    }
    ExitCode::from(code)
}

/// Runs a command and returns what it produced.
pub fn execute(command: Command) -> CommandResult {
    match command {
        // Opening a window is the binary's job (it owns the GUI); a headless caller gets a clear no.
        Command::Open { .. } => Err(Failure::BadInput(anyhow::anyhow!(
            "`open` needs the editor window; run it as `tinct open FILE`"
        ))),
        Command::Analyse {
            file,
            json,
            strict,
            only,
            embedding,
            certificate_out,
            time_limit,
            proof_out,
            geo,
        } => analyse::run_analyse(&analyse::AnalyseArgs {
            file,
            json,
            strict,
            only,
            embedding,
            certificate_out,
            time_limit: seconds(time_limit)?,
            proof_out,
            geo,
        }),
        Command::Colour {
            file,
            out,
            keep_colours,
            balance,
            time_limit,
            add_slots,
            by_parent,
            geo,
        } => {
            if let Some(key) = by_parent {
                return colouring::run_colour_by_parent(
                    &file,
                    &out,
                    &key,
                    seconds(time_limit)?,
                    &geo,
                );
            }
            let balance = balance.map(|b| match b {
                BalanceArg::Count => crate::analysis::BalanceBy::Count,
                BalanceArg::Area => crate::analysis::BalanceBy::Area,
            });
            colouring::run_colour(&colouring::ColourArgs {
                file,
                out,
                keep: keep_colours,
                balance,
                time_limit: seconds(time_limit)?,
                add_slots,
                geo,
            })
        }
        Command::Relax {
            file,
            colours,
            planar,
            allow,
            by_length,
            json,
            time_limit,
            apply,
            out,
            geo,
        } => relax::run_relax(&relax::RelaxArgs {
            file,
            colours,
            planar,
            allow,
            by_length,
            json,
            time_limit: seconds(time_limit)?,
            apply,
            out,
            geo,
        }),
        Command::Import { file, out, geo } => import::run_import(&file, &out, &geo),
        Command::Adjacency { file, json, geo } => import::run_adjacency(&file, json, &geo),
        Command::Export { file, args, geo } => export::run_export(&file, &args, &geo),
        Command::Palette { file, args } => export::run_palette(&file, &args),
        Command::Convert {
            input: from,
            output,
            geo,
        } => {
            let loaded = load(&from, &geo)?;
            save(&loaded.doc, &output)?;
            Ok(Outcome::notes(
                loaded
                    .notices
                    .iter()
                    .map(|n| format!("note: {}", n.message))
                    .collect(),
            ))
        }
    }
}
