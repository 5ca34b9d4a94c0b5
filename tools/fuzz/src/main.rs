//! `caloris-fuzz`: run a fuzzing campaign against the compiler, or replay saved inputs.
//! See `--help` and DEVELOPERS.md.

use caloris_fuzz::campaign::{self, Settings};
use caloris_fuzz::child::{Limits, Worker};
use caloris_fuzz::findings::known_class;
use caloris_fuzz::seeds;
use std::path::PathBuf;
use std::process::ExitCode;
use std::time::Duration;

const HELP: &str = "\
caloris-fuzz: mutate models and put each through analysis, solve, rendering, editor queries,
formatting and the transient run, in a worker process that may crash without ending the run.

usage: caloris-fuzz [OPTIONS]
       caloris-fuzz --replay FILE...

  --seconds N         stop after N seconds (default 60 unless --execs is given)
  --execs N           stop after N executions (seeds included)
  --seed S            random seed (default 1); the same seed makes the same inputs
  --out DIR           where findings go (default target/fuzz-findings)
  --corpus DIR        add the .heat files below DIR as seeds (repeatable)
  --no-default-corpus leave out examples/ and tests/cases/ (reliability/ included)
  --max-input-kb N    keep mutated inputs at most N KiB (default 256)
  --budget-ms N       report inputs slower than N ms (default 2000)
  --hang-seconds N    kill an input after N s and report a hang (default 10)
  --memory-mb N       report inputs that grow memory by more than N MB (default 500)
  --stack-mb N        stack of the worker thread (default 2: the compiler must stay within
                      2 MiB; the language server gives its analyses more)
  --size-budget N     most declarations a model may expand to (default the compiler's,
                      5 000 000); smaller keeps slow builds quick
  --minimize-seconds N  time to minimize each new finding (default 30)
  --replay FILE...    run these inputs once and print what they do

exit status: 0 no findings, 1 findings, 2 usage error";

fn main() -> ExitCode {
    match real_main() {
        Ok(code) => code,
        Err(e) => {
            eprintln!("caloris-fuzz: {e}");
            ExitCode::from(2)
        }
    }
}

fn real_main() -> Result<ExitCode, String> {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let repo = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("../..");
    let repo = repo.canonicalize().unwrap_or(repo);
    let mut seconds = None;
    let mut execs = None;
    let mut seed = 1u64;
    let mut out = repo.join("target/fuzz-findings");
    let mut corpus: Vec<PathBuf> = Vec::new();
    let mut default_corpus = true;
    let mut limits = Limits {
        budget: Duration::from_millis(2000),
        hang: Duration::from_secs(10),
        memory_kb: 500 * 1024,
        stack_mb: 2,
        size_budget: None,
    };
    let mut minimize = Duration::from_secs(30);
    let mut max_input_bytes = caloris_fuzz::mutate::MAX_INPUT_BYTES;
    let mut replay: Option<Vec<PathBuf>> = None;
    let mut worker = false;
    let mut it = args.iter();
    while let Some(a) = it.next() {
        let mut value = || it.next().ok_or_else(|| format!("{a} needs a value"));
        let num = |v: &str| {
            v.parse::<f64>()
                .map_err(|_| format!("{a}: not a number: {v}"))
        };
        match a.as_str() {
            "--help" | "-h" => {
                println!("{HELP}");
                return Ok(ExitCode::SUCCESS);
            }
            "--worker" => worker = true,
            "--seconds" => seconds = Some(num(value()?)?),
            "--execs" => execs = Some(num(value()?)? as u64),
            "--seed" => seed = num(value()?)? as u64,
            "--out" => out = PathBuf::from(value()?),
            "--corpus" => corpus.push(PathBuf::from(value()?)),
            "--no-default-corpus" => default_corpus = false,
            "--max-input-kb" => max_input_bytes = (num(value()?)? * 1024.0) as usize,
            "--budget-ms" => limits.budget = Duration::from_secs_f64(num(value()?)? / 1000.0),
            "--hang-seconds" => limits.hang = Duration::from_secs_f64(num(value()?)?),
            "--memory-mb" => limits.memory_kb = (num(value()?)? * 1024.0) as u64,
            "--size-budget" => limits.size_budget = Some(num(value()?)? as u64),
            "--stack-mb" => limits.stack_mb = num(value()?)?.max(1.0) as usize,
            "--minimize-seconds" => minimize = Duration::from_secs_f64(num(value()?)?),
            "--replay" => replay = Some(it.by_ref().map(PathBuf::from).collect()),
            other => return Err(format!("unknown option {other}\n\n{HELP}")),
        }
    }
    if worker {
        caloris_fuzz::worker::serve(limits.stack_mb, limits.size_budget)
            .map_err(|e| e.to_string())?;
        return Ok(ExitCode::SUCCESS);
    }
    if let Some(files) = replay {
        return replay_files(&files, &limits);
    }
    if default_corpus {
        corpus.extend(["examples", "tests/cases"].map(|d| repo.join(d)));
    }
    let seeds = seeds::load(&corpus);
    if seeds.is_empty() {
        return Err("no seed files (.heat) found".into());
    }
    if seconds.is_none() && execs.is_none() {
        seconds = Some(60.0);
    }
    let settings = Settings {
        seconds,
        execs,
        seed,
        out,
        limits,
        max_input_bytes,
        minimize,
        status_every: Duration::from_secs(10),
    };
    eprintln!(
        "caloris-fuzz: {} seeds, seed {seed}, findings to {}",
        seeds.len(),
        settings.out.display()
    );
    let (t, store) = campaign::run(&settings, &seeds).map_err(|e| e.to_string())?;
    let secs = t.elapsed.as_secs_f64();
    println!(
        "executions: {} in {secs:.1} s ({:.1}/s); kept {} new inputs (pool {}); {} worker restarts; {} minimizing executions; {} resource findings that did not recur on a second run",
        t.execs,
        t.execs as f64 / secs.max(1e-9),
        t.kept,
        t.pool,
        t.restarts,
        t.minimize_execs,
        t.unconfirmed
    );
    let [a, b, c, d, e] = t.times;
    println!("time per input: {a} under 1 ms, {b} under 10 ms, {c} under 100 ms, {d} under 1 s, {e} longer");
    let busy: f64 = t.stage_time.values().map(Duration::as_secs_f64).sum();
    let mut by_stage: Vec<_> = t.stage_time.iter().collect();
    by_stage.sort_by(|a, b| b.1.cmp(a.1));
    let shares: Vec<String> = by_stage
        .iter()
        .map(|(name, d)| format!("{name} {:.0}%", 100.0 * d.as_secs_f64() / busy.max(1e-9)))
        .collect();
    println!("time by stage: {}", shares.join(", "));
    println!(
        "findings: {} in total, {} distinct",
        t.findings,
        store.records.len()
    );
    for r in store.records.values() {
        let f = &r.finding;
        println!(
            "  {:<14} {:<8} {:<24} x{:<5} {} — {} [{}]",
            f.kind,
            f.stage,
            f.key,
            r.count,
            r.file.display(),
            f.detail,
            r.known
                .map(|k| format!("known: {k}"))
                .unwrap_or_else(|| "new".into())
        );
    }
    Ok(if store.records.is_empty() {
        ExitCode::SUCCESS
    } else {
        ExitCode::from(1)
    })
}

fn replay_files(files: &[PathBuf], limits: &Limits) -> Result<ExitCode, String> {
    let mut worker = Worker::start(limits).map_err(|e| e.to_string())?;
    let mut any = false;
    for f in files {
        let bytes = std::fs::read(f).map_err(|e| format!("{}: {e}", f.display()))?;
        let text = String::from_utf8_lossy(&bytes).into_owned();
        let outcome = match worker.run(&bytes, limits) {
            Ok(o) => o,
            Err(o) => {
                worker = Worker::start(limits).map_err(|e| e.to_string())?;
                o
            }
        };
        let stages: Vec<String> = outcome
            .stages
            .iter()
            .map(|(name, d)| format!("{name} {:.3}", d.as_secs_f64()))
            .collect();
        println!(
            "{}: {:.3} s ({}), {}",
            f.display(),
            outcome.elapsed.as_secs_f64(),
            stages.join(", "),
            outcome.features.as_deref().unwrap_or("did not finish")
        );
        for finding in &outcome.findings {
            any = true;
            println!(
                "  {} in {} ({}): {}{}",
                finding.kind,
                finding.stage,
                finding.key,
                finding.detail,
                known_class(finding, &text)
                    .map(|k| format!(" [known: {k}]"))
                    .unwrap_or_default()
            );
        }
    }
    Ok(if any {
        ExitCode::from(1)
    } else {
        ExitCode::SUCCESS
    })
}
