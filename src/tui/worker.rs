//! The worker thread: throw, pattern and layout off the UI thread.
//!
//! A drop trajectory per bin edge, per nozzle (and in wind per azimuth as
//! well) takes milliseconds to tens of milliseconds; the spin solve takes well
//! under one. So the UI thread solves the balance itself on every edit and
//! hands the rest to this thread. Jobs carry an id; when several are queued
//! only the newest is computed (an edit made while one runs makes its result
//! stale), and the UI keeps a result only if its id is the one it asked for
//! last. Results come back on a channel the event loop reads between frames.

use std::sync::mpsc::{self, Receiver, Sender};
use std::thread::JoinHandle;
use std::time::{Duration, Instant};

use crate::physics::balance::SpinReport;
use crate::physics::design::Design;
use crate::physics::hydraulics::Fluids;
use crate::physics::jet::JetExit;
use crate::physics::layout::{overlap, LayoutResult, OverlapOptions};
use crate::physics::pattern::{
    nozzle_paths, radial_pattern, throw_at_rest_and_running, windy_pattern, NozzlePaths,
    PatternGrid, PatternOptions, ThrowComparison, ThrowReport,
};
use crate::physics::torque::jets;
use crate::physics::trajectory::FlightEnv;

/// Points per drawn trajectory.
pub const PATH_SAMPLES: usize = 48;

/// Work for the worker thread.
#[derive(Debug, Clone)]
pub enum Job {
    /// Throw, radial profile, trajectories, 2-D pattern in wind, layout overlap.
    Spray {
        /// Which request this is.
        id: u64,
        /// The design.
        design: Box<Design>,
        /// Its spin solution (the jets at the operating point).
        report: Box<SpinReport>,
    },
    /// The spray results of a scenario shown for comparison.
    Compare {
        /// Which request this is.
        id: u64,
        /// Column in the comparison.
        slot: usize,
        /// The design.
        design: Box<Design>,
        /// Its spin solution.
        report: Box<SpinReport>,
    },
}

/// A finished job.
#[derive(Debug, Clone)]
pub enum Done {
    /// Results of a [`Job::Spray`].
    Spray {
        /// The request's id.
        id: u64,
        /// What was computed.
        result: Box<SprayResult>,
    },
    /// Results of a [`Job::Compare`].
    Compare {
        /// The request's id.
        id: u64,
        /// Column in the comparison.
        slot: usize,
        /// What was computed.
        result: Box<SprayResult>,
    },
}

/// Throw, pattern and layout of one design.
#[derive(Debug, Clone, PartialEq)]
pub struct SprayResult {
    /// Throw and radial profile at the operating point (at rest when stalled).
    pub throw: Result<ThrowReport, String>,
    /// Arm index of each entry of `throw.nozzles` (flowing nozzles only).
    pub arms: Vec<usize>,
    /// Wetted radius at rest against running, when running.
    pub comparison: Option<ThrowComparison>,
    /// Largest, median and small drop paths per flowing nozzle (same order as `arms`).
    pub paths: Vec<Option<NozzlePaths>>,
    /// The 2-D pattern when there is wind.
    pub windy: Option<Result<PatternGrid, String>>,
    /// Overlap on the design's layout, when it has one.
    pub layout: Option<Result<LayoutResult, String>>,
    /// Time the job took.
    pub elapsed: Duration,
}

impl SprayResult {
    /// Wetted radius, m, if the throw was computed.
    pub fn wetted_radius_m(&self) -> Option<f64> {
        self.throw.as_ref().ok().map(|t| t.wetted_radius_m)
    }

    /// CU of the layout, %, if there is one.
    pub fn cu_percent(&self) -> Option<f64> {
        match &self.layout {
            Some(Ok(l)) => Some(l.uniformity.cu_percent),
            _ => None,
        }
    }
}

/// Jets at the state the report describes, with the arm of each.
fn jets_with_arms(design: &Design, report: &SpinReport) -> (Vec<JetExit>, Vec<usize>, f64) {
    let (state, omega) = match &report.operating {
        Some(op) => (&op.point.state, op.omega_rad_s()),
        None => (&report.at_rest, 0.0),
    };
    let arms = state
        .nozzles
        .iter()
        .enumerate()
        .filter(|(_, n)| n.flowing)
        .map(|(k, _)| k)
        .collect();
    (jets(design, state), arms, omega)
}

/// Computes the spray results of one design (what the worker thread runs).
pub fn spray(design: &Design, report: &SpinReport) -> SprayResult {
    let start = Instant::now();
    let fluids = Fluids::for_design(design);
    let env = FlightEnv::new(&fluids.air, &fluids.water, &design.wind);
    let opts = PatternOptions::default();
    let (running, arms, omega) = jets_with_arms(design, report);
    let throw =
        radial_pattern(&running, &design.spray, &env, omega, &opts).map_err(|e| e.to_string());
    let comparison = match (&throw, &report.operating) {
        (Ok(_), Some(_)) => {
            let rest = jets(design, &report.at_rest);
            throw_at_rest_and_running(&rest, &running, &design.spray, &env, &opts).ok()
        }
        _ => None,
    };
    let paths = match &throw {
        Ok(t) => running
            .iter()
            .zip(&t.nozzles)
            .map(|(jet, nt)| {
                nt.as_ref()
                    .and_then(|nt| nozzle_paths(jet, nt, &env, &opts.flight, PATH_SAMPLES).ok())
            })
            .collect(),
        Err(_) => Vec::new(),
    };
    let windy = (design.wind.speed_m_s > 0.0 && throw.is_ok())
        .then(|| windy_pattern(&running, &design.spray, &env, &opts).map_err(|e| e.to_string()));
    let layout = match (&design.layout, &throw) {
        (Some(layout), Ok(t)) => {
            let o = OverlapOptions {
                wetted_radius_m: Some(t.wetted_radius_m).filter(|r| *r > 0.0),
                ..OverlapOptions::default()
            };
            Some(match &windy {
                Some(Ok(grid)) => overlap(layout, grid, &o).map_err(|e| e.to_string()),
                Some(Err(e)) => Err(e.clone()),
                None => overlap(layout, &t.profile, &o).map_err(|e| e.to_string()),
            })
        }
        (Some(_), Err(e)) => Some(Err(e.clone())),
        (None, _) => None,
    };
    SprayResult {
        throw,
        arms,
        comparison,
        paths,
        windy,
        layout,
        elapsed: start.elapsed(),
    }
}

/// The worker thread and its two channels.
#[derive(Debug)]
pub struct Worker {
    jobs: Option<Sender<Job>>,
    done: Receiver<Done>,
    handle: Option<JoinHandle<()>>,
}

impl Worker {
    /// Starts the thread.
    pub fn start() -> Worker {
        let (job_tx, job_rx) = mpsc::channel::<Job>();
        let (done_tx, done_rx) = mpsc::channel::<Done>();
        let handle = std::thread::Builder::new()
            .name("spinwright-worker".into())
            .spawn(move || run(job_rx, done_tx))
            .ok();
        Worker {
            jobs: Some(job_tx),
            done: done_rx,
            handle,
        }
    }

    /// Queues a job; false if the thread is gone.
    pub fn send(&self, job: Job) -> bool {
        self.jobs.as_ref().is_some_and(|tx| tx.send(job).is_ok())
    }

    /// A finished job, if one is waiting.
    pub fn try_recv(&self) -> Option<Done> {
        self.done.try_recv().ok()
    }

    /// Waits up to `timeout` for a finished job.
    pub fn recv_timeout(&self, timeout: Duration) -> Option<Done> {
        self.done.recv_timeout(timeout).ok()
    }
}

impl Drop for Worker {
    fn drop(&mut self) {
        // Closing the job channel ends the thread's loop after its current job.
        self.jobs = None;
        if let Some(h) = self.handle.take() {
            let _ = h.join();
        }
    }
}

fn run(jobs: Receiver<Job>, done: Sender<Done>) {
    while let Ok(first) = jobs.recv() {
        // Only the newest spray job counts; comparison jobs each fill a column.
        let mut queue = vec![first];
        while let Ok(more) = jobs.try_recv() {
            queue.push(more);
        }
        let newest_spray = queue.iter().rposition(|j| matches!(j, Job::Spray { .. }));
        for (i, job) in queue.into_iter().enumerate() {
            let out = match job {
                Job::Spray { id, design, report } => {
                    if Some(i) != newest_spray {
                        continue;
                    }
                    Done::Spray {
                        id,
                        result: Box::new(spray(&design, &report)),
                    }
                }
                Job::Compare {
                    id,
                    slot,
                    design,
                    report,
                } => Done::Compare {
                    id,
                    slot,
                    result: Box::new(spray(&design, &report)),
                },
            };
            if done.send(out).is_err() {
                return;
            }
        }
    }
}
