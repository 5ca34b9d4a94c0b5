//! Findings: what went wrong with an input, how findings are told apart, which ones belong to a
//! class already known and being fixed, and how they are saved.

use std::collections::BTreeMap;
use std::io::Write;
use std::path::{Path, PathBuf};

#[derive(Clone, Debug)]
pub struct Finding {
    /// panic, stack-overflow, alloc-failure, abort, timeout, slow, memory, span, non-finite,
    /// format.
    pub kind: String,
    /// The stage of the oracle it happened in (analyze, render, query, format, run, ...).
    pub stage: String,
    /// What tells one finding of this kind from another (a panic's location, a code).
    pub key: String,
    pub detail: String,
}

impl Finding {
    pub fn new(kind: &str, stage: &str, key: &str, detail: String) -> Finding {
        Finding {
            kind: kind.into(),
            stage: stage.into(),
            key: key.into(),
            detail,
        }
    }

    /// Read a worker's `KIND STAGE KEY<TAB>DETAIL` line.
    pub fn parse(line: &str) -> Option<Finding> {
        let (head, detail) = line.split_once('\t')?;
        let mut parts = head.splitn(3, ' ');
        Some(Finding::new(
            parts.next()?,
            parts.next()?,
            parts.next().unwrap_or(""),
            detail.to_string(),
        ))
    }

    /// Findings with the same signature are one bug.
    pub fn signature(&self) -> String {
        format!("{}|{}|{}", self.kind, self.stage, self.key)
    }

    /// Slowness alone is measured, not a failure, when timing is not meaningful (debug builds).
    pub fn is_timing_only(&self) -> bool {
        self.kind == "slow"
    }
}

/// The classes of failure that are known and being fixed, with the input that shows them
/// (examples of each are in `tests/cases/reliability/` once fixed): recursion depth of the
/// parser and evaluator, the JSON report of build-up link errors, non-finite numbers, and the
/// size of what repetitions, sub-network uses, regions and transient outputs expand into.
/// `None` for anything else, which is new.
pub fn known_class(f: &Finding, input: &str) -> Option<&'static str> {
    let has = |w: &str| {
        caloris_compiler::lexer::lex(input, caloris_compiler::span::FileId(0))
            .iter()
            .any(|t| &input[t.span.start as usize..t.span.end as usize] == w)
    };
    match f.kind.as_str() {
        "stack-overflow" => Some("recursion depth of the parser and evaluator"),
        // Links of a build-up use whose node is unknown have no ends to name.
        "panic"
            if f.key.starts_with("src/output.rs:") && f.detail.contains("index out of bounds") =>
        {
            Some("JSON report of a model with build-up link errors")
        }
        "non-finite" => Some("non-finite numbers"),
        // Only the analysis is where expansion size is the cause (`peak` is the whole input's
        // memory): the same class seen in a later stage means that stage does not scale with
        // the network, which is new.
        "memory" | "alloc-failure" | "timeout" | "slow"
            if matches!(f.stage.as_str(), "analyze" | "peak") =>
        {
            if has("repeat") || has("use") || has("network") {
                Some("expansion size (repeat, network, use)")
            } else if has("region") {
                Some("expansion size (region cells)")
            } else if has("output") && has("transient") {
                Some("expansion size (transient outputs)")
            } else {
                None
            }
        }
        _ => None,
    }
}

/// A finding as first seen, with the input (minimized) that shows it.
pub struct Record {
    pub finding: Finding,
    pub count: usize,
    pub file: PathBuf,
    pub known: Option<&'static str>,
    pub input_bytes: usize,
    pub minimized_bytes: usize,
}

/// Every distinct finding of a campaign, saved under `dir` as it is found.
pub struct Store {
    pub dir: PathBuf,
    pub records: BTreeMap<String, Record>,
}

impl Store {
    pub fn new(dir: &Path) -> std::io::Result<Store> {
        std::fs::create_dir_all(dir)?;
        Ok(Store {
            dir: dir.to_path_buf(),
            records: BTreeMap::new(),
        })
    }

    pub fn seen(&mut self, f: &Finding) -> bool {
        match self.records.get_mut(&f.signature()) {
            Some(r) => {
                r.count += 1;
                true
            }
            None => false,
        }
    }

    /// Save a new finding: the minimized input as `KIND-STAGE-HASH.heat`, the original beside it
    /// and a description.
    pub fn add(
        &mut self,
        f: Finding,
        original: &str,
        minimized: &str,
        origin: &str,
    ) -> std::io::Result<()> {
        let hash = crate::rng::hash(f.signature().as_bytes());
        let stem = format!("{}-{}-{:08x}", f.kind, f.stage, hash as u32);
        let file = self.dir.join(format!("{stem}.heat"));
        std::fs::write(&file, minimized)?;
        if minimized.len() != original.len() {
            std::fs::write(self.dir.join(format!("{stem}.orig.heat")), original)?;
        }
        let known = known_class(&f, minimized);
        let mut d = std::fs::File::create(self.dir.join(format!("{stem}.txt")))?;
        writeln!(d, "kind:    {}", f.kind)?;
        writeln!(d, "stage:   {}", f.stage)?;
        writeln!(d, "key:     {}", f.key)?;
        writeln!(d, "detail:  {}", f.detail)?;
        writeln!(d, "known:   {}", known.unwrap_or("no (new)"))?;
        writeln!(d, "origin:  {origin}")?;
        writeln!(
            d,
            "input:   {} bytes, minimized to {} bytes",
            original.len(),
            minimized.len()
        )?;
        writeln!(d, "replay:  caloris-fuzz --replay {}", file.display())?;
        self.records.insert(
            f.signature(),
            Record {
                finding: f,
                count: 1,
                file,
                known,
                input_bytes: original.len(),
                minimized_bytes: minimized.len(),
            },
        );
        self.write_index()
    }

    /// `findings.tsv`: one line per distinct finding, for people and for the test that runs a
    /// bounded campaign.
    pub fn write_index(&self) -> std::io::Result<()> {
        let mut out = std::fs::File::create(self.dir.join("findings.tsv"))?;
        writeln!(out, "kind\tstage\tkey\tcount\tknown\tfile\tdetail")?;
        for r in self.records.values() {
            let f = &r.finding;
            writeln!(
                out,
                "{}\t{}\t{}\t{}\t{}\t{}\t{}",
                f.kind,
                f.stage,
                f.key,
                r.count,
                r.known.unwrap_or("-"),
                r.file.display(),
                f.detail
            )?;
        }
        Ok(())
    }
}
