//! Saving over a file a person wrote: only the values that changed change.
//!
//! A scenario file is something its author keeps: comments that say where a
//! number came from, the order and spacing they chose, their own unit tags,
//! `notes`. Rewriting the whole file from a [`Scenario`] would throw all of
//! that away, so every save of a design that came from a file goes through
//! [`edit_in_place`]:
//!
//! 1. the original text is read into a tree of values that remembers where
//!    each value sits in the text (comments and spacing are left alone);
//! 2. the original scenario (with its defaults filled in) and the new one are
//!    written out by the fresh writer and read into the same kind of tree;
//! 3. the trees are walked side by side. A value that means the same (the
//!    same SI quantity within 10⁻⁹, the same text, the same word) is left as
//!    it is written. A changed quantity keeps the file's unit tag and only its
//!    number is rewritten; a changed value of any other kind (a bare
//!    coefficient, `Auto`, a different supply kind) is replaced by the new
//!    value's text in the new scenario's units. A field the file left out
//!    (an optional section at its default) is inserted after the field before
//!    it, in the file's own layout, only when the new value differs from the
//!    default; a field the new scenario drops (`rise`, `layout`) is removed
//!    with its line. An added arm is a copy of the file's last arm (without
//!    its comments) edited to the new values; a removed arm goes with its lines.
//! 4. the edited text is read back and must describe the new scenario; if it
//!    does not (or the original cannot be read), the edit is refused and
//!    [`scenario_text`] falls back to the fresh writer, saying why.
//!
//! A file written from nothing uses the fresh writer
//! ([`Scenario::to_ron_string`]). [`save_scenario`] does either and writes
//! through [`save_atomic`](super::save_atomic).

use std::path::Path;

use super::tags::{
    tidy, Angle, Area, Density, FlowRate, Length, Mass, MomentOfInertia, Pressure, Speed,
    Temperature, Torque,
};
use super::{save_atomic, Scenario, ScenarioError};

/// How a scenario's text was made.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Written {
    /// The original text with only the changed values edited: comments,
    /// order, blank lines and notes as the author left them.
    InPlace,
    /// Written from nothing: there was no original text.
    Fresh,
    /// Written from nothing because the original text could not be edited in
    /// place; the reason.
    Rewritten(String),
}

/// A scenario's text and how it was made.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct ScenarioText {
    /// The text to write.
    pub text: String,
    /// How it was made.
    pub written: Written,
}

/// Why a file could not be edited in place.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[error("{0}")]
pub struct EditError(String);

/// The text for `new`: `original` edited in place when there is one (see the
/// module docs), else the fresh writer's text. Never fails: when the original
/// cannot be edited, the fresh text is returned with the reason.
pub fn scenario_text(original: Option<&str>, new: &Scenario) -> ScenarioText {
    match original {
        None => ScenarioText {
            text: new.to_ron_string(),
            written: Written::Fresh,
        },
        Some(orig) => match edit_in_place(orig, new) {
            Ok(text) => ScenarioText {
                text,
                written: Written::InPlace,
            },
            Err(e) => ScenarioText {
                text: new.to_ron_string(),
                written: Written::Rewritten(e.to_string()),
            },
        },
    }
}

/// Saves `new` to `path` atomically (temp file, sync, rename, `FILE.bak`),
/// as [`scenario_text`] makes it from `original` (the text the design was
/// read from, or None for a design made from nothing).
pub fn save_scenario(
    path: impl AsRef<Path>,
    original: Option<&str>,
    new: &Scenario,
) -> Result<ScenarioText, ScenarioError> {
    let out = scenario_text(original, new);
    save_atomic(path, &out.text)?;
    Ok(out)
}

/// `original` with only the values that differ from `new` changed (see the
/// module docs). Fails when the original is not a readable scenario, or when
/// the edited text would not read back as `new`.
pub fn edit_in_place(original: &str, new: &Scenario) -> Result<String, EditError> {
    let options = ron::Options::default();
    let old_text = original.strip_prefix('\u{feff}').unwrap_or(original);
    let old_scenario = super::parse(old_text, "original", &options)
        .map_err(|e| EditError(format!("the original text does not read: {e}")))?;
    let old_tree = parse_tree(original)
        .map_err(|e| EditError(format!("the original text does not read: {e}")))?;
    let full_tree = fresh_tree(&old_scenario)?;
    let new_tree = fresh_tree(new)?;

    let mut editor = Editor::new(original);
    editor.node(&old_tree, Some(&full_tree), &new_tree)?;
    let text = editor.apply()?;

    // The edit must say exactly what the new scenario says.
    let body = text.strip_prefix('\u{feff}').unwrap_or(&text);
    let back = super::parse(body, "edited text", &options)
        .map_err(|e| EditError(format!("the edited text does not read back: {e}")))?;
    if !same(&fresh_tree(&back)?, &new_tree) {
        return Err(EditError(
            "the edited text does not read back as the new design".to_string(),
        ));
    }
    Ok(text)
}

fn fresh_tree(scenario: &Scenario) -> Result<Node, EditError> {
    parse_tree(&scenario.to_ron_string()).map_err(|e| {
        EditError(format!(
            "internal: the fresh writer's text does not read: {e}"
        ))
    })
}

// ---------------------------------------------------------------------------
// A tree of RON values that remembers where each sits in the text.

#[derive(Debug, Clone)]
struct Node {
    start: usize,
    end: usize,
    kind: Kind,
}

#[derive(Debug, Clone)]
enum Kind {
    /// A number, with its text (to keep `2.0` looking like `2.0`).
    Number(f64, String),
    /// A quoted text, decoded.
    Text(String),
    /// A bare word: `Auto`, `true`, `UniformWear`.
    Word(String),
    /// `Name(…)` or `(…)`.
    Group {
        name: Option<String>,
        open: usize,
        body: Body,
    },
    /// `[…]`.
    List { open: usize, items: Vec<Node> },
}

#[derive(Debug, Clone)]
enum Body {
    Fields(Vec<Field>),
    Items(Vec<Node>),
}

#[derive(Debug, Clone)]
struct Field {
    key: String,
    key_start: usize,
    value: Node,
}

fn parse_tree(text: &str) -> Result<Node, String> {
    let mut p = Parser::new(text);
    let node = p.value()?;
    p.trivia()?;
    if p.pos < p.b.len() {
        return Err(format!("unexpected text at byte {}", p.pos));
    }
    Ok(node)
}

struct Parser<'a> {
    s: &'a str,
    b: &'a [u8],
    pos: usize,
    /// Byte ranges of every comment, in order.
    comments: Vec<(usize, usize)>,
}

impl<'a> Parser<'a> {
    fn new(s: &'a str) -> Self {
        Parser {
            s,
            b: s.as_bytes(),
            pos: 0,
            comments: Vec::new(),
        }
    }

    fn at(&self, i: usize) -> Option<u8> {
        self.b.get(i).copied()
    }

    fn peek(&self) -> Option<u8> {
        self.at(self.pos)
    }

    fn starts(&self, pat: &str) -> bool {
        self.s.get(self.pos..).is_some_and(|r| r.starts_with(pat))
    }

    /// Skips white space, comments (recorded), a byte-order mark and `#![…]`
    /// attributes.
    fn trivia(&mut self) -> Result<(), String> {
        loop {
            if self.starts("\u{feff}") {
                self.pos += 3;
            } else if self.peek().is_some_and(|c| c.is_ascii_whitespace()) {
                self.pos += 1;
            } else if self.starts("//") {
                let start = self.pos;
                while self.peek().is_some_and(|c| c != b'\n') {
                    self.pos += 1;
                }
                // A line comment ends before the line break (and its `\r`).
                let mut end = self.pos;
                if end > start && self.at(end - 1) == Some(b'\r') {
                    end -= 1;
                }
                self.comments.push((start, end));
            } else if self.starts("/*") {
                let start = self.pos;
                self.pos += 2;
                let mut depth = 1;
                while depth > 0 {
                    if self.starts("/*") {
                        depth += 1;
                        self.pos += 2;
                    } else if self.starts("*/") {
                        depth -= 1;
                        self.pos += 2;
                    } else if self.peek().is_some() {
                        self.pos += 1;
                    } else {
                        return Err("a /* comment is not closed".into());
                    }
                }
                self.comments.push((start, self.pos));
            } else if self.starts("#![") {
                while self.peek().is_some_and(|c| c != b']') {
                    self.pos += 1;
                }
                if self.peek().is_none() {
                    return Err("an attribute is not closed".into());
                }
                self.pos += 1;
            } else {
                return Ok(());
            }
        }
    }

    fn value(&mut self) -> Result<Node, String> {
        self.trivia()?;
        let start = self.pos;
        match self.peek() {
            Some(b'(') => self.group(None, start),
            Some(b'[') => self.list(start),
            Some(b'"') => self.string(start),
            Some(b'\'') => self.char_literal(start),
            Some(b'r') if self.raw_string_ahead() => self.raw_string(start),
            Some(c) if c.is_ascii_digit() || c == b'-' || c == b'+' || c == b'.' => {
                self.number(start)
            }
            Some(c) if c.is_ascii_alphabetic() || c == b'_' => {
                let name = self.ident()?;
                let word_end = self.pos;
                self.trivia()?;
                if self.peek() == Some(b'(') {
                    self.group(Some(name), start)
                } else {
                    self.pos = word_end;
                    Ok(Node {
                        start,
                        end: word_end,
                        kind: Kind::Word(name),
                    })
                }
            }
            Some(c) => Err(format!(
                "unexpected `{}` at byte {}",
                char::from(c),
                self.pos
            )),
            None => Err("the text ends where a value was expected".into()),
        }
    }

    fn raw_string_ahead(&self) -> bool {
        let mut i = self.pos + 1;
        while self.at(i) == Some(b'#') {
            i += 1;
        }
        self.at(i) == Some(b'"')
    }

    /// An identifier, with an optional `r#` prefix (dropped).
    fn ident(&mut self) -> Result<String, String> {
        if self.starts("r#") {
            self.pos += 2;
        }
        let start = self.pos;
        while self
            .peek()
            .is_some_and(|c| c.is_ascii_alphanumeric() || c == b'_')
        {
            self.pos += 1;
        }
        if self.pos == start {
            return Err(format!("expected a name at byte {start}"));
        }
        Ok(self.s.get(start..self.pos).unwrap_or_default().to_string())
    }

    fn group(&mut self, name: Option<String>, start: usize) -> Result<Node, String> {
        let open = self.pos;
        self.pos += 1;
        self.trivia()?;
        let is_fields = {
            let save = self.pos;
            let saved_comments = self.comments.len();
            let fields = self
                .peek()
                .is_some_and(|c| c.is_ascii_alphabetic() || c == b'_')
                && self.ident().is_ok()
                && self.trivia().is_ok()
                && self.peek() == Some(b':');
            self.pos = save;
            self.comments.truncate(saved_comments);
            fields
        };
        let body = if is_fields {
            let mut fields = Vec::new();
            loop {
                self.trivia()?;
                if self.peek() == Some(b')') {
                    break;
                }
                let key_start = self.pos;
                let key = self.ident()?;
                self.trivia()?;
                if self.peek() != Some(b':') {
                    return Err(format!("expected `:` after `{key}`"));
                }
                self.pos += 1;
                let value = self.value()?;
                fields.push(Field {
                    key,
                    key_start,
                    value,
                });
                if !self.separator(b')')? {
                    break;
                }
            }
            Body::Fields(fields)
        } else {
            Body::Items(self.items(b')')?)
        };
        self.close(b')')?;
        Ok(Node {
            start,
            end: self.pos,
            kind: Kind::Group { name, open, body },
        })
    }

    fn list(&mut self, start: usize) -> Result<Node, String> {
        let open = self.pos;
        self.pos += 1;
        let items = self.items(b']')?;
        self.close(b']')?;
        Ok(Node {
            start,
            end: self.pos,
            kind: Kind::List { open, items },
        })
    }

    fn items(&mut self, end: u8) -> Result<Vec<Node>, String> {
        let mut items = Vec::new();
        loop {
            self.trivia()?;
            if self.peek() == Some(end) {
                break;
            }
            items.push(self.value()?);
            if !self.separator(end)? {
                break;
            }
        }
        Ok(items)
    }

    /// After a value: true after a comma, false before the closing `end`.
    fn separator(&mut self, end: u8) -> Result<bool, String> {
        self.trivia()?;
        match self.peek() {
            Some(b',') => {
                self.pos += 1;
                Ok(true)
            }
            Some(c) if c == end => Ok(false),
            _ => Err(format!(
                "expected `,` or `{}` at byte {}",
                char::from(end),
                self.pos
            )),
        }
    }

    fn close(&mut self, end: u8) -> Result<(), String> {
        self.trivia()?;
        if self.peek() == Some(end) {
            self.pos += 1;
            Ok(())
        } else {
            Err(format!(
                "expected `{}` at byte {}",
                char::from(end),
                self.pos
            ))
        }
    }

    fn number(&mut self, start: usize) -> Result<Node, String> {
        if matches!(self.peek(), Some(b'-' | b'+')) {
            self.pos += 1;
        }
        let hex = self.starts("0x") || self.starts("0X");
        while let Some(c) = self.peek() {
            let exponent_sign = !hex
                && (c == b'-' || c == b'+')
                && matches!(self.at(self.pos - 1), Some(b'e' | b'E'));
            if c.is_ascii_alphanumeric() || c == b'.' || c == b'_' || exponent_sign {
                self.pos += 1;
            } else {
                break;
            }
        }
        let text = self.s.get(start..self.pos).unwrap_or_default().to_string();
        let value = number_value(&text).ok_or_else(|| format!("`{text}` is not a number"))?;
        Ok(Node {
            start,
            end: self.pos,
            kind: Kind::Number(value, text),
        })
    }

    fn string(&mut self, start: usize) -> Result<Node, String> {
        self.pos += 1;
        let mut out = String::new();
        loop {
            let rest = self.s.get(self.pos..).unwrap_or_default();
            let mut chars = rest.chars();
            match chars.next() {
                None => return Err("a quoted text is not closed".into()),
                Some('"') => {
                    self.pos += 1;
                    break;
                }
                Some('\\') => {
                    let Some(e) = chars.next() else {
                        return Err("a quoted text is not closed".into());
                    };
                    self.pos += 1 + e.len_utf8();
                    match e {
                        'n' => out.push('\n'),
                        't' => out.push('\t'),
                        'r' => out.push('\r'),
                        '0' => out.push('\0'),
                        'u' | 'x' => {
                            // `\u{…}` or `\xHH`: keep the escape as written;
                            // texts are compared as written then.
                            out.push('\\');
                            out.push(e);
                        }
                        other => out.push(other),
                    }
                }
                Some(c) => {
                    out.push(c);
                    self.pos += c.len_utf8();
                }
            }
        }
        Ok(Node {
            start,
            end: self.pos,
            kind: Kind::Text(out),
        })
    }

    fn raw_string(&mut self, start: usize) -> Result<Node, String> {
        self.pos += 1;
        let mut hashes = 0;
        while self.peek() == Some(b'#') {
            hashes += 1;
            self.pos += 1;
        }
        self.pos += 1; // the opening quote
        let closing = format!("\"{}", "#".repeat(hashes));
        let rest = self.s.get(self.pos..).unwrap_or_default();
        let Some(len) = rest.find(&closing) else {
            return Err("a raw text is not closed".into());
        };
        let body = rest.get(..len).unwrap_or_default().to_string();
        self.pos += len + closing.len();
        Ok(Node {
            start,
            end: self.pos,
            kind: Kind::Text(body),
        })
    }

    fn char_literal(&mut self, start: usize) -> Result<Node, String> {
        let rest = self.s.get(self.pos + 1..).unwrap_or_default();
        let Some(len) = rest.find('\'') else {
            return Err("a character is not closed".into());
        };
        let body = rest.get(..len).unwrap_or_default().to_string();
        self.pos += len + 2;
        Ok(Node {
            start,
            end: self.pos,
            kind: Kind::Text(body),
        })
    }
}

fn number_value(text: &str) -> Option<f64> {
    let t: String = text.chars().filter(|&c| c != '_').collect();
    let (neg, digits) = match t.strip_prefix('-') {
        Some(r) => (true, r),
        None => (false, t.strip_prefix('+').unwrap_or(&t)),
    };
    let v = if let Some(h) = digits
        .strip_prefix("0x")
        .or_else(|| digits.strip_prefix("0X"))
    {
        i64::from_str_radix(h, 16).ok()? as f64
    } else if let Some(b) = digits.strip_prefix("0b") {
        i64::from_str_radix(b, 2).ok()? as f64
    } else if let Some(o) = digits.strip_prefix("0o") {
        i64::from_str_radix(o, 8).ok()? as f64
    } else {
        digits.parse::<f64>().ok()?
    };
    Some(if neg { -v } else { v })
}

// ---------------------------------------------------------------------------
// Meaning: when two values say the same.

/// A dimension, by the index of its tag family.
type Dim = u8;

/// The SI value of `tag(number)` and its dimension, for a known unit tag.
fn tag_si(tag: &str, number: f64) -> Option<(Dim, f64)> {
    if tag == "um" {
        // A drop size in micrometres.
        return Some((0, number * 1.0e-6));
    }
    Length::from_tag(tag, number)
        .map(|x| (0, x.si()))
        .or_else(|| Pressure::from_tag(tag, number).map(|x| (1, x.si())))
        .or_else(|| FlowRate::from_tag(tag, number).map(|x| (2, x.si())))
        .or_else(|| Angle::from_tag(tag, number).map(|x| (3, x.si())))
        .or_else(|| Temperature::from_tag(tag, number).map(|x| (4, x.si())))
        .or_else(|| Torque::from_tag(tag, number).map(|x| (5, x.si())))
        .or_else(|| Mass::from_tag(tag, number).map(|x| (6, x.si())))
        .or_else(|| Area::from_tag(tag, number).map(|x| (7, x.si())))
        .or_else(|| Speed::from_tag(tag, number).map(|x| (8, x.si())))
        .or_else(|| MomentOfInertia::from_tag(tag, number).map(|x| (9, x.si())))
        .or_else(|| Density::from_tag(tag, number).map(|x| (10, x.si())))
}

/// The number that, tagged `tag`, is the SI value `si`.
fn tag_number(tag: &str, si: f64) -> Option<f64> {
    if tag == "um" {
        return Some(tidy(si * 1.0e6));
    }
    let n = |x: Option<f64>| x;
    n(Length::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Pressure::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| FlowRate::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Angle::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Temperature::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Torque::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Mass::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Area::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Speed::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| MomentOfInertia::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
        .or_else(|| Density::from_tag(tag, 0.0).map(|x| x.with_si(si).number()))
}

/// A unit-tagged quantity `tag(number)`: (dimension, SI value, the number's node).
fn quantity(node: &Node) -> Option<(Dim, f64, &Node)> {
    let Kind::Group {
        name: Some(tag),
        body: Body::Items(items),
        ..
    } = &node.kind
    else {
        return None;
    };
    let [inner] = items.as_slice() else {
        return None;
    };
    let Kind::Number(v, _) = inner.kind else {
        return None;
    };
    tag_si(tag, v).map(|(d, si)| (d, si, inner))
}

/// Equal within 10⁻⁹ relative: a value written in another unit and read back.
fn close(a: f64, b: f64) -> bool {
    a == b || (a - b).abs() <= 1e-9 * a.abs().max(b.abs())
}

/// A struct's name may be left out in a file (`(…)` for `Water(…)`).
fn names_match(a: &Option<String>, b: &Option<String>) -> bool {
    match (a, b) {
        (Some(x), Some(y)) => x == y,
        _ => true,
    }
}

/// Whether two values say the same.
fn same(a: &Node, b: &Node) -> bool {
    match (quantity(a), quantity(b)) {
        (Some((da, sa, _)), Some((db, sb, _))) => return da == db && close(sa, sb),
        (Some(_), None) | (None, Some(_)) => return false,
        (None, None) => {}
    }
    match (&a.kind, &b.kind) {
        (Kind::Number(x, _), Kind::Number(y, _)) => close(*x, *y),
        (Kind::Text(x), Kind::Text(y)) | (Kind::Word(x), Kind::Word(y)) => x == y,
        (
            Kind::Group {
                name: na, body: ba, ..
            },
            Kind::Group {
                name: nb, body: bb, ..
            },
        ) => names_match(na, nb) && same_body(ba, bb),
        (Kind::List { items: ia, .. }, Kind::List { items: ib, .. }) => {
            ia.len() == ib.len() && ia.iter().zip(ib).all(|(x, y)| same(x, y))
        }
        _ => false,
    }
}

fn same_body(a: &Body, b: &Body) -> bool {
    match (a, b) {
        (Body::Fields(fa), Body::Fields(fb)) => {
            fa.len() == fb.len()
                && fa.iter().all(|f| {
                    fb.iter()
                        .find(|g| g.key == f.key)
                        .is_some_and(|g| same(&f.value, &g.value))
                })
        }
        (Body::Items(ia), Body::Items(ib)) => {
            ia.len() == ib.len() && ia.iter().zip(ib).all(|(x, y)| same(x, y))
        }
        (Body::Fields(f), Body::Items(i)) | (Body::Items(i), Body::Fields(f)) => {
            f.is_empty() && i.is_empty()
        }
    }
}

fn find<'n>(body: Option<&'n Body>, key: &str) -> Option<&'n Field> {
    match body {
        Some(Body::Fields(fields)) => fields.iter().find(|f| f.key == key),
        _ => None,
    }
}

fn body_of(node: Option<&Node>) -> Option<&Body> {
    match node.map(|n| &n.kind) {
        Some(Kind::Group { body, .. }) => Some(body),
        _ => None,
    }
}

// ---------------------------------------------------------------------------
// Writing values.

/// A number as a person would write it: 12 significant figures at most, and
/// with a decimal point when the text it replaces had one (`2.0` → `2.5`,
/// `3.0` → `4.0`).
fn format_number(x: f64, like: Option<&str>) -> String {
    let x = tidy(x);
    let x = if x == 0.0 { 0.0 } else { x };
    let mut s = format!("{x}");
    let wants_point = like.is_some_and(|t| t.contains('.'));
    if wants_point && !s.contains('.') {
        s.push_str(".0");
    }
    s
}

/// The compact text of a value of the fresh writer's tree.
fn render(node: &Node) -> String {
    if let Some((_, _, inner)) = quantity(node) {
        if let (
            Kind::Group {
                name: Some(tag), ..
            },
            Kind::Number(v, _),
        ) = (&node.kind, &inner.kind)
        {
            return format!("{tag}({})", format_number(*v, None));
        }
    }
    match &node.kind {
        Kind::Number(_, text) => text.clone(),
        Kind::Text(t) => quote(t),
        Kind::Word(w) => w.clone(),
        Kind::Group { name, body, .. } => {
            let inner = match body {
                Body::Fields(fields) => fields
                    .iter()
                    .map(|f| format!("{}: {}", f.key, render(&f.value)))
                    .collect::<Vec<_>>()
                    .join(", "),
                Body::Items(items) => items.iter().map(render).collect::<Vec<_>>().join(", "),
            };
            format!("{}({inner})", name.as_deref().unwrap_or(""))
        }
        Kind::List { items, .. } => format!(
            "[{}]",
            items.iter().map(render).collect::<Vec<_>>().join(", ")
        ),
    }
}

/// Lines written into a file are kept within this many columns where they can be.
const WIDTH: usize = 96;

/// [`render`], broken after the commas between a group's fields when the
/// line starting at `column` would pass [`WIDTH`]; continuation lines line up
/// after the opening parenthesis, as the shipped files write them.
fn render_wrapped(node: &Node, column: usize, nl: &str) -> String {
    let flat = render(node);
    if column + flat.chars().count() <= WIDTH {
        return flat;
    }
    let Kind::Group {
        name,
        body: Body::Fields(fields),
        ..
    } = &node.kind
    else {
        return flat;
    };
    let mut out = format!("{}(", name.as_deref().unwrap_or(""));
    let indent = column + out.chars().count();
    let mut col = indent;
    for (k, f) in fields.iter().enumerate() {
        let piece = format!("{}: {}", f.key, render(&f.value));
        let len = piece.chars().count();
        if k > 0 {
            // The piece, then a comma or the closing parenthesis.
            if col + 2 + len + 1 > WIDTH {
                out.push(',');
                out.push_str(nl);
                out.push_str(&" ".repeat(indent));
                col = indent;
            } else {
                out.push_str(", ");
                col += 2;
            }
        }
        out.push_str(&piece);
        col += len;
    }
    out.push(')');
    out
}

/// A text in double quotes, with the escapes RON reads.
fn quote(t: &str) -> String {
    let mut s = String::with_capacity(t.len() + 2);
    s.push('"');
    for c in t.chars() {
        match c {
            '"' => s.push_str("\\\""),
            '\\' => s.push_str("\\\\"),
            '\n' => s.push_str("\\n"),
            '\r' => s.push_str("\\r"),
            '\t' => s.push_str("\\t"),
            '\0' => s.push_str("\\0"),
            c => s.push(c),
        }
    }
    s.push('"');
    s
}

// ---------------------------------------------------------------------------
// The edits.

#[derive(Debug)]
struct Edit {
    start: usize,
    end: usize,
    text: String,
}

struct Editor<'a> {
    src: &'a str,
    nl: &'static str,
    edits: Vec<Edit>,
}

/// Where an entry (a field or a list item) sits: its start, the end of its
/// value, and the comma after it, if any.
#[derive(Debug, Clone, Copy)]
struct Entry {
    start: usize,
    value_end: usize,
    comma: Option<usize>,
}

impl Entry {
    /// After the comma, or after the value when there is none.
    fn end(&self) -> usize {
        self.comma.map_or(self.value_end, |c| c + 1)
    }
}

impl<'a> Editor<'a> {
    fn new(src: &'a str) -> Self {
        Editor {
            src,
            nl: if src.contains("\r\n") { "\r\n" } else { "\n" },
            edits: Vec::new(),
        }
    }

    fn replace(&mut self, start: usize, end: usize, text: String) {
        self.edits.push(Edit { start, end, text });
    }

    fn insert(&mut self, at: usize, text: String) {
        self.replace(at, at, text);
    }

    fn apply(mut self) -> Result<String, EditError> {
        // Stable: insertions at one place keep the order they were made in.
        self.edits.sort_by_key(|e| (e.start, e.end));
        let mut out = String::with_capacity(self.src.len() + 64);
        let mut at = 0;
        for e in &self.edits {
            if e.start < at {
                return Err(EditError(
                    "internal: two edits of the same text overlap".to_string(),
                ));
            }
            out.push_str(self.src.get(at..e.start).unwrap_or_default());
            out.push_str(&e.text);
            at = e.end;
        }
        out.push_str(self.src.get(at..).unwrap_or_default());
        Ok(out)
    }

    // --- positions ---------------------------------------------------------

    fn byte(&self, i: usize) -> Option<u8> {
        self.src.as_bytes().get(i).copied()
    }

    /// The next position at or after `pos` that is not white space or a comment.
    fn next_significant(&self, pos: usize) -> usize {
        let mut p = Parser::new(self.src);
        p.pos = pos;
        // An unclosed comment ends the text.
        if p.trivia().is_err() {
            return self.src.len();
        }
        p.pos
    }

    fn line_start(&self, pos: usize) -> usize {
        self.src
            .get(..pos)
            .and_then(|s| s.rfind('\n'))
            .map_or(0, |i| i + 1)
    }

    /// The end of `pos`'s line, before its `\r\n` or `\n`.
    fn line_end(&self, pos: usize) -> usize {
        let end = self
            .src
            .get(pos..)
            .and_then(|s| s.find('\n'))
            .map_or(self.src.len(), |i| pos + i);
        if end > pos && self.byte(end - 1) == Some(b'\r') {
            end - 1
        } else {
            end
        }
    }

    /// Just after `pos`'s line break (or the end of the text).
    fn after_line(&self, pos: usize) -> usize {
        self.src
            .get(pos..)
            .and_then(|s| s.find('\n'))
            .map_or(self.src.len(), |i| pos + i + 1)
    }

    /// The column of `pos` on its line, in characters.
    fn column_of(&self, pos: usize) -> usize {
        let ls = self.line_start(pos);
        self.src.get(ls..pos).map_or(0, |s| s.chars().count())
    }

    fn first_on_line(&self, pos: usize) -> bool {
        let ls = self.line_start(pos);
        self.src
            .get(ls..pos)
            .is_some_and(|s| s.trim_start_matches('\u{feff}').trim().is_empty())
    }

    /// Only white space or comments follow `pos` on its line.
    fn rest_of_line_blank(&self, pos: usize) -> bool {
        let le = self.line_end(pos);
        let next = self.next_significant(pos);
        next >= le
    }

    /// A line break between `a` and `b`.
    fn newline_between(&self, a: usize, b: usize) -> bool {
        self.src.get(a..b).is_some_and(|s| s.contains('\n'))
    }

    fn indent_of(&self, pos: usize) -> String {
        let ls = self.line_start(pos);
        self.src
            .get(ls..pos)
            .unwrap_or_default()
            .trim_start_matches('\u{feff}')
            .to_string()
    }

    fn entry(&self, start: usize, value_end: usize) -> Entry {
        let next = self.next_significant(value_end);
        Entry {
            start,
            value_end,
            comma: (self.byte(next) == Some(b',')).then_some(next),
        }
    }

    /// One entry per line, this one included.
    fn on_own_lines(&self, e: &Entry) -> bool {
        self.first_on_line(e.start) && self.newline_between(e.end(), self.next_significant(e.end()))
    }

    // --- the walk ----------------------------------------------------------

    fn node(&mut self, old: &Node, full: Option<&Node>, new: &Node) -> Result<(), EditError> {
        if same(old, new) {
            return Ok(());
        }
        if let (
            Some((d_old, _, number)),
            Some((d_new, si, _)),
            Kind::Group {
                name: Some(tag), ..
            },
        ) = (quantity(old), quantity(new), &old.kind)
        {
            if d_old == d_new {
                if let (Some(n), Kind::Number(_, written)) = (tag_number(tag, si), &number.kind) {
                    let text = format_number(n, Some(written));
                    self.replace(number.start, number.end, text);
                    return Ok(());
                }
            }
        }
        match (&old.kind, &new.kind) {
            (Kind::Number(_, written), Kind::Number(v, _)) => {
                self.replace(old.start, old.end, format_number(*v, Some(written)));
            }
            (
                Kind::Group {
                    name: na,
                    body: Body::Fields(fo),
                    open,
                },
                Kind::Group {
                    name: nb,
                    body: Body::Fields(fnew),
                    ..
                },
            ) if names_match(na, nb) => {
                self.fields(*open, fo, body_of(full), fnew)?;
            }
            (
                Kind::Group {
                    name: na,
                    body: Body::Items(io),
                    ..
                },
                Kind::Group {
                    name: nb,
                    body: Body::Items(inew),
                    ..
                },
            ) if names_match(na, nb) && io.len() == inew.len() => {
                let full_items = match body_of(full) {
                    Some(Body::Items(i)) if i.len() == io.len() => Some(i),
                    _ => None,
                };
                for (k, (o, n)) in io.iter().zip(inew).enumerate() {
                    self.node(o, full_items.and_then(|f| f.get(k)), n)?;
                }
            }
            (Kind::List { open, items: io }, Kind::List { items: inew, .. }) => {
                let full_items = match full.map(|f| &f.kind) {
                    Some(Kind::List { items, .. }) if items.len() == io.len() => Some(items),
                    _ => None,
                };
                self.list(*open, io, full_items, inew)?;
            }
            _ => {
                let column = self.column_of(old.start);
                self.replace(old.start, old.end, render_wrapped(new, column, self.nl));
            }
        }
        Ok(())
    }

    fn fields(
        &mut self,
        open: usize,
        old: &[Field],
        full: Option<&Body>,
        new: &[Field],
    ) -> Result<(), EditError> {
        // Fields to insert, grouped by the field they follow (None: first).
        let mut inserts: Vec<(Option<&Field>, Vec<&Field>)> = Vec::new();
        let mut anchor: Option<&Field> = None;
        for nf in new {
            match old.iter().find(|f| f.key == nf.key) {
                Some(of) => {
                    let full_value = find(full, &nf.key).map(|f| &f.value);
                    self.node(&of.value, full_value, &nf.value)?;
                    anchor = Some(of);
                }
                None => {
                    let unchanged =
                        find(full, &nf.key).is_some_and(|ff| same(&ff.value, &nf.value));
                    if unchanged {
                        continue;
                    }
                    let same_anchor = inserts.last().is_some_and(|(a, _)| {
                        a.map(|f| f.key_start) == anchor.map(|f| f.key_start)
                    });
                    match inserts.last_mut() {
                        Some((_, group)) if same_anchor => group.push(nf),
                        _ => inserts.push((anchor, vec![nf])),
                    }
                }
            }
        }
        for of in old {
            if !new.iter().any(|f| f.key == of.key) {
                let e = self.entry(of.key_start, of.value.end);
                self.delete_entry(&e);
            }
        }
        for (anchor, group) in inserts {
            // Where the new entries' text starts on its line (for wrapping).
            let column = match anchor {
                Some(a) => {
                    let e = self.entry(a.key_start, a.value.end);
                    if self.on_own_lines(&e) {
                        self.column_of(a.key_start)
                    } else {
                        self.column_of(e.end()) + 1
                    }
                }
                None => old.first().map_or(0, |f| self.column_of(f.key_start)),
            };
            let texts: Vec<String> = group
                .iter()
                .map(|f| {
                    let key = format!("{}: ", f.key);
                    let at = column + key.chars().count();
                    format!("{key}{}", render_wrapped(&f.value, at, self.nl))
                })
                .collect();
            match anchor {
                Some(a) => {
                    let e = self.entry(a.key_start, a.value.end);
                    self.insert_after(&e, &texts);
                }
                None => {
                    let entries: Vec<Entry> = old
                        .iter()
                        .map(|f| self.entry(f.key_start, f.value.end))
                        .collect();
                    self.insert_first(open, &entries, &texts);
                }
            }
        }
        Ok(())
    }

    fn list(
        &mut self,
        open: usize,
        old: &[Node],
        full: Option<&Vec<Node>>,
        new: &[Node],
    ) -> Result<(), EditError> {
        for (k, (o, n)) in old.iter().zip(new).enumerate() {
            self.node(o, full.and_then(|f| f.get(k)), n)?;
        }
        if new.len() > old.len() {
            let extra = new.get(old.len()..).unwrap_or_default();
            match old.last() {
                Some(last) => {
                    let template_full = full.and_then(|f| f.last());
                    let texts = extra
                        .iter()
                        .map(|n| self.item_from_template(last, template_full, n))
                        .collect::<Result<Vec<_>, _>>()?;
                    let e = self.entry(last.start, last.end);
                    self.insert_after(&e, &texts);
                }
                None => {
                    let texts: Vec<String> = extra.iter().map(render).collect();
                    self.insert(open + 1, texts.join(", "));
                }
            }
        } else if new.len() < old.len() {
            let removed = old.get(new.len()..).unwrap_or_default();
            if let (Some(first), Some(last)) = (removed.first(), removed.last()) {
                let last_e = self.entry(last.start, last.end);
                match new.len().checked_sub(1).and_then(|k| old.get(k)) {
                    _ if self.first_on_line(first.start)
                        && self.rest_of_line_blank(last_e.end()) =>
                    {
                        let from = self.line_start(first.start);
                        let to = self.after_line(last_e.end());
                        self.replace(from, to, String::new());
                    }
                    Some(kept) => self.replace(kept.end, last.end, String::new()),
                    None => self.replace(first.start, last_e.end(), String::new()),
                }
            }
        }
        Ok(())
    }

    /// The text of a new list item made from an existing one: its text
    /// without comments, edited to the new values.
    fn item_from_template(
        &self,
        template: &Node,
        template_full: Option<&Node>,
        new: &Node,
    ) -> Result<String, EditError> {
        let raw = self
            .src
            .get(template.start..template.end)
            .unwrap_or_default();
        let bare = strip_comments(raw);
        let tree = parse_tree(&bare).map_err(EditError)?;
        let mut sub = Editor::new(&bare);
        sub.nl = self.nl;
        sub.node(&tree, template_full, new)?;
        sub.apply()
    }

    /// Inserts `texts` (whole entries without separators) after entry `e`, in
    /// its layout: one per line when the entries stand on their own lines,
    /// else on the same line.
    fn insert_after(&mut self, e: &Entry, texts: &[String]) {
        if texts.is_empty() {
            return;
        }
        if self.on_own_lines(e) {
            let indent = self.indent_of(e.start);
            let trailing = e.comma.is_some();
            if !trailing {
                self.insert(e.value_end, ",".to_string());
            }
            let n = texts.len();
            let mut s = String::new();
            for (k, t) in texts.iter().enumerate() {
                s.push_str(self.nl);
                s.push_str(&indent);
                s.push_str(t);
                if trailing || k + 1 < n {
                    s.push(',');
                }
            }
            let at = self.line_end(e.end());
            self.insert(at, s);
        } else {
            match e.comma {
                Some(c) => {
                    let s: String = texts.iter().map(|t| format!(" {t},")).collect();
                    self.insert(c + 1, s);
                }
                None => {
                    let s: String = texts.iter().map(|t| format!(", {t}")).collect();
                    self.insert(e.value_end, s);
                }
            }
        }
    }

    /// Inserts `texts` before the first of `entries` (or into an empty group
    /// opened at `open`).
    fn insert_first(&mut self, open: usize, entries: &[Entry], texts: &[String]) {
        let Some(first) = entries.iter().min_by_key(|e| e.start) else {
            self.insert(open + 1, texts.join(", "));
            return;
        };
        if self.first_on_line(first.start) {
            let indent = self.indent_of(first.start);
            let s: String = texts
                .iter()
                .map(|t| format!("{indent}{t},{}", self.nl))
                .collect();
            let at = self.line_start(first.start);
            self.insert(at, s);
        } else {
            let s: String = texts.iter().map(|t| format!("{t}, ")).collect();
            self.insert(first.start, s);
        }
    }

    /// Removes an entry: its whole lines when it stands on its own lines
    /// (with a comment at the end of its line), else just its text.
    fn delete_entry(&mut self, e: &Entry) {
        if self.first_on_line(e.start) && self.rest_of_line_blank(e.end()) {
            let from = self.line_start(e.start);
            let to = self.after_line(e.end());
            self.replace(from, to, String::new());
            return;
        }
        match e.comma {
            Some(_) => {
                let mut to = e.end();
                while matches!(self.byte(to), Some(b' ' | b'\t')) {
                    to += 1;
                }
                self.replace(e.start, to, String::new());
            }
            None => {
                let before = self.src.get(..e.start).unwrap_or_default().trim_end();
                let from = if before.ends_with(',') {
                    before.len() - 1
                } else {
                    e.start
                };
                self.replace(from, e.value_end, String::new());
            }
        }
    }
}

/// `text` without its comments: a comment alone on its line goes with the
/// line, a comment after a value goes with the spaces before it.
fn strip_comments(text: &str) -> String {
    let mut p = Parser::new(text);
    // Collect every comment by walking the whole value.
    if p.value().is_err() {
        return text.to_string();
    }
    let _ = p.trivia();
    let e = Editor::new(text);
    let mut cuts: Vec<(usize, usize)> = p
        .comments
        .iter()
        .map(|&(s, end)| {
            let ls = e.line_start(s);
            let alone_before = text.get(ls..s).is_some_and(|x| x.trim().is_empty());
            let alone_after =
                e.next_significant(end) >= e.line_end(end) || e.next_significant(end) >= text.len();
            if alone_before && alone_after && !e.newline_between(s, end) {
                (ls, e.after_line(end))
            } else {
                let before = text.get(..s).unwrap_or_default();
                let trimmed = before.trim_end_matches([' ', '\t']);
                (trimmed.len(), end)
            }
        })
        .collect();
    cuts.sort_unstable();
    let mut out = String::with_capacity(text.len());
    let mut at = 0;
    for (s, end) in cuts {
        if s < at {
            at = at.max(end);
            continue;
        }
        out.push_str(text.get(at..s).unwrap_or_default());
        at = end;
    }
    out.push_str(text.get(at..).unwrap_or_default());
    out
}

#[cfg(test)]
#[path = "edit_tests.rs"]
mod tests;
