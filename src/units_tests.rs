//! Unit tests of `units.rs`.

use super::*;

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * a.abs().max(b.abs())
}

#[test]
fn nist_sp811_factors() {
    // NIST SP 811 (2008), Appendix B.8, factors to seven significant figures.
    assert!(close(PSI_PA, 6.894_757e3, 1e-7)); // psi → Pa
    assert!(close(LBF_IN_N_M, 1.129_848e-1, 1e-6)); // lbf·in → N·m
    assert!(close(LBF_FT_N_M, 1.355_818, 1e-6)); // lbf·ft → N·m
    assert!(close(US_GALLON_M3, 3.785_412e-3, 1e-6)); // gal (US) → m³
    assert!(close(LB_IN2_KG_M2, 2.926_397e-4, 1e-6)); // lb·in² → kg·m²
    assert!(close(LB_FT3_KG_M3, 1.601_846e1, 1e-6)); // lb/ft³ → kg/m³
    assert!(close(OUNCE_KG, 2.834_952e-2, 1e-6)); // oz (avoirdupois) → kg
    assert!(close(POUND_FORCE_N, 4.448_222, 1e-6)); // lbf → N
                                                    // Exact ones (SP 811 marks them exact).
    assert_eq!(MPH_M_S, 0.447_04);
    assert!(close(US_GALLON_M3, 3.785_411_784e-3, 1e-15));
    assert!(close(POUND_FORCE_N, 4.448_221_615_260_5, 1e-15));
    // 1 gpm = 3.785 411 784 L/min; 1 m³/h = 16.667 L/min.
    assert!(close(
        parse_quantity(D::Flow, "1gpm").unwrap(),
        3.785_411_784e-3 / 60.0,
        1e-15
    ));
}

#[test]
fn parses_the_forms_the_cli_documents() {
    let cases: &[(Dimension, &str, f64)] = &[
        (D::Pressure, "2.8bar", 2.8e5),
        (D::Pressure, "40psi", 40.0 * PSI_PA),
        (D::Pressure, "280kPa", 280e3),
        (D::Pressure, "280 kPa", 280e3),
        (D::Pressure, "0.3 MPa", 3e5),
        (D::Flow, "12L/min", 12e-3 / 60.0),
        (D::Flow, "12 l/min", 12e-3 / 60.0),
        (D::Flow, "12 L_min", 12e-3 / 60.0),
        (D::Flow, "3.2gpm", 3.2 * US_GALLON_M3 / 60.0),
        (D::Flow, "0.7m3/h", 0.7 / 3600.0),
        (D::Flow, "0.7 m³/h", 0.7 / 3600.0),
        (D::Length, "7.5m", 7.5),
        (D::Length, "25ft", 25.0 * 0.3048),
        (D::SmallLength, "6.5in", 6.5 * 0.0254),
        (D::SmallLength, "160mm", 0.16),
        (D::Length, "160 mm", 0.16),
        (D::Angle, "22deg", 22.0 * PI / 180.0),
        (D::Angle, "22°", 22.0 * PI / 180.0),
        (D::Angle, "0.5rad", 0.5),
        (D::Time, "14.2s", 14.2),
        (D::Time, "2 min", 120.0),
        (D::Volume, "5L", 5e-3),
        (D::Volume, "1.2gal", 1.2 * US_GALLON_M3),
        (D::Torque, "0.02N·m", 0.02),
        (D::Torque, "0.02Nm", 0.02),
        (D::Torque, "0.02 N m", 0.02),
        (D::Torque, "0.18lbf·in", 0.18 * LBF_IN_N_M),
        (D::Torque, "0.18 lbf-in", 0.18 * LBF_IN_N_M),
        (D::AngularSpeed, "30rpm", PI),
        (D::Temperature, "18C", 18.0),
        (D::Temperature, "65°F", (65.0 - 32.0) / 1.8),
        (D::Temperature, "293.15 K", 20.0),
        (D::Mass, "180g", 0.18),
        (D::Mass, "0.4lb", 0.4 * POUND_KG),
        (D::Area, "110mm2", 110e-6),
        (D::Area, "0.17in²", 0.17 * 0.0254 * 0.0254),
        (D::Speed, "4mph", 4.0 * 0.447_04),
        (D::Inertia, "0.0012kg·m2", 0.0012),
        (D::Density, "8500kg/m3", 8500.0),
        (D::Density, "8.5 g/cm3", 8500.0),
        (D::Pressure, "2e5Pa", 2e5),
        (D::Pressure, "-5 kPa", -5e3),
        (D::Pressure, ".5bar", 0.5e5),
        (D::Pressure, "40 PSI", 40.0 * PSI_PA),
        (D::ApplicationRate, "12mm/h", 12e-3 / 3600.0),
    ];
    for &(dim, text, want) in cases {
        let got = parse_quantity(dim, text).unwrap_or_else(|e| panic!("{text}: {e}"));
        assert!(close(got, want, 1e-12), "{text}: {got} vs {want}");
    }
}

#[test]
fn round_values_stay_exact() {
    // The range limits of the scenario checks must hold exactly.
    assert_eq!(parse_quantity(D::Temperature, "122F").unwrap(), 50.0);
    assert_eq!(parse_quantity(D::Temperature, "32F").unwrap(), 0.0);
    assert_eq!(parse_quantity(D::Temperature, "273.15K").unwrap(), 0.0);
    assert_eq!(parse_quantity(D::SmallLength, "2.4mm").unwrap(), 0.0024);
    assert_eq!(parse_quantity(D::Angle, "90deg").unwrap(), PI / 2.0);
    assert_eq!(parse_quantity(D::Angle, "180deg").unwrap(), PI);
    assert_eq!(to_display(D::Temperature, 50.0, UnitSystem::Us), 122.0);
}

#[test]
fn errors_say_what_is_accepted() {
    let e = parse_quantity(D::Pressure, "2.8").unwrap_err();
    assert!(matches!(e, UnitError::MissingUnit { .. }));
    let msg = e.to_string();
    assert!(
        msg.contains("kPa") && msg.contains("psi") && msg.contains("bar"),
        "{msg}"
    );

    let e = parse_quantity(D::Pressure, "2.8 lpm").unwrap_err();
    let msg = e.to_string();
    assert!(matches!(e, UnitError::UnknownUnit { .. }));
    assert!(msg.contains("`lpm` is not a unit of pressure"), "{msg}");
    assert!(msg.contains("psi"), "{msg}");

    let e = parse_quantity(D::Flow, "fast").unwrap_err();
    assert!(matches!(e, UnitError::NotANumber { .. }), "{e}");
    assert!(e.to_string().contains("L/min"));

    assert!(matches!(
        parse_quantity(D::Flow, "  "),
        Err(UnitError::Empty { .. })
    ));
    assert!(matches!(
        parse_quantity(D::Pressure, "1e999bar"),
        Err(UnitError::NotFinite { .. })
    ));
    // A length unit is not a pressure, in either case.
    assert!(parse_quantity(D::Pressure, "3m").is_err());
    assert!(parse_quantity(D::Length, "3kPa").is_err());
    // Only one dot in a number: `1.2.3m` leaves `.3m` as the unit.
    assert!(parse_quantity(D::Length, "1.2.3m").is_err());
}

#[test]
fn display_round_trips_in_both_systems() {
    let values = [0.0, 1e-6, 0.0024, 0.16, 1.0, 7.5, 280e3, 123.456];
    for dim in Dimension::ALL {
        for system in [UnitSystem::Metric, UnitSystem::Us] {
            for &si in &values {
                let shown = to_display(dim, si, system);
                let back = from_display(dim, shown, system);
                assert!(
                    (back - si).abs() <= 1e-12 * si.abs().max(1.0),
                    "{dim:?} {system}: {si} → {shown} → {back}"
                );
                // What we show can be typed back in.
                let typed = format!("{shown:e}{}", unit_label(dim, system));
                let parsed = parse_quantity(dim, &typed)
                    .unwrap_or_else(|e| panic!("{dim:?} `{typed}`: {e}"));
                assert!(
                    (parsed - si).abs() <= 1e-12 * si.abs().max(1.0),
                    "{dim:?} `{typed}` → {parsed}, want {si}"
                );
            }
        }
    }
}

#[test]
fn csv_unit_keys_are_plain_ascii_and_distinct_per_system() {
    for dim in Dimension::ALL {
        for system in [UnitSystem::Metric, UnitSystem::Us] {
            let key = unit_key(dim, system);
            assert!(
                !key.is_empty() && key.chars().all(|c| c.is_ascii_alphanumeric() || c == '_'),
                "{dim:?} {system}: `{key}`"
            );
        }
    }
    assert_eq!(unit_key(D::Pressure, UnitSystem::Metric), "kPa");
    assert_eq!(unit_key(D::Pressure, UnitSystem::Us), "psi");
    assert_eq!(unit_key(D::Flow, UnitSystem::Metric), "L_min");
    assert_eq!(unit_key(D::Torque, UnitSystem::Us), "lbf_in");
    assert_eq!(unit_key(D::Temperature, UnitSystem::Us), "degF");
    assert_eq!(unit_key(D::Angle, UnitSystem::Metric), "deg");
    assert_eq!(
        csv_key("pressure", D::Pressure, UnitSystem::Us),
        "pressure_psi"
    );
}

#[test]
fn every_display_unit_is_in_the_table() {
    for dim in Dimension::ALL {
        for system in [UnitSystem::Metric, UnitSystem::Us] {
            assert_ne!(unit_label(dim, system), "(SI)", "{dim:?} {system}");
        }
    }
}

#[test]
fn formats_like_a_gauge_reading() {
    let m = UnitSystem::Metric;
    let us = UnitSystem::Us;
    assert_eq!(format_quantity(D::Pressure, 280e3, m), "280 kPa");
    // 280 kPa = 40.61 psi.
    assert_eq!(format_quantity(D::Pressure, 280e3, us), "40.6 psi");
    assert_eq!(format_quantity(D::SmallLength, 0.0024, m), "2.40 mm");
    assert_eq!(format_quantity(D::SmallLength, 0.0254 * 6.5, us), "6.50 in");
    assert_eq!(format_quantity(D::Length, 9.0, m), "9.00 m");
    assert_eq!(format_quantity(D::Length, 9.0, us), "29.5 ft");
    assert_eq!(format_quantity(D::Flow, 12e-3 / 60.0, m), "12.0 L/min");
    assert_eq!(format_quantity(D::Flow, 12e-3 / 60.0, us), "3.17 gpm");
    assert_eq!(format_quantity(D::Torque, 0.02, m), "0.0200 N·m");
    assert_eq!(format_quantity(D::Torque, 0.02, us), "0.177 lbf·in");
    assert_eq!(format_quantity(D::Temperature, 20.0, m), "20.0 °C");
    assert_eq!(format_quantity(D::Temperature, 20.0, us), "68.0 °F");
    assert_eq!(format_quantity(D::Angle, 22f64.to_radians(), us), "22.0°");
    assert_eq!(format_quantity(D::AngularSpeed, PI, m), "30.0 rpm");
    assert_eq!(format_quantity(D::Pressure, 1.25e6, m), "1250 kPa");
    assert_eq!(format_quantity(D::Pressure, -5e3, m), "-5.00 kPa");
    assert_eq!(format_quantity(D::Pressure, f64::NAN, m), "n/a kPa");
    assert_eq!(format_quantity(D::Angle, f64::INFINITY, m), "n/a°");
    assert_eq!(format_number(99.96), "100");
    assert_eq!(format_number(9.996), "10.0");
    assert_eq!(format_number(0.0), "0");
    assert_eq!(format_number(2e-5), "2.00e-5");
    assert_eq!(format_number(-1.5e10), "-1.50e10");
    assert_eq!(format_number(0.000_123_4), "0.000123");
    assert_eq!(unit_label(D::Flow, us), "gpm");
    assert_eq!(unit_label(D::Inertia, m), "kg·m²");
}
