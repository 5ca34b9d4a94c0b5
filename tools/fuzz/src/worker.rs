//! The child process of a campaign: reads inputs from standard input, puts each through
//! [`oracle::exercise`] on a thread with the language server's stack size, and writes one line
//! per stage, problem and finished input to standard output. A crash kills only this process;
//! the parent sees which input and stage it was.
//!
//! Protocol. In: `LEN\n` then LEN bytes, per input. Out: `ready RSS_KB`, then per input
//! `s STAGE` before each stage, `f KIND STAGE KEY<TAB>DETAIL` per problem and
//! `d MICROSECONDS PEAK_GROWTH_KB FEATURES` when done.

use crate::oracle::{exercise, Observer, Problem};
use crate::proc_mem;
use std::io::{BufRead, Read, Write};
use std::time::Instant;

struct Out<'a>(&'a mut dyn Write);

impl Observer for Out<'_> {
    fn stage(&mut self, name: &'static str) {
        let _ = writeln!(self.0, "s {name}");
        let _ = self.0.flush();
    }
    fn problem(&mut self, p: Problem) {
        let _ = writeln!(
            self.0,
            "f {} {} {}\t{}",
            p.kind,
            p.stage,
            one_line(&p.key),
            one_line(&p.detail)
        );
        let _ = self.0.flush();
    }
}

pub fn one_line(s: &str) -> String {
    s.replace(['\n', '\r', '\t'], " ")
}

/// Serve inputs until standard input closes. `stack_mb` is the stack of the thread that runs
/// them.
pub fn serve(stack_mb: usize) -> std::io::Result<()> {
    crate::panics::install_hook();
    let worker = std::thread::Builder::new()
        .name("fuzz-worker".into())
        .stack_size(stack_mb << 20)
        .spawn(serve_on_this_thread)?;
    worker
        .join()
        .map_err(|_| std::io::Error::other("worker thread ended abnormally"))?
}

fn serve_on_this_thread() -> std::io::Result<()> {
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
            return Err(std::io::Error::other(format!("bad frame header {header:?}")));
        };
        let mut bytes = vec![0; len];
        input.read_exact(&mut bytes)?;
        let text = String::from_utf8_lossy(&bytes);
        proc_mem::reset_peak();
        let before = proc_mem::own();
        let start = Instant::now();
        let trace = exercise(&text, &mut Out(&mut out));
        let us = start.elapsed().as_micros();
        let after = proc_mem::own();
        let growth = after.peak_kb.saturating_sub(before.rss_kb);
        writeln!(out, "d {us} {growth} {}", trace.features())?;
        out.flush()?;
    }
}
