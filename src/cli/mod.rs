//! The command line: thin commands over the library. Errors are mapped to exit codes here, once:
//! 0 success, 1 the analysis found problems (only with `--strict`), 2 bad input, 3 could not write output.

pub mod analyse;
pub mod colouring;
pub mod export;
pub mod import;
pub mod planarity;

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
        /// The file to open (.tinct, .col, .edges; boundary files .geojson, .topojson, .shp are imported).
        file: PathBuf,
    },
    /// Report on a map: regions, borders, rules, clashes and uncoloured regions.
    Analyse {
        /// The file to analyse (.tinct, .col, .edges, or a boundary file: .geojson, .json, .topojson, .shp).
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
    },
    /// Import a boundary file (.geojson, .json, .topojson, .shp) into a project file.
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
        /// The boundary file to read (.geojson, .json, .topojson, .shp).
        file: PathBuf,
        /// Print machine-readable JSON on standard output.
        #[arg(long)]
        json: bool,
        #[command(flatten)]
        geo: import::GeoArgs,
    },
    /// Export a map as SVG or PNG (for print), GeoJSON (for GIS) or CSV (for spreadsheets).
    Export {
        /// The file to export (any file `analyse` reads; usually a coloured .tinct project).
        file: PathBuf,
        #[command(flatten)]
        args: export::ExportArgs,
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
        /// The file to read (.tinct, .col, .dimacs, .edges).
        input: PathBuf,
        /// The file to write (.tinct, .col, .dimacs, .edges); graph formats receive the constraint graph.
        output: PathBuf,
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
fn seconds(value: f64) -> Option<std::time::Duration> {
    (value.is_finite() && value > 0.0).then(|| std::time::Duration::from_secs_f64(value.min(1e9)))
}

/// Writes `text` to standard output: exit 0, or 3 when it cannot be written (a closed pipe).
fn print_out(text: &str) -> ExitCode {
    use std::io::Write as _;
    let mut stdout = std::io::stdout().lock();
    match stdout
        .write_all(text.as_bytes())
        .and_then(|_| stdout.flush())
    {
        Ok(()) => ExitCode::from(exit::OK),
        Err(e) => error(exit::CANNOT_WRITE, &e.into()),
    }
}

fn error(code: u8, e: &anyhow::Error) -> ExitCode {
    eprintln!("tinct: {e:#}");
    ExitCode::from(code)
}

/// Runs a headless command.
pub fn run(command: Command) -> ExitCode {
    match command {
        Command::Open { .. } => {
            // Opening a window is the binary's job (it owns the GUI); a headless caller gets a clear no.
            eprintln!("tinct: `open` needs the editor window; run it as `tinct open FILE`");
            ExitCode::from(exit::BAD_INPUT)
        }
        Command::Analyse {
            file,
            json,
            strict,
            only,
            embedding,
            certificate_out,
            time_limit,
            proof_out,
        } => {
            let loaded = match crate::formats::load(&file) {
                Ok(l) => l,
                Err(e) => return error(exit::BAD_INPUT, &e),
            };
            let Some(limit) = seconds(time_limit) else {
                return error(
                    exit::BAD_INPUT,
                    &anyhow::anyhow!("--time-limit must be a positive number of seconds"),
                );
            };
            // One analysis: the constraint graph once, then the parts asked for.
            let request = crate::analysis::Request {
                planarity: matches!(only, None | Some(Section::Planarity))
                    || certificate_out.is_some(),
                embedding: embedding || certificate_out.is_some(),
                colouring: matches!(only, None | Some(Section::Colouring)).then_some(
                    crate::analysis::ColourOptions {
                        keep_current: false,
                        balance: None,
                        time_limit: limit,
                    },
                ),
            };
            let analysis = crate::analysis::uncontrolled(|c| {
                crate::analysis::Analysis::run(&loaded.doc, request, c)
            });
            let report = analyse::report(
                &file.display().to_string(),
                &loaded.doc,
                &analysis.rules,
                &loaded.notices,
            );
            // The planarity section lives in src/cli/planarity.rs, the colouring one in colouring.rs.
            let text = if only == Some(Section::Colouring) {
                let head = if json {
                    serde_json::json!({ "schema": report.schema, "file": report.file }).to_string()
                } else {
                    format!("{} ({})\n", report.title, report.file)
                };
                Ok(head)
            } else {
                planarity::attach(
                    &report,
                    &loaded.doc,
                    &analysis,
                    json,
                    only,
                    embedding,
                    certificate_out.as_deref(),
                )
            };
            let text = match (text, &analysis.colouring) {
                (Ok(t), Some(verdict)) => colouring::section(verdict, proof_out.as_deref())
                    .and_then(|c| colouring::append(t, json, &c)),
                (other, _) => other,
            };
            let text = match text {
                Ok(t) => t,
                Err(e) => return error(exit::CANNOT_WRITE, &e),
            };
            let mut stdout = std::io::stdout().lock();
            if let Err(e) = stdout
                .write_all(text.as_bytes())
                .and_then(|_| stdout.flush())
            {
                return error(exit::CANNOT_WRITE, &e.into());
            }
            if strict && !report.ok {
                ExitCode::from(exit::PROBLEMS)
            } else {
                ExitCode::from(exit::OK)
            }
        }
        Command::Colour {
            file,
            out,
            keep_colours,
            balance,
            time_limit,
            add_slots,
        } => {
            let Some(limit) = seconds(time_limit) else {
                return error(
                    exit::BAD_INPUT,
                    &anyhow::anyhow!("--time-limit must be a positive number of seconds"),
                );
            };
            let balance = balance.map(|b| match b {
                BalanceArg::Count => crate::analysis::BalanceBy::Count,
                BalanceArg::Area => crate::analysis::BalanceBy::Area,
            });
            match colouring::run_colour(&file, &out, keep_colours, balance, limit, add_slots) {
                Ok(summary) => {
                    eprintln!("tinct: {summary}");
                    ExitCode::from(exit::OK)
                }
                Err(e) => error(exit::BAD_INPUT, &e),
            }
        }
        Command::Import { file, out, geo } => import::run_import(&file, &out, &geo),
        Command::Adjacency { file, json, geo } => import::run_adjacency(&file, json, &geo),
        Command::Export { file, args } => export::run_export(&file, &args),
        Command::Palette { file, args } => export::run_palette(&file, &args),
        Command::Convert {
            input: from,
            output,
        } => {
            let loaded = match crate::formats::load(&from) {
                Ok(l) => l,
                Err(e) => return error(exit::BAD_INPUT, &e),
            };
            for n in &loaded.notices {
                eprintln!("tinct: note: {}", n.message);
            }
            match crate::formats::save(&loaded.doc, &output) {
                Ok(()) => ExitCode::from(exit::OK),
                Err(e) => error(exit::CANNOT_WRITE, &e),
            }
        }
    }
}
