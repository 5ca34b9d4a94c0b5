//! Panic messages with their location, taken from a hook instead of the default output, so a
//! caught panic is reported once, in the finding.

use std::sync::Mutex;

static LAST: Mutex<Option<(String, String)>> = Mutex::new(None);

/// Replace the default hook (which prints) with one that keeps the location and message.
pub fn install_hook() {
    std::panic::set_hook(Box::new(|info| {
        let location = info
            .location()
            .map(|l| format!("{}:{}", repo_path(l.file()), l.line()))
            .unwrap_or_else(|| "unknown location".into());
        let message = message_of(info.payload());
        if let Ok(mut last) = LAST.lock() {
            *last = Some((location, message));
        }
    }));
}

/// A source path as the repository names it: the CLI's report module is compiled into the
/// fuzzer by a relative path (see `lib.rs`).
fn repo_path(file: &str) -> &str {
    file.strip_prefix("tools/fuzz/src/../../../")
        .unwrap_or(file)
}

fn message_of(payload: &(dyn std::any::Any + Send)) -> String {
    if let Some(s) = payload.downcast_ref::<&str>() {
        s.to_string()
    } else if let Some(s) = payload.downcast_ref::<String>() {
        s.clone()
    } else {
        "panic with a non-text payload".into()
    }
}

/// The location and message of the panic just caught.
pub fn take(payload: &Box<dyn std::any::Any + Send>) -> (String, String) {
    let kept = LAST.lock().ok().and_then(|mut l| l.take());
    kept.unwrap_or_else(|| ("unknown location".into(), message_of(payload.as_ref())))
}
