//! Resident and peak memory of a process, from `/proc/PID/status` (Linux). Elsewhere the
//! figures read as zero and the memory guard is off.

#[derive(Clone, Copy, Default)]
pub struct Mem {
    pub rss_kb: u64,
    /// Peak resident size since the last [`reset_peak`].
    pub peak_kb: u64,
}

pub fn own() -> Mem {
    read("/proc/self/status")
}

pub fn of(pid: u32) -> Mem {
    read(&format!("/proc/{pid}/status"))
}

fn read(path: &str) -> Mem {
    let Ok(text) = std::fs::read_to_string(path) else {
        return Mem::default();
    };
    let field = |name: &str| {
        text.lines()
            .find_map(|l| l.strip_prefix(name))
            .and_then(|rest| {
                rest.trim()
                    .trim_end_matches("kB")
                    .trim()
                    .parse::<u64>()
                    .ok()
            })
            .unwrap_or(0)
    };
    Mem {
        rss_kb: field("VmRSS:"),
        peak_kb: field("VmHWM:"),
    }
}

/// Start measuring the peak afresh (writing 5 to `clear_refs` resets VmHWM to the current size).
pub fn reset_peak() {
    let _ = std::fs::write("/proc/self/clear_refs", "5");
}
