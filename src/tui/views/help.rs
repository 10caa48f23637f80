//! The help overlay (`?`): every key (from the key table,
//! [`crate::tui::keys`]), and the safety cautions.

use ratatui::text::Line;
use ratatui::widgets::{Block, Paragraph};
use ratatui::Frame;

use super::popup;
use crate::tui::app::App;
use crate::tui::keys;

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

/// The help text as lines `width` wide, wrapped under their own column:
/// the key table's entries by section, the mouse, then the safety cautions.
pub fn help_lines(width: u16) -> Vec<Line<'static>> {
    let width = width as usize;
    let entries = keys::help_entries();
    let key_w = entries
        .iter()
        .map(|(_, k, _)| *k)
        .chain(keys::MOUSE.iter().map(|(k, _)| *k))
        .map(|k| k.chars().count())
        .max()
        .unwrap_or(0)
        .min(width / 3);
    let indent = key_w + 4;
    let mut lines = Vec::new();
    let entry = |lines: &mut Vec<Line<'static>>, k: &str, what: &str| {
        for (i, part) in wrap(what, width.saturating_sub(indent))
            .into_iter()
            .enumerate()
        {
            let key = if i == 0 { k } else { "" };
            lines.push(Line::raw(format!("  {key:<key_w$}  {part}")));
        }
    };
    let mut section = "";
    for (s, k, what) in &entries {
        if *s != section {
            if !section.is_empty() {
                lines.push(Line::raw(""));
            }
            lines.push(Line::raw(*s));
            section = s;
        }
        entry(&mut lines, k, what);
    }
    lines.push(Line::raw(""));
    lines.push(Line::raw("Mouse"));
    for (k, what) in keys::MOUSE {
        entry(&mut lines, k, what);
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
        .title_bottom(Line::from(super::keys_line(app)))
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
