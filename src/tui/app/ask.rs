//! "Which value gives this?" on the selected input (`g`): the user types a
//! goal, a speed (`30rpm`) or a wetted radius (`11m`, `36ft`), and the
//! target search of the `target` command ([`crate::inverse::target`]) finds
//! the value nearest the present one that meets it, on a thread of its own.
//! The answer is kept as an ordinary edit (through [`App::apply`], so `z`
//! takes it back); a goal out of reach leaves the design as it was and says
//! what the nearest reachable value gives.
//!
//! The state of these questions, and of the design search of `e` (see
//! [`super::search_form`]), lives in [`Ask`].

use super::search_form::{Found, SearchForm, SearchJob};
use super::task::{Poll, Task};
use super::{App, InputTarget, Mode};
use crate::catalogue::{self, Input};
use crate::inverse::target::{target, Goal, TargetError, TargetResult};
use crate::physics::balance::{rpm, solve};
use crate::physics::coverage::wetted_radius_m;
use crate::physics::design::Design;
use crate::tui::fields::{Field, Kind};
use crate::units::{self, format_quantity, Dimension as D, UnitSystem};

/// What a goal asks for.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Want {
    /// An operating speed, rpm.
    Rpm(f64),
    /// A standard wetted radius, m.
    Throw(f64),
}

/// A goal search's answer: the search, and the wetted radius of the design
/// it found (m, None when it gives no throw).
pub type GoalAnswer = Result<(TargetResult, Option<f64>), TargetError>;

/// A goal being worked out.
#[derive(Debug)]
pub struct GoalJob {
    /// The search.
    pub task: Task<GoalAnswer>,
    /// The input adjusted.
    pub field: Field,
    /// The goal.
    pub want: Want,
    /// The design as it was when asked (an answer to another design is not applied).
    pub base: Design,
}

/// The questions asked of the design: goals and design searches.
#[derive(Debug, Default)]
pub struct Ask {
    /// The goal being worked out, if any.
    pub goal: Option<GoalJob>,
    /// Inputs marked free for a design search (`m`), in the order marked.
    pub marked: Vec<&'static Input>,
    /// The design search running, if any.
    pub search: Option<SearchJob>,
    /// The designs the last search found.
    pub found: Option<Found>,
    /// The form as last filled in (offered again by `e`).
    pub last_form: Option<SearchForm>,
    /// Searches run so far (numbers the pins' labels).
    pub runs: usize,
}

impl Ask {
    /// True while a goal or a search is being worked out.
    pub fn busy(&self) -> bool {
        self.goal.is_some() || self.search.is_some()
    }
}

/// The wetted radius of a design, m (what a throw goal aims at, as the
/// `target` command measures it).
pub fn throw_of(design: &Design) -> Option<f64> {
    wetted_radius_m(design, &solve(design)).ok()
}

/// Reads a goal: a speed with its unit (`30rpm`) or a length (`11m`, `36ft`).
/// A bare number is refused: it could be either.
pub fn parse_goal(text: &str, system: UnitSystem) -> Result<Want, String> {
    let t = text.trim();
    let example = match system {
        UnitSystem::Metric => "11m",
        UnitSystem::Us => "36ft",
    };
    let help = format!("type a speed like 30rpm or a wetted radius like {example}");
    if t.is_empty() {
        return Err(format!("no goal given; {help}"));
    }
    let positive = |v: f64| v.is_finite() && v > 0.0;
    if let Ok(w) = units::parse_quantity(D::AngularSpeed, t) {
        let r = rpm(w);
        return if positive(r) {
            Ok(Want::Rpm(r))
        } else {
            Err(format!("a speed goal must be above zero; {help}"))
        };
    }
    if let Ok(m) = units::parse_quantity(D::Length, t) {
        return if positive(m) {
            Ok(Want::Throw(m))
        } else {
            Err(format!("a throw goal must be above zero; {help}"))
        };
    }
    if t.parse::<f64>().is_ok() {
        return Err(format!(
            "`{t}` has no unit, so it could be a speed or a throw; {help}"
        ));
    }
    Err(format!("`{t}` is neither a speed nor a length; {help}"))
}

impl Want {
    /// The goal for a person, in `system`.
    pub fn show(self, system: UnitSystem) -> String {
        match self {
            Want::Rpm(r) => format!("{r:.1} rpm"),
            Want::Throw(m) => format!("a throw of {}", format_quantity(D::Length, m, system)),
        }
    }

    /// A result of the kind the goal asks for, in `system`.
    fn value(self, v: f64, system: UnitSystem) -> String {
        match self {
            Want::Rpm(_) => format!("{v:.1} rpm"),
            Want::Throw(_) => format_quantity(D::Length, v, system),
        }
    }
}

/// The inputs a goal may adjust, by their command-line names.
fn adjustable_names() -> String {
    catalogue::adjustable()
        .map(|i| i.vary_name())
        .collect::<Vec<_>>()
        .join(", ")
}

impl App {
    /// `g`: asks for the goal of the selected input.
    pub(super) fn start_goal(&mut self) {
        let Some(f) = self.selected_field() else {
            return;
        };
        if self.ask.goal.is_some() {
            self.error("a goal is being worked out already; wait for its answer");
            return;
        }
        let adjustable = f.input.vary.is_some_and(|v| v.search.is_some());
        if !adjustable || !matches!(f.kind(), Kind::Number | Kind::OptionalNumber) {
            self.error(format!(
                "{} cannot be set from a goal; g works on: {}",
                f.label(),
                adjustable_names()
            ));
            return;
        }
        self.mode = Mode::Typing(super::Input {
            target: InputTarget::Goal(f),
            text: String::new(),
        });
    }

    /// Starts the search for the typed goal on a thread of its own.
    pub(super) fn ask_goal(&mut self, f: Field, text: &str) {
        let want = match parse_goal(text, self.units) {
            Ok(w) => w,
            Err(e) => {
                self.error(format!("no goal: {e}"));
                return;
            }
        };
        let design = self.design.clone();
        let input = f.input;
        let task = Task::spawn("spinwright-goal", move |_| {
            let result = match want {
                Want::Rpm(r) => target(&design, input, Goal::Rpm(r)),
                Want::Throw(m) => target(
                    &design,
                    input,
                    Goal::Throw {
                        radius_m: m,
                        throw: &throw_of,
                    },
                ),
            }?;
            let throw = throw_of(&result.design);
            Ok((result, throw))
        });
        self.ask.goal = Some(GoalJob {
            task,
            field: f,
            want,
            base: self.design.clone(),
        });
        self.info(format!(
            "working out the {} that gives {}…",
            f.label(),
            want.show(self.units)
        ));
    }

    /// Takes in the answers of goals and searches; true when anything changed.
    pub(super) fn poll_asks(&mut self) -> bool {
        let mut changed = false;
        if let Some(job) = self.ask.goal.take() {
            match job.task.poll() {
                Poll::Running => self.ask.goal = Some(job),
                Poll::Done(answer) => {
                    self.take_goal(&job, answer);
                    changed = true;
                }
                Poll::Lost => {
                    self.error(
                        "the goal search stopped without an answer; the design is as it was",
                    );
                    changed = true;
                }
            }
        }
        changed |= self.poll_search();
        changed
    }

    fn take_goal(&mut self, job: &GoalJob, answer: GoalAnswer) {
        let f = job.field;
        let (result, throw) = match answer {
            Ok(a) => a,
            Err(e) => {
                self.error(format!("no goal search: {e}"));
                return;
            }
        };
        if self.design != job.base {
            self.error(format!(
                "the design changed while the {} was worked out; nothing applied (g asks again)",
                f.label()
            ));
            return;
        }
        let u = self.units;
        let show = |v: f64| f.unit().format(v, u);
        if !result.reachable {
            let nearest = match result.achieved {
                Some(a) => format!(
                    "the nearest reachable is {} = {}, giving {}",
                    f.label(),
                    show(result.value),
                    job.want.value(a, u)
                ),
                None => "no value in that range gives a running rotor".to_string(),
            };
            self.error(format!(
                "{} is out of reach with {} from {} to {}; {nearest}; design kept",
                job.want.show(u),
                f.label(),
                show(result.range.0),
                show(result.range.1)
            ));
            return;
        }
        let before = show(result.start_value);
        if !self.apply(result.design.clone()) {
            // `apply` said why on the message line.
            return;
        }
        let speed = self.report.operating.as_ref().map_or_else(
            || "no running speed".to_string(),
            |op| format!("{:.1} rpm", rpm(op.omega_rad_s())),
        );
        let throw = throw.map_or_else(
            || "no throw".to_string(),
            |m| format!("throw {}", format_quantity(D::Length, m, u)),
        );
        let margin = self.report.start_margin.map_or_else(
            || "start margin —".to_string(),
            |m| format!("start margin {m:.2}"),
        );
        let arms = if f.input.per_arm() && self.design.rotor.arms.len() > 1 {
            " (all arms, offsets kept)"
        } else {
            ""
        };
        self.info(format!(
            "{} {before} → {}{arms}: {speed} · {throw} · {margin} · z undoes",
            f.label(),
            show(result.value)
        ));
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn goals_are_read_by_their_unit() {
        // 36 ft = 10.9728 m (exact foot, 0.3048 m).
        for (text, system, want) in [
            ("30 rpm", UnitSystem::Metric, Want::Rpm(30.0)),
            ("30rpm", UnitSystem::Us, Want::Rpm(30.0)),
            ("11m", UnitSystem::Metric, Want::Throw(11.0)),
            ("36ft", UnitSystem::Us, Want::Throw(10.9728)),
        ] {
            let got = parse_goal(text, system);
            let close = match (&got, want) {
                (Ok(Want::Rpm(a)), Want::Rpm(b)) | (Ok(Want::Throw(a)), Want::Throw(b)) => {
                    (a - b).abs() < 1e-9 * b
                }
                _ => false,
            };
            assert!(close, "{text}: {got:?}");
        }
        for bad in ["30", "", "fast", "-3rpm", "0m", "2bar"] {
            assert!(parse_goal(bad, UnitSystem::Metric).is_err(), "{bad}");
        }
        let e = parse_goal("30", UnitSystem::Us).unwrap_err();
        assert!(e.contains("36ft") && e.contains("no unit"), "{e}");
    }
}
