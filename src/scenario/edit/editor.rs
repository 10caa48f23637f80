//! The edits: the old and new trees walked side by side, each change a
//! replacement of a byte range of the original text.

use super::*;

#[derive(Debug)]
pub(super) struct Edit {
    pub(super) start: usize,
    pub(super) end: usize,
    pub(super) text: String,
}

pub(super) struct Editor<'a> {
    pub(super) src: &'a str,
    pub(super) nl: &'static str,
    pub(super) edits: Vec<Edit>,
}

/// Where an entry (a field or a list item) sits: its start, the end of its
/// value, and the comma after it, if any.
#[derive(Debug, Clone, Copy)]
pub(super) struct Entry {
    pub(super) start: usize,
    pub(super) value_end: usize,
    pub(super) comma: Option<usize>,
}

impl Entry {
    /// After the comma, or after the value when there is none.
    pub(super) fn end(&self) -> usize {
        self.comma.map_or(self.value_end, |c| c + 1)
    }
}

impl<'a> Editor<'a> {
    pub(super) fn new(src: &'a str) -> Self {
        Editor {
            src,
            nl: if src.contains("\r\n") { "\r\n" } else { "\n" },
            edits: Vec::new(),
        }
    }

    pub(super) fn replace(&mut self, start: usize, end: usize, text: String) {
        self.edits.push(Edit { start, end, text });
    }

    pub(super) fn insert(&mut self, at: usize, text: String) {
        self.replace(at, at, text);
    }

    pub(super) fn apply(mut self) -> Result<String, EditError> {
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

    pub(super) fn byte(&self, i: usize) -> Option<u8> {
        self.src.as_bytes().get(i).copied()
    }

    /// The next position at or after `pos` that is not white space or a comment.
    pub(super) fn next_significant(&self, pos: usize) -> usize {
        let mut p = Parser::new(self.src);
        p.pos = pos;
        // An unclosed comment ends the text.
        if p.trivia().is_err() {
            return self.src.len();
        }
        p.pos
    }

    pub(super) fn line_start(&self, pos: usize) -> usize {
        self.src
            .get(..pos)
            .and_then(|s| s.rfind('\n'))
            .map_or(0, |i| i + 1)
    }

    /// The end of `pos`'s line, before its `\r\n` or `\n`.
    pub(super) fn line_end(&self, pos: usize) -> usize {
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
    pub(super) fn after_line(&self, pos: usize) -> usize {
        self.src
            .get(pos..)
            .and_then(|s| s.find('\n'))
            .map_or(self.src.len(), |i| pos + i + 1)
    }

    /// The column of `pos` on its line, in characters.
    pub(super) fn column_of(&self, pos: usize) -> usize {
        let ls = self.line_start(pos);
        self.src.get(ls..pos).map_or(0, |s| s.chars().count())
    }

    pub(super) fn first_on_line(&self, pos: usize) -> bool {
        let ls = self.line_start(pos);
        self.src
            .get(ls..pos)
            .is_some_and(|s| s.trim_start_matches('\u{feff}').trim().is_empty())
    }

    /// Only white space or comments follow `pos` on its line.
    pub(super) fn rest_of_line_blank(&self, pos: usize) -> bool {
        let le = self.line_end(pos);
        let next = self.next_significant(pos);
        next >= le
    }

    /// A line break between `a` and `b`.
    pub(super) fn newline_between(&self, a: usize, b: usize) -> bool {
        self.src.get(a..b).is_some_and(|s| s.contains('\n'))
    }

    pub(super) fn indent_of(&self, pos: usize) -> String {
        let ls = self.line_start(pos);
        self.src
            .get(ls..pos)
            .unwrap_or_default()
            .trim_start_matches('\u{feff}')
            .to_string()
    }

    pub(super) fn entry(&self, start: usize, value_end: usize) -> Entry {
        let next = self.next_significant(value_end);
        Entry {
            start,
            value_end,
            comma: (self.byte(next) == Some(b',')).then_some(next),
        }
    }

    /// One entry per line, this one included.
    pub(super) fn on_own_lines(&self, e: &Entry) -> bool {
        self.first_on_line(e.start) && self.newline_between(e.end(), self.next_significant(e.end()))
    }

    // --- the walk ----------------------------------------------------------

    pub(super) fn node(
        &mut self,
        old: &Node,
        full: Option<&Node>,
        new: &Node,
    ) -> Result<(), EditError> {
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

    pub(super) fn fields(
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

    pub(super) fn list(
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
    pub(super) fn item_from_template(
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
    pub(super) fn insert_after(&mut self, e: &Entry, texts: &[String]) {
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
    pub(super) fn insert_first(&mut self, open: usize, entries: &[Entry], texts: &[String]) {
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
    pub(super) fn delete_entry(&mut self, e: &Entry) {
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
pub(super) fn strip_comments(text: &str) -> String {
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
