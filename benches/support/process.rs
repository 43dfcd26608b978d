//! Whole-process measurements shared by the benches: a child's wall time and its own peak memory.

use std::time::{Duration, Instant};

/// Runs a program to the end and returns its wall time and its own peak resident memory (MiB),
/// from `wait4`'s resource usage of that child alone.
pub fn run_process(program: &str, args: &[&str]) -> Option<(Duration, f64, i32)> {
    use std::os::unix::process::ExitStatusExt;
    let start = Instant::now();
    let child = std::process::Command::new(program)
        .args(args)
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .ok()?;
    let pid = child.id() as libc::pid_t;
    let mut status = 0;
    // SAFETY: waits for our own child; `usage` is a plain struct the call fills in.
    let mut usage: libc::rusage = unsafe { std::mem::zeroed() };
    let waited = unsafe { libc::wait4(pid, &mut status, 0, &mut usage) };
    let took = start.elapsed();
    if waited != pid {
        return None;
    }
    let code = std::process::ExitStatus::from_raw(status)
        .code()
        .unwrap_or(-1);
    Some((took, usage.ru_maxrss as f64 / 1024.0, code))
}
