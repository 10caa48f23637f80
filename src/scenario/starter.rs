//! The commented starter scenario written by `spinwright new FILE [--units us]`.
//!
//! Two hand-written files, one per unit system, describing the same small
//! two-arm rotor; the tests check that both load and agree.

use crate::units::UnitSystem;

const METRIC: &str = include_str!("starter/metric.ron");
const US: &str = include_str!("starter/us.ron");

/// A commented starter scenario in `system`'s units. Every field is explained
/// in a comment with its unit choices; the text loads as it is.
pub fn starter_text(system: UnitSystem) -> String {
    match system {
        UnitSystem::Metric => METRIC,
        UnitSystem::Us => US,
    }
    .to_string()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::load_str;

    /// True when `word` stands in `text` as a field or variant name (`word:`
    /// or `word(`), not inside a longer name.
    fn names(text: &str, word: &str) -> bool {
        text.match_indices(word).any(|(k, _)| {
            let before = text.get(..k).and_then(|t| t.chars().last());
            let after = text.get(k + word.len()..).and_then(|t| t.chars().next());
            !before.is_some_and(|c| c.is_alphanumeric() || c == '_')
                && matches!(after, Some(':' | '('))
        })
    }

    #[test]
    fn both_starters_mention_every_catalogue_input() {
        for system in [UnitSystem::Metric, UnitSystem::Us] {
            let text = starter_text(system);
            for input in crate::catalogue::all() {
                assert!(
                    names(&text, input.file_field()),
                    "the {system} starter does not mention {} (`{}`)",
                    input.path,
                    input.file_field()
                );
            }
        }
    }

    #[test]
    fn both_starters_load_and_describe_the_same_rotor() {
        let metric = load_str(&starter_text(UnitSystem::Metric), "starter (metric)")
            .unwrap()
            .to_design()
            .unwrap();
        let us = load_str(&starter_text(UnitSystem::Us), "starter (US)")
            .unwrap()
            .to_design()
            .unwrap();
        // The US file rounds each metric value to a number a US user would
        // write (160 mm → 6.25 in); they agree within 2.5 %.
        let near = |a: f64, b: f64, what: &str| {
            assert!(
                (a - b).abs() <= 0.025 * a.abs().max(b.abs()),
                "{what}: {a} vs {b}"
            );
        };
        assert_eq!(metric.rotor.arms.len(), us.rotor.arms.len());
        for (m, u) in metric.rotor.arms.iter().zip(&us.rotor.arms) {
            near(m.radius_m, u.radius_m, "radius");
            near(m.height_m, u.height_m, "height");
            near(m.tube.bore_m, u.tube.bore_m, "bore");
            near(m.tube.outer_m, u.tube.outer_m, "outer");
            near(m.nozzle.diameter_m, u.nozzle.diameter_m, "nozzle");
            near(m.nozzle.elevation_rad, u.nozzle.elevation_rad, "elevation");
        }
        near(metric.rotor.hub_radius_m, us.rotor.hub_radius_m, "hub");
        near(metric.water_temperature_c, us.water_temperature_c, "water");
        match (metric.supply, us.supply) {
            (
                crate::physics::design::Supply::Pressure { inlet_pa: a },
                crate::physics::design::Supply::Pressure { inlet_pa: b },
            ) => near(a, b, "pressure"),
            other => panic!("supplies differ: {other:?}"),
        }
        match (metric.rotor.inertia, us.rotor.inertia) {
            (
                crate::physics::design::Inertia::Estimate {
                    tube_density_kg_m3: a,
                    tube_wall_m: b,
                    tip_mass_kg: c,
                },
                crate::physics::design::Inertia::Estimate {
                    tube_density_kg_m3: x,
                    tube_wall_m: y,
                    tip_mass_kg: z,
                },
            ) => {
                near(a, x, "density");
                near(b, y, "wall");
                near(c, z, "tip mass");
            }
            other => panic!("inertia differs: {other:?}"),
        }
        near(
            metric.layout.unwrap().spacing_m(),
            us.layout.unwrap().spacing_m(),
            "spacing",
        );
    }

    #[test]
    fn starters_explain_every_section() {
        for system in [UnitSystem::Metric, UnitSystem::Us] {
            let text = starter_text(system);
            for word in [
                "supply:",
                "Pressure(",
                "Flow(",
                "Line(",
                "Estimate(",
                "Given(",
                "Washer(",
                "Measured(",
                "brake:",
                "spray:",
                "Square(",
                "Rectangle(",
                "Triangle(",
                "wind:",
                "clearance:",
                "//",
            ] {
                assert!(text.contains(word), "{system} starter lacks {word}");
            }
        }
    }
}
