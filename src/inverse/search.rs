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

mod evaluate;
mod goals;

use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::Mutex;

use argmin::core::{Executor, State};
use argmin::solver::neldermead::NelderMead;
use rayon::prelude::*;

use crate::physics::design::Design;
use evaluate::{Cost, Needs, Problem};
use goals::check;
pub use goals::{
    Closest, Evaluation, Free, GoalKind, Goals, Objective, SearchError, SearchOptions,
    SearchResult, Sensitivity, Shortfall,
};

/// Relative slack under which a met goal counts as binding (2 %).
const BINDING_SLACK: f64 = 0.02;

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
#[path = "search_tests.rs"]
mod tests;
