//! After the optimiser: the finalists re-checked with the full model, the
//! runners-up, the goals that bind, how close a missed goal came and the
//! sensitivity of the best design. Every figure made here comes from the full
//! model (model.md M10), whatever the optimiser screened with.

use rayon::prelude::*;

use super::evaluate::{Fidelity, Problem};
use super::goals::{Closest, Evaluation, Free, GoalKind, SearchOptions, Sensitivity};

/// Least distance between two finalists, as a fraction of each range
/// (largest over the free inputs): the optimiser's last steps around one
/// optimum are one finalist, not several.
const FINALIST_GAP: f64 = 0.01;
/// Relative slack under which a met goal counts as binding (2 %).
const BINDING_SLACK: f64 = 0.02;

/// Largest distance between two points of the unit cube along any axis.
fn distance(a: &[f64], b: &[f64]) -> f64 {
    a.iter()
        .zip(b)
        .map(|(x, y)| (x - y).abs())
        .fold(0.0, f64::max)
}

/// Ranks by the feasibility-first cost, lowest first (a stable sort: ties
/// keep their order).
pub(super) fn rank(evaluations: &mut [Evaluation]) {
    evaluations.sort_by(|a, b| a.cost().total_cmp(&b.cost()));
}

/// The best and the runners-up, every one evaluated with the full model.
pub(super) struct Finish {
    /// The best design by the full model.
    pub(super) best: Evaluation,
    /// Runners-up, best first, that differ from the best and each other.
    pub(super) runners_up: Vec<Evaluation>,
    /// Every full-model evaluation made for the two above.
    pub(super) checked: Vec<Evaluation>,
}

/// The finalists and runners-up. `ranked`: every screened candidate, ranked;
/// `fallback`: the values evaluated when there is none.
///
/// Finalists: the first `options.finalists` of the ranking that lie at least
/// [`FINALIST_GAP`] apart, each evaluated with the full model (in parallel)
/// and ranked again by it. Runners-up: the finalists, then the rest of the
/// ranking (each evaluated with the full model when taken), that differ from
/// the best and from each other by more than `options.distinct`; feasible
/// ones only when the best is feasible. Should a runner-up beat the best by
/// the full model, the two change places.
pub(super) fn finish(
    problem: &Problem<'_>,
    ranked: &[Evaluation],
    fallback: &[f64],
    options: &SearchOptions,
) -> Finish {
    let mut picked: Vec<&Evaluation> = Vec::new();
    for candidate in ranked {
        if picked.len() >= options.finalists.max(1) {
            break;
        }
        let u = problem.unit(&candidate.values);
        if picked
            .iter()
            .all(|p| distance(&problem.unit(&p.values), &u) >= FINALIST_GAP)
        {
            picked.push(candidate);
        }
    }
    let mut finalists: Vec<Evaluation> = if picked.is_empty() {
        vec![problem.evaluate(fallback, Fidelity::Full)]
    } else {
        picked
            .par_iter()
            .map(|c| problem.evaluate(&c.values, Fidelity::Full))
            .collect()
    };
    rank(&mut finalists);
    let mut finalists = finalists.into_iter();
    let first = finalists
        .next()
        .unwrap_or_else(|| problem.evaluate(fallback, Fidelity::Full));
    let feasible = first.feasible();
    let mut chosen: Vec<Vec<f64>> = vec![problem.unit(&first.values)];
    let mut set = vec![first];
    let mut checked = Vec::new();
    let distinct =
        |chosen: &[Vec<f64>], u: &[f64]| chosen.iter().all(|c| distance(c, u) > options.distinct);
    for full in finalists {
        let u = problem.unit(&full.values);
        let allowed = full.feasible() || !feasible;
        if set.len() <= options.runners_up && allowed && distinct(&chosen, &u) {
            chosen.push(u);
            set.push(full);
        } else {
            checked.push(full);
        }
    }
    let finalist_values: Vec<&[f64]> = picked.iter().map(|p| p.values.as_slice()).collect();
    for candidate in ranked {
        if set.len() > options.runners_up || (feasible && !candidate.feasible()) {
            break;
        }
        let u = problem.unit(&candidate.values);
        if distinct(&chosen, &u) && !finalist_values.contains(&candidate.values.as_slice()) {
            let full = problem.evaluate(&candidate.values, Fidelity::Full);
            if feasible && !full.feasible() {
                checked.push(full);
                continue;
            }
            chosen.push(u);
            set.push(full);
        }
    }
    rank(&mut set);
    let mut set = set.into_iter();
    let best = set
        .next()
        .unwrap_or_else(|| problem.evaluate(fallback, Fidelity::Full));
    let runners_up: Vec<Evaluation> = set.collect();
    checked.push(best.clone());
    checked.extend(runners_up.iter().cloned());
    Finish {
        best,
        runners_up,
        checked,
    }
}

/// Goals met with less than [`BINDING_SLACK`] to spare (none when the best
/// misses a goal).
pub(super) fn binding(best: &Evaluation) -> Vec<GoalKind> {
    if !best.feasible() {
        return Vec::new();
    }
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
}

/// What `e` gave for `goal`.
fn achieved(e: &Evaluation, goal: GoalKind) -> Option<f64> {
    e.goals
        .iter()
        .find(|x| x.goal == goal)
        .and_then(|x| x.achieved)
}

/// The better of two values for `goal` (the lower for an upper limit).
fn better(goal: GoalKind, a: f64, b: f64) -> f64 {
    match goal {
        GoalKind::RpmHigh | GoalKind::MaxFlow => a.min(b),
        _ => a.max(b),
    }
}

/// For each goal the best design misses, the closest any design came: the
/// screened candidate that came closest is evaluated again with the full
/// model, and set beside every full-model evaluation in `checked`.
pub(super) fn closest(
    problem: &Problem<'_>,
    best: &Evaluation,
    ranked: &[Evaluation],
    checked: &[Evaluation],
) -> Vec<Closest> {
    best.unmet()
        .map(|g| {
            let goal = g.goal;
            let screened = ranked
                .iter()
                .filter(|_| goal != GoalKind::Runs)
                .filter_map(|e| achieved(e, goal).map(|a| (a, e)))
                .reduce(|x, y| if better(goal, x.0, y.0) == y.0 { y } else { x });
            let again = screened.map(|(_, e)| problem.evaluate(&e.values, Fidelity::Full));
            let best_value = checked
                .iter()
                .chain(again.as_ref())
                .filter_map(|e| achieved(e, goal))
                .reduce(|a, b| better(goal, a, b))
                .filter(|_| goal != GoalKind::Runs);
            Closest {
                goal,
                limit: g.limit,
                best: best_value,
            }
        })
        .collect()
}

/// Each free value of the best design moved by ± `perturbation` (of the
/// value, or of the range for a zero value), with the full model.
pub(super) fn sensitivity(
    problem: &Problem<'_>,
    free: &[Free],
    best: &Evaluation,
    perturbation: f64,
) -> Vec<Sensitivity> {
    let steps: Vec<(usize, &Free, f64, f64)> = free
        .iter()
        .enumerate()
        .filter_map(|(i, f)| {
            let value = *best.values.get(i)?;
            let step = if value.abs() > 0.0 {
                perturbation * value.abs()
            } else {
                perturbation * (f.to - f.from)
            };
            Some((i, f, value, step))
        })
        .collect();
    let points: Vec<Vec<f64>> = steps
        .iter()
        .flat_map(|&(i, _, value, step)| {
            [value - step, value + step].map(|v| {
                let mut values = best.values.clone();
                if let Some(x) = values.get_mut(i) {
                    *x = v;
                }
                values
            })
        })
        .collect();
    let mut evaluated = points
        .par_iter()
        .map(|values| problem.evaluate(values, Fidelity::Full))
        .collect::<Vec<_>>()
        .into_iter();
    steps
        .into_iter()
        .filter_map(|(_, f, value, step)| {
            let minus = evaluated.next()?;
            let plus = evaluated.next()?;
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
        .collect()
}
