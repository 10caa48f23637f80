//! The search's vocabulary: free inputs, goals, objective, options, one
//! evaluated design and the finished result, and the check of a request
//! before any design is solved.

use crate::catalogue::{How, Input, VaryError};
use crate::physics::balance::SpinStatus;
use crate::physics::design::Design;

/// Cost offset of a design that misses a goal: above the cost of any design
/// that meets them all (those cost −objective, and no objective reaches it).
pub(super) const PENALTY: f64 = 1e6;

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
    /// Screen the candidates in wind with a coarse 2-D pattern while the
    /// optimiser runs, then re-check the finalists with the full model
    /// (`false`: every candidate with the full model, several times slower in
    /// wind; in calm air the two are the same).
    pub screen: bool,
    /// How many of the best screened candidates (at least a hundredth of a
    /// range apart) are re-checked with the full model; the best of them by
    /// the full model is the answer.
    pub finalists: usize,
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
            screen: true,
            finalists: 8,
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
    /// The caller asked the search to stop before it finished.
    #[error("the search was stopped before it finished")]
    Stopped,
}

fn sets_supply(input: &Input) -> bool {
    matches!(
        input.vary.map(|v| v.how),
        Some(How::SupplyPressure | How::SupplyFlow)
    )
}

pub(super) fn check(
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
