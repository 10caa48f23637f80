//! One design evaluated for the search: the free values applied, the speed
//! solved, the pattern worked out when CU or spacing is wanted, every goal's
//! shortfall; and the cost function argmin sees.

use std::sync::atomic::{AtomicBool, AtomicUsize, Ordering};
use std::sync::Mutex;

use argmin::core::{CostFunction, Error as ArgminError};

use super::goals::{Evaluation, Free, GoalKind, Goals, Objective, Shortfall};
use crate::catalogue::VaryError;
use crate::inverse::sweep::summarize;
use crate::physics::balance::{solve, solve_speed, SpinReport, SpinStatus};
use crate::physics::coverage::{
    flight_env, head_pattern_in_wind, head_throw, spraying_state, wetted_radius_m,
};
use crate::physics::design::{Design, Layout};
use crate::physics::layout::{overlap, HeadPattern, OverlapOptions, DEFAULT_CELLS_ALONG_ROW};
use crate::physics::pattern::{windy_pattern, PatternGrid, PatternOptions, RadialProfile};

/// Cost per unit of distance (in the unit cube of the ranges) outside the ranges.
const OUTSIDE: f64 = 1e4;
/// Start margin cap used as an objective (a rotor without breakaway torque
/// has no finite margin).
const MARGIN_CAP: f64 = 1e3;

/// Drop-size classes per nozzle of the screening pattern in wind (the full
/// pattern has [`PatternOptions::default`]'s).
const SCREEN_BINS: usize = 12;
/// Azimuths per turn of the screening pattern in wind.
const SCREEN_AZIMUTHS: usize = 24;
/// Grid cells per wetted radius of the screening pattern in wind (the full
/// pattern has about 55: 120 across its larger extent).
const SCREEN_CELLS_PER_RADIUS: f64 = 25.0;
/// Catch cells along a row of the screening overlap in wind (the full
/// overlap has [`DEFAULT_CELLS_ALONG_ROW`]).
const SCREEN_CELLS_ALONG_ROW: usize = 20;

/// How finely a candidate is worked out.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(super) enum Fidelity {
    /// While the optimiser runs: the speed-only solve and, in wind, the
    /// coarse 2-D pattern (fewer drop classes and azimuths, a coarser grid)
    /// placed with the still-air wetted radius found from the outer drops,
    /// overlapped on fewer catch cells.
    Screen,
    /// For every reported figure: the full solve and the pattern exactly as
    /// `solve` and `layout` work it out.
    Full,
}

/// The pattern of one head as the overlap needs it (worked out once per
/// head) and the wetted radius the spacing percentages are read against.
struct Pattern {
    wetted_radius_m: f64,
    shape: Shape,
    /// Catch cells along a row of the overlap.
    cells_along_row: usize,
}

enum Shape {
    /// Calm air: the radial profile.
    Radial(RadialProfile),
    /// Wind: the 2-D pattern.
    Windy(PatternGrid),
}

impl Pattern {
    /// `wetted_radius_m`: the still-air wetted radius already found for the
    /// candidate (the screening pattern in wind is read against it).
    fn new(
        design: &Design,
        report: &SpinReport,
        fidelity: Fidelity,
        wetted_radius_m: f64,
    ) -> Option<Pattern> {
        let windy = design.wind.speed_m_s > 0.0;
        if windy && fidelity == Fidelity::Screen {
            let opts = PatternOptions {
                bins: SCREEN_BINS,
                azimuths: SCREEN_AZIMUTHS,
                // No wetted radius (nothing reaches the threshold): the
                // pattern's own cell size.
                cell_m: (wetted_radius_m > 0.0).then(|| wetted_radius_m / SCREEN_CELLS_PER_RADIUS),
                ..PatternOptions::default()
            };
            let jets = spraying_state(design, report).jets;
            let grid = windy_pattern(&jets, &design.spray, &flight_env(design), &opts).ok()?;
            return Some(Pattern {
                wetted_radius_m,
                shape: Shape::Windy(grid),
                cells_along_row: SCREEN_CELLS_ALONG_ROW,
            });
        }
        // The full model, as `uniformity_on_layout` works it out (in calm air
        // the screen is the full model: the radial profile is cheap).
        let opts = PatternOptions::default();
        let head = head_throw(design, report, &opts, None).ok()?;
        let shape = if windy {
            Shape::Windy(head_pattern_in_wind(design, &head, &opts).ok()?)
        } else {
            Shape::Radial(head.throw.profile)
        };
        Some(Pattern {
            wetted_radius_m: head.throw.wetted_radius_m,
            shape,
            cells_along_row: DEFAULT_CELLS_ALONG_ROW,
        })
    }

    fn cu(&self, layout: &Layout) -> Option<f64> {
        let opts = OverlapOptions {
            wetted_radius_m: Some(self.wetted_radius_m),
            cells_along_row: self.cells_along_row,
        };
        let pattern: &dyn HeadPattern = match &self.shape {
            Shape::Radial(p) => p,
            Shape::Windy(g) => g,
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
        let r = self.wetted_radius_m;
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
pub(super) struct Needs {
    pub(super) layout_cu: bool,
    pub(super) spacing_goal: Option<f64>,
}

/// One search: the design, its free inputs, goals and objective, and every
/// design evaluated so far.
pub(super) struct Problem<'a> {
    pub(super) design: &'a Design,
    pub(super) free: &'a [Free],
    pub(super) goals: Goals,
    pub(super) objective: Objective,
    pub(super) needs: Needs,
    /// How the optimiser's candidates are worked out.
    pub(super) screen: Fidelity,
    pub(super) archive: Mutex<Vec<Evaluation>>,
    pub(super) count: AtomicUsize,
    /// Set by the caller to stop the search; read before every candidate.
    pub(super) stop: &'a AtomicBool,
}

impl Problem<'_> {
    /// Whether the caller has asked the search to stop.
    pub(super) fn stopped(&self) -> bool {
        self.stop.load(Ordering::Relaxed)
    }
}

impl Problem<'_> {
    fn si(&self, u: &[f64]) -> Vec<f64> {
        self.free
            .iter()
            .zip(u)
            .map(|(f, &x)| f.from + (f.to - f.from) * x.clamp(0.0, 1.0))
            .collect()
    }

    pub(super) fn unit(&self, values: &[f64]) -> Vec<f64> {
        self.free
            .iter()
            .zip(values)
            .map(|(f, &v)| ((v - f.from) / (f.to - f.from)).clamp(0.0, 1.0))
            .collect()
    }

    /// Evaluate the design at `values` (SI): screened while the optimiser
    /// runs, with the full model for every reported design.
    pub(super) fn evaluate(&self, values: &[f64], fidelity: Fidelity) -> Evaluation {
        self.count.fetch_add(1, Ordering::Relaxed);
        let mut d = self.design.clone();
        for (f, &v) in self.free.iter().zip(values) {
            if let Err(e) = f.input.vary_to(&mut d, v) {
                return self.invalid(values, e);
            }
        }
        let report = match fidelity {
            Fidelity::Screen => solve_speed(&d),
            Fidelity::Full => solve(&d),
        };
        self.measure(values, &d, &report, fidelity)
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

    fn measure(
        &self,
        values: &[f64],
        d: &Design,
        report: &SpinReport,
        fidelity: Fidelity,
    ) -> Evaluation {
        let (rpm, start_margin, flow) = summarize(report);
        let running = report.status == SpinStatus::Running;
        let wetted = wetted_radius_m(d, report).ok().filter(|r| r.is_finite());
        // CU only when a goal or the objective needs it (or for a reported
        // design with a layout), and only for a rotor that runs.
        let want_cu = self.needs.layout_cu || (fidelity == Fidelity::Full && d.layout.is_some());
        let want_spacing = self.needs.spacing_goal;
        let pattern = match wetted {
            Some(w) if running && (want_cu || want_spacing.is_some()) => {
                Pattern::new(d, report, fidelity, w)
            }
            _ => None,
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
pub(super) struct Cost<'a, 'b> {
    pub(super) problem: &'a Problem<'b>,
}

impl CostFunction for Cost<'_, '_> {
    type Param = Vec<f64>;
    type Output = f64;

    fn cost(&self, u: &Self::Param) -> Result<f64, ArgminError> {
        if self.problem.stopped() {
            // Nothing is solved any more: a flat cost lets Nelder–Mead's
            // spread test end the start within a few cheap iterations
            // (argmin's Nelder–Mead does not take an error from the cost).
            return Ok(0.0);
        }
        let outside: f64 = u
            .iter()
            .map(|&x| (x - x.clamp(0.0, 1.0)).powi(2))
            .sum::<f64>()
            .sqrt();
        let values = self.problem.si(u);
        let e = self.problem.evaluate(&values, self.problem.screen);
        let c = e.cost() + OUTSIDE * outside;
        if let Ok(mut archive) = self.problem.archive.lock() {
            archive.push(e);
        }
        Ok(c)
    }
}
