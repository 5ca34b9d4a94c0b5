//! The child process of a campaign: reads inputs from standard input, puts each through
//! [`oracle::exercise`] on a thread with a 2 MiB stack (what the compiler must fit in), and
//! writes one line per stage, problem and finished input to standard output. A crash kills only this process;
//! the parent sees which input and stage it was.
//!
//! Protocol. In: `LEN\n` then LEN bytes, per input. Out: `ready RSS_KB`, then per input
//! `s STAGE` before each stage, `f KIND STAGE KEY<TAB>DETAIL` per problem and
//! `t STAGE MICROSECONDS` per stage run and `d MICROSECONDS PEAK_GROWTH_KB SLOWEST_STAGE
//! FEATURES` when done.

use crate::oracle::{exercise, Observer, Problem};
use crate::proc_mem;
use std::io::{BufRead, Read, Write};
use std::time::Instant;

/// Writes the protocol lines and keeps the slowest stage.
struct Out<'a> {
    w: &'a mut dyn Write,
    current: (&'static str, Instant),
    slowest: (&'static str, u128),
}

impl Out<'_> {
    fn end_stage(&mut self) {
        let us = self.current.1.elapsed().as_micros();
        if self.current.0 != "start" {
            let _ = writeln!(self.w, "t {} {us}", self.current.0);
        }
        if us >= self.slowest.1 {
            self.slowest = (self.current.0, us);
        }
    }
}

impl Observer for Out<'_> {
    fn stage(&mut self, name: &'static str) {
        self.end_stage();
        self.current = (name, Instant::now());
        let _ = writeln!(self.w, "s {name}");
        let _ = self.w.flush();
    }
    fn problem(&mut self, p: Problem) {
        let _ = writeln!(
            self.w,
            "f {} {} {}\t{}",
            p.kind,
            p.stage,
            one_line(&p.key),
            one_line(&p.detail)
        );
        let _ = self.w.flush();
    }
}

pub fn one_line(s: &str) -> String {
    s.replace(['\n', '\r', '\t'], " ")
}

/// Serve inputs until standard input closes. `stack_mb` is the stack of the thread that runs
/// them.
pub fn serve(stack_mb: usize, size_budget: Option<u64>) -> std::io::Result<()> {
    crate::panics::install_hook();
    let worker = std::thread::Builder::new()
        .name("fuzz-worker".into())
        .stack_size(stack_mb << 20)
        .spawn(move || serve_on_this_thread(size_budget))?;
    worker
        .join()
        .map_err(|_| std::io::Error::other("worker thread ended abnormally"))?
}

fn serve_on_this_thread(size_budget: Option<u64>) -> std::io::Result<()> {
    let stdin = std::io::stdin();
    let mut input = stdin.lock();
    let stdout = std::io::stdout();
    let mut out = stdout.lock();
    writeln!(out, "ready {}", proc_mem::own().rss_kb)?;
    out.flush()?;
    let mut header = String::new();
    loop {
        header.clear();
        if input.read_line(&mut header)? == 0 {
            return Ok(());
        }
        let Ok(len) = header.trim().parse::<usize>() else {
            return Err(std::io::Error::other(format!(
                "bad frame header {header:?}"
            )));
        };
        let mut bytes = vec![0; len];
        input.read_exact(&mut bytes)?;
        let text = String::from_utf8_lossy(&bytes);
        proc_mem::reset_peak();
        let before = proc_mem::own();
        let start = Instant::now();
        let mut obs = Out {
            w: &mut out,
            current: ("start", start),
            slowest: ("start", 0),
        };
        let trace = exercise(&text, size_budget, &mut obs);
        obs.end_stage();
        let slowest = obs.slowest.0;
        let us = start.elapsed().as_micros();
        let after = proc_mem::own();
        let growth = after.peak_kb.saturating_sub(before.rss_kb);
        writeln!(out, "d {us} {growth} {slowest} {}", trace.features())?;
        out.flush()?;
    }
}
