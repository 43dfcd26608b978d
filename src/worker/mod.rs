//! Background work: one named thread that runs long jobs (analysis, loading files) off the user
//! interface thread, with cancellation, progress and revision stamps.
//!
//! The worker knows nothing of the GUI: it wakes its owner through a callback given at start-up
//! (the editor passes one that asks for a repaint). Results carry the document revision they were
//! computed for, so the owner can tell a stale result from a current one. A panic inside a job is
//! caught and reported as a failure; the thread lives on and runs the next job.

use std::panic::AssertUnwindSafe;
use std::sync::atomic::{AtomicBool, AtomicU32, Ordering};
use std::sync::mpsc::{Receiver, Sender, TryRecvError, channel};
use std::sync::{Arc, Mutex};
use std::thread::JoinHandle;

use crate::doc::Document;

/// Shared progress of the running job, readable at any time without waiting.
#[derive(Default)]
pub struct Progress {
    /// Parts per thousand done.
    permille: AtomicU32,
    stage: Mutex<String>,
}

impl Progress {
    /// Reports progress: a stage name and a fraction in `0..=1`.
    pub fn set(&self, stage: &str, fraction: f64) {
        self.permille.store(
            (fraction.clamp(0.0, 1.0) * 1000.0) as u32,
            Ordering::Relaxed,
        );
        if let Ok(mut s) = self.stage.lock()
            && *s != stage
        {
            *s = stage.to_string();
        }
    }

    /// The latest stage and fraction.
    pub fn get(&self) -> (String, f64) {
        let stage = self.stage.lock().map(|s| s.clone()).unwrap_or_default();
        (stage, self.permille.load(Ordering::Relaxed) as f64 / 1000.0)
    }
}

/// What a job needs to run: its cancellation flag and its progress.
pub struct JobContext {
    pub cancel: Arc<AtomicBool>,
    pub progress: Arc<Progress>,
}

impl JobContext {
    /// True once the job has been cancelled (by the user, or by a newer job).
    pub fn cancelled(&self) -> bool {
        self.cancel.load(Ordering::Relaxed)
    }

    /// Runs `f` with an analysis control backed by this job's flag and progress.
    pub fn with_control<T>(&self, f: impl FnOnce(&crate::analysis::Control) -> T) -> T {
        let progress = |stage: &str, fraction: f64| self.progress.set(stage, fraction);
        f(&crate::analysis::Control {
            cancel: &self.cancel,
            progress: &progress,
        })
    }
}

/// A job's work: runs on the worker thread and returns a result of type `T`.
pub type JobFn<T> = Box<dyn FnOnce(&JobContext) -> T + Send>;

/// A request to the worker.
enum Request<T> {
    Run {
        revision: u64,
        kind: JobKind,
        job: JobFn<T>,
        cancel: Arc<AtomicBool>,
        progress: Arc<Progress>,
    },
}

/// What kind of job: newer jobs of one kind cancel older ones of the same kind.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash)]
pub enum JobKind {
    Analysis,
    Load,
    Other,
    /// Writing a file the user asked for: never cancelled by a newer job (each is wanted).
    Export,
    /// Saving the project: never cancelled either.
    Save,
    /// Writing unsaved work aside: a newer one replaces an older one still queued.
    Autosave,
}

/// What the worker reports back.
#[derive(Debug)]
pub enum Event<T> {
    /// A job finished (possibly early, if it noticed cancellation and returned what it had).
    Done {
        revision: u64,
        kind: JobKind,
        cancelled: bool,
        result: T,
    },
    /// A job panicked; the message says where. The worker carries on.
    Failed {
        revision: u64,
        kind: JobKind,
        message: String,
    },
}

/// The handle the owner keeps.
pub struct Worker<T: Send + 'static> {
    requests: Option<Sender<Request<T>>>,
    events: Receiver<Event<T>>,
    running: Vec<(JobKind, u64, Arc<AtomicBool>, Arc<Progress>)>,
    thread: Option<JoinHandle<()>>,
}

impl<T: Send + 'static> Worker<T> {
    /// Starts the worker thread. `wake` is called after every event is sent.
    pub fn start(wake: Box<dyn Fn() + Send>) -> std::io::Result<Worker<T>> {
        let (request_tx, request_rx) = channel::<Request<T>>();
        let (event_tx, event_rx) = channel::<Event<T>>();
        let thread = std::thread::Builder::new()
            .name("tinct-worker".into())
            .spawn(move || {
                while let Ok(Request::Run {
                    revision,
                    kind,
                    job,
                    cancel,
                    progress,
                }) = request_rx.recv()
                {
                    if cancel.load(Ordering::Relaxed) {
                        continue;
                    }
                    let context = JobContext {
                        cancel: cancel.clone(),
                        progress,
                    };
                    let outcome = std::panic::catch_unwind(AssertUnwindSafe(|| job(&context)));
                    let event = match outcome {
                        Ok(result) => Event::Done {
                            revision,
                            kind,
                            cancelled: cancel.load(Ordering::Relaxed),
                            result,
                        },
                        Err(payload) => {
                            let message = payload
                                .downcast_ref::<&str>()
                                .map(|s| s.to_string())
                                .or_else(|| payload.downcast_ref::<String>().cloned())
                                .unwrap_or_else(|| "unknown error".into());
                            Event::Failed {
                                revision,
                                kind,
                                message,
                            }
                        }
                    };
                    if event_tx.send(event).is_err() {
                        break;
                    }
                    wake();
                }
            })?;
        Ok(Worker {
            requests: Some(request_tx),
            events: event_rx,
            running: Vec::new(),
            thread: Some(thread),
        })
    }

    /// Queues a job for `revision`, cancelling any earlier job of the same kind.
    pub fn submit(&mut self, revision: u64, kind: JobKind, job: JobFn<T>) {
        if !matches!(kind, JobKind::Export | JobKind::Save) {
            self.cancel(kind);
        }
        let cancel = Arc::new(AtomicBool::new(false));
        let progress = Arc::new(Progress::default());
        self.running
            .push((kind, revision, cancel.clone(), progress.clone()));
        if let Some(tx) = &self.requests {
            let _ = tx.send(Request::Run {
                revision,
                kind,
                job,
                cancel,
                progress,
            });
        }
    }

    /// Cancels every queued or running job of `kind`.
    pub fn cancel(&mut self, kind: JobKind) {
        for (k, _, flag, _) in &self.running {
            if *k == kind {
                flag.store(true, Ordering::Relaxed);
            }
        }
        self.running.retain(|(k, ..)| *k != kind);
    }

    /// The job of `kind` that is running or queued, if any: its revision and progress.
    pub fn busy(&self, kind: JobKind) -> Option<(u64, (String, f64))> {
        self.running
            .iter()
            .find(|(k, ..)| *k == kind)
            .map(|(_, rev, _, p)| (*rev, p.get()))
    }

    /// True when no job is queued or running.
    pub fn idle(&self) -> bool {
        self.running.is_empty()
    }

    /// The next event, without waiting.
    pub fn try_next(&mut self) -> Option<Event<T>> {
        match self.events.try_recv() {
            Ok(event) => {
                let (kind, revision) = match &event {
                    Event::Done { kind, revision, .. } | Event::Failed { kind, revision, .. } => {
                        (*kind, *revision)
                    }
                };
                self.running
                    .retain(|(k, r, ..)| !(*k == kind && *r == revision));
                Some(event)
            }
            Err(TryRecvError::Empty | TryRecvError::Disconnected) => None,
        }
    }
}

impl<T: Send + 'static> Drop for Worker<T> {
    fn drop(&mut self) {
        for (_, _, flag, _) in &self.running {
            flag.store(true, Ordering::Relaxed);
        }
        // Closing the channel ends the thread's loop once the current job returns.
        self.requests = None;
        if let Some(t) = self.thread.take() {
            let _ = t.join();
        }
    }
}

/// A snapshot of the document for a job: jobs never see the live document.
pub fn snapshot(doc: &Document) -> Arc<Document> {
    Arc::new(doc.clone())
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::time::{Duration, Instant};

    fn wait<T: Send + 'static>(w: &mut Worker<T>) -> Event<T> {
        let deadline = Instant::now() + Duration::from_secs(20);
        loop {
            if let Some(e) = w.try_next() {
                return e;
            }
            assert!(Instant::now() < deadline, "the worker did not answer");
            std::thread::sleep(Duration::from_millis(2));
        }
    }

    #[test]
    fn a_panicking_job_is_reported_and_the_next_job_runs() {
        let mut w: Worker<u32> = Worker::start(Box::new(|| {})).unwrap();
        w.submit(1, JobKind::Other, Box::new(|_| panic!("boom in job")));
        match wait(&mut w) {
            Event::Failed {
                revision: 1,
                message,
                ..
            } => assert!(message.contains("boom")),
            other => panic!("expected a failure, got {other:?}"),
        }
        w.submit(2, JobKind::Other, Box::new(|_| 42));
        assert!(matches!(
            wait(&mut w),
            Event::Done {
                revision: 2,
                result: 42,
                cancelled: false,
                ..
            }
        ));
    }

    #[test]
    fn a_newer_job_cancels_the_older_one() {
        let mut w: Worker<bool> = Worker::start(Box::new(|| {})).unwrap();
        let started = Arc::new(AtomicBool::new(false));
        let s = started.clone();
        w.submit(
            1,
            JobKind::Analysis,
            Box::new(move |ctx| {
                s.store(true, Ordering::SeqCst);
                while !ctx.cancelled() {
                    std::thread::sleep(Duration::from_millis(1));
                }
                false
            }),
        );
        while !started.load(Ordering::SeqCst) {
            std::thread::sleep(Duration::from_millis(1));
        }
        w.submit(2, JobKind::Analysis, Box::new(|_| true));
        assert!(matches!(
            wait(&mut w),
            Event::Done {
                revision: 1,
                cancelled: true,
                ..
            }
        ));
        assert!(matches!(
            wait(&mut w),
            Event::Done {
                revision: 2,
                cancelled: false,
                result: true,
                ..
            }
        ));
    }
}
