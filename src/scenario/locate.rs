//! Where a field path stands in the scenario text: the line of
//! `rotor.arms[1].nozzle.diameter`, so a validation message can name it.
//!
//! Validation ([`super::Scenario::to_design`]) works on the parsed values,
//! which have lost their place in the file. This module walks the RON text
//! once, the way the file's shape nests (groups in `(…)`, lists in `[…]`,
//! `name: value` fields), and records the line where each field path begins.
//! Paths are spelt as validation spells them: struct fields joined by dots,
//! list elements as `[i]`, enum kinds kept (`supply.Line.bore`,
//! `friction.bearing.Washer.inner`), unit tags left out (`mm(…)` adds
//! nothing). A path the file does not spell out (a field left to its
//! default) is looked up by its nearest written parent.

use std::collections::HashMap;

use super::tags::is_unit_tag;

/// The line (1-based) where each field path of a RON scenario text begins.
#[derive(Debug, Default)]
pub struct Lines(HashMap<String, usize>);

impl Lines {
    /// Scan `text`. Never fails: text that is not well formed (it would not
    /// have parsed) simply yields fewer paths.
    pub fn scan(text: &str) -> Lines {
        Scanner::new(text).run()
    }

    /// The line of `path`, or of its nearest parent written in the file.
    pub fn line_of(&self, path: &str) -> Option<usize> {
        let mut p = path;
        loop {
            if let Some(line) = self.0.get(p) {
                return Some(*line);
            }
            // Drop the last `.name` or `[i]`.
            let cut = p.rfind(['.', '['])?;
            p = p.get(..cut)?;
        }
    }
}

/// Where the first thing that is not a blank or a comment begins: its line
/// and the rest of that line. `None` for a text of blanks and comments only.
pub fn first_token(text: &str) -> Option<(usize, &str)> {
    let mut s = Scanner::new(text);
    s.skip_blank();
    let &(start, _) = s.chars.peek()?;
    let rest = text.get(start..)?;
    Some((s.line, rest.lines().next().unwrap_or(rest)))
}

#[derive(Debug)]
enum Frame {
    /// A group `(…)`: fields `name: value`, or a tuple such as a tag's number.
    Group { path: String, key: Option<String> },
    /// A list `[…]` and the index of the element being read.
    List { path: String, index: usize },
}

struct Scanner<'a> {
    chars: std::iter::Peekable<std::str::CharIndices<'a>>,
    text: &'a str,
    line: usize,
    stack: Vec<Frame>,
    lines: HashMap<String, usize>,
    /// In a list, whether the current element's line is already recorded.
    element_seen: bool,
}

fn join(parent: &str, name: &str) -> String {
    if parent.is_empty() {
        name.to_string()
    } else {
        format!("{parent}.{name}")
    }
}

impl<'a> Scanner<'a> {
    fn new(text: &'a str) -> Self {
        Scanner {
            chars: text.char_indices().peekable(),
            text,
            line: 1,
            stack: Vec::new(),
            lines: HashMap::new(),
            element_seen: false,
        }
    }

    fn bump(&mut self) -> Option<char> {
        let (_, c) = self.chars.next()?;
        if c == '\n' {
            self.line += 1;
        }
        Some(c)
    }

    /// Skips white space and comments (`//` to the end of the line, nested `/* */`).
    fn skip_blank(&mut self) {
        loop {
            match self.chars.peek().map(|&(_, c)| c) {
                Some(c) if c.is_whitespace() => {
                    self.bump();
                }
                Some('/') => {
                    let mut ahead = self.chars.clone();
                    ahead.next();
                    match ahead.peek().map(|&(_, c)| c) {
                        Some('/') => {
                            while let Some(c) = self.bump() {
                                if c == '\n' {
                                    break;
                                }
                            }
                        }
                        Some('*') => {
                            self.bump();
                            self.bump();
                            let mut depth = 1usize;
                            let mut last = ' ';
                            while let Some(c) = self.bump() {
                                if last == '*' && c == '/' {
                                    depth -= 1;
                                    if depth == 0 {
                                        break;
                                    }
                                    last = ' ';
                                    continue;
                                }
                                if last == '/' && c == '*' {
                                    depth += 1;
                                    last = ' ';
                                    continue;
                                }
                                last = c;
                            }
                        }
                        _ => return,
                    }
                }
                _ => return,
            }
        }
    }

    /// The path of the value that starts here.
    fn value_path(&self) -> Option<String> {
        match self.stack.last() {
            None => Some(String::new()),
            Some(Frame::Group { key, .. }) => key.clone(),
            Some(Frame::List { path, index }) => Some(format!("{path}[{index}]")),
        }
    }

    /// A value begins on the current line: in a list, record the element.
    fn value_starts(&mut self) {
        if let Some(Frame::List { path, index }) = self.stack.last() {
            if !self.element_seen {
                let p = format!("{path}[{index}]");
                self.lines.entry(p).or_insert(self.line);
                self.element_seen = true;
            }
        }
    }

    fn record(&mut self, path: &str, line: usize) {
        if !path.is_empty() {
            self.lines.entry(path.to_string()).or_insert(line);
        }
    }

    fn run(mut self) -> Lines {
        loop {
            self.skip_blank();
            let Some(&(start, c)) = self.chars.peek() else {
                break;
            };
            match c {
                '(' => {
                    self.value_starts();
                    self.bump();
                    let path = self.value_path().unwrap_or_default();
                    self.stack.push(Frame::Group { path, key: None });
                }
                '[' => {
                    self.value_starts();
                    self.bump();
                    let path = self.value_path().unwrap_or_default();
                    self.stack.push(Frame::List { path, index: 0 });
                    self.element_seen = false;
                }
                ')' | ']' => {
                    self.bump();
                    self.stack.pop();
                    self.element_seen = true;
                }
                ',' => {
                    self.bump();
                    match self.stack.last_mut() {
                        Some(Frame::List { index, .. }) => {
                            *index += 1;
                            self.element_seen = false;
                        }
                        Some(Frame::Group { key, .. }) => *key = None,
                        None => {}
                    }
                }
                '"' => {
                    self.value_starts();
                    self.bump();
                    let mut escaped = false;
                    while let Some(c) = self.bump() {
                        match (escaped, c) {
                            (false, '\\') => escaped = true,
                            (false, '"') => break,
                            _ => escaped = false,
                        }
                    }
                }
                c if c.is_alphabetic() || c == '_' => {
                    let line = self.line;
                    let mut end = start;
                    while let Some(&(i, c)) = self.chars.peek() {
                        if c.is_alphanumeric() || c == '_' {
                            end = i + c.len_utf8();
                            self.bump();
                        } else {
                            break;
                        }
                    }
                    let word = self.text.get(start..end).unwrap_or_default().to_string();
                    self.skip_blank();
                    match self.chars.peek().map(|&(_, c)| c) {
                        Some(':') => {
                            self.bump();
                            if let Some(Frame::Group { path, key }) = self.stack.last_mut() {
                                let p = join(path, &word);
                                *key = Some(p.clone());
                                self.record(&p, line);
                            }
                        }
                        Some('(') => {
                            self.value_starts();
                            self.bump();
                            let outer = self.value_path();
                            let top_level = self.stack.is_empty();
                            let path = match outer {
                                // The scenario's own name and the unit tags add no segment.
                                Some(p) if top_level || is_unit_tag(&word) || word == "um" => p,
                                Some(p) => {
                                    let p = join(&p, &word);
                                    self.record(&p, line);
                                    p
                                }
                                None => String::new(),
                            };
                            self.stack.push(Frame::Group { path, key: None });
                        }
                        _ => self.value_starts(),
                    }
                }
                _ => {
                    // Numbers, signs, `#![…]` attributes: part of a value.
                    self.value_starts();
                    self.bump();
                }
            }
        }
        Lines(self.lines)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    const TEXT: &str = "// a comment with rotor.arms: (\n\
Scenario(\n\
    name: \"a (b) [c]\",\n\
    supply: Line(source: kPa(400), length: m(15),\n\
        bore: mm(16), roughness: mm(0.0015), minor_k: 2.0, lift: m(0.5)),\n\
    rotor: (\n\
        hub_radius: mm(12),\n\
        arms: [\n\
            (radius: mm(160), /* ( */ nozzle: (diameter: mm(2.4))),\n\
            (\n\
                radius: mm(150),\n\
                nozzle: (\n\
                    diameter: mm(7),\n\
                ),\n\
            ),\n\
        ],\n\
        inertia: Given(kg_m2(0.0012)),\n\
    ),\n\
    friction: (bearing: Washer(mu_kinetic: 0.1,\n\
        inner: mm(4))),\n\
)\n";

    #[test]
    fn finds_the_line_of_each_field() {
        let lines = Lines::scan(TEXT);
        let at = |p: &str| lines.line_of(p);
        assert_eq!(at("name"), Some(3));
        assert_eq!(at("supply"), Some(4));
        assert_eq!(at("supply.Line"), Some(4));
        assert_eq!(at("supply.Line.source"), Some(4));
        assert_eq!(at("supply.Line.bore"), Some(5));
        assert_eq!(at("supply.Line.lift"), Some(5));
        assert_eq!(at("rotor.hub_radius"), Some(7));
        assert_eq!(at("rotor.arms"), Some(8));
        assert_eq!(at("rotor.arms[0]"), Some(9));
        assert_eq!(at("rotor.arms[0].nozzle.diameter"), Some(9));
        assert_eq!(at("rotor.arms[1]"), Some(10));
        assert_eq!(at("rotor.arms[1].radius"), Some(11));
        assert_eq!(at("rotor.arms[1].nozzle.diameter"), Some(13));
        assert_eq!(at("rotor.inertia.Given"), Some(17));
        assert_eq!(at("friction.bearing.Washer.mu_kinetic"), Some(19));
        assert_eq!(at("friction.bearing.Washer.inner"), Some(20));
    }

    #[test]
    fn a_field_left_to_its_default_takes_its_parents_line() {
        let lines = Lines::scan(TEXT);
        // `height` is not written: the arm's own line.
        assert_eq!(lines.line_of("rotor.arms[1].height"), Some(10));
        assert_eq!(lines.line_of("rotor.arms[1].tube.bore"), Some(10));
        // Not in the file at all.
        assert_eq!(lines.line_of("water.temperature"), None);
    }

    #[test]
    fn the_first_token_skips_comments() {
        assert_eq!(first_token(TEXT), Some((2, "Scenario(")));
        assert_eq!(first_token("  \n// only\n/* a\n */ \n"), None);
        assert_eq!(first_token(""), None);
        assert_eq!(first_token("\n\nx_m,y_m\n1,2"), Some((3, "x_m,y_m")));
    }

    #[test]
    fn broken_text_does_not_panic() {
        for text in [
            "", "(", ")))", "[[[,,", "a: b: (", "\"open", "/* open", "é(ü:",
        ] {
            let _ = Lines::scan(text).line_of("a.b[0]");
        }
    }
}
