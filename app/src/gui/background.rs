//! Threads for work nobody waits on (writing a backup, freeing an old column), started at a
//! lower priority than the window and the rules worker, so that backing up a long project while
//! the geologist edits does not hold back the column she is looking at.

use std::thread::JoinHandle;

/// The nice value of a background thread (Linux: 0 is normal, 19 the lowest). At 10 such a thread
/// gets about a tenth of a core's time while the window and the rules keep both cores busy
/// (the kernel's scheduler weights, `sched_prio_to_weight`: 110 for nice 10 against 1024 for
/// nice 0), and all of it otherwise: a backup is delayed by a busy moment, never skipped.
pub const BACKGROUND_NICE: i32 = 10;

/// Start `work` on a thread named `name` at the background priority.
pub fn spawn<T: Send + 'static>(
    name: &str,
    work: impl FnOnce() -> T + Send + 'static,
) -> std::io::Result<JoinHandle<T>> {
    std::thread::Builder::new().name(name.into()).spawn(move || {
        lower_this_thread();
        work()
    })
}

/// Lower the calling thread's priority. On Linux the nice value belongs to each thread, and
/// `setpriority(PRIO_PROCESS, 0, …)` sets the calling thread's (setpriority(2), "Bugs"). Other
/// systems keep the thread at normal priority: there the call would lower the whole process.
/// A refusal (a sandbox that forbids it) leaves the thread as it was; the work still gets done.
fn lower_this_thread() {
    #[cfg(target_os = "linux")]
    let _ = rustix::process::setpriority_process(None, BACKGROUND_NICE);
}

#[cfg(test)]
mod tests {
    use super::*;

    #[cfg(target_os = "linux")]
    #[test]
    fn a_background_thread_runs_lower_and_the_caller_stays_as_it_was() {
        let caller = rustix::process::getpriority_process(None).expect("own priority");
        let inside = spawn("aggrade-test-background", || rustix::process::getpriority_process(None))
            .expect("thread starts")
            .join()
            .expect("thread ends")
            .expect("its priority");
        // A thread may only lower itself: starting from nice n it ends at 10, or stays at n
        // when n was lower still (a test run under `nice -n 15`).
        assert_eq!(inside, BACKGROUND_NICE.max(caller), "caller at {caller}");
        assert_eq!(rustix::process::getpriority_process(None).expect("own priority"), caller);
    }

    #[test]
    fn background_work_is_done_and_its_result_returned() {
        let got = spawn("aggrade-test-background", || 6 * 7).expect("thread starts").join();
        assert_eq!(got.ok(), Some(42));
    }
}
