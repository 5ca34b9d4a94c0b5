//! Nothing in one document may take the server down. The compiler bounds its own recursion
//! (nesting limits, flat operator chains), and an analysis still runs on a thread with a known,
//! generous stack, with a panic caught and turned into a value the caller reports as an
//! internal-error diagnostic of that document while the server keeps serving.

use std::any::Any;
use std::panic::{catch_unwind, AssertUnwindSafe};

/// Stack of an analysis thread. The compiler's depth limits keep a whole analysis well under
/// 1 MB even unoptimised; this margin is for whatever they do not foresee, so a stack overflow
/// (which no handler can catch: it aborts the process) stays out of reach.
pub const ANALYSIS_STACK: usize = 64 * 1024 * 1024;

/// Code of the diagnostic that reports a failed analysis.
pub const INTERNAL_ERROR: &str = "E900";

/// Run `f`, turning a panic into its message.
pub fn guarded<T>(f: impl FnOnce() -> T) -> Result<T, String> {
    // Nothing `f` touched is looked at again after a panic (its partial result is dropped and
    // the shared inputs are read-only), so the unwind cannot expose a broken invariant.
    catch_unwind(AssertUnwindSafe(f)).map_err(|p| panic_message(p.as_ref()))
}

/// Run `f` on a new thread with [`ANALYSIS_STACK`] and wait for it; a panic becomes its
/// message.
pub fn on_analysis_thread<T: Send>(f: impl FnOnce() -> T + Send) -> Result<T, String> {
    std::thread::scope(|scope| {
        let handle = std::thread::Builder::new()
            .name("caloris-analysis".into())
            .stack_size(ANALYSIS_STACK)
            .spawn_scoped(scope, f)
            .map_err(|e| format!("could not start an analysis thread: {e}"))?;
        // A joined thread's panic is returned here, not raised again by the scope.
        handle.join().map_err(|p| panic_message(p.as_ref()))
    })
}

fn panic_message(payload: &(dyn Any + Send)) -> String {
    if let Some(s) = payload.downcast_ref::<&str>() {
        (*s).to_string()
    } else if let Some(s) = payload.downcast_ref::<String>() {
        s.clone()
    } else {
        "a panic without a message".to_string()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_panic_becomes_its_message() {
        assert_eq!(guarded(|| 7), Ok(7));
        let r: Result<(), String> = guarded(|| panic!("the message {}", 42));
        assert_eq!(r, Err("the message 42".to_string()));
        let r: Result<(), String> = on_analysis_thread(|| panic!("on its own thread"));
        assert_eq!(r, Err("on its own thread".to_string()));
    }

    #[test]
    fn the_analysis_thread_has_the_stack_it_promises() {
        // About 16 MB of frames: far more than a test thread's default 2 MB.
        fn deep(n: usize) -> usize {
            let pad = std::hint::black_box([0u8; 1024]);
            if n == 0 {
                pad[0] as usize
            } else {
                deep(n - 1) + std::hint::black_box(pad[n % 1024]) as usize
            }
        }
        assert_eq!(on_analysis_thread(|| deep(16 * 1024)), Ok(0));
    }
}
