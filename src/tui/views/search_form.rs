//! The design search panel (`e`): the form, the progress of a running
//! search, and the designs found; and the prompt of a goal (`g`).

use ratatui::text::{Line, Span};
use ratatui::widgets::{Block, Paragraph, Wrap};
use ratatui::Frame;

use super::popup;
use crate::inverse::search::{Evaluation, GoalKind, Objective};
use crate::tui::app::{App, Found, Item, Level, SearchForm, SearchPanel, OBJECTIVES};
use crate::tui::fields::Field;
use crate::units::{format_quantity, Dimension as D, UnitSystem};

/// The message-line prompt while a goal is typed.
pub fn goal_prompt(app: &App, f: Field) -> String {
    let example = match app.units {
        UnitSystem::Metric => "11m",
        UnitSystem::Us => "36ft",
    };
    format!(
        "which {} gives… (a speed like 30rpm, or a throw like {example})",
        f.label()
    )
}

/// What an objective makes largest, in words.
pub fn objective_words(o: Objective) -> &'static str {
    match o {
        Objective::Throw => "wetted radius",
        Objective::Margin => "start margin",
        Objective::Cu => "CU at the layout's spacing",
        Objective::Spacing => "largest square spacing at the CU goal",
    }
}

fn goal_words(g: GoalKind) -> &'static str {
    match g {
        GoalKind::Runs => "the rotor runs",
        GoalKind::RpmLow => "speed at least",
        GoalKind::RpmHigh => "speed at most",
        GoalKind::MinThrow => "throw at least",
        GoalKind::MaxFlow => "flow at most",
        GoalKind::MinMargin => "start margin at least",
        GoalKind::Cu => "CU at least",
    }
}

/// A goal's limit or result for a person.
fn goal_value(g: GoalKind, v: f64, system: UnitSystem) -> String {
    match g {
        GoalKind::Runs => String::new(),
        GoalKind::RpmLow | GoalKind::RpmHigh => format!("{v:.1} rpm"),
        GoalKind::MinThrow => format_quantity(D::Length, v, system),
        GoalKind::MaxFlow => format_quantity(D::Flow, v, system),
        GoalKind::MinMargin => format!("{v:.2}"),
        GoalKind::Cu => format!("{v:.1} %"),
    }
}

/// Draws the panel.
pub fn draw(app: &App, frame: &mut Frame, panel: &SearchPanel) {
    let area = frame.area();
    let w = area.width.saturating_sub(4).min(96);
    let h = area.height.saturating_sub(2).min(24);
    let r = popup(frame, w, h);
    let (title, lines) = match panel {
        SearchPanel::Form(form) => (" design search ", form_lines(app, form)),
        SearchPanel::Running => (" searching ", running_lines(app, w)),
        SearchPanel::Results(sel) => match &app.ask.found {
            Some(found) => (" designs found ", result_lines(app, found, *sel)),
            None => (" designs found ", vec![Line::raw(" nothing found yet")]),
        },
    };
    let mut lines = lines;
    // The message line may be under the box: its news goes in the box too.
    if let Some(m) = &app.message {
        let style = match m.level {
            Level::Error => app.theme.error(),
            Level::Info => app.theme.good(),
        };
        lines.push(Line::raw(""));
        lines.push(Line::styled(format!(" {}", m.text), style));
    }
    let block = Block::bordered()
        .title(Line::from(title))
        .title_bottom(Line::from(super::keys_line(app)))
        .border_style(app.theme.heading());
    frame.render_widget(
        Paragraph::new(lines)
            .wrap(Wrap { trim: false })
            .block(block),
        r,
    );
}

fn form_lines(app: &App, form: &SearchForm) -> Vec<Line<'static>> {
    let t = &app.theme;
    let label_w = form
        .lines
        .iter()
        .map(|l| l.item.label().chars().count())
        .max()
        .unwrap_or(0);
    let mut out = vec![Line::styled(
        " from the design on screen; empty goals are not set",
        t.dim(),
    )];
    for (i, line) in form.lines.iter().enumerate() {
        let here = i == form.selected;
        let value = match line.item {
            Item::Objective(k) => {
                let o = OBJECTIVES.get(k).copied().unwrap_or(Objective::Throw);
                format!("◂ {} ▸", objective_words(o))
            }
            _ if here => format!("{}▏", line.text),
            _ => line.text.clone(),
        };
        let text = format!(" {:<label_w$}  {value}", line.item.label());
        out.push(if here {
            Line::styled(text, t.selected())
        } else {
            Line::raw(text)
        });
    }
    out.push(Line::raw(""));
    if let Some(line) = form.lines.get(form.selected) {
        out.push(Line::styled(
            format!(" {}", line.item.hint(app.units)),
            t.dim(),
        ));
    }
    if let Some(p) = &form.problem {
        out.push(Line::styled(format!(" {p}"), t.error()));
    }
    out
}

fn running_lines(app: &App, width: u16) -> Vec<Line<'static>> {
    let t = &app.theme;
    let Some(job) = &app.ask.search else {
        return vec![Line::raw(" no search running")];
    };
    let (done, total) = job.task.progress.get();
    let bar_w = (width as usize).saturating_sub(12).clamp(10, 60);
    let filled = (bar_w * done.min(total)).checked_div(total).unwrap_or(0);
    let free: Vec<&str> = job
        .form
        .lines
        .iter()
        .filter_map(|l| match l.item {
            Item::Free(i) => Some(i.vary_name()),
            _ => None,
        })
        .collect();
    vec![
        Line::raw(format!(" free: {}", free.join(", "))),
        Line::raw(""),
        Line::from(vec![
            Span::raw(" "),
            Span::styled("█".repeat(filled), t.good()),
            Span::styled("░".repeat(bar_w - filled), t.dim()),
        ]),
        Line::raw(format!(
            " {done} of {} starts done · {:.1} s",
            if total > 0 {
                total.to_string()
            } else {
                "…".into()
            },
            job.task.seconds()
        )),
        Line::raw(""),
        Line::styled(
            " Esc cancels: the design stays as it is".to_string(),
            t.dim(),
        ),
    ]
}

/// The results of one design: its values, then what it gives.
fn candidate_lines(app: &App, found: &Found, e: &Evaluation) -> (String, String) {
    let u = app.units;
    let values: Vec<String> = found
        .result
        .free
        .iter()
        .zip(&e.values)
        .map(|(f, &v)| format!("{} {}", f.input.vary_name(), f.input.unit.format(v, u)))
        .collect();
    let opt = |v: Option<String>, none: &str| v.unwrap_or_else(|| none.to_string());
    let mut gives = vec![
        opt(e.rpm.map(|r| format!("{r:.1} rpm")), "does not run"),
        opt(
            e.wetted_radius_m
                .map(|m| format!("throw {}", format_quantity(D::Length, m, u))),
            "no throw",
        ),
        opt(
            e.start_margin.map(|m| format!("start margin {m:.2}")),
            "start margin —",
        ),
        opt(
            e.flow_m3_s
                .map(|q| format!("flow {}", format_quantity(D::Flow, q, u))),
            "flow —",
        ),
    ];
    if let Some(c) = e.cu_percent {
        gives.push(format!("CU {c:.1} %"));
    }
    if let Some(s) = e.spacing_m {
        gives.push(format!("spacing {}", format_quantity(D::Length, s, u)));
    }
    let verdict = if e.feasible() {
        "meets every goal".to_string()
    } else {
        let missed: Vec<String> = e
            .unmet()
            .map(|g| match g.goal {
                GoalKind::Runs => goal_words(g.goal).to_string(),
                k => format!("{} {}", goal_words(k), goal_value(k, g.limit, u)),
            })
            .collect();
        format!("misses: {}", missed.join(", "))
    };
    gives.push(verdict);
    (values.join(" · "), gives.join(" · "))
}

fn result_lines(app: &App, found: &Found, sel: usize) -> Vec<Line<'static>> {
    let t = &app.theme;
    let u = app.units;
    let r = &found.result;
    let mut out = vec![Line::raw(format!(
        " {} designs solved in {:.1} s · made largest: {}",
        r.evaluations,
        found.seconds,
        objective_words(r.objective)
    ))];
    if !r.feasible() {
        for c in &r.closest {
            let best = c.best.map_or_else(
                || "nothing to compare".to_string(),
                |b| goal_value(c.goal, b, u),
            );
            out.push(Line::styled(
                format!(
                    " not met: {} {}; the closest came {best}",
                    goal_words(c.goal),
                    goal_value(c.goal, c.limit, u)
                ),
                t.error(),
            ));
        }
    }
    if !r.binding.is_empty() {
        let b: Vec<&str> = r.binding.iter().map(|g| goal_words(*g)).collect();
        out.push(Line::styled(
            format!(" binding (under 2 % to spare): {}", b.join(", ")),
            t.dim(),
        ));
    }
    if !r.at_range_end.is_empty() {
        let b: Vec<&str> = r.at_range_end.iter().map(|i| i.vary_name()).collect();
        out.push(Line::styled(
            format!(" at an end of its range (widen it?): {}", b.join(", ")),
            t.dim(),
        ));
    }
    out.push(Line::raw(""));
    for (i, c) in found.candidates.iter().enumerate() {
        let (values, gives) = candidate_lines(app, found, &c.eval);
        let mark = if i == sel { "▸" } else { " " };
        let pinned = if app.pins.iter().any(|p| p.label == c.label) {
            " (pinned)"
        } else {
            ""
        };
        let role = if i == 0 { "best" } else { "runner-up" };
        let head = format!(" {mark} {}{pinned} ({role}): {values}", c.label);
        out.push(if i == sel {
            Line::styled(head, t.selected())
        } else {
            Line::raw(head)
        });
        out.push(Line::styled(format!("     {gives}"), t.dim()));
    }
    out
}
