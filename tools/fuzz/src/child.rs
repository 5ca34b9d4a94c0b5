//! The parent's handle on a worker process: send an input, wait for its result under a time
//! limit while watching the worker's memory, and turn a death into a finding.

use crate::findings::Finding;
use crate::proc_mem;
use std::io::{BufRead, BufReader, Read, Write};
use std::os::unix::process::ExitStatusExt;
use std::process::{Child, ChildStdin, Command, Stdio};
use std::sync::mpsc::{channel, Receiver, RecvTimeoutError};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

/// Limits one input must keep.
#[derive(Clone, Copy)]
pub struct Limits {
    /// An input slower than this is reported as slow.
    pub budget: Duration,
    /// An input still running after this is killed and reported as a hang.
    pub hang: Duration,
    /// Growth of the worker's memory that makes a finding (and a kill), kB.
    pub memory_kb: u64,
    pub stack_mb: usize,
    /// The analysis's size budget (`Options::size_budget`; `None` for the default).
    pub size_budget: Option<u64>,
}

/// The result of one input.
pub struct Outcome {
    pub findings: Vec<Finding>,
    /// Time spent in each stage the input finished.
    pub stages: Vec<(String, Duration)>,
    /// Coverage features (`None` when the worker did not finish the input).
    pub features: Option<String>,
    pub elapsed: Duration,
}

pub struct Worker {
    child: Child,
    stdin: ChildStdin,
    lines: Receiver<String>,
    stderr: Arc<Mutex<Vec<u8>>>,
    baseline_kb: u64,
}

/// How much of a dead worker's standard error is kept.
const STDERR_TAIL: usize = 4096;

impl Worker {
    pub fn start(limits: &Limits) -> std::io::Result<Worker> {
        let exe = std::env::current_exe()?;
        let mut command = Command::new(exe);
        command.args(["--worker", "--stack-mb", &limits.stack_mb.to_string()]);
        if let Some(b) = limits.size_budget {
            command.args(["--size-budget", &b.to_string()]);
        }
        let mut child = command
            .env("RUST_BACKTRACE", "0")
            .stdin(Stdio::piped())
            .stdout(Stdio::piped())
            .stderr(Stdio::piped())
            .spawn()?;
        let stdin = child
            .stdin
            .take()
            .ok_or_else(|| std::io::Error::other("no stdin"))?;
        let stdout = child
            .stdout
            .take()
            .ok_or_else(|| std::io::Error::other("no stdout"))?;
        let mut err = child
            .stderr
            .take()
            .ok_or_else(|| std::io::Error::other("no stderr"))?;
        let (tx, lines) = channel();
        std::thread::spawn(move || {
            for line in BufReader::new(stdout).lines() {
                let Ok(line) = line else { return };
                if tx.send(line).is_err() {
                    return;
                }
            }
        });
        let stderr = Arc::new(Mutex::new(Vec::new()));
        let tail = stderr.clone();
        std::thread::spawn(move || {
            let mut buf = [0u8; 4096];
            while let Ok(n) = err.read(&mut buf) {
                if n == 0 {
                    return;
                }
                if let Ok(mut t) = tail.lock() {
                    t.extend_from_slice(&buf[..n]);
                    let over = t.len().saturating_sub(STDERR_TAIL);
                    t.drain(..over);
                }
            }
        });
        let ready = lines
            .recv_timeout(Duration::from_secs(30))
            .map_err(|_| std::io::Error::other("the worker did not start"))?;
        let baseline_kb = ready
            .strip_prefix("ready ")
            .and_then(|v| v.parse().ok())
            .unwrap_or(0);
        Ok(Worker {
            child,
            stdin,
            lines,
            stderr,
            baseline_kb,
        })
    }

    /// Put one input through the worker. `Err` means the worker is gone (dead or killed) and
    /// must be replaced; the outcome then holds the finding that says why.
    pub fn run(&mut self, input: &[u8], limits: &Limits) -> Result<Outcome, Outcome> {
        let start = Instant::now();
        let sent = writeln!(self.stdin, "{}", input.len())
            .and_then(|_| self.stdin.write_all(input))
            .and_then(|_| self.stdin.flush());
        let mut stage = "start".to_string();
        let mut findings = Vec::new();
        let mut stages = Vec::new();
        if sent.is_err() {
            return Err(self.death(stage, findings, start));
        }
        let tick = Duration::from_millis(20);
        loop {
            match self.lines.recv_timeout(tick) {
                Ok(line) => {
                    if let Some(s) = line.strip_prefix("s ") {
                        stage = s.to_string();
                    } else if let Some(t) = line.strip_prefix("t ") {
                        if let Some((name, us)) = t.split_once(' ') {
                            let us = us.parse().unwrap_or(0);
                            stages.push((name.to_string(), Duration::from_micros(us)));
                        }
                    } else if let Some(f) = line.strip_prefix("f ") {
                        findings.extend(Finding::parse(f));
                    } else if let Some(d) = line.strip_prefix("d ") {
                        let mut parts = d.splitn(4, ' ');
                        let us: u64 = parts.next().and_then(|v| v.parse().ok()).unwrap_or(0);
                        let growth: u64 = parts.next().and_then(|v| v.parse().ok()).unwrap_or(0);
                        let slowest = parts.next().unwrap_or("?");
                        let features = parts.next().unwrap_or("-").to_string();
                        let elapsed = Duration::from_micros(us);
                        if elapsed > limits.budget {
                            findings.push(Finding::new(
                                "slow",
                                slowest,
                                "",
                                format!(
                                    "took {:.2} s (budget {:.2} s)",
                                    elapsed.as_secs_f64(),
                                    limits.budget.as_secs_f64()
                                ),
                            ));
                        }
                        if growth > limits.memory_kb {
                            findings.push(Finding::new(
                                "memory",
                                "peak",
                                "",
                                format!("peak memory grew by {} MB", growth / 1024),
                            ));
                        }
                        return Ok(Outcome {
                            findings,
                            stages,
                            features: Some(features),
                            elapsed,
                        });
                    }
                }
                Err(RecvTimeoutError::Disconnected) => {
                    return Err(self.death(stage, findings, start));
                }
                Err(RecvTimeoutError::Timeout) => {
                    let rss = proc_mem::of(self.child.id()).rss_kb;
                    if rss > self.baseline_kb + limits.memory_kb {
                        self.kill();
                        findings.push(Finding::new(
                            "memory",
                            &stage,
                            "",
                            format!("resident memory reached {} MB; killed", rss / 1024),
                        ));
                        return Err(self.outcome(findings, start));
                    }
                    if start.elapsed() > limits.hang {
                        self.kill();
                        findings.push(Finding::new(
                            "timeout",
                            &stage,
                            "",
                            format!(
                                "still running after {:.0} s; killed",
                                limits.hang.as_secs_f64()
                            ),
                        ));
                        return Err(self.outcome(findings, start));
                    }
                }
            }
        }
    }

    fn outcome(&self, findings: Vec<Finding>, start: Instant) -> Outcome {
        Outcome {
            findings,
            stages: Vec::new(),
            features: None,
            elapsed: start.elapsed(),
        }
    }

    fn kill(&mut self) {
        let _ = self.child.kill();
        let _ = self.child.wait();
    }

    /// The worker stopped by itself: say how, from its exit status and its last words.
    fn death(&mut self, stage: String, mut findings: Vec<Finding>, start: Instant) -> Outcome {
        let status = self.child.wait().ok();
        // The stderr reader may still be copying the last bytes.
        std::thread::sleep(Duration::from_millis(30));
        let tail = self
            .stderr
            .lock()
            .map(|t| String::from_utf8_lossy(&t).into_owned())
            .unwrap_or_default();
        let how = match status {
            Some(s) => match (s.code(), s.signal()) {
                (Some(c), _) => format!("exit code {c}"),
                (None, Some(sig)) => format!("signal {sig}"),
                _ => "unknown status".into(),
            },
            None => "unknown status".into(),
        };
        // The line that says what happened, else the last one.
        let last = tail
            .lines()
            .find(|l| l.contains("overflowed its stack") || l.contains("memory allocation of"))
            .or_else(|| tail.lines().rfind(|l| !l.trim().is_empty()))
            .unwrap_or("")
            .to_string();
        let (kind, key) = if tail.contains("has overflowed its stack") {
            ("stack-overflow", String::new())
        } else if tail.contains("memory allocation of") {
            ("alloc-failure", String::new())
        } else {
            ("abort", how.clone())
        };
        findings.push(Finding::new(
            kind,
            &stage,
            &key,
            format!("worker died ({how}): {}", crate::worker::one_line(&last)),
        ));
        self.outcome(findings, start)
    }
}

impl Drop for Worker {
    fn drop(&mut self) {
        self.kill();
    }
}
