//! Helpers shared by the integration tests.

use std::path::PathBuf;

use spinwright::catalogue::{self, Unit, Value};
use spinwright::physics::design::Design;
use spinwright::units::Dimension;

/// The crate's root folder.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// Every shipped scenario file, sorted by name.
pub fn shipped_scenarios() -> Vec<PathBuf> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(root().join("scenarios"))
        .expect("scenarios/ exists")
        .map(|e| e.expect("readable entry").path())
        .filter(|p| p.extension().is_some_and(|e| e == "ron"))
        .collect();
    files.sort();
    files
}

/// Asserts `a` and `b` agree to `rel` relative in every input of the
/// catalogue (numbers, choices, auto and the name). Temperatures are compared
/// in kelvin (0 °C is not a special value for them).
pub fn assert_designs_close(a: &Design, b: &Design, rel: f64) {
    assert_eq!(a.rotor.arms.len(), b.rotor.arms.len(), "arm count");
    let mut bad = Vec::new();
    for input in catalogue::all() {
        let arms: Vec<Option<usize>> = if input.per_arm() {
            (0..a.rotor.arms.len()).map(Some).collect()
        } else {
            vec![None]
        };
        for arm in arms {
            let path = input.path_at(arm);
            match (input.get(a, arm), input.get(b, arm)) {
                (Some(Value::Number(x)), Some(Value::Number(y))) => {
                    let (x, y) = match input.unit {
                        Unit::Dim(Dimension::Temperature) => (x + 273.15, y + 273.15),
                        _ => (x, y),
                    };
                    if !(x == y || (x - y).abs() <= rel * x.abs().max(y.abs())) {
                        bad.push(format!("{path}: {x} vs {y}"));
                    }
                }
                (x, y) if x != y => bad.push(format!("{path}: {x:?} vs {y:?}")),
                _ => {}
            }
        }
    }
    assert!(bad.is_empty(), "designs differ:\n{}", bad.join("\n"));
}
