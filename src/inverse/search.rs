//! Design search: the values of a few free inputs, each within a range, that
//! meet a set of goals (speed band, least throw, most flow, least start
//! margin, least CU) and make one objective as large as it will go (CU at the
//! layout's spacing, throw, the largest square spacing at a CU goal, or the
//! start margin). model.md M10 gives the method and its rules.
//!
//! Method: multi-start Nelder–Mead (argmin) in the unit cube of the free
//! ranges. Starts are the design's own values (clamped into the ranges) and a
//! Latin hypercube drawn with a fixed seed, so a search is repeatable. The
//! starts run in parallel (rayon). Constraints are ranked feasibility-first:
//! any design that meets every goal ranks above any that does not; among
//! those that meet them, a larger objective ranks higher; among those that do
//! not, a smaller summed relative shortfall ranks higher. The cost handed to
//! Nelder–Mead encodes that ranking (`−objective` when feasible,
//! `PENALTY + shortfall` otherwise), plus a pull back into the ranges for a
//! simplex that steps outside them.
//!
//! Pure: no terminal, no files. Free inputs are catalogue inputs with a
//! [`crate::catalogue::Vary`] rule and take their values through
//! [`Input::vary_to`], as sweeps do (per-arm inputs move all arms together).

use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::Mutex;

use argmin::core::{CostFunction, Error as ArgminError, Executor, State};
use argmin::solver::neldermead::NelderMead;
use rayon::prelude::*;

use crate::catalogue::{How, Input, VaryError};
use crate::inverse::sweep::summarize;
use crate::physics::balance::{solve, solve_speed, SpinReport, SpinStatus};
use crate::physics::coverage::{head_pattern_in_wind, head_throw, wetted_radius_m, HeadThrow};
use crate::physics::design::{Design, Layout};
use crate::physics::layout::{overlap, HeadPattern, OverlapOptions};
use crate::physics::pattern::PatternOptions;

/// Cost offset of a design that misses a goal: above the cost of any design
/// that meets them all (those cost −objective, and no objective reaches it).
const PENALTY: f64 = 1e6;
/// Cost per unit of distance (in the unit cube of the ranges) outside the ranges.
const OUTSIDE: f64 = 1e4;
/// Relative slack under which a met goal counts as binding (2 %).
const BINDING_SLACK: f64 = 0.02;
/// Start margin cap used as an objective (a rotor without breakaway torque
/// has no finite margin).
const MARGIN_CAP: f64 = 1e3;

/// One free input and its range, SI.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Free {
    /// The catalogue input (one with a vary rule).
    pub input: &'static Input,
    /// Lower end of the range, SI.
    pub from: f64,
    /// Upper end of the range, SI (above `from`).
    pub to: f64,
}

/// What the search makes as large as it can.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Objective {
    /// CU at the layout's spacing, % (needs a layout).
    Cu,
    /// Standard wetted radius, m.
    Throw,
    /// The largest square spacing whose CU meets the CU goal, m.
    Spacing,
    /// Start margin (stall over breakaway torque), capped at 1000.
    Margin,
}

impl Objective {
    /// The key in JSON and on the command line.
    pub fn key(self) -> &'static str {
        match self {
            Objective::Cu => "cu",
            Objective::Throw => "throw",
            Objective::Spacing => "spacing",
            Objective::Margin => "margin",
        }
    }
}

/// The goals a design must meet. Every goal is optional except that the
/// rotor must run (a stalled or runaway-free rotor meets nothing).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Goals {
    /// Operating speed band, rpm (low, high).
    pub rpm: Option<(f64, f64)>,
    /// Least standard wetted radius, m.
    pub min_throw_m: Option<f64>,
    /// Most total flow, m³/s.
    pub max_flow_m3_s: Option<f64>,
    /// Least start margin (stall over breakaway torque).
    pub min_margin: Option<f64>,
    /// Least CU at the layout's spacing, % (a goal for the objectives other
    /// than spacing; with [`Objective::Spacing`] it is the CU the spacing must keep).
    pub cu_percent: Option<f64>,
}

/// One goal, for reporting which bind and which are missed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum GoalKind {
    /// The rotor runs (finds an operating speed).
    Runs,
    /// Speed at or above the band's low end.
    RpmLow,
    /// Speed at or below the band's high end.
    RpmHigh,
    /// Wetted radius at or above the least throw.
    MinThrow,
    /// Flow at or below the most flow.
    MaxFlow,
    /// Start margin at or above the least margin.
    MinMargin,
    /// CU at or above the CU goal (at the layout's spacing; with the spacing
    /// objective, at the smallest scanned spacing).
    Cu,
}

impl GoalKind {
    /// The key in JSON.
    pub fn key(self) -> &'static str {
        match self {
            GoalKind::Runs => "runs",
            GoalKind::RpmLow => "rpm_low",
            GoalKind::RpmHigh => "rpm_high",
            GoalKind::MinThrow => "min_throw",
            GoalKind::MaxFlow => "max_flow",
            GoalKind::MinMargin => "min_margin",
            GoalKind::Cu => "cu",
        }
    }
}

/// A goal a design misses: how far, relative to its limit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Shortfall {
    /// Which goal.
    pub goal: GoalKind,
    /// The limit, SI (rpm for the speed band, % for CU; NaN for `Runs`).
    pub limit: f64,
    /// What the design gave, SI (None when it gave nothing to compare).
    pub achieved: Option<f64>,
    /// Relative shortfall (0 when met, 1 for "nothing to compare").
    pub relative: f64,
}

/// How the search options are set.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SearchOptions {
    /// Number of Nelder–Mead starts (the design's own values are one of them).
    pub starts: usize,
    /// Most Nelder–Mead iterations per start.
    pub max_iters: u64,
    /// Seed of the Latin hypercube of starts.
    pub seed: u64,
    /// Smallest distance, as a fraction of each range (largest over the free
    /// inputs), between the best design and a runner-up and between runners-up.
    pub distinct: f64,
    /// How many runners-up to report at most.
    pub runners_up: usize,
    /// The relative step of the sensitivity table (±5 % of each value).
    pub perturbation: f64,
}

impl Default for SearchOptions {
    fn default() -> Self {
        SearchOptions {
            starts: 12,
            max_iters: 80,
            seed: 0x5EED_2026,
            distinct: 0.1,
            runners_up: 3,
            perturbation: 0.05,
        }
    }
}

/// One evaluated design.
#[derive(Debug, Clone, PartialEq)]
pub struct Evaluation {
    /// The free values, SI, in the order of the free inputs.
    pub values: Vec<f64>,
    /// Spin status, or None when the design could not take the values.
    pub status: Option<SpinStatus>,
    /// Why the design could not take the values.
    pub invalid: Option<VaryError>,
    /// Operating speed, rpm.
    pub rpm: Option<f64>,
    /// Standard wetted radius, m.
    pub wetted_radius_m: Option<f64>,
    /// CU at the layout's spacing, % (when needed or when reported).
    pub cu_percent: Option<f64>,
    /// Largest square spacing meeting the CU goal, m (spacing objective).
    pub spacing_m: Option<f64>,
    /// Start margin.
    pub start_margin: Option<f64>,
    /// Total flow, m³/s.
    pub flow_m3_s: Option<f64>,
    /// The objective's value (None when the design cannot give it).
    pub objective: Option<f64>,
    /// Every goal with its shortfall (0 when met).
    pub goals: Vec<Shortfall>,
}

impl Evaluation {
    /// Meets every goal.
    pub fn feasible(&self) -> bool {
        self.invalid.is_none() && self.goals.iter().all(|g| g.relative <= 0.0)
    }

    /// Summed relative shortfall.
    pub fn shortfall(&self) -> f64 {
        self.goals.iter().map(|g| g.relative.max(0.0)).sum()
    }

    /// The feasibility-first ranking cost: lower is better.
    pub fn cost(&self) -> f64 {
        let c = if self.feasible() {
            -self.objective.unwrap_or(0.0)
        } else {
            PENALTY + self.shortfall()
        };
        if c.is_finite() {
            c
        } else {
            PENALTY * 10.0
        }
    }

    /// The goals missed.
    pub fn unmet(&self) -> impl Iterator<Item = &Shortfall> {
        self.goals.iter().filter(|g| g.relative > 0.0)
    }
}

/// One row of the sensitivity table: the best design with one free value
/// moved by ± the perturbation.
#[derive(Debug, Clone, PartialEq)]
pub struct Sensitivity {
    /// The free input.
    pub input: &'static Input,
    /// Its value in the best design, SI.
    pub value: f64,
    /// The step used, SI (the perturbation times the value, or times the
    /// range when the value is zero).
    pub step: f64,
    /// The design with the value lowered by the step.
    pub minus: Evaluation,
    /// The design with the value raised by the step.
    pub plus: Evaluation,
    /// Objective change per SI unit of the value (central difference), when
    /// both sides give an objective.
    pub per_unit: Option<f64>,
}

/// For an unmet goal: the closest any evaluated design came to it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Closest {
    /// Which goal.
    pub goal: GoalKind,
    /// The limit, SI.
    pub limit: f64,
    /// The best value any design gave for it (None: no design gave one).
    pub best: Option<f64>,
}

/// A finished search.
#[derive(Debug, Clone, PartialEq)]
pub struct SearchResult {
    /// The free inputs, as given.
    pub free: Vec<Free>,
    /// The objective.
    pub objective: Objective,
    /// The best design found, checked with the full solve.
    pub best: Evaluation,
    /// The best design itself.
    pub design: Design,
    /// Runners-up that differ from the best and from each other.
    pub runners_up: Vec<Evaluation>,
    /// Goals met with less than 2 % to spare at the best design.
    pub binding: Vec<GoalKind>,
    /// Free inputs whose best value sits at an end of its range.
    pub at_range_end: Vec<&'static Input>,
    /// For a search that met no design: per missed goal of the best design,
    /// the closest any design came.
    pub closest: Vec<Closest>,
    /// ± perturbation of each free value at the best design.
    pub sensitivity: Vec<Sensitivity>,
    /// Designs solved in all.
    pub evaluations: usize,
}

impl SearchResult {
    /// Whether the best design meets every goal.
    pub fn feasible(&self) -> bool {
        self.best.feasible()
    }
}

/// A search that cannot be run as asked.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum SearchError {
    /// No free input.
    #[error("a search needs at least one free input (--free NAME=FROM..TO)")]
    NoFree,
    /// A range that is empty or not finite.
    #[error("`{0}`: the range must run from a lower to a higher value")]
    BadRange(&'static str),
    /// Two free inputs that cannot be free together.
    #[error("`{0}` and `{1}` cannot both be free: {2}")]
    Clash(&'static str, &'static str, &'static str),
    /// An end of a range the design cannot take.
    #[error("free range: {0}")]
    Value(#[from] VaryError),
    /// The objective or a goal needs a layout the design does not have.
    #[error("{0} needs a layout in the scenario")]
    NeedsLayout(&'static str),
    /// A goal that makes no sense (band upside down, non-positive limit).
    #[error("{0}")]
    BadGoal(String),
    /// The optimiser failed.
    #[error("the optimiser stopped: {0}")]
    Optimiser(String),
}

fn sets_supply(input: &Input) -> bool {
    matches!(
        input.vary.map(|v| v.how),
        Some(How::SupplyPressure | How::SupplyFlow)
    )
}

fn check(
    design: &Design,
    free: &[Free],
    goals: &Goals,
    objective: Objective,
) -> Result<(), SearchError> {
    if free.is_empty() {
        return Err(SearchError::NoFree);
    }
    for f in free {
        if !(f.from.is_finite() && f.to.is_finite() && f.to > f.from) {
            return Err(SearchError::BadRange(f.input.vary_name()));
        }
        for v in [f.from, f.to] {
            f.input.vary_to(&mut design.clone(), v)?;
        }
    }
    for (i, a) in free.iter().enumerate() {
        for b in free.iter().skip(i + 1) {
            if a.input == b.input {
                return Err(SearchError::Clash(
                    a.input.vary_name(),
                    b.input.vary_name(),
                    "the same input twice",
                ));
            }
            if sets_supply(a.input) && sets_supply(b.input) {
                return Err(SearchError::Clash(
                    a.input.vary_name(),
                    b.input.vary_name(),
                    "both set the supply; free one",
                ));
            }
        }
    }
    if design.layout.is_none() {
        if objective == Objective::Cu {
            return Err(SearchError::NeedsLayout("the CU objective"));
        }
        if goals.cu_percent.is_some() && objective != Objective::Spacing {
            return Err(SearchError::NeedsLayout("a CU goal"));
        }
    }
    let positive = |v: Option<f64>, what: &str| match v {
        Some(x) if !(x.is_finite() && x > 0.0) => Err(SearchError::BadGoal(format!(
            "{what} must be a number above zero"
        ))),
        _ => Ok(()),
    };
    positive(goals.min_throw_m, "the least throw")?;
    positive(goals.max_flow_m3_s, "the most flow")?;
    positive(goals.min_margin, "the least start margin")?;
    if let Some(cu) = goals.cu_percent {
        if !(cu.is_finite() && cu > 0.0 && cu < 100.0) {
            return Err(SearchError::BadGoal(
                "the CU goal must lie between 0 and 100 %".into(),
            ));
        }
    }
    if let Some((lo, hi)) = goals.rpm {
        if !(lo.is_finite() && hi.is_finite() && lo > 0.0 && hi >= lo) {
            return Err(SearchError::BadGoal(
                "the speed band must run from a low to a higher speed, both above zero".into(),
            ));
        }
    }
    Ok(())
}

/// The pattern of one head as the overlap needs it: the radial profile in
/// calm air, the 2-D pattern in wind (worked out once per head).
enum Pattern {
    Radial(HeadThrow),
    Windy(HeadThrow, crate::physics::pattern::PatternGrid),
}

impl Pattern {
    fn new(design: &Design, report: &SpinReport, opts: &PatternOptions) -> Option<Pattern> {
        let head = head_throw(design, report, opts, None).ok()?;
        if design.wind.speed_m_s > 0.0 {
            let grid = head_pattern_in_wind(design, &head, opts).ok()?;
            Some(Pattern::Windy(head, grid))
        } else {
            Some(Pattern::Radial(head))
        }
    }

    fn head(&self) -> &HeadThrow {
        match self {
            Pattern::Radial(h) | Pattern::Windy(h, _) => h,
        }
    }

    fn cu(&self, layout: &Layout) -> Option<f64> {
        let opts = OverlapOptions {
            wetted_radius_m: Some(self.head().throw.wetted_radius_m),
            ..OverlapOptions::default()
        };
        let pattern: &dyn HeadPattern = match self {
            Pattern::Radial(h) => &h.throw.profile,
            Pattern::Windy(_, g) => g,
        };
        overlap(layout, pattern, &opts)
            .ok()
            .map(|r| r.uniformity.cu_percent)
            .filter(|c| c.is_finite())
    }

    /// The largest square spacing S such that every scanned spacing from the
    /// scan start up to S keeps CU at or above `goal`: scan outward from
    /// 0.3 R in steps of 0.1 R up to 2.2 R (R the wetted radius), then bisect
    /// between the last spacing that met the goal and the first that did not
    /// (CU is not monotone in spacing: a later spacing that meets the goal
    /// again does not count). Returns (spacing, CU at the scan start);
    /// spacing None when even the scan start misses the goal.
    fn largest_spacing(&self, goal: f64) -> (Option<f64>, Option<f64>) {
        let r = self.head().throw.wetted_radius_m;
        if !(r.is_finite() && r > 0.0) {
            return (None, None);
        }
        let cu_at = |s: f64| self.cu(&Layout::Square { spacing_m: s });
        let start = 0.3 * r;
        let first = cu_at(start);
        if first.is_none_or(|c| c < goal) {
            return (None, first);
        }
        let mut good = start;
        let mut bad = None;
        for k in 1..=19 {
            let s = start + 0.1 * r * f64::from(k);
            if cu_at(s).is_some_and(|c| c >= goal) {
                good = s;
            } else {
                bad = Some(s);
                break;
            }
        }
        if let Some(mut bad) = bad {
            for _ in 0..6 {
                let mid = 0.5 * (good + bad);
                if cu_at(mid).is_some_and(|c| c >= goal) {
                    good = mid;
                } else {
                    bad = mid;
                }
            }
        }
        (Some(good), first)
    }
}

/// What the search needs from a design beyond the speed.
#[derive(Debug, Clone, Copy)]
struct Needs {
    layout_cu: bool,
    spacing_goal: Option<f64>,
}

struct Problem<'a> {
    design: &'a Design,
    free: &'a [Free],
    goals: Goals,
    objective: Objective,
    needs: Needs,
    archive: Mutex<Vec<Evaluation>>,
    count: AtomicUsize,
}

impl Problem<'_> {
    fn si(&self, u: &[f64]) -> Vec<f64> {
        self.free
            .iter()
            .zip(u)
            .map(|(f, &x)| f.from + (f.to - f.from) * x.clamp(0.0, 1.0))
            .collect()
    }

    fn unit(&self, values: &[f64]) -> Vec<f64> {
        self.free
            .iter()
            .zip(values)
            .map(|(f, &v)| ((v - f.from) / (f.to - f.from)).clamp(0.0, 1.0))
            .collect()
    }

    /// Evaluate the design at `values` (SI): with the fast speed solve in the
    /// search, the full solve for the reported designs.
    fn evaluate(&self, values: &[f64], full: bool) -> Evaluation {
        self.count.fetch_add(1, Ordering::Relaxed);
        let mut d = self.design.clone();
        for (f, &v) in self.free.iter().zip(values) {
            if let Err(e) = f.input.vary_to(&mut d, v) {
                return self.invalid(values, e);
            }
        }
        let report = if full { solve(&d) } else { solve_speed(&d) };
        self.measure(values, &d, &report, full)
    }

    fn invalid(&self, values: &[f64], e: VaryError) -> Evaluation {
        Evaluation {
            values: values.to_vec(),
            status: None,
            invalid: Some(e),
            rpm: None,
            wetted_radius_m: None,
            cu_percent: None,
            spacing_m: None,
            start_margin: None,
            flow_m3_s: None,
            objective: None,
            goals: vec![Shortfall {
                goal: GoalKind::Runs,
                limit: f64::NAN,
                achieved: None,
                relative: 2.0,
            }],
        }
    }

    fn measure(&self, values: &[f64], d: &Design, report: &SpinReport, full: bool) -> Evaluation {
        let (rpm, start_margin, flow) = summarize(report);
        let running = report.status == SpinStatus::Running;
        let wetted = wetted_radius_m(d, report).ok().filter(|r| r.is_finite());
        // CU only when a goal or the objective needs it (or for a reported
        // design with a layout), and only for a rotor that runs.
        let want_cu = self.needs.layout_cu || (full && d.layout.is_some());
        let want_spacing = self.needs.spacing_goal;
        let pattern = if running && (want_cu || want_spacing.is_some()) {
            Pattern::new(d, report, &PatternOptions::default())
        } else {
            None
        };
        let cu = match (&pattern, d.layout, want_cu) {
            (Some(p), Some(layout), true) => p.cu(&layout),
            _ => None,
        };
        let (spacing, cu_start) = match (&pattern, want_spacing) {
            (Some(p), Some(goal)) => p.largest_spacing(goal),
            _ => (None, None),
        };
        let objective = match self.objective {
            Objective::Cu => cu,
            Objective::Throw => wetted,
            Objective::Spacing => spacing.or(Some(0.0)).filter(|_| running),
            Objective::Margin => Some(start_margin.map_or(MARGIN_CAP, |m| m.min(MARGIN_CAP))),
        };
        let mut goals = vec![Shortfall {
            goal: GoalKind::Runs,
            limit: f64::NAN,
            achieved: None,
            relative: if running { 0.0 } else { 1.0 },
        }];
        let below = |achieved: Option<f64>, limit: f64| {
            achieved.map_or(1.0, |a| ((limit - a) / limit).max(0.0))
        };
        let above = |achieved: Option<f64>, limit: f64| {
            achieved.map_or(1.0, |a| ((a - limit) / limit).max(0.0))
        };
        if let Some((lo, hi)) = self.goals.rpm {
            let r = rpm.filter(|_| running);
            goals.push(Shortfall {
                goal: GoalKind::RpmLow,
                limit: lo,
                achieved: r,
                relative: below(r, lo),
            });
            goals.push(Shortfall {
                goal: GoalKind::RpmHigh,
                limit: hi,
                achieved: r,
                relative: above(r, hi),
            });
        }
        if let Some(l) = self.goals.min_throw_m {
            goals.push(Shortfall {
                goal: GoalKind::MinThrow,
                limit: l,
                achieved: wetted,
                relative: below(wetted, l),
            });
        }
        if let Some(q) = self.goals.max_flow_m3_s {
            goals.push(Shortfall {
                goal: GoalKind::MaxFlow,
                limit: q,
                achieved: flow,
                relative: above(flow, q),
            });
        }
        if let Some(m) = self.goals.min_margin {
            // No breakaway torque: any stall torque starts the rotor.
            let margin = start_margin.or(Some(f64::INFINITY));
            goals.push(Shortfall {
                goal: GoalKind::MinMargin,
                limit: m,
                achieved: start_margin,
                relative: below(margin, m),
            });
        }
        if let Some(c) = self.goals.cu_percent {
            let achieved = if self.objective == Objective::Spacing {
                cu_start
            } else {
                cu
            };
            goals.push(Shortfall {
                goal: GoalKind::Cu,
                limit: c,
                achieved,
                relative: below(achieved, c),
            });
        }
        Evaluation {
            values: values.to_vec(),
            status: Some(report.status),
            invalid: None,
            rpm: rpm.filter(|_| running),
            wetted_radius_m: wetted,
            cu_percent: cu,
            spacing_m: spacing,
            start_margin,
            flow_m3_s: flow,
            objective,
            goals,
        }
    }
}

/// The cost function argmin sees: the unit cube of the ranges.
struct Cost<'a, 'b> {
    problem: &'a Problem<'b>,
}

impl CostFunction for Cost<'_, '_> {
    type Param = Vec<f64>;
    type Output = f64;

    fn cost(&self, u: &Self::Param) -> Result<f64, ArgminError> {
        let outside: f64 = u
            .iter()
            .map(|&x| (x - x.clamp(0.0, 1.0)).powi(2))
            .sum::<f64>()
            .sqrt();
        let values = self.problem.si(u);
        let e = self.problem.evaluate(&values, false);
        let c = e.cost() + OUTSIDE * outside;
        if let Ok(mut archive) = self.problem.archive.lock() {
            archive.push(e);
        }
        Ok(c)
    }
}

/// A small deterministic generator (SplitMix64) for the Latin hypercube.
struct SplitMix(u64);

impl SplitMix {
    fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in [0, 1).
    fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 / (1u64 << 53) as f64
    }

    fn below(&mut self, n: usize) -> usize {
        (self.unit() * n as f64) as usize % n.max(1)
    }
}

/// `count` points of a Latin hypercube in `[0, 1)^dims`: each axis cut into
/// `count` equal strata, each stratum used once per axis.
pub fn latin_hypercube(count: usize, dims: usize, seed: u64) -> Vec<Vec<f64>> {
    let mut rng = SplitMix(seed);
    let mut points = vec![vec![0.0; dims]; count];
    for axis in 0..dims {
        let mut strata: Vec<usize> = (0..count).collect();
        // Fisher–Yates shuffle.
        for i in (1..count).rev() {
            let j = rng.below(i + 1);
            strata.swap(i, j);
        }
        for (point, stratum) in points.iter_mut().zip(strata) {
            if let Some(x) = point.get_mut(axis) {
                *x = (stratum as f64 + rng.unit()) / count as f64;
            }
        }
    }
    points
}

/// A starting simplex around `u0`: each axis stepped by 0.2 of its range
/// (inward when the step would leave the range).
fn simplex(u0: &[f64]) -> Vec<Vec<f64>> {
    let mut s = vec![u0.to_vec()];
    for i in 0..u0.len() {
        let mut v = u0.to_vec();
        if let Some(x) = v.get_mut(i) {
            *x = if *x + 0.2 <= 1.0 { *x + 0.2 } else { *x - 0.2 };
        }
        s.push(v);
    }
    s
}

fn run_start(problem: &Problem<'_>, u0: Vec<f64>, max_iters: u64) -> Result<(), SearchError> {
    let solver = NelderMead::new(simplex(&u0))
        .with_sd_tolerance(1e-4)
        .map_err(|e| SearchError::Optimiser(e.to_string()))?;
    let result = Executor::new(Cost { problem }, solver)
        .configure(|state| state.max_iters(max_iters))
        .run()
        .map_err(|e| SearchError::Optimiser(e.to_string()))?;
    // The best point is in the archive already; the state is read only to
    // make sure argmin ended with one.
    let _ = result.state().get_best_param();
    Ok(())
}

/// Largest distance between two points of the unit cube along any axis.
fn distance(a: &[f64], b: &[f64]) -> f64 {
    a.iter()
        .zip(b)
        .map(|(x, y)| (x - y).abs())
        .fold(0.0, f64::max)
}

/// Run a design search. `progress(done, total)` is called after each start
/// finishes (and once more after the sensitivity table), from any worker.
pub fn search(
    design: &Design,
    free: &[Free],
    goals: &Goals,
    objective: Objective,
    options: &SearchOptions,
    progress: &(dyn Fn(usize, usize) + Sync),
) -> Result<SearchResult, SearchError> {
    let mut goals = *goals;
    if objective == Objective::Spacing && goals.cu_percent.is_none() {
        goals.cu_percent = Some(85.0);
    }
    check(design, free, &goals, objective)?;
    let needs = Needs {
        layout_cu: objective == Objective::Cu
            || (goals.cu_percent.is_some() && objective != Objective::Spacing),
        spacing_goal: (objective == Objective::Spacing)
            .then_some(goals.cu_percent)
            .flatten(),
    };
    let problem = Problem {
        design,
        free,
        goals,
        objective,
        needs,
        archive: Mutex::new(Vec::new()),
        count: AtomicUsize::new(0),
    };
    // Starts: the design's own values (clamped into the ranges), then a
    // Latin hypercube.
    let own: Vec<f64> = free
        .iter()
        .map(|f| {
            f.input
                .varied_value(design)
                .unwrap_or(0.5 * (f.from + f.to))
        })
        .collect();
    let mut starts = vec![problem.unit(&own)];
    starts.extend(latin_hypercube(
        options.starts.saturating_sub(1),
        free.len(),
        options.seed,
    ));
    let total = starts.len() + 1;
    let done = AtomicUsize::new(0);
    starts
        .into_par_iter()
        .map(|u0| {
            let r = run_start(&problem, u0, options.max_iters);
            progress(done.fetch_add(1, Ordering::Relaxed) + 1, total);
            r
        })
        .collect::<Result<Vec<()>, SearchError>>()?;
    let mut archive = problem
        .archive
        .lock()
        .map(|mut a| std::mem::take(&mut *a))
        .unwrap_or_default();
    archive.sort_by(|a, b| a.cost().total_cmp(&b.cost()));

    // The best: the first of the ranking that the full solve confirms
    // (the fast and full solves find the same operating point; this guards
    // the report against any difference).
    let mut best = None;
    for candidate in archive.iter().take(20) {
        let full = problem.evaluate(&candidate.values, true);
        if full.feasible() == candidate.feasible() {
            best = Some(full);
            break;
        }
    }
    let best = match best {
        Some(b) => b,
        None => match archive.first() {
            Some(first) => problem.evaluate(&first.values, true),
            None => problem.evaluate(&own, true),
        },
    };
    let best_u = problem.unit(&best.values);

    // Runners-up: the next in the ranking that differ from the best and from
    // each other by more than `distinct` of a range; feasible ones only when
    // the best is feasible.
    let mut chosen: Vec<Vec<f64>> = vec![best_u.clone()];
    let mut runners_up = Vec::new();
    for candidate in &archive {
        if runners_up.len() >= options.runners_up {
            break;
        }
        if best.feasible() && !candidate.feasible() {
            break;
        }
        let u = problem.unit(&candidate.values);
        if chosen.iter().all(|c| distance(c, &u) > options.distinct) {
            let full = problem.evaluate(&candidate.values, true);
            if best.feasible() && !full.feasible() {
                continue;
            }
            chosen.push(u);
            runners_up.push(full);
        }
    }

    // Goals that bind at the best design.
    let binding = if best.feasible() {
        best.goals
            .iter()
            .filter(|g| g.goal != GoalKind::Runs)
            .filter(|g| {
                g.achieved.is_some_and(|a| {
                    let slack = match g.goal {
                        GoalKind::RpmHigh | GoalKind::MaxFlow => (g.limit - a) / g.limit,
                        _ => (a - g.limit) / g.limit,
                    };
                    slack < BINDING_SLACK
                })
            })
            .map(|g| g.goal)
            .collect()
    } else {
        Vec::new()
    };
    let at_range_end = free
        .iter()
        .zip(&best_u)
        .filter(|(_, &u)| !(0.005..=0.995).contains(&u))
        .map(|(f, _)| f.input)
        .collect();

    // How close the search came to each missed goal.
    let closest = best
        .unmet()
        .map(|g| {
            let values = archive.iter().flat_map(|e| {
                e.goals
                    .iter()
                    .filter(|x| x.goal == g.goal)
                    .filter_map(|x| x.achieved)
            });
            let best_value = match g.goal {
                GoalKind::RpmHigh | GoalKind::MaxFlow => values.reduce(f64::min),
                GoalKind::Runs => None,
                _ => values.reduce(f64::max),
            };
            Closest {
                goal: g.goal,
                limit: g.limit,
                best: best_value,
            }
        })
        .collect();

    // Sensitivity: each free value moved by ± the perturbation.
    let sensitivity = free
        .iter()
        .enumerate()
        .filter_map(|(i, f)| {
            let value = *best.values.get(i)?;
            let step = if value.abs() > 0.0 {
                options.perturbation * value.abs()
            } else {
                options.perturbation * (f.to - f.from)
            };
            let at = |v: f64| {
                let mut values = best.values.clone();
                if let Some(x) = values.get_mut(i) {
                    *x = v;
                }
                problem.evaluate(&values, false)
            };
            let minus = at(value - step);
            let plus = at(value + step);
            let per_unit = match (minus.objective, plus.objective) {
                (Some(a), Some(b)) if step > 0.0 => Some((b - a) / (2.0 * step)),
                _ => None,
            };
            Some(Sensitivity {
                input: f.input,
                value,
                step,
                minus,
                plus,
                per_unit,
            })
        })
        .collect();
    progress(total, total);

    let mut best_design = design.clone();
    for (f, &v) in free.iter().zip(&best.values) {
        f.input.vary_to(&mut best_design, v)?;
    }
    Ok(SearchResult {
        free: free.to_vec(),
        objective,
        best,
        design: best_design,
        runners_up,
        binding,
        at_range_end,
        closest,
        sensitivity,
        evaluations: problem.count.load(Ordering::Relaxed),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::{DEFLECTION, INLET_PRESSURE, NOZZLE_DIAMETER};
    use crate::physics::balance::rpm;
    use crate::physics::fixtures::three_arm_rotor;

    fn quick() -> SearchOptions {
        SearchOptions {
            starts: 4,
            max_iters: 25,
            ..SearchOptions::default()
        }
    }

    #[test]
    fn latin_hypercube_uses_each_stratum_once_per_axis() {
        let pts = latin_hypercube(8, 3, 7);
        assert_eq!(pts.len(), 8);
        for axis in 0..3 {
            let mut strata: Vec<usize> = pts.iter().map(|p| (p[axis] * 8.0) as usize).collect();
            strata.sort_unstable();
            assert_eq!(strata, (0..8).collect::<Vec<_>>());
        }
        assert_eq!(pts, latin_hypercube(8, 3, 7), "same seed, same starts");
    }

    #[test]
    fn bad_requests_are_errors() {
        let d = three_arm_rotor();
        let none = |_: usize, _: usize| {};
        let g = Goals::default();
        let o = quick();
        assert_eq!(
            search(&d, &[], &g, Objective::Throw, &o, &none).unwrap_err(),
            SearchError::NoFree
        );
        let f = Free {
            input: &DEFLECTION,
            from: 0.5,
            to: 0.1,
        };
        assert!(matches!(
            search(&d, &[f], &g, Objective::Throw, &o, &none),
            Err(SearchError::BadRange(_))
        ));
        let f = Free {
            input: &DEFLECTION,
            from: 0.1,
            to: 0.5,
        };
        assert!(matches!(
            search(&d, &[f, f], &g, Objective::Throw, &o, &none),
            Err(SearchError::Clash(..))
        ));
        let mut no_layout = d.clone();
        no_layout.layout = None;
        assert!(matches!(
            search(&no_layout, &[f], &g, Objective::Cu, &o, &none),
            Err(SearchError::NeedsLayout(_))
        ));
    }

    #[test]
    fn a_speed_band_and_throw_are_met_and_checked_with_the_full_solve() {
        let d = three_arm_rotor();
        let free = [
            Free {
                input: &DEFLECTION,
                from: 20f64.to_radians(),
                to: 80f64.to_radians(),
            },
            Free {
                input: &INLET_PRESSURE,
                from: 150e3,
                to: 400e3,
            },
        ];
        let goals = Goals {
            rpm: Some((25.0, 35.0)),
            ..Goals::default()
        };
        let r = search(&d, &free, &goals, Objective::Throw, &quick(), &|_, _| {}).unwrap();
        assert!(r.feasible(), "{:?}", r.best);
        let report = solve(&r.design);
        let got = rpm(report.operating.as_ref().unwrap().omega_rad_s());
        assert!((25.0..=35.0).contains(&got), "{got}");
        assert!(r.evaluations > 20);
        for ru in &r.runners_up {
            assert!(ru.feasible());
            assert!(ru.objective.unwrap() <= r.best.objective.unwrap() + 1e-9);
        }
        assert_eq!(r.sensitivity.len(), 2);
    }

    #[test]
    fn an_impossible_goal_is_reported_with_how_close_it_came() {
        let d = three_arm_rotor();
        let free = [Free {
            input: &NOZZLE_DIAMETER,
            from: 1.5e-3,
            to: 3e-3,
        }];
        let goals = Goals {
            min_throw_m: Some(500.0),
            ..Goals::default()
        };
        let r = search(&d, &free, &goals, Objective::Margin, &quick(), &|_, _| {}).unwrap();
        assert!(!r.feasible());
        let c = r
            .closest
            .iter()
            .find(|c| c.goal == GoalKind::MinThrow)
            .unwrap();
        assert!(c.best.unwrap() > 1.0 && c.best.unwrap() < 500.0, "{c:?}");
    }
}
