//! Meaning (when two values say the same) and writing values back as text.

use super::*;

/// A dimension, by the index of its tag family.
pub(super) type Dim = u8;

/// The SI value of `tag(number)` and its dimension, for a known unit tag.
pub(super) fn tag_si(tag: &str, number: f64) -> Option<(Dim, f64)> {
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
pub(super) fn tag_number(tag: &str, si: f64) -> Option<f64> {
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
pub(super) fn quantity(node: &Node) -> Option<(Dim, f64, &Node)> {
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
pub(super) fn close(a: f64, b: f64) -> bool {
    a == b || (a - b).abs() <= 1e-9 * a.abs().max(b.abs())
}

/// A struct's name may be left out in a file (`(…)` for `Water(…)`).
pub(super) fn names_match(a: &Option<String>, b: &Option<String>) -> bool {
    match (a, b) {
        (Some(x), Some(y)) => x == y,
        _ => true,
    }
}

/// Whether two values say the same.
pub(super) fn same(a: &Node, b: &Node) -> bool {
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

pub(super) fn same_body(a: &Body, b: &Body) -> bool {
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

pub(super) fn find<'n>(body: Option<&'n Body>, key: &str) -> Option<&'n Field> {
    match body {
        Some(Body::Fields(fields)) => fields.iter().find(|f| f.key == key),
        _ => None,
    }
}

pub(super) fn body_of(node: Option<&Node>) -> Option<&Body> {
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
pub(super) fn format_number(x: f64, like: Option<&str>) -> String {
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
pub(super) fn render(node: &Node) -> String {
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
pub(super) const WIDTH: usize = 96;

/// [`render`], broken after the commas between a group's fields when the
/// line starting at `column` would pass [`WIDTH`]; continuation lines line up
/// after the opening parenthesis, as the shipped files write them.
pub(super) fn render_wrapped(node: &Node, column: usize, nl: &str) -> String {
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
pub(super) fn quote(t: &str) -> String {
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
