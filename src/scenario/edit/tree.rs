//! A tree of RON values that remembers where each sits in the text.

#[derive(Debug, Clone)]
pub(super) struct Node {
    pub(super) start: usize,
    pub(super) end: usize,
    pub(super) kind: Kind,
}

#[derive(Debug, Clone)]
pub(super) enum Kind {
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
pub(super) enum Body {
    Fields(Vec<Field>),
    Items(Vec<Node>),
}

#[derive(Debug, Clone)]
pub(super) struct Field {
    pub(super) key: String,
    pub(super) key_start: usize,
    pub(super) value: Node,
}

pub(super) fn parse_tree(text: &str) -> Result<Node, String> {
    let mut p = Parser::new(text);
    let node = p.value()?;
    p.trivia()?;
    if p.pos < p.b.len() {
        return Err(format!("unexpected text at byte {}", p.pos));
    }
    Ok(node)
}

pub(super) struct Parser<'a> {
    pub(super) s: &'a str,
    pub(super) b: &'a [u8],
    pub(super) pos: usize,
    /// Byte ranges of every comment, in order.
    pub(super) comments: Vec<(usize, usize)>,
}

impl<'a> Parser<'a> {
    pub(super) fn new(s: &'a str) -> Self {
        Parser {
            s,
            b: s.as_bytes(),
            pos: 0,
            comments: Vec::new(),
        }
    }

    pub(super) fn at(&self, i: usize) -> Option<u8> {
        self.b.get(i).copied()
    }

    pub(super) fn peek(&self) -> Option<u8> {
        self.at(self.pos)
    }

    pub(super) fn starts(&self, pat: &str) -> bool {
        self.s.get(self.pos..).is_some_and(|r| r.starts_with(pat))
    }

    /// Skips white space, comments (recorded), a byte-order mark and `#![…]`
    /// attributes.
    pub(super) fn trivia(&mut self) -> Result<(), String> {
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

    pub(super) fn value(&mut self) -> Result<Node, String> {
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

    pub(super) fn raw_string_ahead(&self) -> bool {
        let mut i = self.pos + 1;
        while self.at(i) == Some(b'#') {
            i += 1;
        }
        self.at(i) == Some(b'"')
    }

    /// An identifier, with an optional `r#` prefix (dropped).
    pub(super) fn ident(&mut self) -> Result<String, String> {
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

    pub(super) fn group(&mut self, name: Option<String>, start: usize) -> Result<Node, String> {
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

    pub(super) fn list(&mut self, start: usize) -> Result<Node, String> {
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

    pub(super) fn items(&mut self, end: u8) -> Result<Vec<Node>, String> {
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
    pub(super) fn separator(&mut self, end: u8) -> Result<bool, String> {
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

    pub(super) fn close(&mut self, end: u8) -> Result<(), String> {
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

    pub(super) fn number(&mut self, start: usize) -> Result<Node, String> {
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

    pub(super) fn string(&mut self, start: usize) -> Result<Node, String> {
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

    pub(super) fn raw_string(&mut self, start: usize) -> Result<Node, String> {
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

    pub(super) fn char_literal(&mut self, start: usize) -> Result<Node, String> {
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

pub(super) fn number_value(text: &str) -> Option<f64> {
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
