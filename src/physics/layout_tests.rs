//! Unit tests of `layout.rs`.

use super::*;

#[test]
fn recommended_spacing_is_the_edge_of_the_goal() {
    // A head whose rate falls linearly from 10 mm/h at the head to 0 at
    // 8 m (an invented leg): the recommendation meets the goal, every
    // scanned spacing below it does too, and 10 % more does not (the rule
    // in model.md M9).
    let leg = MeasuredLeg::new(vec![(0.0, 10.0), (8.0, 0.0)]).unwrap();
    let reach = leg.reach_m();
    let opts = OverlapOptions::default();
    for family in [
        PatternFamily::Square,
        PatternFamily::Rectangle(RowRule::Ratio(DEFAULT_ROWS_RATIO)),
        PatternFamily::Rectangle(RowRule::Fixed(9.0)),
        PatternFamily::Triangle,
    ] {
        let best = recommend_spacing(&leg, family, SpacingGoal::Cu(85.0), &opts)
            .unwrap()
            .unwrap();
        assert!(best.uniformity.cu_percent >= 85.0);
        let s = best.spacing_m;
        let further = overlap(&family.layout(1.1 * s), &leg, &opts).unwrap();
        assert!(further.uniformity.cu_percent < 85.0, "{family:?} at {s}");
        let mut k = RECOMMEND_SCAN_START * reach;
        while k < s {
            let r = overlap(&family.layout(k), &leg, &opts).unwrap();
            assert!(r.uniformity.cu_percent >= 85.0, "{family:?} at {k}");
            k += RECOMMEND_SCAN_STEP * reach;
        }
    }
    // A goal nothing meets.
    let none = recommend_spacing(&leg, PatternFamily::Square, SpacingGoal::Cu(100.1), &opts);
    assert!(matches!(none, Ok(None)));
}

#[test]
fn hand_set() {
    // references.md: 1.0, 0.9, 0.7, 1.2 → CU 84.21 %, DU_lq 73.68 % (one can low).
    let s = uniformity(&[1.0, 0.9, 0.7, 1.2]).unwrap();
    assert!((s.cu_percent - 84.21).abs() < 0.005);
    assert!((s.du_lq_percent - 73.68).abs() < 0.005);
    assert_eq!(s.low_quarter_count, 1);
    assert!((s.driest_quarter_runtime_factor.unwrap() - 1.0 / 0.7368).abs() < 1e-3);
}

#[test]
fn quarter_counting() {
    assert_eq!(low_count(4, 0.25), 1);
    assert_eq!(low_count(10, 0.25), 3); // 2.5 rounds up
    assert_eq!(low_count(15, 0.25), 4);
    assert_eq!(low_count(2, 0.25), 1);
    assert_eq!(low_count(15, 0.5), 8);
}

#[test]
fn bad_catches_are_errors() {
    assert!(uniformity(&[]).is_err());
    assert!(uniformity(&[0.0, 0.0]).is_err());
    let e = uniformity(&[1.0, f64::NAN]).unwrap_err().to_string();
    assert!(e.contains("catch 2") && !e.contains("NaN"), "{e}");
    assert!(uniformity(&[1.0, -1.0]).is_err());
}

#[test]
fn leg_integrates_exactly() {
    // A flat 10 mm/h out to 5 m: Q = 10 mm/h · π 25 m².
    let leg = MeasuredLeg::new(vec![(1.0, 10.0), (5.0, 10.0)]).unwrap();
    assert!((leg.flow_m3_s() * M_S_TO_MM_H - 10.0 * PI * 25.0).abs() < 1e-9);
    // A cone from 12 at r = 0 to 0 at 6 m: ∫ = 2π·12·36/6 = 144π·... (mean of a cone: 1/3).
    let cone = MeasuredLeg::new(vec![(0.0, 12.0), (6.0, 0.0)]).unwrap();
    let exact = 12.0 * PI * 36.0 / 3.0;
    assert!((cone.flow_m3_s() * M_S_TO_MM_H - exact).abs() < 1e-9);
    assert_eq!(cone.rate_at(3.0), 6.0);
    assert_eq!(cone.rate_at(7.0), 0.0);
}

#[test]
fn uniform_disc_overlap_mean() {
    // A flat disc pattern on a triangle layout: mean = Q/(S·L).
    let leg = MeasuredLeg::new(vec![(0.0, 6.0), (7.9999, 6.0), (8.0, 0.0)]).unwrap();
    let layout = Layout::Triangle { spacing_m: 8.0 };
    let r = overlap(&layout, &leg, &OverlapOptions::default()).unwrap();
    assert!((r.mean_rate_mm_h / r.expected_rate_mm_h - 1.0).abs() < 0.01);
    assert!((r.spacing_percent_of_diameter - 50.0).abs() < 1e-3);
    assert_eq!(
        r.grid.rate_mm_h.len(),
        (40.0 * 3f64.sqrt() / 2.0).round() as usize
    );
}

#[test]
fn absurd_spacing_is_an_error() {
    let leg = MeasuredLeg::new(vec![(0.0, 6.0), (20.0, 0.0)]).unwrap();
    let tight = Layout::Square { spacing_m: 0.05 };
    let e = overlap(&tight, &leg, &OverlapOptions::default()).unwrap_err();
    assert!(e.to_string().contains("too close"), "{e}");
    assert!(overlap(
        &Layout::Square {
            spacing_m: f64::NAN
        },
        &leg,
        &OverlapOptions::default()
    )
    .is_err());
}

#[test]
fn intake_advice() {
    assert_eq!(
        intake_check(8.0, 10.0, 2.5).unwrap(),
        IntakeVerdict::WithinIntake
    );
    match intake_check(25.0, 10.0, 2.5).unwrap() {
        IntakeVerdict::Exceeds { cycle, warning } => {
            // 2.5 mm / 15 mm/h = 10 min; 2.5 mm / 10 mm/h = 15 min.
            assert_eq!(cycle.run_min, 10.0);
            assert_eq!(cycle.soak_min, 15.0);
            assert!(warning.contains("25.0 mm/h"));
        }
        other => panic!("{other:?}"),
    }
    assert!(intake_check(25.0, 0.0, 2.5).is_err());
}
