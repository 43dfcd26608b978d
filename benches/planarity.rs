//! Planarity benchmark: random maximal planar graphs (labels shuffled), planar and with one edge
//! moved, against a plain depth-first search over the same CSR graph measured in the same run;
//! then the adversarial family for Kuratowski isolation (rings of crossing chords), with the
//! growth exponents of the test and of test+Kuratowski.
//!
//! Run with `cargo bench --no-default-features --bench planarity`. Prints one table; the ratios
//! are the numbers to quote.

// Calls into the C library (resource usage, signals, a counting allocator) need `unsafe`.
#![allow(unsafe_code)]

#[path = "../tests/support/generators.rs"]
mod generators;
#[path = "support/process.rs"]
mod process;
use process::run_process;

use std::hint::black_box;
use std::sync::atomic::AtomicBool;
use std::time::{Duration, Instant};

use tinct::engine::Graph;
use tinct::engine::certify::{check_embedding, check_kuratowski};
use tinct::engine::planarity::{Planarity, is_planar, planarity};

use generators::{
    Rng, crossing_chord_ring, move_one_edge, permutation, random_triangulation, relabel,
};

/// The floor: one iterative depth-first search touching every half-edge once.
fn plain_dfs(g: &Graph) -> u64 {
    let n = g.vertex_count();
    let (offsets, targets) = g.csr();
    let mut seen = vec![false; n];
    let mut cursor: Vec<u32> = offsets[..n].to_vec();
    let mut stack: Vec<u32> = Vec::new();
    let mut order_sum = 0u64;
    for s in 0..n as u32 {
        if seen[s as usize] {
            continue;
        }
        seen[s as usize] = true;
        stack.push(s);
        while let Some(&v) = stack.last() {
            let vi = v as usize;
            if cursor[vi] < offsets[vi + 1] {
                let w = targets[cursor[vi] as usize];
                cursor[vi] += 1;
                if !seen[w as usize] {
                    seen[w as usize] = true;
                    order_sum += u64::from(w);
                    stack.push(w);
                }
            } else {
                stack.pop();
            }
        }
    }
    order_sum
}

/// Wall time of one call.
fn time<T>(f: impl FnOnce() -> T) -> Duration {
    let start = Instant::now();
    black_box(f());
    start.elapsed()
}

/// Peak resident set size of this process in MiB (VmHWM), if the platform reports it.
fn peak_rss_mib() -> Option<f64> {
    let status = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = status.lines().find(|l| l.starts_with("VmHWM:"))?;
    let kib: f64 = line.split_whitespace().nth(1)?.parse().ok()?;
    Some(kib / 1024.0)
}

/// Resets the peak RSS counter (Linux: writing 5 to clear_refs), so that the next reading covers
/// only what follows. Returns false where unsupported.
fn reset_peak_rss() -> bool {
    std::fs::write("/proc/self/clear_refs", "5").is_ok()
}

fn ms(d: Duration) -> f64 {
    d.as_secs_f64() * 1e3
}

fn median(mut values: Vec<f64>) -> f64 {
    values.sort_by(f64::total_cmp);
    let k = values.len();
    if k % 2 == 1 {
        values[k / 2]
    } else {
        (values[k / 2 - 1] + values[k / 2]) / 2.0
    }
}

/// `--write-delaunay DIR N`: writes the whole-process bench's input files for `N` points.
fn write_delaunay(dir: &std::path::Path, n: usize) {
    let edges = delaunay_edges(n, 7 + n as u64);
    let mut text = format!("{n} {}\n", edges.len());
    let mut adjacency: Vec<Vec<u32>> = vec![Vec::new(); n];
    for &(a, b) in &edges {
        text.push_str(&format!("{a} {b}\n"));
        adjacency[a as usize].push(b);
        adjacency[b as usize].push(a);
    }
    std::fs::write(dir.join(format!("delaunay-{n}.edges")), text).expect("temporary file");
    // The C suite's adjacency-list format: N=n, then "v: neighbours -1".
    let mut adj = format!("N={n}\n");
    for (v, list) in adjacency.iter().enumerate() {
        adj.push_str(&format!("{v}:"));
        for w in list {
            adj.push_str(&format!(" {w}"));
        }
        adj.push_str(" -1\n");
    }
    std::fs::write(dir.join(format!("delaunay-{n}.adj")), adj).expect("temporary file");
}

fn main() {
    let args: Vec<String> = std::env::args().collect();
    if let Some(i) = args.iter().position(|a| a == "--write-delaunay") {
        let n = args.get(i + 2).and_then(|a| a.parse().ok()).unwrap_or(1000);
        write_delaunay(std::path::Path::new(&args[i + 1]), n);
        return;
    }
    // `-- process` runs only the whole-process comparison (it writes large files and runs other
    // programs), `-- engine` only the engine tables.
    let only: Option<String> = std::env::args().skip(1).find(|a| !a.starts_with("--"));
    if only.as_deref() != Some("engine") {
        process_section();
        if only.as_deref() == Some("process") {
            return;
        }
    }
    let never = AtomicBool::new(false);
    println!(
        "{:>9} {:>9} | {:>8} {:>9} {:>9} {:>8} | {:>9} {:>9} {:>7} {:>7} | {:>8} {:>8}",
        "n",
        "m",
        "DFS ms",
        "test ms",
        "t+emb ms",
        "emb/DFS",
        "test* ms",
        "t+K ms",
        "K/test",
        "K/DFS",
        "t/DFS",
        "K pieces"
    );
    // TINCT_BENCH_SIZES=100000,1000000 restricts the sizes (for profiling).
    let sizes: Vec<usize> = std::env::var("TINCT_BENCH_SIZES")
        .ok()
        .map(|s| s.split(',').filter_map(|x| x.trim().parse().ok()).collect())
        .unwrap_or_else(|| vec![10_000, 100_000, 1_000_000]);
    for &n in &sizes {
        // Best of many interleaved rounds: on a shared machine the plain search varies most.
        let runs = if n >= 1_000_000 { 9 } else { 15 };
        let mut rng = Rng::new(n as u64);
        let tri = random_triangulation(n, n, &mut rng);
        let p = permutation(n, &mut rng);
        let tri = relabel(&tri, &p, &mut rng);
        let mut moved = move_one_edge(n, &tri, &mut rng);
        let (g, _) = Graph::from_edges(n, &tri).expect("generated edges are in range");
        let mut h = Graph::from_edges(n, &moved).expect("in range").0;
        while is_planar(&h, &never, &mut |_| {}).unwrap_or(true) {
            moved = move_one_edge(n, &tri, &mut rng);
            h = Graph::from_edges(n, &moved).expect("in range").0;
        }
        drop((tri, moved, p));

        // Certificates are checked once, outside the timings.
        match planarity(&g, &never, &mut |_| {}) {
            Ok(Planarity::Planar(e)) => check_embedding(&g, &e).expect("embedding verifies"),
            other => panic!(
                "triangulation must be planar: {:?}",
                other.map(|v| v.is_planar())
            ),
        }
        let pieces = match planarity(&h, &never, &mut |_| {}) {
            Ok(Planarity::NonPlanar(k)) => {
                check_kuratowski(&h, &k).expect("Kuratowski subgraph verifies");
                k.edges.len()
            }
            other => panic!(
                "moved edge must be non-planar: {:?}",
                other.map(|v| v.is_planar())
            ),
        };

        // Interleaved rounds. Times are the best of each column (other processes on a shared
        // machine only ever add time); ratios are the median over rounds of the ratio within a
        // round, so that a fast moment for one column is never set against a slow one for the
        // other.
        let mut rounds: Vec<[f64; 5]> = Vec::with_capacity(runs);
        for _ in 0..runs {
            rounds.push([
                ms(time(|| plain_dfs(&g))),
                ms(time(|| is_planar(&g, &never, &mut |_| {}))),
                ms(time(|| planarity(&g, &never, &mut |_| {}))),
                ms(time(|| is_planar(&h, &never, &mut |_| {}))),
                ms(time(|| planarity(&h, &never, &mut |_| {}))),
            ]);
        }
        let best = |i: usize| rounds.iter().map(|r| r[i]).fold(f64::MAX, f64::min);
        let ratio = |a: usize, b: usize| median(rounds.iter().map(|r| r[a] / r[b]).collect());
        println!(
            "{:>9} {:>9} | {:>8.2} {:>9.2} {:>9.2} {:>8.2} | {:>9.2} {:>9.2} {:>7.2} {:>7.2} | {:>8.2} {:>8}",
            n,
            g.edge_count(),
            best(0),
            best(1),
            best(2),
            ratio(2, 0),
            best(3),
            best(4),
            ratio(4, 3),
            ratio(4, 0),
            ratio(1, 0),
            pieces,
        );
        // Where the time goes: the first progress report of each phase, relative to the start.
        let mut seen: Vec<(String, f64)> = Vec::new();
        let start = Instant::now();
        let _ = black_box(planarity(&g, &never, &mut |p| {
            let name = format!("{:?}", p.phase);
            if seen.last().map(|(s, _)| s != &name).unwrap_or(true) {
                seen.push((name, ms(start.elapsed())));
            }
        }));
        let total = ms(start.elapsed());
        println!("  phases (first report, ms): {seen:?}, end {total:.1}");
        if n == 1_000_000 {
            let before = peak_rss_mib();
            let reset = reset_peak_rss();
            let _ = black_box(planarity(&g, &never, &mut |_| {}));
            let _ = black_box(planarity(&h, &never, &mut |_| {}));
            let after = peak_rss_mib();
            println!(
                "peak RSS at n = 10^6: {:.0} MiB for the whole run including generation; {} MiB \
                 during test+embedding and test+Kuratowski with both graphs resident{}",
                before.unwrap_or(f64::NAN),
                after.map_or("?".to_string(), |v| format!("{v:.0}")),
                if reset {
                    ""
                } else {
                    " (peak reset unsupported: whole-run figure)"
                }
            );
        }
    }
    ring_section(&never);
    println!(
        "columns: test = is_planar on the planar graph; t+emb = planarity() with embedding; \
         test* = is_planar on the graph with one edge moved; t+K = planarity() with Kuratowski \
         subgraph; emb/DFS and K/DFS = those against the plain search; K/test = t+K against \
         test*; times are the best round, ratios the median of the ratios within rounds; \
         K pieces = edges in the certificate"
    );
}

/// The adversarial family: rings of k crossing chords (every certificate needs all k chords)
/// inside a random triangulation of the same size. Prints the time of the test alone and of
/// test+Kuratowski, and how test+Kuratowski grows from one size to the next.
fn ring_section(never: &AtomicBool) {
    // TINCT_BENCH_RING=1001,10001 chooses the chord counts (odd).
    let sizes: Vec<usize> = std::env::var("TINCT_BENCH_RING")
        .ok()
        .map(|s| s.split(',').filter_map(|x| x.trim().parse().ok()).collect())
        // Up to about 10^6 vertices (k chords, 2k ring vertices, 2k triangulation vertices):
        // the isolation is linear on this family, so the growth column should stay near 1.
        .unwrap_or_else(|| vec![1_001, 10_001, 100_001, 250_001]);
    println!(
        "crossing-chord rings: {:>8} {:>9} {:>9} | {:>9} {:>9} {:>7} | {:>11} {:>10}",
        "k", "n", "m", "test ms", "t+K ms", "K/test", "growth test", "growth t+K"
    );
    let mut previous: Option<(usize, f64, f64)> = None;
    for &k in &sizes {
        let mut rng = Rng::new(k as u64);
        let (n, edges) = crossing_chord_ring(k, 2 * k, &mut rng);
        let (g, _) = Graph::from_edges(n, &edges).expect("generated edges are in range");
        match planarity(&g, never, &mut |_| {}) {
            Ok(Planarity::NonPlanar(kur)) => {
                check_kuratowski(&g, &kur).expect("Kuratowski subgraph verifies")
            }
            other => panic!(
                "ring must be non-planar: {:?}",
                other.map(|v| v.is_planar())
            ),
        }
        let runs = if k >= 100_000 { 3 } else { 5 };
        let mut best = [Duration::MAX; 2];
        for _ in 0..runs {
            let round = [
                time(|| is_planar(&g, never, &mut |_| {})),
                time(|| planarity(&g, never, &mut |_| {})),
            ];
            for (b, r) in best.iter_mut().zip(round) {
                *b = (*b).min(r);
            }
        }
        let [test, with_kuratowski] = best;
        // Growth exponents between consecutive sizes: 1 is linear, 2 quadratic. The test alone
        // is linear too, so the two columns should match (caches make both exceed 1 once the
        // graph no longer fits in them).
        let growth = |now: f64, before: f64, k0: usize| {
            format!("{:.2}", (now / before).ln() / (k as f64 / k0 as f64).ln())
        };
        let (g_test, g_k) = previous.map_or(("-".to_string(), "-".to_string()), |(k0, t0, tk0)| {
            (
                growth(ms(test), t0, k0),
                growth(ms(with_kuratowski), tk0, k0),
            )
        });
        println!(
            "                      {:>8} {:>9} {:>9} | {:>9.2} {:>9.2} {:>7.2} | {:>11} {:>10}",
            k,
            n,
            g.edge_count(),
            ms(test),
            ms(with_kuratowski),
            ms(with_kuratowski) / ms(test),
            g_test,
            g_k
        );
        previous = Some((k, ms(test), ms(with_kuratowski)));
    }
}

/// A Delaunay triangulation of `n` random points in the unit square (seeded): planar, about 3n
/// edges, the kind of graph map adjacency resembles. Vertex labels follow the points.
fn delaunay_edges(n: usize, seed: u64) -> Vec<(u32, u32)> {
    let mut rng = Rng::new(seed);
    let unit = |rng: &mut Rng| (rng.next_u64() >> 11) as f64 / (1u64 << 53) as f64;
    let points: Vec<delaunator::Point> = (0..n)
        .map(|_| delaunator::Point {
            x: unit(&mut rng),
            y: unit(&mut rng),
        })
        .collect();
    let t = delaunator::triangulate(&points);
    let mut edges: Vec<(u32, u32)> = Vec::with_capacity(3 * n);
    for tri in t.triangles.chunks_exact(3) {
        for (a, b) in [(tri[0], tri[1]), (tri[1], tri[2]), (tri[2], tri[0])] {
            let (a, b) = (a as u32, b as u32);
            edges.push((a.min(b), a.max(b)));
        }
    }
    edges.sort_unstable();
    edges.dedup();
    edges
}

/// Best of `runs` runs of a program: (time, peak memory, exit code).
fn best_of(runs: usize, program: &str, args: &[&str]) -> Option<(Duration, f64, i32)> {
    (0..runs)
        .filter_map(|_| run_process(program, args))
        .min_by_key(|(t, _, _)| *t)
}

/// The whole `tinct analyse` process on Delaunay triangulations of 10^5 and 10^6 points,
/// against the edge-addition planarity suite in C (John Boyer's reference implementation,
/// Debian package `planarity`: `apt-get install planarity` to include it) on the same graph, and
/// against a plain read of the file by `cat`. Targets: `--only planarity` at most 1.0x the C
/// suite at 10^6; `--only colouring` at most 2.0x the C suite's planarity run.
fn process_section() {
    let tinct = env!("CARGO_BIN_EXE_tinct");
    let dir = std::env::temp_dir().join(format!("tinct-process-bench-{}", std::process::id()));
    let _ = std::fs::create_dir_all(&dir);
    let have_c = std::process::Command::new("planarity")
        .arg("-h")
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .status()
        .is_ok();
    println!(
        "Whole process on Delaunay triangulations: best of 3 runs; ratios against the C planarity \
         suite's planarity run (-s -p){}",
        if have_c {
            ""
        } else {
            " (the C suite is not installed: apt-get install planarity)"
        }
    );
    println!(
        "{:>9} {:<40} {:>10} {:>10} {:>8}",
        "n", "work", "time ms", "peak MiB", "ratio"
    );
    for n in [100_000usize, 1_000_000] {
        // The files are written by a child process, so that this one stays small: a child's
        // peak memory as `wait4` reports it includes what its parent had mapped when it forked.
        let edge_file = dir.join(format!("delaunay-{n}.edges"));
        let adjacency_file = dir.join(format!("delaunay-{n}.adj"));
        let written = std::process::Command::new(std::env::current_exe().expect("own path"))
            .args(["--write-delaunay", &dir.to_string_lossy(), &n.to_string()])
            .status()
            .is_ok_and(|s| s.success());
        assert!(written, "the graph files could not be written");
        let edge_path = edge_file.to_string_lossy().into_owned();
        let out_path = dir.join("embedding.out").to_string_lossy().into_owned();
        let adj_path = adjacency_file.to_string_lossy().into_owned();
        let c_suite = have_c
            .then(|| best_of(3, "planarity", &["-s", "-q", "-p", &adj_path, &out_path]))
            .flatten();
        let reference = c_suite.map(|(t, _, _)| t);
        let line = |work: &str, result: Option<(Duration, f64, i32)>| match result {
            Some((t, mem, _)) => println!(
                "{n:>9} {work:<40} {:>10.0} {mem:>10.0} {:>8}",
                ms(t),
                reference.map_or("-".to_string(), |r| format!(
                    "{:.2}x",
                    t.as_secs_f64() / r.as_secs_f64()
                ))
            ),
            None => println!("{n:>9} {work:<40} {:>10} {:>10} {:>8}", "-", "-", "-"),
        };
        line("C suite: planarity -s -p", c_suite);
        line("cat (a plain read)", best_of(3, "cat", &[&edge_path]));
        for (work, only) in [
            ("tinct analyse --json --only planarity", "planarity"),
            ("tinct analyse --json --only rules", "rules"),
            ("tinct analyse --json --only colouring", "colouring"),
        ] {
            line(
                work,
                best_of(3, tinct, &["analyse", &edge_path, "--json", "--only", only]),
            );
        }
    }
    let _ = std::fs::remove_dir_all(&dir);
}
