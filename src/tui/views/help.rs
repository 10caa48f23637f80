//! The help overlay (`?`): every key, and the safety cautions.

use ratatui::text::Line;
use ratatui::widgets::{Block, Paragraph};
use ratatui::Frame;

use super::popup;
use crate::tui::app::App;

/// Every key the interface takes, as (keys, what they do).
pub const KEYS: &[(&str, &str)] = &[
    ("↑ ↓  Home End", "select a field in the list"),
    ("← →", "nudge the value a fine step (choices: change)"),
    ("Shift+← →", "nudge a coarse step (ten fine steps)"),
    (
        "Alt+← →",
        "nudge a finer step (a tenth of a fine step; Ctrl+← → too); the hint line shows all three",
    ),
    (
        "Enter",
        "type a value with its unit: 2.8bar, 45psi, 6.5in, 22deg, auto",
    ),
    (
        "",
        "a bare number is taken in the unit shown; Esc cancels, Ctrl+U clears",
    ),
    (
        "+  -",
        "add an arm (a copy of the selected one) / remove the selected arm; arms are spread evenly",
    ),
    (
        "a",
        "arms together (one block edits every arm, azimuths evenly spread) / apart (each arm on its own); joining needs the arms alike",
    ),
    (
        "*",
        "arms apart: copy the selected arm (radius, height, rise, tube, nozzle) to every arm; azimuths kept",
    ),
    (
        "Tab  Shift+Tab  1-5",
        "switch view: Balance, Throw, Pattern, Field, Compare",
    ),
    (
        "PgUp PgDn  wheel",
        "scroll the table or the view; the wheel over the list scrolls it",
    ),
    ("click", "select a field, or a view by its tab"),
    (
        "p  r  f  t",
        "Field view: type the measured pressure, rotation (40rpm, 1.5s, 10/14.2s), flow (12L/min, 5L in 30s), wetted radius",
    ),
    (
        "n  x",
        "Field view: add the reading above to the table of readings / drop the last row; the table is fitted (running friction, brake)",
    ),
    (
        "d",
        "Field view: type the coast-down, seconds at each completed turn after the water is shut off (0.9, 1.9, 3.0)",
    ),
    (
        "k",
        "Field view: keep the readings when another file opens (they are cleared otherwise)",
    ),
    (
        "g",
        "which value of the selected input gives a goal: type a speed (30rpm) or a throw (11m, 36ft); the nearest value is applied",
    ),
    (
        "m  e",
        "mark inputs free for a design search (◆ in the list) / open the search: ranges, goals, what to make largest; Enter runs it, Esc cancels",
    ),
    (
        "",
        "found designs: c pins one for Compare, Enter applies it, e goes back to the goals",
    ),
    ("z  Z", "undo / redo the last edit (goals and applied searches too)"),
    ("c", "pin the current design for Compare"),
    (
        "[ ]  < >  x",
        "Compare view: pick a pin (▸) / move it left or right (the first is the baseline) / drop it",
    ),
    ("u", "switch between metric and US units"),
    ("s  S", "save / save as: only changed values change, comments stay; the old file is kept as .bak"),
    (
        "o",
        "open a scenario from scenarios/ or this folder (c there: add to Compare)",
    ),
    ("?", "this help; any key closes it"),
    (
        "q  Ctrl+C",
        "quit (asks first when there are unsaved changes)",
    ),
];

/// Safety cautions shown with the help.
pub const CAUTIONS: &[&str] = &[
    "Jets and spinning arms can injure eyes: keep faces away from a running head, wear eye protection when testing.",
    "Shut off and depressurise the supply before servicing a head, a nozzle or a hose.",
    "On drinking-water supplies fit the backflow prevention your water authority requires.",
    "Controllers, pumps and valves near water: keep them dry, protected and to electrical code.",
    "Keep jets clear of overhead power lines; never let a jet reach one.",
    "This tool estimates; local codes and licensed practice take precedence over its numbers.",
];

/// Splits `text` into lines of at most `width` characters at spaces.
fn wrap(text: &str, width: usize) -> Vec<String> {
    let width = width.max(10);
    let mut out = Vec::new();
    let mut line = String::new();
    for word in text.split_whitespace() {
        let n = line.chars().count();
        if n > 0 && n + 1 + word.chars().count() > width {
            out.push(std::mem::take(&mut line));
        }
        if !line.is_empty() {
            line.push(' ');
        }
        line.push_str(word);
    }
    if !line.is_empty() || out.is_empty() {
        out.push(line);
    }
    out
}

/// The help text as lines `width` wide, wrapped under their own column.
pub fn help_lines(width: u16) -> Vec<Line<'static>> {
    let width = width as usize;
    let key_w = KEYS
        .iter()
        .map(|(k, _)| k.chars().count())
        .max()
        .unwrap_or(0)
        .min(width / 3);
    let indent = key_w + 4;
    let mut lines = vec![Line::raw("Keys")];
    for (k, what) in KEYS {
        for (i, part) in wrap(what, width.saturating_sub(indent))
            .into_iter()
            .enumerate()
        {
            let key = if i == 0 { *k } else { "" };
            lines.push(Line::raw(format!("  {key:<key_w$}  {part}")));
        }
    }
    lines.push(Line::raw(""));
    lines.push(Line::raw("Safety"));
    for c in CAUTIONS {
        for (i, part) in wrap(c, width.saturating_sub(4)).into_iter().enumerate() {
            let bullet = if i == 0 { "•" } else { " " };
            lines.push(Line::raw(format!("  {bullet} {part}")));
        }
    }
    lines
}

/// Draws the help overlay, scrolled by `scroll` lines.
pub fn draw(app: &App, frame: &mut Frame, scroll: u16) {
    let area = frame.area();
    let w = area.width.saturating_sub(4).min(100);
    let h = area.height.saturating_sub(2);
    let r = popup(frame, w, h);
    let block = Block::bordered()
        .title(Line::from(" help "))
        .title_bottom(Line::from(" ↑↓ scroll · any other key closes "))
        .border_style(app.theme.heading());
    let inner_w = w.saturating_sub(2);
    let lines = help_lines(inner_w);
    // Rows the text takes once wrapped, to stop the scroll at its end.
    let per_row = inner_w.max(1) as usize;
    let rows: usize = lines
        .iter()
        .map(|l| l.width().div_ceil(per_row).max(1))
        .sum();
    let max = (rows as u16).saturating_sub(h.saturating_sub(2));
    frame.render_widget(
        Paragraph::new(lines)
            .scroll((scroll.min(max), 0))
            .block(block),
        r,
    );
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn help_names_every_caution_and_fits_its_width() {
        let text: Vec<String> = help_lines(60).iter().map(|l| l.to_string()).collect();
        assert!(text.iter().all(|l| l.chars().count() <= 60), "{text:#?}");
        let all = text.join(" ");
        for word in [
            "eye",
            "depressurise",
            "backflow",
            "electrical",
            "power lines",
            "local codes",
        ] {
            assert!(all.contains(word), "{word} missing from the help");
        }
    }
}
