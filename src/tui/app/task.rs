//! A long question on a thread of its own: the goal of `g` and the design
//! search of `e`. Each runs on a fresh thread (so the worker stays free for
//! the throw and pattern of the design shown), reports how far it has got
//! through two counters, and hands its answer back on a channel that the
//! event loop reads between frames, as the worker's results are.

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::mpsc::{self, Receiver, TryRecvError};
use std::sync::Arc;
use std::time::{Duration, Instant};

/// How far a task has got: steps done out of steps known (0 when unknown),
/// and whether the interface has asked it to stop.
#[derive(Debug, Default)]
pub struct Progress {
    done: AtomicUsize,
    total: AtomicUsize,
    stop: AtomicBool,
}

impl Progress {
    /// Records `done` of `total` steps.
    pub fn set(&self, done: usize, total: usize) {
        self.done.store(done, Ordering::Relaxed);
        self.total.store(total, Ordering::Relaxed);
    }

    /// Asks the task to stop (a task that can stop reads [`Progress::stop_flag`]).
    pub fn ask_to_stop(&self) {
        self.stop.store(true, Ordering::Relaxed);
    }

    /// The flag [`Progress::ask_to_stop`] sets, for the task to read.
    pub fn stop_flag(&self) -> &AtomicBool {
        &self.stop
    }

    /// (done, total) as last recorded.
    pub fn get(&self) -> (usize, usize) {
        (
            self.done.load(Ordering::Relaxed),
            self.total.load(Ordering::Relaxed),
        )
    }
}

/// A task running on its own thread.
#[derive(Debug)]
pub struct Task<T> {
    answer: Receiver<T>,
    /// How far it has got.
    pub progress: Arc<Progress>,
    /// When it was started.
    pub started: Instant,
}

/// What polling a task gives.
#[derive(Debug)]
pub enum Poll<T> {
    /// Still running.
    Running,
    /// The answer.
    Done(T),
    /// The thread ended without an answer (it could not start or it failed).
    Lost,
}

impl<T: Send + 'static> Task<T> {
    /// Runs `work` on a new thread; `work` may report its progress.
    pub fn spawn(name: &str, work: impl FnOnce(&Progress) -> T + Send + 'static) -> Task<T> {
        let (tx, rx) = mpsc::channel();
        let progress = Arc::new(Progress::default());
        let shared = Arc::clone(&progress);
        // A thread that cannot start drops `tx`: the task then polls as Lost.
        let _ = std::thread::Builder::new()
            .name(name.to_string())
            .spawn(move || {
                let answer = work(&shared);
                let _ = tx.send(answer);
            });
        Task {
            answer: rx,
            progress,
            started: Instant::now(),
        }
    }

    /// The answer, if it is in.
    pub fn poll(&self) -> Poll<T> {
        match self.answer.try_recv() {
            Ok(a) => Poll::Done(a),
            Err(TryRecvError::Empty) => Poll::Running,
            Err(TryRecvError::Disconnected) => Poll::Lost,
        }
    }

    /// Waits up to `timeout` for the answer.
    pub fn wait(&self, timeout: Duration) -> Poll<T> {
        match self.answer.recv_timeout(timeout) {
            Ok(a) => Poll::Done(a),
            Err(mpsc::RecvTimeoutError::Timeout) => Poll::Running,
            Err(mpsc::RecvTimeoutError::Disconnected) => Poll::Lost,
        }
    }

    /// Seconds since it started.
    pub fn seconds(&self) -> f64 {
        self.started.elapsed().as_secs_f64()
    }
}
