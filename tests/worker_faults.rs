//! Worker faults through the public worker API: a panic inside an analysis job becomes a
//! `Failed` event with the panic's message, the owner is woken for it, and the next analysis runs
//! and gives the right answer (checked by the colouring checker).

use std::path::Path;
use std::sync::Arc;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::{Duration, Instant};

use tinct::analysis::{Analysis, PlanarityVerdict, Request};
use tinct::doc::{Edit, check_colouring, file};
use tinct::worker::{Event, JobKind, Worker, snapshot};

fn next<T: Send + 'static>(worker: &mut Worker<T>) -> Event<T> {
    let deadline = Instant::now() + Duration::from_secs(120);
    loop {
        if let Some(event) = worker.try_next() {
            return event;
        }
        assert!(Instant::now() < deadline, "the worker did not answer");
        std::thread::sleep(Duration::from_millis(2));
    }
}

#[test]
fn a_panic_inside_an_analysis_job_is_reported_and_the_next_analysis_runs() {
    let path = Path::new(env!("CARGO_MANIFEST_DIR")).join("sample-maps/vessland-province.tinct");
    let doc = file::load(&path).unwrap();
    let wakes = Arc::new(AtomicUsize::new(0));
    let counter = wakes.clone();
    let mut worker: Worker<Analysis> = Worker::start(Box::new(move || {
        counter.fetch_add(1, Ordering::SeqCst);
    }))
    .unwrap();

    // The job gets part-way through a real analysis (the constraint graph and the planarity
    // test run) and then fails, as a bug in an engine would.
    let snap = snapshot(&doc);
    worker.submit(
        1,
        JobKind::Analysis,
        Box::new(move |ctx| {
            let partial = ctx.with_control(|c| Analysis::run(&snap, Request::everything(), c));
            panic!(
                "injected fault after analysing {} regions",
                partial.rules.graph_vertices
            )
        }),
    );
    match next(&mut worker) {
        Event::Failed {
            revision,
            kind,
            message,
        } => {
            assert_eq!((revision, kind), (1, JobKind::Analysis));
            assert!(
                message.contains("injected fault after analysing"),
                "{message}"
            );
        }
        Event::Done { .. } => panic!("the failing job reported a result"),
    }
    assert_eq!(worker.busy(JobKind::Analysis), None);

    // A panic whose payload is not text still becomes a message.
    worker.submit(2, JobKind::Other, Box::new(|_| std::panic::panic_any(7u8)));
    match next(&mut worker) {
        Event::Failed { message, .. } => assert!(!message.is_empty()),
        Event::Done { .. } => panic!("the failing job reported a result"),
    }

    // The next analysis runs on the same worker and is right.
    let snap = snapshot(&doc);
    worker.submit(
        3,
        JobKind::Analysis,
        Box::new(move |ctx| ctx.with_control(|c| Analysis::run(&snap, Request::everything(), c))),
    );
    let result = match next(&mut worker) {
        Event::Done {
            revision: 3,
            cancelled: false,
            result,
            ..
        } => result,
        other => panic!("expected the analysis of revision 3, got {other:?}"),
    };
    assert_eq!(result.planarity, Some(PlanarityVerdict::Planar));
    let colouring = result.colouring.unwrap();
    let mut coloured = doc.clone();
    coloured
        .apply(Edit::SetColouring(colouring.colouring.unwrap()))
        .unwrap();
    assert!(check_colouring(&coloured).is_clean());
    // The owner was woken for the failures and for the result.
    assert_eq!(wakes.load(Ordering::SeqCst), 3);
}
