//! The design search from the interface (`m` marks free inputs, `e` opens
//! the form): the free inputs with their ranges, the goals (speed band,
//! least throw, most flow, least start margin, CU) and the objective are
//! typed into a small form; the search of the `search` command
//! ([`crate::inverse::search`]) runs on the current design on a thread of its
//! own, with its progress shown; Esc stops waiting for it. The best design
//! and the runners-up are listed: each can be pinned for Compare (`c`) or
//! applied as an ordinary, undoable edit (Enter).
//!
//! Esc asks the search's thread to stop (every start ends at its next
//! candidate) and frees the interface at once; whatever the thread still
//! sends back is dropped.

use ratatui::crossterm::event::{KeyCode, KeyEvent};

use super::task::{Poll, Task};
use super::{App, Mode};
use crate::catalogue::{Input, Search, Unit};
use crate::inverse::search::{
    search_until, Evaluation, Free, Goals, Objective, SearchError, SearchOptions, SearchResult,
};
use crate::inverse::target;
use crate::physics::balance::rpm;
use crate::physics::design::Design;
use crate::tui::fields::{self, Field};
use crate::tui::keys::{Action, Scope};
use crate::units::{self, Dimension as D, UnitSystem};

/// Most inputs a search from the interface frees at once.
pub const MAX_FREE: usize = 4;

/// The objectives in the order ←→ steps through them.
pub const OBJECTIVES: [Objective; 4] = [
    Objective::Throw,
    Objective::Margin,
    Objective::Cu,
    Objective::Spacing,
];

/// What a line of the form sets.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Item {
    /// A free input's range, `FROM..TO`.
    Free(&'static Input),
    /// The speed band, `LO..HI` rpm.
    Rpm,
    /// The least wetted radius.
    MinThrow,
    /// The most total flow.
    MaxFlow,
    /// The least start margin.
    MinMargin,
    /// The CU goal, %.
    Cu,
    /// What to make as large as it will go.
    Objective(usize),
}

impl Item {
    /// The line's label.
    pub fn label(self) -> String {
        match self {
            Item::Free(i) => format!("free {}", i.vary_name()),
            Item::Rpm => "speed band".into(),
            Item::MinThrow => "least throw".into(),
            Item::MaxFlow => "most flow".into(),
            Item::MinMargin => "least start margin".into(),
            Item::Cu => "CU goal".into(),
            Item::Objective(_) => "make largest".into(),
        }
    }

    /// What to type, for the line's hint.
    pub fn hint(self, system: UnitSystem) -> &'static str {
        match (self, system) {
            (Item::Free(_), _) => "FROM..TO with units, e.g. 40deg..85deg",
            (Item::Rpm, _) => "LO..HI in rpm, e.g. 25..35",
            (Item::MinThrow, UnitSystem::Metric) => "a length, e.g. 10m (empty: none)",
            (Item::MinThrow, UnitSystem::Us) => "a length, e.g. 33ft (empty: none)",
            (Item::MaxFlow, UnitSystem::Metric) => "a flow, e.g. 20L/min (empty: none)",
            (Item::MaxFlow, UnitSystem::Us) => "a flow, e.g. 5gpm (empty: none)",
            (Item::MinMargin, _) => "a ratio, e.g. 1.5 (empty: none)",
            (Item::Cu, _) => "percent, e.g. 80 (spacing: the CU kept; default 85)",
            (Item::Objective(_), _) => "←→ change: throw, start margin, CU, spacing",
        }
    }
}

/// A line of the form: what it sets and the text typed.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Line {
    /// What it sets.
    pub item: Item,
    /// The text typed (empty: no such goal).
    pub text: String,
}

/// The search form.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct SearchForm {
    /// The lines, free inputs first.
    pub lines: Vec<Line>,
    /// The line being edited.
    pub selected: usize,
    /// Why the last Enter did not start a search.
    pub problem: Option<String>,
}

/// The search panel (a box over the screen).
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum SearchPanel {
    /// The form being filled in.
    Form(SearchForm),
    /// The search running (Esc stops waiting).
    Running,
    /// The designs found, the highlighted one.
    Results(usize),
}

impl SearchPanel {
    /// The key table's place for the panel.
    pub fn scope(&self) -> Scope {
        match self {
            SearchPanel::Form(_) => Scope::SearchForm,
            SearchPanel::Running => Scope::SearchRunning,
            SearchPanel::Results(_) => Scope::SearchResults,
        }
    }
}

/// A search running.
#[derive(Debug)]
pub struct SearchJob {
    /// The search.
    pub task: Task<Result<SearchResult, SearchError>>,
    /// The design searched from.
    pub base: Design,
    /// The form it was started from (to go back to).
    pub form: SearchForm,
    /// The progress and whole seconds last drawn (redrawn when they change).
    pub drawn: (usize, usize, u64),
}

/// A design the search found.
#[derive(Debug, Clone)]
pub struct Candidate {
    /// Its label for Compare.
    pub label: String,
    /// What the search measured.
    pub eval: Evaluation,
    /// The design.
    pub design: Design,
}

/// What the last search found.
#[derive(Debug, Clone)]
pub struct Found {
    /// The search's report.
    pub result: SearchResult,
    /// The best design first, then the runners-up.
    pub candidates: Vec<Candidate>,
    /// Seconds it took.
    pub seconds: f64,
}

/// The text of a value for a range end: the number in the shown unit with
/// the unit (`deg` for degrees), a bare number for a unit without a symbol.
fn end_text(input: &Input, si: f64, system: UnitSystem) -> String {
    let shown = units::format_number(input.unit.to_display(si, system));
    match input.unit {
        Unit::Dim(d) => {
            let label = units::unit_label(d, system);
            format!("{shown}{}", if label == "°" { "deg" } else { label })
        }
        _ => shown,
    }
}

/// A first range for a free input around the design's value: ±20° for an
/// angle, 0.7 to 1.4 times for a size (inside the target search's range for
/// the inputs it adjusts), 0 to twice a brake; ±30 % otherwise.
fn first_range(input: &'static Input, design: &Design) -> Option<(f64, f64)> {
    let v = input.varied_value(design)?;
    let search = input.vary.and_then(|s| s.search);
    let (lo, hi) = match search {
        Some(Search::Shifted { .. }) => (v - 20f64.to_radians(), v + 20f64.to_radians()),
        Some(Search::Brake { .. }) => (0.0, if v > 0.0 { 2.0 * v } else { 1e-3 }),
        Some(Search::Scaled { .. }) => (0.7 * v, 1.4 * v),
        None if v != 0.0 => {
            let (a, b) = (0.7 * v, 1.3 * v);
            (a.min(b), a.max(b))
        }
        None => return None,
    };
    let (lo, hi) = match search.and_then(|_| target::range(input, design).ok()) {
        Some((a, b)) => (lo.max(a), hi.min(b)),
        None => (lo, hi),
    };
    (lo < hi).then_some((lo, hi))
}

/// The first form for `free` on `design`: ranges around the present values,
/// a speed band of ±25 % around the present speed, the throw as objective.
pub fn new_form(
    free: &[&'static Input],
    design: &Design,
    speed_rpm: Option<f64>,
    system: UnitSystem,
) -> SearchForm {
    let mut lines: Vec<Line> = free
        .iter()
        .map(|&input| Line {
            item: Item::Free(input),
            text: first_range(input, design).map_or_else(String::new, |(a, b)| {
                format!(
                    "{}..{}",
                    end_text(input, a, system),
                    end_text(input, b, system)
                )
            }),
        })
        .collect();
    let band = speed_rpm
        .filter(|r| r.is_finite() && *r > 0.0)
        .map_or_else(String::new, |r| {
            format!("{:.0}..{:.0}", (0.75 * r).max(1.0), (1.25 * r).max(2.0))
        });
    lines.push(Line {
        item: Item::Rpm,
        text: band,
    });
    for item in [Item::MinThrow, Item::MaxFlow, Item::MinMargin, Item::Cu] {
        lines.push(Line {
            item,
            text: String::new(),
        });
    }
    lines.push(Line {
        item: Item::Objective(0),
        text: String::new(),
    });
    SearchForm {
        lines,
        selected: 0,
        problem: None,
    }
}

/// A speed: a bare number in rpm, or a number with a speed unit.
fn read_rpm(text: &str) -> Result<f64, String> {
    let t = text.trim();
    let v = match t.parse::<f64>() {
        Ok(v) => v,
        Err(_) => units::parse_quantity(D::AngularSpeed, t)
            .map(rpm)
            .map_err(|e| e.to_string())?,
    };
    if v.is_finite() && v > 0.0 {
        Ok(v)
    } else {
        Err(format!("`{t}`: a speed above zero"))
    }
}

/// A positive value typed for `input`'s field (a bare number in the shown unit).
fn read_value(input: &'static Input, text: &str, system: UnitSystem) -> Result<f64, String> {
    match fields::parse_typed(Field::of(input), text, system) {
        Ok(Some(v)) if v.is_finite() => Ok(v),
        Ok(_) => Err(format!("`{}`: a value is needed", text.trim())),
        Err(e) => Err(e.0),
    }
}

/// A bare positive number (`%` allowed after it).
fn read_number(text: &str, what: &str) -> Result<f64, String> {
    let t = text.trim();
    let t = t.strip_suffix('%').unwrap_or(t).trim();
    match t.parse::<f64>() {
        Ok(v) if v.is_finite() && v > 0.0 => Ok(v),
        _ => Err(format!("{what}: a bare number above zero")),
    }
}

/// What a filled-in form asks for.
#[derive(Debug, Clone, PartialEq)]
pub struct Request {
    /// The free inputs and their ranges.
    pub free: Vec<Free>,
    /// The goals.
    pub goals: Goals,
    /// The objective.
    pub objective: Objective,
}

/// Reads the form; `Err` names the line that is wrong and why.
pub fn read_form(form: &SearchForm, system: UnitSystem) -> Result<Request, String> {
    let mut free = Vec::new();
    let mut goals = Goals::default();
    let mut objective = Objective::Throw;
    for line in &form.lines {
        let t = line.text.trim();
        let name = line.item.label();
        let fail = |why: String| format!("{name}: {why}");
        match line.item {
            Item::Objective(k) => {
                objective = OBJECTIVES.get(k).copied().unwrap_or(Objective::Throw);
                continue;
            }
            Item::Free(_) | Item::Rpm if t.is_empty() => {
                if let Item::Free(_) = line.item {
                    return Err(fail("type a range FROM..TO".into()));
                }
                continue;
            }
            _ if t.is_empty() => continue,
            _ => {}
        }
        match line.item {
            Item::Free(input) => {
                let (a, b) = t
                    .split_once("..")
                    .ok_or_else(|| fail("write the range FROM..TO".into()))?;
                let from = read_value(input, a, system).map_err(fail)?;
                let to = read_value(input, b, system).map_err(fail)?;
                if to <= from {
                    return Err(fail("the range runs from a lower to a higher value".into()));
                }
                free.push(Free { input, from, to });
            }
            Item::Rpm => {
                let (a, b) = t
                    .split_once("..")
                    .ok_or_else(|| fail("write the band LO..HI, e.g. 25..35".into()))?;
                let (lo, hi) = (read_rpm(a).map_err(fail)?, read_rpm(b).map_err(fail)?);
                if hi < lo {
                    return Err(fail("the low end comes first".into()));
                }
                goals.rpm = Some((lo, hi));
            }
            Item::MinThrow => {
                goals.min_throw_m = Some(Unit::Dim(D::Length).parse(t, system).map_err(fail)?)
            }
            Item::MaxFlow => {
                goals.max_flow_m3_s = Some(Unit::Dim(D::Flow).parse(t, system).map_err(fail)?)
            }
            Item::MinMargin => goals.min_margin = Some(read_number(t, "a ratio").map_err(fail)?),
            Item::Cu => {
                let c = read_number(t, "a percentage").map_err(fail)?;
                if c >= 100.0 {
                    return Err(fail("a CU goal lies below 100 %".into()));
                }
                goals.cu_percent = Some(c);
            }
            Item::Objective(_) => {}
        }
    }
    Ok(Request {
        free,
        goals,
        objective,
    })
}

impl App {
    /// `m`: marks the selected input free for a design search, or unmarks it.
    pub(super) fn toggle_mark(&mut self) {
        let Some(f) = self.selected_field() else {
            return;
        };
        let input = f.input;
        if let Some(k) = self.ask.marked.iter().position(|i| *i == input) {
            self.ask.marked.remove(k);
            self.info(format!(
                "{} is no longer free for a search ({} marked)",
                f.label(),
                self.ask.marked.len()
            ));
            return;
        }
        if input.vary.is_none() {
            self.error(format!("{} cannot be a free input of a search", f.label()));
            return;
        }
        if self.ask.marked.len() >= MAX_FREE {
            self.error(format!(
                "{MAX_FREE} inputs are marked already; m on one of them unmarks it"
            ));
            return;
        }
        self.ask.marked.push(input);
        let arms = if input.per_arm() {
            " (all arms together)"
        } else {
            ""
        };
        self.info(format!(
            "{} marked free for a search{arms}; e opens the search form ({} marked)",
            f.label(),
            self.ask.marked.len()
        ));
    }

    /// `e`: opens the search form on the marked inputs (or the selected one).
    pub(super) fn open_search(&mut self) {
        if self.ask.search.is_some() {
            self.mode = Mode::Search(SearchPanel::Running);
            return;
        }
        let mut free = self.ask.marked.clone();
        if free.is_empty() {
            match self.selected_field().map(|f| f.input) {
                Some(i) if i.vary.is_some() => free.push(i),
                _ => {
                    self.error("mark the free inputs with m first (the selected one cannot vary)");
                    return;
                }
            }
        }
        let speed = self
            .report
            .operating
            .as_ref()
            .map(|op| rpm(op.omega_rad_s()));
        let mut form = new_form(&free, &self.design, speed, self.units);
        // The goals typed last time stay; the free lines follow the marks.
        if let Some(last) = &self.ask.last_form {
            for line in &mut form.lines {
                if let Some(old) = last.lines.iter().find(|l| match (l.item, line.item) {
                    (Item::Objective(_), Item::Objective(_)) => true,
                    (a, b) => a == b,
                }) {
                    *line = old.clone();
                }
            }
        }
        self.mode = Mode::Search(SearchPanel::Form(form));
    }

    /// Keys while the search panel is shown (`a`: the key table's action).
    pub(super) fn key_search(&mut self, a: Option<Action>, k: &KeyEvent, panel: SearchPanel) {
        match panel {
            SearchPanel::Form(form) => self.key_form(a, k, form),
            SearchPanel::Running if a == Some(Action::CancelSearch) => {
                // The thread stops at its next candidate; what it sends
                // back then is dropped with the job.
                if let Some(job) = self.ask.search.take() {
                    job.task.progress.ask_to_stop();
                    self.ask.last_form = Some(job.form);
                }
                self.info("search cancelled; the design is as it was");
            }
            SearchPanel::Running => self.mode = Mode::Search(SearchPanel::Running),
            SearchPanel::Results(sel) => self.key_results(a, k, sel),
        }
    }

    fn key_form(&mut self, a: Option<Action>, k: &KeyEvent, mut form: SearchForm) {
        let n = form.lines.len().max(1);
        let back = matches!(k.code, KeyCode::Up | KeyCode::BackTab | KeyCode::Left);
        let line = form.lines.get_mut(form.selected);
        match (a, line) {
            (Some(Action::CloseSearch), _) => {
                self.ask.last_form = Some(form);
                return;
            }
            (Some(Action::RunSearch), _) => {
                self.start_search(form);
                return;
            }
            (Some(Action::FormLine), _) => {
                form.selected = (form.selected + if back { n - 1 } else { 1 }) % n;
            }
            (Some(Action::FormObjective), Some(line)) => {
                if let Item::Objective(o) = line.item {
                    let m = OBJECTIVES.len();
                    line.item = Item::Objective((o + if back { m - 1 } else { 1 }) % m);
                }
            }
            (Some(Action::ClearTyping), Some(line)) => line.text.clear(),
            (Some(Action::DeleteChar), Some(line)) => {
                line.text.pop();
            }
            (Some(Action::TypeChar), Some(line)) => {
                if let KeyCode::Char(c) = k.code {
                    if !matches!(line.item, Item::Objective(_)) && line.text.chars().count() < 60 {
                        line.text.push(c);
                    }
                }
            }
            _ => {}
        }
        self.mode = Mode::Search(SearchPanel::Form(form));
    }

    fn start_search(&mut self, mut form: SearchForm) {
        let request = match read_form(&form, self.units) {
            Ok(r) => r,
            Err(e) => {
                form.problem = Some(e);
                self.mode = Mode::Search(SearchPanel::Form(form));
                return;
            }
        };
        form.problem = None;
        let design = self.design.clone();
        let base = design.clone();
        let task = Task::spawn("spinwright-search", move |p| {
            search_until(
                &design,
                &request.free,
                &request.goals,
                request.objective,
                &SearchOptions::default(),
                &|done, total| p.set(done, total),
                p.stop_flag(),
            )
        });
        self.ask.search = Some(SearchJob {
            task,
            base,
            form,
            drawn: (0, 0, 0),
        });
        self.mode = Mode::Search(SearchPanel::Running);
    }

    /// Takes in the search's answer; true when it came.
    pub(super) fn poll_search(&mut self) -> bool {
        let Some(job) = self.ask.search.take() else {
            return false;
        };
        let answer = match job.task.poll() {
            Poll::Running => {
                // The progress bar and the clock move: draw again when they do.
                let (done, total) = job.task.progress.get();
                let now = (done, total, job.task.started.elapsed().as_secs());
                let moved = now != job.drawn;
                self.ask.search = Some(SearchJob { drawn: now, ..job });
                return moved;
            }
            Poll::Done(a) => a,
            Poll::Lost => Err(SearchError::Optimiser(
                "the search stopped without an answer".into(),
            )),
        };
        // Shown when the panel waits for it, or nothing else is on screen.
        let shown = matches!(self.mode, Mode::Search(SearchPanel::Running) | Mode::Normal);
        let seconds = job.task.seconds();
        self.ask.last_form = Some(job.form.clone());
        match answer {
            Ok(result) => {
                self.ask.runs += 1;
                let run = self.ask.runs;
                let candidates = candidates(&result, &job.base, run);
                let feasible = result.feasible();
                self.ask.found = Some(Found {
                    result,
                    candidates,
                    seconds,
                });
                if shown {
                    self.mode = Mode::Search(SearchPanel::Results(0));
                }
                if feasible {
                    self.info("search done: the best design meets every goal");
                } else {
                    self.error("search done: no design met every goal (see how close they came)");
                }
            }
            Err(e) => {
                let mut form = job.form;
                form.problem = Some(e.to_string());
                if shown {
                    self.mode = Mode::Search(SearchPanel::Form(form));
                }
                self.error(format!("no search: {e}"));
            }
        }
        true
    }

    fn key_results(&mut self, a: Option<Action>, k: &KeyEvent, sel: usize) {
        let n = self.ask.found.as_ref().map_or(0, |f| f.candidates.len());
        let chosen = self
            .ask
            .found
            .as_ref()
            .and_then(|f| f.candidates.get(sel))
            .cloned();
        let mut next = Mode::Search(SearchPanel::Results(sel));
        match (a, chosen) {
            (Some(Action::CloseSearch), _) => next = Mode::Normal,
            (Some(Action::ResultMove), _) => {
                let to = if k.code == KeyCode::Up {
                    sel.saturating_sub(1)
                } else {
                    (sel + 1).min(n.saturating_sub(1))
                };
                next = Mode::Search(SearchPanel::Results(to));
            }
            (Some(Action::PinFound), Some(c)) => self.pin(c.label, c.design),
            (Some(Action::ApplyFound), Some(c)) => {
                next = Mode::Normal;
                if self.apply(c.design) {
                    self.info(format!("{} applied to the design; z undoes", c.label));
                }
            }
            (Some(Action::BackToGoals), _) => {
                if let Some(form) = self.ask.last_form.clone() {
                    next = Mode::Search(SearchPanel::Form(form));
                }
            }
            _ => {}
        }
        self.mode = next;
    }
}

/// The best design and the runners-up as designs with Compare labels.
fn candidates(result: &SearchResult, base: &Design, run: usize) -> Vec<Candidate> {
    let mut out = vec![Candidate {
        label: format!("found {run}"),
        eval: result.best.clone(),
        design: result.design.clone(),
    }];
    for (k, e) in result.runners_up.iter().enumerate() {
        let mut d = base.clone();
        let ok = result
            .free
            .iter()
            .zip(&e.values)
            .all(|(f, &v)| f.input.vary_to(&mut d, v).is_ok());
        if ok {
            out.push(Candidate {
                label: format!("found {run}.{}", k + 1),
                eval: e.clone(),
                design: d,
            });
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::{DEFLECTION, NOZZLE_DIAMETER};
    use crate::scenario;

    fn lawn() -> Design {
        scenario::builtin_example().to_design().unwrap()
    }

    #[test]
    fn the_first_form_reads_back_as_ranges_around_the_design() {
        let d = lawn();
        let form = new_form(
            &[&DEFLECTION, &NOZZLE_DIAMETER],
            &d,
            Some(32.0),
            UnitSystem::Metric,
        );
        let r = read_form(&form, UnitSystem::Metric).unwrap();
        assert_eq!(r.free.len(), 2);
        let defl = DEFLECTION.varied_value(&d).unwrap();
        // 80° ± 20°, the top clipped to the target search's 89° (catalogue).
        assert!((r.free[0].from - (defl - 20f64.to_radians())).abs() < 1e-3);
        assert!((r.free[0].to - 89f64.to_radians()).abs() < 1e-3);
        let noz = NOZZLE_DIAMETER.varied_value(&d).unwrap();
        assert!((r.free[1].from / noz - 0.7).abs() < 1e-2, "{:?}", r.free[1]);
        assert_eq!(r.goals.rpm, Some((24.0, 40.0)));
        assert_eq!(r.objective, Objective::Throw);
        // The same in US units.
        let us = new_form(&[&NOZZLE_DIAMETER], &d, None, UnitSystem::Us);
        let r = read_form(&us, UnitSystem::Us).unwrap();
        assert!((r.free[0].to / noz - 1.4).abs() < 1e-2, "{:?}", r.free[0]);
        assert_eq!(r.goals.rpm, None);
    }

    #[test]
    fn a_wrong_line_is_named() {
        let d = lawn();
        let mut form = new_form(&[&DEFLECTION], &d, Some(30.0), UnitSystem::Metric);
        let set = |form: &mut SearchForm, item: Item, text: &str| {
            if let Some(l) = form.lines.iter_mut().find(|l| l.item == item) {
                l.text = text.to_string();
            }
        };
        set(&mut form, Item::Rpm, "40..20");
        let e = read_form(&form, UnitSystem::Metric).unwrap_err();
        assert!(e.starts_with("speed band"), "{e}");
        set(&mut form, Item::Rpm, "20..40");
        set(&mut form, Item::MinThrow, "10m");
        set(&mut form, Item::MaxFlow, "20L/min");
        set(&mut form, Item::MinMargin, "1.5");
        set(&mut form, Item::Cu, "120");
        let e = read_form(&form, UnitSystem::Metric).unwrap_err();
        assert!(e.starts_with("CU goal"), "{e}");
        set(&mut form, Item::Cu, "80%");
        let r = read_form(&form, UnitSystem::Metric).unwrap();
        assert_eq!(r.goals.min_throw_m, Some(10.0));
        assert_eq!(r.goals.min_margin, Some(1.5));
        assert_eq!(r.goals.cu_percent, Some(80.0));
        // 20 L/min = 20e-3 / 60 m³/s.
        assert!((r.goals.max_flow_m3_s.unwrap() - 20e-3 / 60.0).abs() < 1e-12);
        set(&mut form, Item::Free(&DEFLECTION), "85deg..40deg");
        let e = read_form(&form, UnitSystem::Metric).unwrap_err();
        assert!(e.starts_with("free deflection"), "{e}");
    }
}
