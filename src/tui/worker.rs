//! The worker thread: throw, pattern and layout off the UI thread.
//!
//! A drop trajectory per bin edge, per nozzle (and in wind per azimuth as
//! well) takes milliseconds to tens of milliseconds; the spin solve takes well
//! under one. So the UI thread solves the balance itself on every edit and
//! hands the rest to this thread. Jobs carry an id; when several are queued
//! only the newest is computed (an edit made while one runs makes its result
//! stale), and the UI keeps a result only if its id is the one it asked for
//! last. Results come back on a channel the event loop reads between frames.
//! The same thread runs the comparison of pinned designs, field checks, the
//! fit over several readings and the coast-down fit.

use std::sync::mpsc::{self, Receiver, Sender};
use std::thread::JoinHandle;
use std::time::{Duration, Instant};

use crate::inverse::coast::{fit_coast, CoastData, CoastResult};
use crate::inverse::compare::{compare_with_coverage, Comparison};
use crate::inverse::field::{check, FieldCheck, FieldReading, FieldTolerances};
use crate::inverse::fit::{fit, FitResult, SpeedReading};
use crate::physics::balance::{solve, SpinReport};
use crate::physics::coverage::{flight_env, head_throw, layout_overlap, wetted_radius_m};
use crate::physics::design::Design;
use crate::physics::layout::{LayoutResult, OverlapOptions};
use crate::physics::pattern::{
    nozzle_paths, NozzlePaths, PatternOptions, ThrowComparison, ThrowReport,
};

/// Points per drawn trajectory.
pub const PATH_SAMPLES: usize = 48;

/// Work for the worker thread.
#[derive(Debug, Clone)]
pub enum Job {
    /// Throw, radial profile, trajectories, layout overlap (2-D pattern in wind).
    Spray {
        /// Which request this is.
        id: u64,
        /// The design.
        design: Box<Design>,
        /// Its spin solution (the jets at the operating point).
        report: Box<SpinReport>,
    },
    /// Pinned and saved designs against the current one.
    Compare {
        /// Which request this is.
        id: u64,
        /// Column names and designs; the first is the baseline of the deltas.
        designs: Vec<(String, Design)>,
    },
    /// A field check of the design against readings.
    Field {
        /// Which request this is.
        id: u64,
        /// The design.
        design: Box<Design>,
        /// The readings.
        reading: FieldReading,
    },
    /// The running friction and brake fitted to several readings.
    Fit {
        /// Which request this is.
        id: u64,
        /// The design.
        design: Box<Design>,
        /// The readings, one per pressure.
        readings: Vec<SpeedReading>,
    },
    /// The dry friction and brake fitted to a coast-down.
    Coast {
        /// Which request this is.
        id: u64,
        /// The design (for its inertia and air drag).
        design: Box<Design>,
        /// Times of completed turns after the water was shut off, s.
        turn_times_s: Vec<f64>,
    },
}

impl Job {
    fn kind(&self) -> u8 {
        match self {
            Job::Spray { .. } => 0,
            Job::Compare { .. } => 1,
            Job::Field { .. } => 2,
            Job::Fit { .. } => 3,
            Job::Coast { .. } => 4,
        }
    }
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
        /// The comparison, or why there is none.
        result: Box<Result<Comparison, String>>,
    },
    /// Results of a [`Job::Field`].
    Field {
        /// The request's id.
        id: u64,
        /// The check, or why the readings cannot be used.
        result: Box<Result<FieldCheck, String>>,
    },
    /// Results of a [`Job::Fit`].
    Fit {
        /// The request's id.
        id: u64,
        /// The fit, or why there is none.
        result: Box<Result<FitResult, String>>,
    },
    /// Results of a [`Job::Coast`].
    Coast {
        /// The request's id.
        id: u64,
        /// The fit, or why there is none.
        result: Box<Result<CoastResult, String>>,
    },
}

/// Throw, pattern and layout of one design.
#[derive(Debug, Clone, PartialEq)]
pub struct SprayResult {
    /// Throw and radial profile at the operating point (at rest when not turning).
    pub throw: Result<ThrowReport, String>,
    /// Arm index of each entry of `throw.nozzles` (flowing nozzles only).
    pub arms: Vec<usize>,
    /// Wetted radius at rest against at speed.
    pub comparison: Option<ThrowComparison>,
    /// Largest, median and small drop paths per flowing nozzle (same order as `arms`).
    pub paths: Vec<Option<NozzlePaths>>,
    /// Overlap on the design's layout (from the 2-D pattern in wind), when it has one.
    pub layout: Option<Result<LayoutResult, String>>,
    /// The largest spacing of the layout's own pattern (its row-to-head
    /// ratio kept) with CU at least [`RECOMMEND_CU_PERCENT`], in the design's
    /// wind (model.md M9); `None` without a layout or when none meets it.
    pub recommended: Option<LayoutResult>,
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

/// The CU goal of the spacing the Pattern view recommends, % (common practice
/// for sprinkler layouts: 85 %).
pub const RECOMMEND_CU_PERCENT: f64 = 85.0;

/// The recommended spacing of `layout`'s pattern for the Pattern view.
fn recommended_for(
    design: &Design,
    head: &crate::physics::coverage::HeadThrow,
    layout: &crate::physics::design::Layout,
    opts: &PatternOptions,
) -> Option<LayoutResult> {
    use crate::physics::design::Layout as L;
    use crate::physics::layout::{PatternFamily, RowRule, SpacingGoal};
    let family = match *layout {
        L::Square { .. } => PatternFamily::Square,
        L::Rectangle { spacing_m, rows_m } => {
            PatternFamily::Rectangle(RowRule::Ratio(rows_m / spacing_m))
        }
        L::Triangle { .. } => PatternFamily::Triangle,
    };
    let recs = crate::physics::coverage::recommend_spacings(
        design,
        head,
        &[family],
        SpacingGoal::Cu(RECOMMEND_CU_PERCENT),
        opts,
        &OverlapOptions::default(),
    )
    .ok()?;
    // In wind the last entry is the windy one, as the layout shown.
    recs.into_iter().last().and_then(|r| r.result)
}

/// Computes the spray results of one design (what the worker thread runs),
/// through the same coverage path as the `throw` and `layout` commands.
pub fn spray(design: &Design, report: &SpinReport) -> SprayResult {
    let start = Instant::now();
    let opts = PatternOptions::default();
    let state = report.described_state();
    let arms: Vec<usize> = state
        .nozzles
        .iter()
        .enumerate()
        .filter(|(_, n)| n.flowing)
        .map(|(k, _)| k)
        .collect();
    let head = head_throw(design, report, &opts, None).map_err(|e| e.to_string());
    let env = flight_env(design);
    let (throw, comparison, paths, layout, recommended) = match &head {
        Ok(h) => {
            let paths = h
                .spraying
                .jets
                .iter()
                .zip(&h.throw.nozzles)
                .map(|(jet, nt)| {
                    nt.as_ref().and_then(|nt| {
                        nozzle_paths(jet, nt, &design.spray, &env, &opts.flight, PATH_SAMPLES).ok()
                    })
                })
                .collect();
            let layout = design.layout.map(|l| {
                layout_overlap(design, h, &l, &opts, &OverlapOptions::default())
                    .map_err(|e| e.to_string())
            });
            let recommended = design
                .layout
                .and_then(|l| recommended_for(design, h, &l, &opts));
            (
                Ok(h.throw.clone()),
                h.spraying.running.then_some(h.rest_vs_running),
                paths,
                layout,
                recommended,
            )
        }
        Err(e) => (
            Err(e.clone()),
            None,
            Vec::new(),
            design.layout.map(|_| Err(e.clone())),
            None,
        ),
    };
    SprayResult {
        throw,
        arms,
        comparison,
        paths,
        layout,
        recommended,
        elapsed: start.elapsed(),
    }
}

/// The comparison of named designs with throw, CU and DU_lq as extra results.
pub fn comparison(designs: &[(String, Design)]) -> Result<Comparison, String> {
    let pairs: Vec<(&str, &Design)> = designs.iter().map(|(n, d)| (n.as_str(), d)).collect();
    compare_with_coverage(&pairs).map_err(|e| e.to_string())
}

/// The field check of a design, with the throw model when a throw was measured.
pub fn field_check(design: &Design, reading: &FieldReading) -> Result<FieldCheck, String> {
    let throw = |d: &Design| wetted_radius_m(d, &solve(d)).ok();
    check(design, reading, &FieldTolerances::default(), Some(&throw)).map_err(|e| e.to_string())
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
        // Of each kind only the newest job counts: an older one is stale.
        let mut queue = vec![first];
        while let Ok(more) = jobs.try_recv() {
            queue.push(more);
        }
        let newest = |kind: u8| queue.iter().rposition(|j| j.kind() == kind);
        let keep: Vec<usize> = (0..5).filter_map(newest).collect();
        for (i, job) in queue.into_iter().enumerate() {
            if !keep.contains(&i) {
                continue;
            }
            let out = match job {
                Job::Spray { id, design, report } => Done::Spray {
                    id,
                    result: Box::new(spray(&design, &report)),
                },
                Job::Compare { id, designs } => Done::Compare {
                    id,
                    result: Box::new(comparison(&designs)),
                },
                Job::Field {
                    id,
                    design,
                    reading,
                } => Done::Field {
                    id,
                    result: Box::new(field_check(&design, &reading)),
                },
                Job::Fit {
                    id,
                    design,
                    readings,
                } => Done::Fit {
                    id,
                    result: Box::new(fit(&design, &readings, None).map_err(|e| e.to_string())),
                },
                Job::Coast {
                    id,
                    design,
                    turn_times_s,
                } => Done::Coast {
                    id,
                    result: Box::new(
                        fit_coast(&design, &CoastData::TurnTimes(turn_times_s), None)
                            .map_err(|e| e.to_string()),
                    ),
                },
            };
            if done.send(out).is_err() {
                return;
            }
        }
    }
}
