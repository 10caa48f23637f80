//! View 5, Compare: the design as it is now against pinned designs and saved
//! scenarios — the key results with deltas against the first pinned design
//! (▲ better, ▼ worse), and the inputs that differ.

use ratatui::layout::{Constraint, Rect};
use ratatui::style::Style;
use ratatui::text::{Line, Span};
use ratatui::widgets::{Cell, Paragraph, Row, Table, Wrap};
use ratatui::Frame;

use super::num;
use crate::inverse::compare::{Comparison, InputDifference, InputValue};
use crate::tui::app::App;
use crate::units::{to_display, unit_label, Dimension as D, UnitSystem};

/// A result key's label and dimension (None: shown as is, with `unit`).
fn result_label(key: &str) -> (&'static str, Option<D>) {
    match key {
        "rpm" => ("speed rpm", None),
        "start_margin" => ("start margin", None),
        "total_flow_m3_s" => ("flow", Some(D::Flow)),
        "stall_torque_n_m" => ("stall torque", Some(D::Torque)),
        "runaway_rpm" => ("runaway rpm", None),
        "wetted_radius_m" => ("wetted radius", Some(D::Length)),
        "cu_percent" => ("CU %", None),
        "du_lq_percent" => ("DU_lq %", None),
        _ => ("", None),
    }
}

/// An input's label in the list: `arm 2 nozzle mm`, `inlet pressure psi`.
fn input_label(i: &InputDifference, system: UnitSystem) -> String {
    let unit = i.input.unit.label(system);
    let arm = i.arm.map(|k| format!("arm {} ", k + 1)).unwrap_or_default();
    format!("{arm}{} {unit}", i.input.label)
        .trim_end()
        .to_string()
}

fn show_input(app: &App, i: &InputDifference, v: &Option<InputValue>) -> String {
    match v {
        None => "—".to_string(),
        Some(InputValue::Text(t)) => t.clone(),
        Some(InputValue::Number(x)) => num(i.input.unit.to_display(*x, app.units)),
    }
}

fn table(app: &App, c: &Comparison, width: u16) -> (Vec<Row<'static>>, Vec<Constraint>) {
    let t = &app.theme;
    let n = c.names.len();
    let label_w = (width * 2 / 5).clamp(12, 26);
    let col_w = (width.saturating_sub(label_w) / n.max(1) as u16).max(8);
    let mut widths = vec![Constraint::Length(label_w)];
    widths.extend(std::iter::repeat_n(Constraint::Length(col_w), n));
    let pins = app.pins.len();
    let chosen = app.pin_selected.min(pins.saturating_sub(1));
    let mut rows = vec![Row::new(std::iter::once(Cell::from("")).chain(
        c.names.iter().enumerate().map(|(k, s)| {
            if pins > 1 && k == chosen && k < pins {
                Cell::from(Span::styled(format!("▸{s}"), t.selected()))
            } else {
                Cell::from(s.clone())
            }
        }),
    ))
    .style(t.heading())];
    rows.push(Row::new(vec![Cell::from(Span::styled(
        "results",
        t.heading(),
    ))]));
    for r in &c.results {
        let (label, dim) = result_label(&r.key);
        let label = match dim {
            Some(d) => format!("{label} {}", unit_label(d, app.units)),
            None if label.is_empty() => format!("{} {}", r.key, r.unit),
            None => label.to_string(),
        };
        let shown = |v: f64| dim.map_or(v, |d| to_display(d, v, app.units));
        let delta = |d: f64| {
            dim.map_or(d, |dm| {
                to_display(dm, d, app.units) - to_display(dm, 0.0, app.units)
            })
        };
        let mut cells = vec![Cell::from(label)];
        for (k, v) in r.values.iter().enumerate() {
            let base = v.map_or("—".to_string(), |v| num(shown(v)));
            if k == 0 {
                cells.push(Cell::from(base));
                continue;
            }
            let d = r.deltas.get(k).copied().flatten();
            let (mark, style) = match r.better(k) {
                Some(true) => (" ▲", t.good()),
                Some(false) => (" ▼", t.bad()),
                None => ("", Style::default()),
            };
            let pct = r.percents.get(k).copied().flatten();
            let text = match (d, pct) {
                (Some(d), Some(p)) if d != 0.0 => {
                    format!("{base} {}%{mark}", crate::words::signed(p, 1))
                }
                (Some(d), None) if d != 0.0 => {
                    let sign = if d > 0.0 { "+" } else { "" };
                    format!("{base} {sign}{}{mark}", num(delta(d)))
                }
                _ => base,
            };
            cells.push(Cell::from(Span::styled(text, style)));
        }
        rows.push(Row::new(cells));
    }
    rows.push(Row::new(vec![Cell::from(Span::styled(
        "inputs that differ",
        t.heading(),
    ))]));
    if c.inputs.is_empty() {
        rows.push(Row::new(vec![Cell::from(
            "  (none: the inputs are the same)",
        )]));
    }
    for (i, all) in merged_inputs(c, arm_counts(app)) {
        let label = if all {
            let on_arm_one = input_label(i, app.units);
            format!(
                "arms {}",
                on_arm_one.strip_prefix("arm 1 ").unwrap_or(&on_arm_one)
            )
        } else {
            input_label(i, app.units)
        };
        let first = i.values.first().cloned().flatten();
        let mut cells = vec![Cell::from(label)];
        for (k, v) in i.values.iter().enumerate() {
            let text = show_input(app, i, v);
            let style = if k > 0 && *v != first {
                t.warning()
            } else {
                Style::default()
            };
            cells.push(Cell::from(Span::styled(text, style)));
        }
        rows.push(Row::new(cells));
    }
    (rows, widths)
}

/// The arm count of each compared design (the pins, then the design now).
fn arm_counts(app: &App) -> impl Fn(usize) -> Option<usize> + '_ {
    |k: usize| {
        app.pins
            .get(k)
            .map(|p| &p.design)
            .or((k == app.pins.len()).then_some(&app.design))
            .map(|d| d.rotor.arms.len())
    }
}

/// The differing inputs as the table lists them: a per-arm input that
/// differs alike on every arm of designs with the same arm count is one row
/// (`true`: all arms, labelled `arms radius mm`), not a row per arm.
fn merged_inputs(
    c: &Comparison,
    arms: impl Fn(usize) -> Option<usize>,
) -> Vec<(&InputDifference, bool)> {
    let columns = c.names.len();
    let mut out = Vec::new();
    let mut merged: Vec<&'static str> = Vec::new();
    for i in &c.inputs {
        if i.arm.is_some() && merged.contains(&i.input.path) {
            continue;
        }
        if i.arm == Some(0) {
            let group: Vec<&InputDifference> =
                c.inputs.iter().filter(|j| j.input == i.input).collect();
            let m = group.len();
            let every_arm = group.iter().enumerate().all(|(k, j)| j.arm == Some(k));
            let same_count = (0..columns).all(|k| arms(k) == Some(m));
            let alike = group.iter().all(|j| j.values == i.values);
            if m > 1 && every_arm && same_count && alike {
                merged.push(i.input.path);
                out.push((i, true));
                continue;
            }
        }
        out.push((i, false));
    }
    out
}

/// For each design after the first, its name and the inputs in which it
/// differs from the first, in the list's words: `radius (all arms)`,
/// `nozzle (arm 2)`, `inlet pressure`. `arms(k)` is design `k`'s arm count.
pub fn differences_per_design(
    c: &Comparison,
    arms: impl Fn(usize) -> Option<usize>,
) -> Vec<(String, Vec<String>)> {
    c.names
        .iter()
        .enumerate()
        .skip(1)
        .map(|(k, name)| {
            // Inputs in first-seen order, each with the arms it differs on.
            let mut found: Vec<(&'static str, Vec<usize>)> = Vec::new();
            for i in &c.inputs {
                let first = i.values.first().cloned().flatten();
                if i.values.get(k).cloned().flatten() == first {
                    continue;
                }
                let label = i.input.label;
                let at = match found.iter().position(|(l, _)| *l == label) {
                    Some(at) => at,
                    None => {
                        found.push((label, Vec::new()));
                        found.len() - 1
                    }
                };
                if let (Some(arm), Some((_, list))) = (i.arm, found.get_mut(at)) {
                    list.push(arm);
                }
            }
            let words = found
                .into_iter()
                .map(|(label, list)| match list.len() {
                    0 => label.to_string(),
                    n if arms(k) == Some(n) && n > 1 => format!("{label} (all arms)"),
                    1 => format!("{label} (arm {})", list.first().map_or(0, |a| a + 1)),
                    _ => {
                        let l: Vec<String> = list.iter().map(|a| (a + 1).to_string()).collect();
                        format!("{label} (arms {})", l.join(", "))
                    }
                })
                .collect();
            (name.clone(), words)
        })
        .collect()
}

/// Draws the Compare view.
pub fn draw(app: &App, frame: &mut Frame, area: Rect) {
    let t = &app.theme;
    let mut head = vec![Line::styled(
        "deltas against the first pin · c pins the design as it is now · o, then c on a file, adds a saved scenario · [ ] picks a pin (▸), < > moves it, x drops it",
        t.dim(),
    )];
    if app.pins.is_empty() {
        head.push(Line::raw(""));
        head.push(Line::raw(
            "Nothing pinned yet. Pin the design, change it, and see what the change did.",
        ));
        frame.render_widget(Paragraph::new(head).wrap(Wrap { trim: true }), area);
        return;
    }
    if app.comparison.waiting {
        head.push(Line::styled("computing…", t.dim()));
    }
    if let Some(Ok(c)) = app.comparison.result.as_deref() {
        let arms = arm_counts(app);
        let base = c.names.first().cloned().unwrap_or_default();
        for (name, words) in differences_per_design(c, arms) {
            let what = if words.is_empty() {
                "the same inputs".to_string()
            } else {
                words.join(", ")
            };
            head.push(Line::from(vec![
                Span::styled(format!("{name} against {base}: "), t.heading()),
                Span::raw(what),
            ]));
        }
    }
    let head_h = super::wrapped_rows(&head, area.width).min(area.height);
    let [top, body] =
        ratatui::layout::Layout::vertical([Constraint::Length(head_h), Constraint::Min(1)])
            .areas(area);
    frame.render_widget(Paragraph::new(head).wrap(Wrap { trim: true }), top);
    match app.comparison.result.as_deref() {
        None => {}
        Some(Err(e)) => frame.render_widget(
            Paragraph::new(Line::styled(e.clone(), t.error())).wrap(Wrap { trim: true }),
            body,
        ),
        Some(Ok(c)) => {
            let (rows, widths) = table(app, c, body.width);
            let max = rows.len().saturating_sub(body.height as usize);
            let skip = app.pane_scroll.min(max);
            let rows: Vec<Row> = rows.into_iter().skip(skip).collect();
            frame.render_widget(Table::new(rows, widths), body);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::catalogue::{ALTITUDE, NOZZLE_DIAMETER, SEAL_PER_PRESSURE};

    fn diff(input: &'static crate::catalogue::Input, arm: Option<usize>) -> InputDifference {
        InputDifference {
            input,
            arm,
            path: input.path_at(arm),
            unit: input.unit.si_label(),
            values: Vec::new(),
        }
    }

    #[test]
    fn inputs_read_as_their_catalogue_labels_with_units() {
        let m = UnitSystem::Metric;
        assert_eq!(
            input_label(&diff(&NOZZLE_DIAMETER, Some(0)), m),
            "arm 1 nozzle mm"
        );
        assert_eq!(
            input_label(&diff(&NOZZLE_DIAMETER, Some(2)), UnitSystem::Us),
            "arm 3 nozzle in"
        );
        // A long length from the catalogue, not guessed from the path.
        assert_eq!(
            input_label(&diff(&ALTITUDE, None), UnitSystem::Us),
            "altitude ft"
        );
        assert_eq!(
            input_label(&diff(&SEAL_PER_PRESSURE, None), m),
            "seal slope N·m/kPa"
        );
    }
}
