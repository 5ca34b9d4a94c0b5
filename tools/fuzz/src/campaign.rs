//! A campaign: seeds first, then mutated inputs, each through a worker process; new findings
//! minimized and saved; inputs that reach a new set of diagnostic codes kept as seeds.

use crate::child::{Limits, Outcome, Worker};
use crate::findings::{Finding, Store};
use crate::mutate::Mutator;
use crate::rng::Rng;
use crate::seeds::Seed;
use std::collections::{BTreeMap, HashSet};
use std::path::PathBuf;
use std::time::{Duration, Instant};

pub struct Settings {
    pub seconds: Option<f64>,
    pub execs: Option<u64>,
    pub seed: u64,
    pub out: PathBuf,
    pub limits: Limits,
    /// Mutated inputs stay at most this large.
    pub max_input_bytes: usize,
    /// Time allowed to minimize one new finding.
    pub minimize: Duration,
    /// Report every this often on standard error.
    pub status_every: Duration,
}

/// Kept inputs are at most this large, and at most this many, so the pool stays cheap.
const MAX_KEPT_BYTES: usize = 64 * 1024;
const MAX_POOL: usize = 4000;

pub struct Totals {
    pub execs: u64,
    pub elapsed: Duration,
    pub pool: usize,
    pub kept: usize,
    pub restarts: u64,
    pub findings: u64,
    /// Executions spent minimizing findings (not counted in `execs`).
    pub minimize_execs: u64,
    /// Slow inputs, timeouts and memory findings that did not recur when run a second time (see
    /// [`confirmed`]). Not findings.
    pub unconfirmed: u64,
    /// Executions by time taken: under 1 ms, 10 ms, 100 ms, 1 s, and longer.
    pub times: [u64; 5],
    /// Time spent in each stage, over the inputs that finished.
    pub stage_time: BTreeMap<String, Duration>,
}

impl Totals {
    fn count_time(&mut self, d: Duration) {
        let ms = d.as_secs_f64() * 1000.0;
        let i = [1.0, 10.0, 100.0, 1000.0]
            .iter()
            .position(|&limit| ms < limit)
            .unwrap_or(4);
        self.times[i] += 1;
    }
}

pub fn run(settings: &Settings, seeds: &[Seed]) -> std::io::Result<(Totals, Store)> {
    let mut mutator = Mutator::new(seeds.iter().map(|s| s.text.as_str()));
    mutator.max_bytes = settings.max_input_bytes;
    let mut rng = Rng::new(settings.seed);
    let mut store = Store::new(&settings.out)?;
    let mut pool: Vec<String> = seeds.iter().map(|s| s.text.clone()).collect();
    let mut features: HashSet<String> = HashSet::new();
    let mut worker = Worker::start(&settings.limits)?;
    let start = Instant::now();
    let mut last_status = start;
    let mut t = Totals {
        execs: 0,
        elapsed: Duration::ZERO,
        pool: 0,
        kept: 0,
        restarts: 0,
        findings: 0,
        minimize_execs: 0,
        unconfirmed: 0,
        times: [0; 5],
        stage_time: BTreeMap::new(),
    };
    let done = |t: &Totals| {
        settings.execs.is_some_and(|n| t.execs >= n)
            || settings
                .seconds
                .is_some_and(|s| start.elapsed().as_secs_f64() >= s)
    };
    while !done(&t) {
        let i = t.execs as usize;
        let (input, origin) = if i < seeds.len() {
            (seeds[i].text.clone(), format!("seed {}", seeds[i].name))
        } else {
            // Half the time a recent discovery, so new ground is explored further.
            let base = if pool.len() > seeds.len() && rng.chance(1, 2) {
                let recent = (pool.len() - seeds.len()).min(200);
                &pool[pool.len() - 1 - rng.below(recent)]
            } else {
                &pool[rng.below(pool.len())]
            };
            let other = &seeds[rng.below(seeds.len())].text;
            (
                mutator.mutate(&mut rng, base, other),
                format!("mutation {} of --seed {}", t.execs, settings.seed),
            )
        };
        let outcome = exec(&mut worker, &input, settings, &mut t)?;
        t.execs += 1;
        t.count_time(outcome.elapsed);
        for (name, d) in &outcome.stages {
            *t.stage_time.entry(name.clone()).or_default() += *d;
        }
        if let Some(f) = &outcome.features {
            if features.insert(f.clone()) && i >= seeds.len() && input.len() <= MAX_KEPT_BYTES {
                t.kept += 1;
                if pool.len() >= MAX_POOL {
                    pool.remove(seeds.len());
                }
                pool.push(input.clone());
            }
        }
        for f in outcome.findings {
            t.findings += 1;
            if store.seen(&f) {
                continue;
            }
            if !confirmed(&mut worker, &input, &f, settings, &mut t)? {
                t.unconfirmed += 1;
                eprintln!(
                    "unconfirmed: {} in {} — {}; not so on a second run, not kept",
                    f.kind, f.stage, f.detail
                );
                continue;
            }
            let minimized = minimize(&mut worker, &input, &f, settings, &mut t)?;
            eprintln!(
                "new finding: {} in {} ({}) — {}; {} → {} bytes",
                f.kind,
                f.stage,
                f.key,
                f.detail,
                input.len(),
                minimized.len()
            );
            store.add(f, &input, &minimized, &origin)?;
        }
        if last_status.elapsed() >= settings.status_every {
            last_status = Instant::now();
            let secs = start.elapsed().as_secs_f64();
            eprintln!(
                "[{secs:.0} s] {} executions, {:.0}/s, pool {}, distinct findings {}",
                t.execs,
                t.execs as f64 / secs.max(1e-9),
                pool.len(),
                store.records.len()
            );
        }
    }
    store.write_index()?;
    t.elapsed = start.elapsed();
    t.pool = pool.len();
    Ok((t, store))
}

/// One input through the worker, starting a new worker when the last one died.
fn exec(
    worker: &mut Worker,
    input: &str,
    settings: &Settings,
    t: &mut Totals,
) -> std::io::Result<Outcome> {
    match worker.run(input.as_bytes(), &settings.limits) {
        Ok(o) => Ok(o),
        Err(o) => {
            t.restarts += 1;
            *worker = Worker::start(&settings.limits)?;
            Ok(o)
        }
    }
}

/// Whether a finding recurs when its input runs again. Only the resource limits can fail to
/// recur (everything else the oracle checks is deterministic): time is wall-clock time, so a
/// quick input overruns it on a loaded machine, and a worker that served thousands of inputs
/// holds memory its allocator kept, so a modest input can tip it over the memory limit (the
/// worker is then killed, and the second run is in a fresh one).
fn confirmed(
    worker: &mut Worker,
    input: &str,
    finding: &Finding,
    settings: &Settings,
    t: &mut Totals,
) -> std::io::Result<bool> {
    if !matches!(finding.kind.as_str(), "timeout" | "slow" | "memory") {
        return Ok(true);
    }
    t.minimize_execs += 1;
    let sig = finding.signature();
    let again = exec(worker, input, settings, t)?;
    Ok(again.findings.iter().any(|f| f.signature() == sig))
}

/// The smallest input found within the time allowed that still shows the same finding:
/// chunks of lines, then of characters, are removed while the finding stays.
fn minimize(
    worker: &mut Worker,
    input: &str,
    finding: &Finding,
    settings: &Settings,
    t: &mut Totals,
) -> std::io::Result<String> {
    let deadline = Instant::now() + settings.minimize;
    // Slow findings cost their whole time limit per try; a few tries only.
    let mut tries_left = match finding.kind.as_str() {
        "timeout" | "slow" | "memory" => 6,
        _ => 2000,
    };
    let sig = finding.signature();
    let mut best = input.to_string();
    for by_lines in [true, false] {
        let mut units = split(&best, by_lines);
        let mut chunk = units.len().div_ceil(2).max(1);
        loop {
            let mut i = 0;
            while i < units.len() {
                if Instant::now() >= deadline || tries_left == 0 {
                    return Ok(best);
                }
                let end = (i + chunk).min(units.len());
                let candidate: String = units[..i]
                    .iter()
                    .chain(&units[end..])
                    .map(String::as_str)
                    .collect();
                tries_left -= 1;
                t.minimize_execs += 1;
                let o = exec(worker, &candidate, settings, t)?;
                if o.findings.iter().any(|f| f.signature() == sig) {
                    units.drain(i..end);
                    best = candidate;
                } else {
                    i += chunk;
                }
            }
            if chunk == 1 {
                break;
            }
            chunk = chunk.div_ceil(2);
        }
    }
    Ok(best)
}

/// Lines (with their ends) or characters of `text`.
fn split(text: &str, by_lines: bool) -> Vec<String> {
    if by_lines {
        text.split_inclusive('\n').map(str::to_string).collect()
    } else {
        text.chars().map(String::from).collect()
    }
}
