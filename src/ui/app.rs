//! The editor's state and its frame loop: drain worker events, draw the panels (which read state and
//! emit commands), then apply the commands in one place at the end of the frame.

use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use crate::analysis::{self, Analysis, Request};
use crate::doc::{self, Document, Edit, RegionId};
use crate::session::Session;
use crate::worker::{Event, JobKind, Worker};

use super::commands::{Command, ExportFormat};
use super::dialogs::Dialogs;
use super::dialogs::path::PathPrompt;
use super::frame::{Action, Frame, UnsavedAnswer};
use super::jobs::{JobResult, export_files, human_size};
use super::panels::Panels;
use super::state::{Highlight, Level, Message, PaletteWarnings, PathPurpose, ViewState};

/// The invented map the editor opens with.
pub const DEFAULT_MAP: &str = include_str!("../../sample-maps/vessland-province.tinct");

/// How often unsaved work is written to the recovery file.
pub const AUTOSAVE_EVERY: Duration = Duration::from_secs(5);

/// How long the document must rest after an edit before the background analysis starts, when
/// the last analysis took long enough for a burst of edits to pile up work.
pub const ANALYSIS_DEBOUNCE: Duration = Duration::from_millis(250);

/// An analysis quicker than this starts at once after an edit: on a small map the verdict follows
/// the edit without a wait (a newer edit cancels a job still running).
pub const QUICK_ANALYSIS: Duration = Duration::from_millis(50);

/// The path a project is saved to by default: the document's file when it is a project, else
/// the same name with the project extension (an imported `states.geojson` becomes
/// `states.tinct` beside it).
pub fn project_path_for(path: &Path) -> PathBuf {
    path.with_extension(doc::file::EXTENSION)
}

/// The editor.
pub struct App {
    pub session: Session,
    /// How the map is shown and what the tools act on (read by every panel).
    pub view: ViewState,
    /// The panels' own state (the canvas's view and drawing caches, the region list's search).
    pub panels: Panels,
    /// The windows' own state.
    pub dialogs: Dialogs,
    pub palette_warnings: PaletteWarnings,
    pub messages: Vec<Message>,
    /// A command waiting for the user to decide about unsaved changes.
    pub confirm_discard: Option<Command>,
    /// The command the user interrupted with *Save first*: it runs once the save succeeds, and
    /// is dropped if the save fails or its path prompt is cancelled.
    pub after_save: Option<Command>,
    /// The user agreed to discard unsaved changes for this command.
    pub discard_agreed: Option<Command>,
    /// Apply the fewest-colours colouring as soon as an analysis of the current revision arrives.
    pub apply_when_ready: bool,
    /// The latest background analysis (possibly for an older revision: then it is shown as stale).
    pub analysis: Option<Analysis>,
    /// The revision the latest analysis job was started for.
    analysis_requested: Option<u64>,
    /// When the latest analysis job was started, and how long the last finished one took.
    analysis_started: Option<Instant>,
    analysis_took: Option<Duration>,
    /// When the document last changed (for the debounce).
    changed_at: Instant,
    seen_revision: u64,
    worker: Option<Worker<JobResult>>,
    /// A second thread for the disk (saves, autosaves, exports, proofs), so that neither waits
    /// behind a long analysis and the interface never waits for the disk.
    files: Option<Worker<JobResult>>,
    /// Paths chosen in a system file dialog, delivered from its thread.
    dialog_results: std::sync::mpsc::Receiver<(PathPurpose, Option<PathBuf>)>,
    dialog_sender: std::sync::mpsc::Sender<(PathPurpose, Option<PathBuf>)>,
    /// Actions sent outside the panels (shortcuts, a save that finished), applied at the end of
    /// the frame with those the panels sent.
    pending: Vec<Action>,
    /// Set once the user has agreed to close.
    pub quit_confirmed: bool,
    /// Files opened or saved recently, newest first.
    pub recent: Vec<PathBuf>,
    /// Notes from reading the current file (problems in the data that did not stop the load).
    pub notices: Vec<String>,
    /// Where unsaved work is written aside (`None`: nowhere).
    pub recovery_dir: Option<PathBuf>,
    /// Unsaved work from an earlier session, offered back to the user.
    pub recovery_offer: Option<doc::recovery::Recovered>,
    /// How often unsaved work is written aside.
    pub autosave_every: Duration,
    autosaved_at: Instant,
    /// The revision last written aside, if any.
    autosaved_revision: Option<u64>,
    last_title: String,
    /// How many documents this editor has put in front of the user (each Open, New, recovery).
    documents: u64,
    /// What to drop for one colour fewer, once asked (for the revision it names).
    pub relax: Option<super::state::RelaxAnswer>,
    /// What to drop so that the borders can be drawn flat, once asked.
    pub relax_flat: Option<super::state::RelaxAnswer>,
}

impl App {
    /// The editor on the embedded sample map, or on `path` if given (read in the background).
    pub fn new(ctx: Option<egui::Context>, path: Option<PathBuf>) -> App {
        // The real window keeps a recovery file; headless uses (tests) choose their own folder.
        let recovery = ctx.is_some().then(doc::recovery::recovery_dir);
        App::new_with(ctx, path, recovery)
    }

    /// The editor with an explicit recovery folder (`None`: no recovery file).
    pub fn new_with(
        ctx: Option<egui::Context>,
        path: Option<PathBuf>,
        recovery: Option<PathBuf>,
    ) -> App {
        let doc = doc::file::from_str(DEFAULT_MAP).unwrap_or_else(|_| Document::new("Untitled"));
        let start = |ctx: &Option<egui::Context>| {
            ctx.clone()
                .and_then(|ctx| Worker::start(Box::new(move || ctx.request_repaint())).ok())
        };
        let (worker, files) = (start(&ctx), start(&ctx));
        let (dialog_sender, dialog_results) = std::sync::mpsc::channel();
        let palette_warnings = PaletteWarnings::of(&doc);
        let mut app = App {
            session: Session::new(doc, None),
            view: ViewState::default(),
            panels: Panels::default(),
            dialogs: Dialogs::default(),
            palette_warnings,
            messages: Vec::new(),
            confirm_discard: None,
            after_save: None,
            discard_agreed: None,
            apply_when_ready: false,
            analysis: None,
            analysis_requested: None,
            analysis_started: None,
            analysis_took: None,
            changed_at: Instant::now(),
            seen_revision: u64::MAX,
            worker,
            files,
            dialog_results,
            dialog_sender,
            pending: Vec::new(),
            relax: None,
            relax_flat: None,
            quit_confirmed: false,
            last_title: String::new(),
            documents: 1,
            recent: recovery
                .as_deref()
                .map(doc::recovery::recent_files)
                .unwrap_or_default(),
            notices: Vec::new(),
            recovery_dir: recovery,
            recovery_offer: None,
            autosave_every: AUTOSAVE_EVERY,
            autosaved_at: Instant::now(),
            autosaved_revision: None,
        };
        if let Some(dir) = app.recovery_dir.clone() {
            match doc::recovery::read(&dir) {
                Ok(found) => app.recovery_offer = found,
                Err(e) => app.say(
                    Level::Error,
                    format!(
                        "Unsaved work from an earlier session could not be read and was not used ({e}); the file is kept at {}",
                        doc::recovery::file_in(&dir).display()
                    ),
                ),
            }
        }
        if let Some(path) = path {
            app.open_path(path);
        }
        app
    }

    /// Writes unsaved work to the recovery file every few seconds; removes it once nothing is unsaved.
    fn autosave(&mut self, ctx: &egui::Context) {
        let Some(dir) = self.recovery_dir.clone() else {
            return;
        };
        if self.recovery_offer.is_some() {
            // Do not overwrite work the user has not yet decided about.
            return;
        }
        let revision = self.session.doc().revision();
        if !self.session.is_dirty() {
            if self.autosaved_revision.take().is_some() {
                doc::recovery::clear(&dir);
            }
            return;
        }
        if self.autosaved_revision != Some(revision)
            && self.autosaved_at.elapsed() >= self.autosave_every
        {
            self.autosaved_at = Instant::now();
            // Marked as asked at once, so that the next frames do not ask again meanwhile.
            self.autosaved_revision = Some(revision);
            let snapshot = crate::worker::snapshot(self.session.doc());
            let original = self.session.path().map(Path::to_path_buf);
            let job = move |_: &crate::worker::JobContext| JobResult::Autosaved {
                revision,
                result: doc::recovery::write(&dir, &snapshot, original.as_deref())
                    .map_err(|e| e.to_string()),
            };
            self.run_file_job(revision, JobKind::Autosave, Box::new(job));
        } else if self.autosaved_revision != Some(revision) {
            // An idle window draws no frames: ask for one when the write falls due, so work left
            // unsaved is written aside on time even if the user walks away.
            ctx.request_repaint_after(
                self.autosave_every
                    .saturating_sub(self.autosaved_at.elapsed()),
            );
        }
    }

    /// Takes back the unsaved work of an earlier session (as unsaved work again).
    pub fn recover(&mut self) {
        if let Some(r) = self.recovery_offer.take() {
            // Work that belonged to a project comes back as one undoable step on top of the
            // project as it is on disk: undo shows the file, redo the recovered work.
            let on_disk = r.original.as_ref().and_then(|path| {
                doc::file::load(path)
                    .ok()
                    .map(|saved| (path.clone(), saved))
            });
            match on_disk {
                Some((path, saved)) => {
                    let step = doc::edits_between(&saved, &r.doc, "Recover unsaved work");
                    self.replace_session(Session::new(saved, Some(path)));
                    self.edit(step);
                }
                // Never saved, or its file is gone: unsaved work with nothing under it.
                None => self.replace_session(Session::unsaved(r.doc, r.original)),
            }
            self.say(
                Level::Info,
                "Unsaved work from the earlier session is back (Undo shows the file as saved); save it to keep it",
            );
        }
    }

    /// Drops the unsaved work of an earlier session, at the user's word.
    pub fn discard_recovery(&mut self) {
        self.recovery_offer = None;
        if let Some(dir) = &self.recovery_dir {
            doc::recovery::clear(dir);
        }
    }

    /// Queues a command for the end of this frame.
    pub fn emit(&mut self, command: Command) {
        self.pending.push(Action::Run(command));
    }

    pub fn say(&mut self, level: Level, text: impl Into<String>) {
        self.messages.push(Message {
            level,
            text: text.into(),
            at: Instant::now(),
        });
        if self.messages.len() > 50 {
            self.messages.remove(0);
        }
    }

    /// Applies an edit through the undo history; refusals become messages.
    pub fn edit(&mut self, edit: Edit) {
        if let Err(e) = self.session.apply(edit) {
            self.say(Level::Warning, format!("Not changed: {e}"));
        }
    }

    /// Reads a file on the worker (or here, when there is no worker, as in tests).
    pub fn open_path(&mut self, path: PathBuf) {
        let job_path = path.clone();
        let import = self.dialogs.path.import_options.clone();
        let job = move || {
            let result = crate::formats::load(&job_path, &import)
                .map(|l| Box::new((l.doc, l.notices.into_iter().map(|n| n.message).collect())))
                .map_err(|e| format!("{e:#}"));
            JobResult::Loaded {
                path: job_path,
                result,
            }
        };
        match &mut self.worker {
            Some(w) => {
                w.submit(0, JobKind::Load, Box::new(move |_| job()));
                self.say(Level::Info, format!("Opening {}…", path.display()));
            }
            None => {
                let result = job();
                self.receive(result);
            }
        }
    }

    fn receive(&mut self, result: JobResult) {
        match result {
            JobResult::Exported {
                format,
                path,
                result: Ok((bytes, labels)),
            } => self.say(
                Level::Info,
                format!(
                    "Wrote the {} to {} ({}){}",
                    format.name(),
                    path.display(),
                    human_size(bytes),
                    labels.map(|l| format!("; {l}")).unwrap_or_default()
                ),
            ),
            JobResult::Exported {
                format,
                result: Err(e),
                ..
            } => self.say(
                Level::Error,
                format!("The {} was not written: {e}", format.name()),
            ),
            JobResult::Loaded {
                path,
                result: Ok(loaded),
            } => {
                let (doc, notices) = *loaded;
                // An imported map keeps its notes itself (with their regions); only a graph
                // file's notes about its lines are held here.
                let notices = if doc.notes().is_empty() {
                    notices
                } else {
                    Vec::new()
                };
                let count = doc.notes().len() + notices.len();
                self.replace_session(Session::new(doc, Some(path.clone())));
                self.say(Level::Info, format!("Opened {}", path.display()));
                self.remember(&path);
                if count > 0 {
                    self.say(
                        Level::Warning,
                        format!(
                            "{} about the file: see the verdict panel",
                            super::words::count(count, "note", "notes")
                        ),
                    );
                }
                self.notices = notices;
            }
            JobResult::Loaded {
                path,
                result: Err(e),
            } => {
                // The open document is untouched: nothing is lost.
                self.say(
                    Level::Error,
                    format!("Could not open {}: {e}", path.display()),
                );
            }
            JobResult::Saved {
                path,
                revision,
                written,
                result,
            } => self.saved(path, revision, written, result),
            JobResult::Autosaved { revision, result } => match result {
                // Saved meanwhile: what was written aside is not needed (nor wanted at the
                // next start).
                Ok(()) if !self.session.is_dirty() => {
                    if let Some(dir) = &self.recovery_dir {
                        doc::recovery::clear(dir);
                    }
                }
                Ok(()) => {}
                Err(e) => {
                    if self.autosaved_revision == Some(revision) {
                        self.autosaved_revision = None;
                    }
                    self.say(
                        Level::Warning,
                        format!("Unsaved work could not be written aside: {e}"),
                    );
                }
            },
            JobResult::ProofWritten {
                folder,
                names,
                result,
            } => match result {
                Ok(()) => self.say(
                    Level::Info,
                    format!("Wrote {} to {}", names.join(", "), folder.display()),
                ),
                Err(e) => self.say(Level::Error, format!("Proof not written: {e}")),
            },
            JobResult::Analysed(a) => {
                self.analysis_took = self.analysis_started.map(|t| t.elapsed());
                self.analysis = Some(*a);
                if self.apply_when_ready && !self.analysis_is_stale() {
                    self.apply_when_ready = false;
                    self.apply_fewest(false);
                }
            }
            JobResult::Relaxed { revision, result } => match result {
                Ok(answer) if revision == self.session.doc().revision() => {
                    let text = answer.words_line();
                    let level = if answer.impossible || answer.relaxations.is_empty() {
                        Level::Warning
                    } else {
                        Level::Info
                    };
                    if answer.flat.is_some() {
                        self.relax_flat = Some(*answer);
                    } else {
                        self.relax = Some(*answer);
                    }
                    self.say(level, text);
                }
                Ok(_) => self.say(
                    Level::Warning,
                    "The map changed while the rules to drop were being found; ask again",
                ),
                Err(why) => self.say(Level::Error, format!("No answer: {why}")),
            },
            JobResult::ColouredByParent { revision, result } => {
                if revision != self.session.doc().revision() {
                    self.say(
                        Level::Warning,
                        "The map changed while it was being coloured by parent unit; try again",
                    );
                } else {
                    match result {
                        Ok(outcome) => {
                            self.edit(outcome.edit.clone());
                            let mut text =
                                format!("Coloured by parent unit: {}", outcome.summary());
                            if outcome.clashes_after > 0 {
                                text.push_str(&format!(
                                    "; {} of {} pairs of neighbours across parent borders may look alike to some readers (see the palette check)",
                                    outcome.clashes_after, outcome.across
                                ));
                            }
                            self.say(Level::Info, text);
                        }
                        Err(why) => {
                            self.say(Level::Error, format!("Not coloured by parent unit: {why}"))
                        }
                    }
                }
            }
            JobResult::Balanced { revision, verdict } => {
                if revision != self.session.doc().revision() {
                    self.say(
                        Level::Warning,
                        "The map changed while colours were being evened out; try again",
                    );
                } else if let Some(colouring) = verdict.colouring {
                    self.edit(Edit::Batch {
                        label: "Even out colour use".into(),
                        edits: vec![Edit::SetColouring(colouring)],
                    });
                    self.say(Level::Info, "Colours evened out");
                } else {
                    self.say(Level::Warning, "No balanced colouring was found");
                }
            }
        }
    }

    /// Puts another document in front of the user. Everything derived from the old one goes:
    /// revisions restart with each document, so nothing keyed by revision may survive.
    fn replace_session(&mut self, session: Session) {
        if let Some(w) = &mut self.worker {
            w.cancel(JobKind::Analysis);
        }
        self.session = session;
        self.relax = None;
        self.relax_flat = None;
        self.documents += 1;
        self.notices.clear();
        self.view = ViewState::default();
        self.panels.reset();
        self.dialogs.walk = None;
        self.palette_warnings = PaletteWarnings::of(self.session.doc());
        self.analysis = None;
        self.apply_when_ready = false;
        self.analysis_requested = None;
        self.seen_revision = u64::MAX;
    }

    /// Counts the documents shown so far: it changes exactly when the document on show is
    /// replaced (Open, New, recovered work), when revisions start again.
    pub fn document_number(&self) -> u64 {
        self.documents
    }

    /// Shows `doc` as a new, unsaved document (used by benchmarks and tests that build maps in code).
    pub fn show_document(&mut self, doc: Document) {
        self.replace_session(Session::new(doc, None));
    }

    /// Adds a file to the recent list (kept in the state folder, when there is one).
    fn remember(&mut self, path: &Path) {
        if let Some(dir) = &self.recovery_dir {
            self.recent = doc::recovery::remember_file(dir, path);
        }
    }

    /// Opens a file from the recent list (asking first if there are unsaved changes).
    pub fn open_recent(&mut self, path: PathBuf) {
        self.confirm_or_run_open(path);
    }

    /// Applies the analysis's fewest-colours colouring as one undoable edit. With `add_slots`,
    /// the palette first gains the slots the colouring lacks (in the same undo step); without it,
    /// a palette that is too small is reported and nothing changes.
    pub fn apply_fewest(&mut self, add_slots: bool) {
        let Some(verdict) = self.analysis.as_ref().and_then(|a| a.colouring.clone()) else {
            self.say(Level::Warning, "No colouring is available yet");
            return;
        };
        if let Some(why) = verdict.impossible {
            self.say(
                Level::Error,
                format!("No colouring can satisfy this map: {why}"),
            );
            return;
        }
        let extra = verdict.extra_slots_needed;
        match verdict.colouring {
            Some(_) if extra > 0 && !add_slots => self.say(
                Level::Warning,
                format!(
                    "This map needs {} colours but the palette has {}: use \"{}\" or add slots in the palette window",
                    verdict.minimum.unwrap_or(0),
                    self.session.doc().palette().slots.len(),
                    Command::ColourAddingSlots.label()
                ),
            ),
            Some(colouring) if colouring == self.session.doc().colouring() && extra == 0 => {
                self.say(Level::Info, "The map already has this colouring");
            }
            Some(colouring) => {
                let mut edits = Vec::new();
                if extra > 0 {
                    edits.push(doc::palette_edit::grow_palette(self.session.doc(), extra));
                }
                edits.push(Edit::SetColouring(colouring));
                self.edit(Edit::Batch {
                    label: "Colour with the fewest colours".into(),
                    edits,
                });
                let changed = verdict
                    .changed
                    .map(|c| format!(" ({c} regions changed colour)"))
                    .unwrap_or_default();
                let added = if extra > 0 {
                    format!(
                        "; added {extra} palette slot{}",
                        if extra == 1 { "" } else { "s" }
                    )
                } else {
                    String::new()
                };
                self.say(
                    Level::Info,
                    format!(
                        "Coloured with {} colours{changed}{added}",
                        verdict.minimum.map_or("?".into(), |m| m.to_string())
                    ),
                );
            }
            None => self.say(
                Level::Warning,
                "No colouring was found before the search stopped",
            ),
        }
    }

    /// Runs `job` on the analysis worker; without one (headless tests, benchmarks), runs it here
    /// and takes its result at once. True when it went to the worker.
    fn run_job(
        &mut self,
        revision: u64,
        kind: JobKind,
        job: crate::worker::JobFn<JobResult>,
    ) -> bool {
        self.run_on(false, revision, kind, job)
    }

    /// Runs `job` on the file thread, or here when there is none, as [`App::run_job`] does.
    fn run_file_job(
        &mut self,
        revision: u64,
        kind: JobKind,
        job: crate::worker::JobFn<JobResult>,
    ) -> bool {
        self.run_on(true, revision, kind, job)
    }

    fn run_on(
        &mut self,
        files: bool,
        revision: u64,
        kind: JobKind,
        job: crate::worker::JobFn<JobResult>,
    ) -> bool {
        let worker = if files {
            &mut self.files
        } else {
            &mut self.worker
        };
        match worker {
            Some(w) => {
                w.submit(revision, kind, job);
                true
            }
            None => {
                let ctx = crate::worker::JobContext {
                    cancel: Default::default(),
                    progress: Default::default(),
                };
                let result = job(&ctx);
                self.receive(result);
                false
            }
        }
    }

    /// Writes an export on the file thread (a picture of a large map takes a while); the result
    /// arrives as a message.
    pub fn export_to(&mut self, format: ExportFormat, path: PathBuf) {
        // A mistyped or missing extension gets the format's own, and the user is told.
        let extension = path
            .extension()
            .map(|e| e.to_string_lossy().to_ascii_lowercase());
        let path = match extension {
            Some(e) if format.extensions().contains(&e.as_str()) => path,
            other => {
                let fixed = path.with_extension(format.extensions()[0]);
                let was = match other {
                    Some(e) => format!("ended in .{e}"),
                    None => "had no extension".to_string(),
                };
                self.say(
                    Level::Warning,
                    format!(
                        "The name {was}; a {} file ends in .{}, so it is written as {}",
                        format.name(),
                        format.extensions()[0],
                        fixed.display()
                    ),
                );
                fixed
            }
        };
        let snapshot = crate::worker::snapshot(self.session.doc());
        let options = self.dialogs.path.export_options.clone();
        let revision = self.session.doc().revision();
        let job = move |_: &crate::worker::JobContext| {
            let result = export_files(&snapshot, format, &options, &path)
                .map_err(|e| e.to_string())
                .and_then(|(files, labels)| {
                    let mut total = 0;
                    for (file, bytes) in &files {
                        crate::atomic::write_atomically(file, bytes)
                            .map_err(|e| format!("cannot write {}: {e}", file.display()))?;
                        total += bytes.len();
                    }
                    Ok((total, labels.map(|r| r.summary())))
                });
            JobResult::Exported {
                format,
                path,
                result,
            }
        };
        if self.run_file_job(revision, JobKind::Export, Box::new(job)) {
            self.say(Level::Info, format!("Writing the {}…", format.name()));
        }
    }

    /// Writes the CNF and DRAT proof files of the current obstructions into `folder` (on the file
    /// thread).
    pub fn export_proof(&mut self, folder: &Path) {
        let files = self
            .analysis
            .as_ref()
            .and_then(|a| a.colouring.as_ref())
            .map(analysis::proof_texts)
            .unwrap_or_default();
        if files.is_empty() {
            self.say(
                Level::Warning,
                "There is no proof to export: no number of colours is known to fail on this map beyond what its mutual neighbours show",
            );
            return;
        }
        let folder = folder.to_path_buf();
        let revision = self.session.doc().revision();
        let job = move |_: &crate::worker::JobContext| {
            let result = std::fs::create_dir_all(&folder)
                .map_err(|e| e.to_string())
                .and_then(|_| {
                    for (name, text) in &files {
                        crate::atomic::write_atomically(&folder.join(name), text.as_bytes())
                            .map_err(|e| e.to_string())?;
                    }
                    Ok(())
                });
            JobResult::ProofWritten {
                names: files.into_iter().map(|(n, _)| n).collect(),
                folder,
                result,
            }
        };
        self.run_file_job(revision, JobKind::Export, Box::new(job));
    }

    /// True when the analysis on show was computed for an older revision of the document.
    pub fn analysis_is_stale(&self) -> bool {
        self.analysis
            .as_ref()
            .is_none_or(|a| a.revision != self.session.doc().revision())
    }

    /// True while a background job (analysis, load, save, autosave, export) is queued or
    /// running, or its result has not been taken in yet.
    pub fn jobs_running(&self) -> bool {
        [&self.worker, &self.files]
            .into_iter()
            .flatten()
            .any(|w| !w.idle())
    }

    /// The running analysis, if any: its stage and fraction done.
    pub fn analysis_progress(&self) -> Option<(String, f64)> {
        self.worker
            .as_ref()
            .and_then(|w| w.busy(JobKind::Analysis))
            .map(|(_, p)| p)
    }

    /// Stops the running analysis.
    pub fn cancel_analysis(&mut self) {
        if let Some(w) = &mut self.worker {
            w.cancel(JobKind::Analysis);
            // A colouring waiting for this analysis is called off with it: applied later, it
            // would land at a moment the user did not choose (after an undo, say).
            let waiting = std::mem::take(&mut self.apply_when_ready);
            self.say(
                Level::Info,
                if waiting {
                    "Analysis cancelled, and with it the colouring that waited for it; it starts again after the next change"
                } else {
                    "Analysis cancelled; it starts again after the next change"
                },
            );
        }
    }

    /// Starts an analysis of the current revision (on the worker, or here when there is none).
    pub fn start_analysis(&mut self) {
        let revision = self.session.doc().revision();
        self.analysis_requested = Some(revision);
        self.analysis_started = Some(Instant::now());
        let snapshot = crate::worker::snapshot(self.session.doc());
        // The embedding is kept: a planar verdict on show carries its certificate.
        let request = Request {
            embedding: true,
            ..Request::everything()
        };
        match &mut self.worker {
            Some(w) => w.submit(
                revision,
                JobKind::Analysis,
                Box::new(move |ctx| {
                    JobResult::Analysed(Box::new(
                        ctx.with_control(|c| Analysis::run(&snapshot, request, c)),
                    ))
                }),
            ),
            None => {
                let ctx = crate::worker::JobContext {
                    cancel: Default::default(),
                    progress: Default::default(),
                };
                self.analysis = Some(ctx.with_control(|c| Analysis::run(&snapshot, request, c)));
            }
        }
    }

    /// Saves to `path` (atomically, on the file thread) and, once written, remembers it as the
    /// document's file. The document may change meanwhile: the save counts for the revision it
    /// wrote.
    pub fn save_to(&mut self, path: &Path) {
        let path = if path.extension().is_none() {
            path.with_extension(doc::file::EXTENSION)
        } else {
            path.to_path_buf()
        };
        let snapshot = crate::worker::snapshot(self.session.doc());
        let revision = self.session.doc().revision();
        let job_path = path.clone();
        let job = move |_: &crate::worker::JobContext| JobResult::Saved {
            result: crate::formats::save(&snapshot, &job_path).map_err(|e| format!("{e:#}")),
            path: job_path,
            revision,
            written: snapshot,
        };
        if self.run_file_job(revision, JobKind::Save, Box::new(job)) {
            self.say(Level::Info, format!("Saving {}…", path.display()));
        }
    }

    fn saved(
        &mut self,
        path: PathBuf,
        revision: u64,
        written: std::sync::Arc<Document>,
        result: Result<(), String>,
    ) {
        match result {
            Ok(()) => {
                let is_project = path.extension().is_some_and(|e| e == doc::file::EXTENSION);
                if is_project {
                    self.session
                        .saved_with(path.clone(), revision, Some(written));
                    self.remember(&path);
                }
                self.say(Level::Info, format!("Saved {}", path.display()));
                // The command that *Save first* interrupted goes on now that nothing is unsaved.
                if let Some(command) = self.after_save.take() {
                    self.emit(command);
                }
            }
            Err(e) => {
                self.after_save = None;
                self.say(Level::Error, format!("Not saved: {e}"));
            }
        }
    }

    /// One frame of work that does not draw: worker events, dialog results, the checks.
    pub fn logic(&mut self, ctx: &egui::Context) {
        while let Some(event) = self
            .worker
            .as_mut()
            .and_then(|w| w.try_next())
            .or_else(|| self.files.as_mut().and_then(|w| w.try_next()))
        {
            match event {
                Event::Done {
                    result,
                    cancelled: false,
                    ..
                } => self.receive(result),
                Event::Done {
                    cancelled: true, ..
                } => {}
                Event::Failed { message, .. } => {
                    self.say(Level::Error, format!("A background job failed: {message}"))
                }
            }
        }
        while let Ok((purpose, picked)) = self.dialog_results.try_recv() {
            match picked {
                Some(path) => self.path_chosen(purpose, path),
                None => self.say(
                    Level::Info,
                    "No file was chosen (if no dialog appeared, this system has no file dialog service: type the path instead)",
                ),
            }
        }
        let dropped: Vec<PathBuf> = ctx.input(|i| {
            i.raw
                .dropped_files
                .iter()
                .map(|f| f.path().to_path_buf())
                .collect()
        });
        if let Some(path) = dropped.into_iter().next() {
            self.confirm_or_run_open(path);
        }
        if self.palette_warnings.revision != self.session.doc().revision() {
            self.palette_warnings = PaletteWarnings::of(self.session.doc());
        }
        let revision = self.session.doc().revision();
        if revision != self.seen_revision {
            self.seen_revision = revision;
            self.changed_at = Instant::now();
            self.panels.canvas.scene.sync(self.session.doc());
        }
        if self.analysis_requested != Some(revision) {
            let rest = self.changed_at.elapsed();
            let wait = if self.analysis_took.is_some_and(|t| t < QUICK_ANALYSIS) {
                Duration::ZERO
            } else {
                ANALYSIS_DEBOUNCE
            };
            if rest >= wait || self.worker.is_none() {
                self.start_analysis();
            } else {
                ctx.request_repaint_after(wait - rest);
            }
        }
        self.autosave(ctx);
        let title = self.session.title();
        if title != self.last_title {
            ctx.send_viewport_cmd(egui::ViewportCommand::Title(title.clone()));
            self.last_title = title;
        }
        if ctx.input(|i| i.viewport().close_requested())
            && !self.quit_confirmed
            && self.session.is_dirty()
        {
            ctx.send_viewport_cmd(egui::ViewportCommand::CancelClose);
            self.confirm_discard = Some(Command::Quit);
        }
        self.messages
            .retain(|m| m.level == Level::Error || m.at.elapsed() < Duration::from_secs(12));
    }

    fn confirm_or_run_open(&mut self, path: PathBuf) {
        if self.session.is_dirty() {
            self.say(
                Level::Warning,
                "Save or discard your changes first, then drop the file again",
            );
        } else {
            self.open_path(path);
        }
    }

    /// Starts the system file dialog on its own thread (it blocks while open).
    pub fn browse(&self, purpose: PathPurpose) {
        let sender = self.dialog_sender.clone();
        let _ = std::thread::Builder::new()
            .name("tinct-file-dialog".into())
            .spawn(move || {
                let dialog = rfd::FileDialog::new()
                    .add_filter("Tinct project", &["tinct"])
                    .add_filter("Graph (DIMACS, edge list)", &["col", "dimacs", "edges"])
                    .add_filter(
                        "Boundary data (GeoJSON, TopoJSON, Shapefile, GeoPackage, FlatGeobuf)",
                        &crate::geo::BOUNDARY_EXTENSIONS,
                    );
                let picked = match purpose {
                    PathPurpose::ExportProof => rfd::FileDialog::new().pick_folder(),
                    PathPurpose::Open => dialog.pick_file(),
                    PathPurpose::SaveAs => dialog.set_file_name("map.tinct").save_file(),
                    PathPurpose::Export(format) => rfd::FileDialog::new()
                        .set_file_name(format.default_file_name())
                        .save_file(),
                };
                let _ = sender.send((purpose, picked));
            });
    }

    /// Draws one frame of the whole editor into `ui` (also what the UI tests drive): the work
    /// that does not draw, then every panel and window from one read-only [`Frame`], then the
    /// actions they sent, applied in order.
    pub fn ui(&mut self, ui: &mut egui::Ui) {
        let ctx = ui.ctx().clone();
        self.logic(&ctx);
        self.shortcuts(&ctx);
        let progress = self.analysis_progress();
        let frame = Frame {
            session: &self.session,
            analysis: self.analysis.as_ref(),
            analysis_stale: self.analysis_is_stale(),
            progress,
            view: &self.view,
            generation: self.panels.canvas.scene.generation,
            palette_warnings: &self.palette_warnings,
            messages: &self.messages,
            recent: &self.recent,
            notices: &self.notices,
            recovery_offer: self.recovery_offer.as_ref(),
            unsaved_question: self.confirm_discard,
            relax: self.relax.as_ref(),
            relax_flat: self.relax_flat.as_ref(),
            actions: Default::default(),
        };
        super::draw(&frame, &mut self.panels, &mut self.dialogs, ui);
        let actions = frame.into_actions();
        self.pending.extend(actions);
        self.apply_pending(&ctx);
    }

    /// Applies the actions sent during this frame, in the order they were sent (an action may
    /// send more: a finished save runs the command it interrupted).
    pub fn apply_pending(&mut self, ctx: &egui::Context) {
        if !self.pending.is_empty() {
            // What changed is drawn at once (a window that opens, a view that moves).
            ctx.request_repaint();
        }
        while !self.pending.is_empty() {
            for action in std::mem::take(&mut self.pending) {
                self.apply(ctx, action);
            }
        }
    }

    /// Applies one action.
    pub fn apply(&mut self, ctx: &egui::Context, action: Action) {
        match action {
            Action::Run(command) => self.run(ctx, command),
            Action::Edit(edit) => self.edit(edit),
            Action::ColourByParent(key) => {
                let revision = self.session.doc().revision();
                let snapshot = crate::worker::snapshot(self.session.doc());
                let job = move |ctx: &crate::worker::JobContext| JobResult::ColouredByParent {
                    revision,
                    result: ctx
                        .with_control(|c| {
                            analysis::hierarchy::colour_by_parent(
                                &snapshot,
                                &key,
                                &crate::engine::colouring::SolveOptions {
                                    time_limit: Some(analysis::COLOURING_TIME_LIMIT),
                                    prove_three: false,
                                    ..Default::default()
                                },
                                c,
                            )
                        })
                        .map(Box::new)
                        .map_err(|e| e.to_string()),
                };
                self.run_job(revision, JobKind::Other, Box::new(job));
            }
            Action::Say(level, text) => self.say(level, text),
            Action::Select(id) => self.view.selection = id,
            Action::GoTo(regions) => self.go_to(regions),
            Action::BorderFrom(id) => self.view.border_first = id,
            Action::SetPinSlot(slot) => self.view.pin_slot = slot,
            Action::SetGroup(group) => self.view.group = group,
            Action::ShowHighlight(highlight, regions) => self.show_highlight(highlight, regions),
            Action::HideHighlight => self.view.highlight = None,
            Action::WalkThrough(highlight, regions) => {
                self.dialogs.walk = Some(super::dialogs::argument::Walk::new(highlight));
                self.show_highlight(highlight, regions);
            }
            Action::CancelAnalysis => self.cancel_analysis(),
            Action::OpenFile(path) => self.confirm_or_run_open(path),
            Action::PathChosen(purpose, path) => self.path_chosen(purpose, path),
            Action::PathCancelled => self.after_save = None,
            Action::Browse(purpose) => self.browse(purpose),
            Action::Unsaved(answer) => {
                let Some(command) = self.confirm_discard.take() else {
                    return;
                };
                match answer {
                    // Save, then carry on with what was interrupted (once the save succeeds).
                    UnsavedAnswer::SaveFirst => {
                        self.after_save = Some(command);
                        self.run(ctx, Command::Save);
                    }
                    // Agreed for this command only: the work is not marked saved.
                    UnsavedAnswer::Discard => {
                        self.discard_agreed = Some(command);
                        self.run(ctx, command);
                    }
                    UnsavedAnswer::Cancel => {}
                }
            }
            Action::Recover(true) => self.recover(),
            Action::Recover(false) => self.discard_recovery(),
        }
    }

    /// A path typed or picked for `purpose`.
    fn path_chosen(&mut self, purpose: PathPurpose, path: PathBuf) {
        self.dialogs.path.prompt = None;
        match purpose {
            PathPurpose::Open => self.open_path(path),
            PathPurpose::SaveAs => self.save_to(&path),
            PathPurpose::ExportProof => self.export_proof(&path),
            PathPurpose::Export(format) => self.export_to(format, path),
        }
    }

    /// Runs one command now.
    pub fn run(&mut self, ctx: &egui::Context, command: Command) {
        let discards = matches!(command, Command::New | Command::Open | Command::Quit);
        if discards && self.session.is_dirty() && self.discard_agreed != Some(command) {
            self.confirm_discard = Some(command);
            return;
        }
        // Agreeing to discard covers this one command; the work stays unsaved (not marked saved)
        // until something replaces it, so a cancelled Open loses nothing.
        self.discard_agreed = None;
        self.confirm_discard = None;
        match command {
            Command::New => self.replace_session(Session::new(Document::new("Untitled"), None)),
            Command::Open => {
                self.dialogs.path.prompt = Some(PathPrompt::new(PathPurpose::Open, ""))
            }
            // Only a project file is saved over; an imported file's document is saved as a
            // project (asking where, with the project name beside the source suggested).
            Command::Save => match self.session.path().map(Path::to_path_buf) {
                Some(path) if path.extension().is_some_and(|e| e == doc::file::EXTENSION) => {
                    self.save_to(&path)
                }
                _ => self.run(ctx, Command::SaveAs),
            },
            Command::SaveAs => {
                let text = self
                    .session
                    .path()
                    .map(|p| project_path_for(p).display().to_string())
                    .unwrap_or_default();
                self.dialogs.path.prompt = Some(PathPrompt::new(PathPurpose::SaveAs, text));
            }
            Command::Quit => {
                self.quit_confirmed = true;
                ctx.send_viewport_cmd(egui::ViewportCommand::Close);
            }
            Command::Undo => match self.session.undo() {
                Ok(Some(label)) => self.say(Level::Info, format!("Undone: {label}")),
                Ok(None) => self.say(Level::Info, "Nothing to undo"),
                Err(e) => self.say(Level::Error, format!("Cannot undo: {e}")),
            },
            Command::Redo => match self.session.redo() {
                Ok(Some(label)) => self.say(Level::Info, format!("Redone: {label}")),
                Ok(None) => self.say(Level::Info, "Nothing to redo"),
                Err(e) => self.say(Level::Error, format!("Cannot redo: {e}")),
            },
            Command::DeleteRegion => {
                if let Some(id) = self.view.selection.take() {
                    self.edit(Edit::PutRegion { id, region: None });
                }
            }
            Command::ClearSelection => {
                self.view.selection = None;
                self.view.border_first = None;
                self.view.group = None;
                self.dialogs.commands = None;
            }
            Command::FitView => self.panels.canvas.fit_pending = true,
            Command::ToggleBorders => self.view.show_borders = !self.view.show_borders,
            Command::ToggleLabels => self.view.show_labels = !self.view.show_labels,
            Command::CommandList => {
                self.dialogs.commands = Some(Default::default());
            }
            Command::UseTool(tool) => {
                self.view.tool = tool;
                self.view.border_first = None;
            }
            Command::ColourFewest => {
                if self.analysis_is_stale() {
                    self.apply_when_ready = true;
                    // No analysis of this revision under way (one was cancelled): start one, or
                    // the colours would wait for an edit and land at a moment nobody chose.
                    let revision = self.session.doc().revision();
                    let running = self
                        .worker
                        .as_ref()
                        .and_then(|w| w.busy(JobKind::Analysis))
                        .is_some_and(|(r, _)| r == revision);
                    if !running {
                        self.start_analysis();
                    }
                    self.say(
                        Level::Info,
                        "Colouring: the colours are applied as soon as the analysis finishes",
                    );
                } else {
                    self.apply_fewest(false);
                }
            }
            Command::ColourAddingSlots => self.apply_fewest(true),
            Command::BalanceColours => {
                let revision = self.session.doc().revision();
                let snapshot = crate::worker::snapshot(self.session.doc());
                let job = move |ctx: &crate::worker::JobContext| JobResult::Balanced {
                    revision,
                    verdict: Box::new(ctx.with_control(|c| {
                        analysis::colour(
                            &snapshot,
                            c,
                            analysis::ColourOptions {
                                balance: Some(analysis::BalanceBy::Count),
                                ..Default::default()
                            },
                        )
                    })),
                };
                self.run_job(revision, JobKind::Other, Box::new(job));
            }
            Command::FindRelaxations => self.find_relaxations(),
            Command::ApplyRelaxations => self.apply_answer(false),
            Command::FindFlatRelaxations => self.find_flat_relaxations(),
            Command::ApplyFlatRelaxations => self.apply_answer(true),
            Command::ColourByParent => {
                self.dialogs.by_parent = Some(
                    super::dialogs::by_parent::ByParentDraft::for_document(self.session.doc()),
                );
            }
            Command::ExportProof => {
                self.dialogs.path.prompt = Some(PathPrompt::new(PathPurpose::ExportProof, ""))
            }
            Command::ClearColours => {
                if !self.session.doc().colouring().is_empty() {
                    self.edit(Edit::SetColouring(Default::default()));
                }
            }
            Command::ProjectSettings => {
                self.dialogs.settings = Some(
                    super::dialogs::settings::SettingsDraft::for_document(self.session.doc()),
                );
            }
            Command::PaletteWindow => {
                if self.dialogs.palette.is_none() {
                    self.dialogs.palette = Some(super::dialogs::palette::PaletteEditor::new(
                        self.session.doc().palette(),
                    ));
                }
            }
            Command::AssignSlots => {
                let thresholds = doc::palette_check::thresholds(self.session.doc());
                match doc::palette_check::slot_assignment_edit(self.session.doc(), &thresholds) {
                    Ok(Some(edit)) => {
                        self.edit(edit);
                        self.say(
                            Level::Info,
                            "Colours moved between slots: those that meet most often now differ most",
                        );
                    }
                    Ok(None) => self.say(
                        Level::Info,
                        "The colours already sit in the slots that suit them best",
                    ),
                    Err(e) => self.say(Level::Error, format!("Slots not reassigned: {e}")),
                }
            }
            Command::Export(format) => {
                let text = self
                    .session
                    .path()
                    .as_ref()
                    .and_then(|p| p.parent())
                    .map(|dir| dir.join(format.default_file_name()).display().to_string())
                    .unwrap_or_else(|| format.default_file_name().to_string());
                self.dialogs.path.prompt = Some(PathPrompt::new(PathPurpose::Export(format), text));
            }
        }
    }

    /// Keyboard shortcuts: single keys only when no text field has focus.
    pub fn shortcuts(&mut self, ctx: &egui::Context) {
        if ctx.input_mut(|i| i.consume_key(egui::Modifiers::NONE, egui::Key::Escape)) {
            self.escape(ctx);
        }
        let typing = ctx.egui_wants_keyboard_input();
        // The most specific shortcut first: Ctrl+Shift+S is Save as, and must not be taken
        // by Save's Ctrl+S (egui matches a shortcut even when more modifiers are held).
        let mut commands = Command::all();
        commands.sort_by_key(|c| {
            std::cmp::Reverse(c.shortcut().map_or(0, |s| {
                [s.modifiers.command, s.modifiers.shift, s.modifiers.alt]
                    .iter()
                    .filter(|m| **m)
                    .count()
            }))
        });
        for command in commands {
            let Some(shortcut) = command.shortcut() else {
                continue;
            };
            if typing && command.needs_modifier_free_keyboard() {
                continue;
            }
            if ctx.input_mut(|i| i.consume_shortcut(&shortcut)) {
                self.emit(command);
            }
        }
    }

    /// Escape closes what is open, the innermost first: the command list, a path prompt, the
    /// unsaved-changes question (as Cancel), the palette window, the project settings, the
    /// colour-by-parent window, an open menu; with nothing
    /// open it clears the selection.
    fn escape(&mut self, ctx: &egui::Context) {
        if self.dialogs.commands.is_none() && self.dialogs.path.prompt.is_some() {
            self.after_save = None;
        }
        let closed = self.dialogs.commands.take().is_some()
            || self.dialogs.path.prompt.take().is_some()
            || self.confirm_discard.take().is_some()
            || self.dialogs.palette.take().is_some()
            || self.dialogs.settings.take().is_some()
            || self.dialogs.by_parent.take().is_some();
        if closed {
            return;
        }
        if egui::Popup::is_any_open(ctx) {
            egui::Popup::close_all(ctx);
        } else {
            self.emit(Command::ClearSelection);
        }
    }

    /// Selects the first of `regions` and moves the view so that all of them are in sight.
    pub fn go_to(&mut self, regions: Vec<RegionId>) {
        self.view.selection = regions.first().copied();
        if !regions.is_empty() {
            self.panels.canvas.go_to = Some(regions);
        }
    }

    /// Starts the search for the fewest rules to drop for one colour fewer than the proven
    /// minimum (in the background).
    fn find_relaxations(&mut self) {
        let minimum = self
            .analysis
            .as_ref()
            .filter(|_| !self.analysis_is_stale())
            .and_then(|a| a.colouring.as_ref())
            .filter(|c| c.proven)
            .and_then(|c| c.minimum);
        let Some(minimum) = minimum.filter(|m| *m >= 2) else {
            self.say(
                Level::Info,
                "The fewest colours must be known first: wait for the analysis to prove them",
            );
            return;
        };
        let revision = self.session.doc().revision();
        let snapshot = crate::worker::snapshot(self.session.doc());
        let job = move |ctx: &crate::worker::JobContext| JobResult::Relaxed {
            revision,
            result: ctx
                .with_control(|c| {
                    analysis::relax::fewest_relaxations(
                        &snapshot,
                        minimum - 1,
                        &analysis::relax::Allowed::default(),
                        analysis::COLOURING_TIME_LIMIT,
                        c,
                    )
                })
                .map(|v| Box::new(relax_answer(&snapshot, revision, minimum, &v)))
                .map_err(|e| e.to_string()),
        };
        self.run_job(revision, JobKind::Other, Box::new(job));
    }

    /// Starts the search for the fewest contacts to drop so that the borders can be drawn flat.
    fn find_flat_relaxations(&mut self) {
        let revision = self.session.doc().revision();
        let snapshot = crate::worker::snapshot(self.session.doc());
        let job = move |ctx: &crate::worker::JobContext| JobResult::Relaxed {
            revision,
            result: ctx
                .with_control(|c| {
                    analysis::relax::fewest_relaxations_planar(
                        &snapshot,
                        &analysis::relax::Allowed::default(),
                        analysis::COLOURING_TIME_LIMIT,
                        c,
                    )
                })
                .map(|v| Box::new(flat_answer(&snapshot, revision, &v)))
                .map_err(|e| e.to_string()),
        };
        self.run_job(revision, JobKind::Other, Box::new(job));
    }

    /// Drops the rules found for the current revision (for a flat drawing when `flat`, else for
    /// one colour fewer), as one undoable step.
    fn apply_answer(&mut self, flat: bool) {
        let revision = self.session.doc().revision();
        let slot = if flat { &self.relax_flat } else { &self.relax };
        let Some(answer) = slot.as_ref().filter(|a| a.revision == revision) else {
            let ask = if flat {
                "to draw the borders flat"
            } else {
                "for one colour fewer"
            };
            self.say(
                Level::Info,
                format!("Nothing to drop yet: ask what to drop {ask} first"),
            );
            return;
        };
        let (relaxations, colours) = (answer.relaxations.clone(), answer.colours);
        let doc = self.session.doc();
        let (edit, what, goal) = if flat {
            (
                analysis::relax::planar_relaxation_edit(doc, &relaxations),
                ("contact", "contacts"),
                "the borders can be drawn flat".to_string(),
            )
        } else {
            (
                analysis::relax::relaxation_edit(doc, &relaxations, colours),
                ("rule", "rules"),
                format!("{colours} colours do"),
            )
        };
        let Some(edit) = edit else {
            self.say(Level::Info, "Nothing to drop");
            return;
        };
        let n = relaxations.len();
        self.edit(edit);
        if flat {
            self.relax_flat = None;
        } else {
            self.relax = None;
        }
        self.say(
            Level::Info,
            format!(
                "Dropped {n} {} so that {goal} (undo puts {} back)",
                if n == 1 { what.0 } else { what.1 },
                if n == 1 { "it" } else { "them" }
            ),
        );
    }

    /// Where a world point is on screen, given the canvas drawn last frame (for tests and tools).
    pub fn screen_of(&self, p: [f64; 2]) -> Option<egui::Pos2> {
        self.panels.canvas.screen_of(p)
    }

    /// The regions a highlight draws, for the current analysis.
    pub fn highlight_regions(&self, highlight: Highlight) -> Vec<RegionId> {
        let analysis = self.analysis.as_ref();
        let colouring = analysis.and_then(|a| a.colouring.as_ref());
        match highlight {
            Highlight::NotPlanar => match analysis.and_then(|a| a.planarity.as_ref()) {
                Some(analysis::PlanarityVerdict::NotPlanar(o)) => o.regions.clone(),
                _ => Vec::new(),
            },
            Highlight::NotThreeColourable => colouring
                .and_then(|c| c.three_impossible.as_ref())
                .map(|why| why.regions.clone())
                .unwrap_or_default(),
            Highlight::NotFewerColourable => colouring
                .and_then(|c| c.minimum_impossible.as_ref())
                .map(|why| why.regions.clone())
                .unwrap_or_default(),
            Highlight::Relaxations => self
                .relax
                .as_ref()
                .map(super::state::RelaxAnswer::regions)
                .unwrap_or_default(),
            Highlight::FlatRelaxations => self
                .relax_flat
                .as_ref()
                .map(super::state::RelaxAnswer::regions)
                .unwrap_or_default(),
        }
    }

    /// Shows a highlight on the map and moves the view so that all its `regions` are in sight.
    pub fn show_highlight(&mut self, highlight: Highlight, regions: Vec<RegionId>) {
        self.view.highlight = Some(highlight);
        if !regions.is_empty() {
            self.panels.canvas.go_to = Some(regions);
        }
    }
}

/// The answer of the relaxation search in the editor's terms.
fn relax_answer(
    doc: &doc::Document,
    revision: u64,
    minimum: u32,
    verdict: &analysis::relax::RelaxVerdict,
) -> super::state::RelaxAnswer {
    let relaxations = verdict.relaxations();
    let mut kinds: std::collections::BTreeMap<&str, usize> = std::collections::BTreeMap::new();
    for r in &relaxations {
        *kinds.entry(r.kind()).or_default() += 1;
    }
    let counts = kinds
        .iter()
        .map(|(kind, n)| {
            let (one, many) = match *kind {
                "corner" => ("corner contact", "corner contacts"),
                "manual" => ("border added by hand", "borders added by hand"),
                "short" => ("short border", "short borders"),
                "group" => ("group membership", "group memberships"),
                _ => ("pin", "pins"),
            };
            format!("{n} {}", if *n == 1 { one } else { many })
        })
        .collect::<Vec<_>>()
        .join(" and ");
    let report = &verdict.report;
    // The part that needs more colours whatever is dropped: the last obstruction's regions.
    let part = if report.infeasible {
        report
            .obstructions
            .last()
            .map(|o| {
                let mut ids: Vec<doc::RegionId> = o
                    .vertices
                    .iter()
                    .filter_map(|&v| {
                        verdict
                            .model
                            .vertex_region
                            .get(v as usize)
                            .copied()
                            .flatten()
                    })
                    .collect();
                ids.sort();
                ids.dedup();
                ids
            })
            .unwrap_or_default()
    } else {
        Vec::new()
    };
    super::state::RelaxAnswer {
        revision,
        minimum,
        colours: report.colours,
        words: relaxations.iter().map(|r| r.describe(doc)).collect(),
        relaxations,
        counts,
        proven: report.proven_optimal,
        lower_bound: report.lower_bound,
        impossible: report.infeasible,
        part,
        stopped: report.stopped,
        checked: verdict.check.is_ok(),
        flat: None,
    }
}

/// The flat-drawing answer in the editor's terms.
fn flat_answer(
    doc: &doc::Document,
    revision: u64,
    verdict: &analysis::relax::PlanarRelaxVerdict,
) -> super::state::RelaxAnswer {
    let relaxations = verdict.relaxations();
    let report = &verdict.report;
    let part = if report.infeasible {
        verdict
            .obstacles()
            .last()
            .map(|o| o.regions.clone())
            .unwrap_or_default()
    } else {
        Vec::new()
    };
    let n = relaxations.len();
    super::state::RelaxAnswer {
        revision,
        minimum: 0,
        colours: 0,
        words: relaxations.iter().map(|r| r.describe(doc)).collect(),
        counts: format!("{n} {}", if n == 1 { "contact" } else { "contacts" }),
        relaxations,
        proven: report.proven_optimal,
        lower_bound: report.lower_bound,
        impossible: report.infeasible,
        part,
        stopped: report.stopped,
        checked: verdict.check.is_ok(),
        flat: Some(verdict.summary(doc)),
    }
}
