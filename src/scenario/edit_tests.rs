use super::*;
use crate::physics::design::{self as d, Design};
use crate::scenario::load_str;
use crate::units::UnitSystem;

/// Every scenario shipped with spinwright, with its file name.
fn shipped() -> Vec<(String, String)> {
    let mut files: Vec<(String, String)> = Vec::new();
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/scenarios");
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_some_and(|x| x == "ron") {
            let text = std::fs::read_to_string(&path).unwrap();
            files.push((path.display().to_string(), text));
        }
    }
    files.sort();
    files.push((
        "starter (metric)".into(),
        crate::scenario::starter_text(UnitSystem::Metric),
    ));
    files.push((
        "starter (US)".into(),
        crate::scenario::starter_text(UnitSystem::Us),
    ));
    assert!(files.len() >= 6, "{} scenarios", files.len());
    files
}

fn design_of(text: &str) -> (Scenario, Design) {
    let sc = load_str(text, "test").unwrap();
    let design = sc.to_design().unwrap();
    (sc, design)
}

/// The lines of `a` and `b` that differ, by line number (same line count).
fn changed_lines(a: &str, b: &str) -> Vec<(String, String)> {
    let (la, lb): (Vec<&str>, Vec<&str>) = (a.lines().collect(), b.lines().collect());
    assert_eq!(la.len(), lb.len(), "line count changed:\n{b}");
    la.iter()
        .zip(&lb)
        .filter(|(x, y)| x != y)
        .map(|(x, y)| (x.to_string(), y.to_string()))
        .collect()
}

/// The comment on a line (from `//` on), if any, outside quotes.
fn comment_of(line: &str) -> Option<&str> {
    let mut in_text = false;
    let b = line.as_bytes();
    for i in 0..b.len() {
        match b[i] {
            b'"' => in_text = !in_text,
            b'/' if !in_text && b.get(i + 1) == Some(&b'/') => return Some(&line[i..]),
            _ => {}
        }
    }
    None
}

type Change = (&'static str, &'static str, fn(&mut Design));

/// One-value edits and a word the edited line must hold.
fn edits() -> Vec<Change> {
    vec![
        ("first arm's radius", "radius", |d| {
            d.rotor.arms[0].radius_m += 0.010
        }),
        ("last arm's nozzle", "diameter", |d| {
            d.rotor.arms.last_mut().unwrap().nozzle.diameter_m *= 1.1
        }),
        ("supply pressure", "kPa|psi|bar", |d| match &mut d.supply {
            d::Supply::Pressure { inlet_pa } => *inlet_pa += 20e3,
            d::Supply::Line(l) => l.source_pa += 20e3,
            d::Supply::Flow { total_m3_s } => *total_m3_s *= 1.1,
        }),
        ("water temperature", "temperature", |d| {
            d.water_temperature_c += 3.0
        }),
        ("swivel loss", "k:", |d| d.rotor.swivel.k += 0.25),
        ("hub radius", "hub_radius", |d| {
            d.rotor.hub_radius_m += 0.002
        }),
    ]
}

#[test]
fn every_shipped_scenario_keeps_every_comment_and_changes_one_line() {
    for (name, text) in shipped() {
        let (sc, design) = design_of(&text);
        for system in [UnitSystem::Metric, UnitSystem::Us] {
            // Nothing changed: the text is the same to the byte.
            let same_design = Scenario::from_design(&design, system, &sc.notes);
            assert_eq!(
                edit_in_place(&text, &same_design).unwrap(),
                text,
                "{name} {system}: an unchanged design changed the text"
            );
            for (what, word, change) in edits() {
                let mut edited = design.clone();
                change(&mut edited);
                let new = Scenario::from_design(&edited, system, &sc.notes);
                let out = edit_in_place(&text, &new)
                    .unwrap_or_else(|e| panic!("{name} {system} {what}: {e}"));
                let diff = changed_lines(&text, &out);
                assert_eq!(
                    diff.len(),
                    1,
                    "{name} {system} {what}: lines changed: {diff:#?}"
                );
                let (before, after) = &diff[0];
                assert!(
                    word.split('|').any(|w| after.contains(w)),
                    "{name} {system} {what}: edited line `{after}`"
                );
                assert_eq!(
                    comment_of(before),
                    comment_of(after),
                    "{name} {system} {what}: the line's comment changed"
                );
                // Same unit tags on the line: the file's units, not the display units.
                let tags = |l: &str| -> Vec<String> {
                    l.split(|c: char| !(c.is_ascii_alphanumeric() || c == '_' || c == '('))
                        .filter(|t| t.ends_with('('))
                        .map(str::to_string)
                        .collect()
                };
                assert_eq!(tags(before), tags(after), "{name} {system} {what}");
                // The edit reads back as the edited design.
                let back = load_str(&out, "edited").unwrap().to_design().unwrap();
                assert_designs_close(&back, &edited, &format!("{name} {system} {what}"));
            }
        }
    }
}

fn assert_designs_close(a: &Design, b: &Design, what: &str) {
    let fa = Scenario::from_design(a, UnitSystem::Metric, "").to_ron_string();
    let fb = Scenario::from_design(b, UnitSystem::Metric, "").to_ron_string();
    let (ta, tb) = (parse_tree(&fa).unwrap(), parse_tree(&fb).unwrap());
    assert!(same(&ta, &tb), "{what}:\n{fa}\n---\n{fb}");
}

#[test]
fn an_edited_value_is_written_in_the_files_unit() {
    let text = "Scenario(name: \"x\", supply: Pressure(psi(45)), rotor: (hub_radius: in(0.5), \
                swivel: (inlet_bore: in(0.5), k: 1.5), arms: [(radius: in(6), azimuth: deg(0), \
                height: in(10), tube: (bore: in(0.25), outer: in(0.3125), roughness: in(0.00006), \
                minor_k: 0.6), nozzle: (diameter: in(0.07), elevation: deg(20), deflection: deg(10), \
                cd: 0.96, cv: 0.98))], inertia: Given(lb_in2(2.5))), friction: (bearing: \
                Measured(running: N_m(0.01), breakaway: N_m(0.02))))";
    let (sc, mut design) = design_of(text);
    design.rotor.arms[0].radius_m = 7.0 * 0.0254;
    design.friction.bearing = d::Bearing::Measured {
        running_n_m: 0.015,
        breakaway_n_m: 0.02,
    };
    let new = Scenario::from_design(&design, UnitSystem::Metric, &sc.notes);
    let out = edit_in_place(text, &new).unwrap();
    assert!(out.contains("radius: in(7)"), "{out}");
    assert!(out.contains("running: N_m(0.015)"), "{out}");
    assert!(out.contains("minor_k: 0.6"), "{out}");
    assert_eq!(out.len(), text.len() + 1, "{out}");
}

/// A file as a person might write it by hand: odd spacing, tabs, comments
/// everywhere, fields out of order, optional sections left out.
const HAND: &str = "\u{feff}// my rotor   (kept)
/* a block comment
   over two lines */
(   name:\"Hand \\\"made\\\"\", // the name
  notes: \"first line\\nsecond line\",

\tsupply:Pressure( kPa( 250 ) ) , // from the tap

  rotor:(swivel:(k:1.5,inlet_bore:mm(10)),hub_radius : mm(10),
    arms:[ // two arms
      ( radius:mm(150),azimuth:deg(0),height:mm(200),
        tube:(bore:mm(6),outer:mm(8),roughness:mm(0.0015),minor_k:0.5),
        nozzle:(diameter:mm(2.0),elevation:deg(25),deflection:deg(40),cd:0.96,cv:0.98) ), // arm A
      ( radius:mm(150),azimuth:deg(180),height:mm(200), // arm B
        tube:(bore:mm(6),outer:mm(8),roughness:mm(0.0015),minor_k:0.5),
        nozzle:(diameter:mm(2.0),elevation:deg(25),deflection:deg(40),cd:0.96,cv:0.98) )
    ],
    inertia:Given(kg_m2(0.0004))),
  friction: (bearing: Measured(running: N_m(0.01), breakaway: N_m(0.015)) /* inline */,
             brake: (viscous: 0.02)),
  // no layout, no wind, no spray
)
";

fn comments(text: &str) -> Vec<&str> {
    let mut p = Parser::new(text);
    p.value().unwrap();
    p.trivia().unwrap();
    p.comments
        .iter()
        .map(|&(s, e)| &text[s..e])
        .collect::<Vec<_>>()
}

fn edit_hand(change: impl FnOnce(&mut Design), system: UnitSystem) -> (String, Design) {
    let (sc, mut design) = design_of(HAND);
    change(&mut design);
    let new = Scenario::from_design(&design, system, &sc.notes);
    let out = edit_in_place(HAND, &new).unwrap_or_else(|e| panic!("{e}"));
    let back = load_str(&out, "edited").unwrap().to_design().unwrap();
    assert_designs_close(&back, &design, &out);
    assert_eq!(back.name, "Hand \"made\"");
    assert_eq!(
        load_str(&out, "edited").unwrap().notes,
        "first line\nsecond line"
    );
    (out, design)
}

fn keeps_all_comments(out: &str) {
    for c in comments(HAND) {
        assert!(out.contains(c), "lost comment {c:?} in\n{out}");
    }
    assert!(out.starts_with('\u{feff}'));
}

#[test]
fn hand_written_files_keep_their_shape() {
    for system in [UnitSystem::Metric, UnitSystem::Us] {
        let (out, _) = edit_hand(|_| {}, system);
        assert_eq!(out, HAND, "unchanged");

        let (out, _) = edit_hand(|d| d.rotor.arms[1].nozzle.deflection_rad = 0.5, system);
        keeps_all_comments(&out);
        let diff = changed_lines(HAND, &out);
        assert_eq!(diff.len(), 1, "{diff:#?}");
        assert!(diff[0].1.contains("deflection:rad(0.5)") || diff[0].1.contains("deg("));

        let (out, _) = edit_hand(|d| d.rotor.swivel.k = 2.0, system);
        assert!(out.contains("swivel:(k:2.0,inlet_bore:mm(10))"), "{out}");
        keeps_all_comments(&out);
    }
}

#[test]
fn sections_left_out_are_added_only_when_they_differ_from_their_default() {
    // Calm wind is the default: nothing to add.
    let (out, _) = edit_hand(|d| d.wind.speed_m_s = 0.0, UnitSystem::Metric);
    assert_eq!(out, HAND);
    // A breeze and a layout are added after the last section before them.
    let (out, _) = edit_hand(
        |d| {
            d.wind.speed_m_s = 3.0;
            d.layout = Some(d::Layout::Square { spacing_m: 9.0 });
        },
        UnitSystem::Metric,
    );
    keeps_all_comments(&out);
    assert!(
        out.contains("             brake: (viscous: 0.02)),\n  layout: Square(spacing: m(9)),\n  wind: (speed: m_s(3), from: deg(0)),\n  // no layout"),
        "{out}"
    );
    // Inside a group written on one line, on the same line.
    let (out, _) = edit_hand(|d| d.friction.brake.quadratic = 0.5, UnitSystem::Metric);
    assert!(
        out.contains("brake: (viscous: 0.02, quadratic: 0.5))"),
        "{out}"
    );
    // An optional field of an arm.
    let (out, _) = edit_hand(|d| d.rotor.arms[0].rise_m = 0.05, UnitSystem::Us);
    assert!(out.contains("height:mm(200), rise: in("), "{out}");
}

#[test]
fn arms_added_and_removed() {
    // A third arm: a copy of the last arm, without its comments, edited.
    let (out, _) = edit_hand(
        |d| {
            let mut third = d.rotor.arms[1];
            third.azimuth_rad = 1.0;
            third.radius_m = 0.2;
            d.rotor.arms.push(third);
        },
        UnitSystem::Metric,
    );
    keeps_all_comments(&out);
    assert_eq!(out.matches("// arm B").count(), 1, "{out}");
    assert!(
        out.contains(
            "cv:0.98) ),\n      ( radius:mm(200),azimuth:deg(57.2957795131),height:mm(200),\n"
        ),
        "{out}"
    );
    // Back to one arm: the second arm's lines go, with their comments.
    let (out, _) = edit_hand(
        |d| {
            d.rotor.arms.truncate(1);
        },
        UnitSystem::Metric,
    );
    assert!(!out.contains("arm B"), "{out}");
    assert!(out.contains("// arm A\n    ],"), "{out}");

    // In a shipped file, an arm added to the lawn rotor.
    let text = crate::scenario::BUILTIN_EXAMPLE;
    let (sc, mut design) = design_of(text);
    let arm = design.rotor.arms[0];
    design.rotor.arms.push(arm);
    let new = Scenario::from_design(&design, UnitSystem::Us, &sc.notes);
    let out = edit_in_place(text, &new).unwrap();
    assert_eq!(out.lines().count(), text.lines().count() + 6, "{out}");
    for line in text.lines().filter(|l| l.contains("//")) {
        assert!(out.contains(line), "lost {line}");
    }
}

#[test]
fn a_new_kind_of_value_replaces_the_old_one() {
    let (out, _) = edit_hand(
        |d| {
            d.supply = d::Supply::Flow {
                total_m3_s: 12.0 / 60_000.0,
            }
        },
        UnitSystem::Metric,
    );
    assert!(
        out.contains("\tsupply:Flow(L_min(12)) , // from the tap"),
        "{out}"
    );
    keeps_all_comments(&out);
    let (out, _) = edit_hand(
        |d| {
            d.friction.bearing = d::Bearing::Washer(d::Washer {
                mu_kinetic: 0.1,
                mu_static: 0.15,
                inner_m: 0.004,
                outer_m: 0.008,
                thrust_area_m2: 80e-6,
                rotor_mass_kg: 0.1,
                radius_rule: d::WasherRule::UniformWear,
            })
        },
        UnitSystem::Metric,
    );
    assert!(
        // Too long for one line: wrapped after a comma, lined up after `(`.
        out.contains(
            "  friction: (bearing: Washer(mu_kinetic: 0.1, mu_static: 0.15, inner: mm(4), outer: mm(8),\n\
             \x20                            thrust_area: mm2(80), rotor_mass: g(100), radius_rule: UniformWear) /* inline */,\n"
        ),
        "{out}"
    );
}

#[test]
fn crlf_files_stay_crlf() {
    let text = HAND.replace('\n', "\r\n");
    let (sc, mut design) = design_of(&text);
    design.wind.speed_m_s = 2.0;
    design.rotor.arms[0].radius_m = 0.16;
    let new = Scenario::from_design(&design, UnitSystem::Metric, &sc.notes);
    let out = edit_in_place(&text, &new).unwrap();
    assert_eq!(
        out.matches('\n').count(),
        out.matches("\r\n").count(),
        "{out:?}"
    );
    assert!(out.contains("radius:mm(160)"));
    assert!(
        out.contains("wind: (speed: m_s(2), from: deg(0)),\r\n"),
        "{out:?}"
    );
}

#[test]
fn changed_notes_and_names_are_written() {
    let (sc, mut design) = design_of(HAND);
    design.name = "Renamed".into();
    let new = Scenario::from_design(&design, UnitSystem::Metric, "new notes");
    let out = edit_in_place(HAND, &new).unwrap();
    assert!(out.contains("name:\"Renamed\", // the name"), "{out}");
    assert!(out.contains("notes: \"new notes\","), "{out}");
    assert_ne!(sc.notes, "new notes");
}

#[test]
fn text_from_nothing_or_from_a_broken_original_is_fresh() {
    let (_, design) = design_of(HAND);
    let new = Scenario::from_design(&design, UnitSystem::Metric, "");
    let fresh = scenario_text(None, &new);
    assert_eq!(fresh.written, Written::Fresh);
    assert_eq!(fresh.text, new.to_ron_string());
    let broken = scenario_text(Some("this is not a scenario"), &new);
    assert!(
        matches!(broken.written, Written::Rewritten(_)),
        "{broken:?}"
    );
    assert_eq!(broken.text, new.to_ron_string());
    let kept = scenario_text(Some(HAND), &new);
    assert_eq!(kept.written, Written::InPlace);
}

#[test]
fn save_scenario_writes_atomically_with_a_backup() {
    let dir = tempfile::tempdir().unwrap();
    let file = dir.path().join("hand.ron");
    std::fs::write(&file, HAND).unwrap();
    let (sc, mut design) = design_of(HAND);
    design.rotor.arms[0].height_m = 0.25;
    let new = Scenario::from_design(&design, UnitSystem::Metric, &sc.notes);
    let out = save_scenario(&file, Some(HAND), &new).unwrap();
    assert_eq!(out.written, Written::InPlace);
    assert_eq!(std::fs::read_to_string(&file).unwrap(), out.text);
    assert_eq!(
        std::fs::read_to_string(dir.path().join("hand.ron.bak")).unwrap(),
        HAND
    );
    assert!(out.text.contains("height:mm(250)"));
}

#[test]
fn numbers_keep_their_written_style() {
    assert_eq!(format_number(3.0, Some("2.0")), "3.0");
    assert_eq!(format_number(3.0, Some("2")), "3");
    assert_eq!(format_number(0.1 + 0.2, None), "0.3");
    assert_eq!(format_number(-0.0, None), "0");
    assert_eq!(number_value("1_000"), Some(1000.0));
    assert_eq!(number_value("-0x10"), Some(-16.0));
    assert_eq!(number_value("2.5e-3"), Some(0.0025));
}

#[test]
fn comments_are_stripped_from_a_copied_arm() {
    let s = strip_comments("(\n  // alone\n  a: 1, // after\n  b: /* in */ 2,\n)");
    assert_eq!(s, "(\n  a: 1,\n  b: 2,\n)");
}

#[test]
fn an_overhead_clearance_is_added_and_checked() {
    let (out, _) = edit_hand(|d| d.site.clearance_m = Some(4.0), UnitSystem::Metric);
    assert!(
        out.contains("  notes: \"first line\\nsecond line\",\n  clearance: m(4),\n"),
        "{out}"
    );
    let bad = out.replace("clearance: m(4)", "clearance: m(-1)");
    let err = load_str(&bad, "bad.ron").unwrap_err().to_string();
    assert!(
        err.contains("clearance") && err.contains("between 0 and 1000 m"),
        "{err}"
    );
}
