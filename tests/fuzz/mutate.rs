//! Text mutations of the shipped scenarios and catch-can CSV.

use super::*;

pub(super) const UNIT_TAGS: &[&str] = &[
    "mm", "m", "in", "ft", "kPa", "bar", "psi", "L_min", "m3_h", "gpm", "deg", "C", "F", "N_m",
    "lbf_in", "g", "kg", "lb", "oz", "mm2", "in2", "m_s", "mph", "kg_m2", "kg_m3", "Auto",
];

pub(super) const CSV_WORDS: &[&str] = &[
    "duration",
    "can_diameter",
    "can_area",
    "distance_m",
    "distance_ft",
    "catch_ml",
    "catch_mm",
    "catch_in",
    "x_m",
    "x_ft",
    "y_m",
    "y_ft",
    "s",
    "min",
    "h",
    "mm",
    "cm",
    "in",
    "mm2",
    "cm2",
    "in2",
];

pub(super) const NUMBERS: &[&str] = &[
    "0",
    "-0",
    "0.0",
    "-1",
    "-0.5",
    "1e308",
    "1e309",
    "-1e308",
    "1e-308",
    "5e-324",
    "1e-12",
    "1e12",
    "NaN",
    "nan",
    "inf",
    "-inf",
    "+inf",
    "1e999",
    "99999999999999999999999999",
    "0.000000000000000000000000001",
    "1e",
    ".",
    "-",
    "+",
    "1.2.3",
    "0x10",
    "1_000",
    "90",
    "90.0000001",
    "180",
    "-180",
    "360",
    "50",
    "-40",
    "11000",
    "1",
];

pub(super) const STRAY: &[&str] = &[
    "(", ")", "[", "]", ",", ":", "\"", "//", "/*", "\n", " ", "#", "\u{0}", "é", "\u{feff}",
    "Some(", "None", "true",
];

/// A piece of the text: words (identifiers and numbers) can be mutated.
#[derive(Debug, Clone)]
pub(super) struct Token {
    text: String,
    word: bool,
}

pub(super) fn word_char(c: char) -> bool {
    c.is_ascii_alphanumeric() || matches!(c, '_' | '.' | '+' | '-')
}

/// Splits RON-ish or CSV text into words, strings, comments, spaces and
/// single punctuation characters.
pub(super) fn tokenize(text: &str) -> Vec<Token> {
    let chars: Vec<char> = text.chars().collect();
    let mut out = Vec::new();
    let mut i = 0;
    while let Some(&c) = chars.get(i) {
        let start = i;
        let word = word_char(c);
        if word {
            while chars.get(i).is_some_and(|&c| word_char(c)) {
                i += 1;
            }
        } else if c == '"' {
            i += 1;
            while let Some(&c) = chars.get(i) {
                i += 1;
                if c == '"' {
                    break;
                }
            }
        } else if c == '/' && chars.get(i + 1) == Some(&'/') {
            while chars.get(i).is_some_and(|&c| c != '\n') {
                i += 1;
            }
        } else if c.is_whitespace() {
            while chars.get(i).is_some_and(|c| c.is_whitespace()) {
                i += 1;
            }
        } else {
            i += 1;
        }
        out.push(Token {
            text: chars[start..i].iter().collect(),
            word,
        });
    }
    out
}

/// One mutation: what to do, where (an index taken modulo the candidates),
/// which replacement, and a random number.
type Mutation = (u8, usize, usize, f64);

pub(super) fn random_number(choice: usize, x: f64) -> String {
    match choice % 4 {
        0 => NUMBERS[choice / 4 % NUMBERS.len()].to_string(),
        1 => format!("{x}"),
        2 => format!("{x:e}"),
        _ => format!("{}", (x.abs().fract() * 1e3).round() - 100.0),
    }
}

pub(super) fn mutate(base: &str, mutations: &[Mutation], words: &[&str]) -> String {
    let mut tokens = tokenize(base);
    for &(op, at, choice, x) in mutations {
        let word_ix: Vec<usize> = (0..tokens.len()).filter(|&i| tokens[i].word).collect();
        let number_ix: Vec<usize> = word_ix
            .iter()
            .copied()
            .filter(|&i| {
                tokens[i]
                    .text
                    .starts_with(|c: char| c.is_ascii_digit() || c == '-')
            })
            .collect();
        let tag_ix: Vec<usize> = word_ix
            .iter()
            .copied()
            .filter(|&i| words.contains(&tokens[i].text.as_str()))
            .collect();
        let pick = |ix: &[usize]| (!ix.is_empty()).then(|| ix[at % ix.len()]);
        let non_space: Vec<usize> = (0..tokens.len())
            .filter(|&i| !tokens[i].text.trim().is_empty())
            .collect();
        match op % 9 {
            0 => {
                if let Some(i) = pick(&non_space) {
                    tokens.remove(i);
                }
            }
            1 => {
                if let Some(i) = pick(&non_space) {
                    let t = tokens[i].clone();
                    tokens.insert(i, t);
                }
            }
            2 => {
                if let (Some(i), false) = (pick(&word_ix), word_ix.is_empty()) {
                    let from = word_ix[choice % word_ix.len()];
                    tokens[i].text = tokens[from].text.clone();
                }
            }
            3..=5 => {
                if let Some(i) = pick(&number_ix) {
                    tokens[i].text = random_number(choice, x);
                }
            }
            6 | 7 => {
                if let Some(i) = pick(&tag_ix) {
                    tokens[i].text = words[choice % words.len()].to_string();
                }
            }
            _ => {
                let i = at % (tokens.len() + 1);
                tokens.insert(
                    i,
                    Token {
                        text: STRAY[choice % STRAY.len()].to_string(),
                        word: false,
                    },
                );
            }
        }
    }
    tokens.into_iter().map(|t| t.text).collect()
}

pub(super) fn shipped(ext: &str) -> Vec<String> {
    let mut files: Vec<_> = std::fs::read_dir(root().join("scenarios"))
        .expect("scenarios/ exists")
        .map(|e| e.expect("readable entry").path())
        .filter(|p| p.extension().is_some_and(|e| e == ext))
        .collect();
    files.sort();
    files
        .iter()
        .map(|p| std::fs::read_to_string(p).expect("readable scenario"))
        .collect()
}

pub(super) fn mutations() -> impl Strategy<Value = Vec<Mutation>> {
    prop::collection::vec(
        (any::<u8>(), any::<usize>(), any::<usize>(), any::<f64>()),
        1..6,
    )
}

/// Mutated shipped scenarios (nine in ten) or raw bytes.
pub(super) fn scenario_texts() -> impl Strategy<Value = String> {
    let bases = shipped("ron");
    let n = bases.len();
    prop_oneof![
        9 => (0..n, mutations()).prop_map(move |(k, m)| mutate(&bases[k], &m, UNIT_TAGS)),
        1 => prop::collection::vec(any::<u8>(), 0..300)
            .prop_map(|b| String::from_utf8_lossy(&b).into_owned()),
    ]
}

pub(super) fn catch_can_texts() -> impl Strategy<Value = String> {
    let bases = shipped("csv");
    let n = bases.len();
    prop_oneof![
        9 => (0..n, mutations()).prop_map(move |(k, m)| mutate(&bases[k], &m, CSV_WORDS)),
        1 => prop::collection::vec(any::<u8>(), 0..300)
            .prop_map(|b| String::from_utf8_lossy(&b).into_owned()),
    ]
}
