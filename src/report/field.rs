//! A field check in words: the findings, the candidate causes and the
//! resisting torque's split, in metric or US units. Every number shown is a
//! size (no signs): directions are words ("slower", "speeds it up").

use crate::inverse::field::{
    Alone, Cause, CauseEvidence, CauseKind, Detail, Direction, FieldCheck, Finding, NozzleAlone,
    ResistSplit, Within,
};
use crate::units::{format_quantity, Dimension as D, UnitSystem};

/// A factor "3.0×", "12×" (never negative: callers pass factors ≥ 0).
pub fn times(k: f64) -> String {
    let k = k.max(0.0);
    if k >= 10.0 {
        format!("{k:.0}×")
    } else if k >= 0.995 || k == 0.0 {
        format!("{k:.1}×")
    } else {
        format!("{k:.2}×")
    }
}

fn q(dim: D, v: f64, u: UnitSystem) -> String {
    format_quantity(dim, v, u)
}

/// The name of a cause in a sentence.
pub fn cause_name(kind: CauseKind) -> &'static str {
    match kind {
        CauseKind::Pressure => "pressure",
        CauseKind::Nozzle => "nozzle",
        CauseKind::Bearing => "bearing drag",
        CauseKind::Seal => "seal drag",
        CauseKind::Brake => "brake drag",
        CauseKind::Air => "air drag",
    }
}

/// What a part's change means at the unit, slower (more drag) or faster (less).
fn part_hint(kind: CauseKind, more: bool) -> &'static str {
    match (kind, more) {
        (CauseKind::Bearing, true) => "grit in the washer or a dry bearing",
        (CauseKind::Bearing, false) => "a bearing running freer than designed",
        (CauseKind::Seal, true) => "a dry or swollen seal",
        (CauseKind::Seal, false) => "a worn seal — look for a leak at the swivel",
        (CauseKind::Brake, true) => "brake fluid too thick (cold) or the brake binding",
        (CauseKind::Brake, false) => "brake fluid low or the brake worn",
        (CauseKind::Air, true) => "something on the arms catching the air",
        (CauseKind::Air, false) => "less air drag than designed",
        (CauseKind::Pressure | CauseKind::Nozzle, _) => "",
    }
}

/// The explanation a top cause gives, for the speed finding.
fn explanation(top: &Cause, u: UnitSystem) -> String {
    match top.evidence {
        CauseEvidence::Pressure {
            measured_pa,
            design_pa,
        } => format!(
            "the pressure {} design ({} against {}) explains most of it",
            if measured_pa < design_pa {
                "below"
            } else {
                "above"
            },
            q(D::Pressure, measured_pa, u),
            q(D::Pressure, design_pa, u)
        ),
        CauseEvidence::NozzleFromFlow { scale, .. } => {
            if scale < 1.0 {
                "the partly clogged nozzle explains most of it — clean or replace it".into()
            } else {
                "the worn nozzle's extra flow explains most of it — replace it".into()
            }
        }
        CauseEvidence::NozzleUnmeasured(_) => "the nozzle".into(),
        CauseEvidence::Part { alone, .. } => {
            let name = cause_name(top.kind);
            match alone {
                Alone::Factor { factor, .. } => format!(
                    "{name} about {} design explains it: {}",
                    times(factor),
                    part_hint(top.kind, factor > 1.0)
                ),
                Alone::Added { needed_n_m } => format!(
                    "{name} of about {} where the design has none explains it: {}",
                    q(D::Torque, needed_n_m, u),
                    part_hint(top.kind, true)
                ),
                Alone::NegativeFriction | Alone::Absent => format!("{name} explains most of it"),
            }
        }
    }
}

fn within_words(w: Within, what: &str) -> String {
    match w {
        Within::ReadingBand => "within reading accuracy".into(),
        Within::Tolerance(t) | Within::Beyond(t) => format!("within {t:.0} % of {what}"),
    }
}

/// The headline of a finding.
pub fn finding_text(f: &Finding, u: UnitSystem) -> String {
    match &f.detail {
        Detail::Speed {
            direction,
            percent,
            within,
            top,
            ..
        } => {
            let head = match direction {
                Direction::Slower => format!("spins {percent:.1} % slower than design"),
                Direction::Faster => format!("spins {percent:.1} % faster than design"),
                Direction::AsDesigned => "spins as designed".to_string(),
            };
            match within {
                Within::ReadingBand => format!("{head}, within reading accuracy"),
                Within::Tolerance(t) => format!("{head}, within the {t:.0} % allowed"),
                Within::Beyond(_) => match top {
                    Some(c) => format!("{head}: {}", explanation(c, u)),
                    None => match direction {
                        Direction::Faster => format!(
                            "{head}, more than less drag can explain: check the nozzle angles and the pressure gauge"
                        ),
                        _ => format!("{head}: more drag than designed, no single part explains it"),
                    },
                },
            }
        }
        Detail::DesignDoesNotRun {
            pressure_pa,
            stalls,
            ..
        } => {
            if *stalls {
                format!(
                    "the design stalls at {}, yet the rotor turns: less breakaway friction than designed, or the pressure reading is low",
                    q(D::Pressure, *pressure_pa, u)
                )
            } else {
                format!(
                    "the design finds no steady speed at {}, yet the rotor settles: more drag than designed",
                    q(D::Pressure, *pressure_pa, u)
                )
            }
        }
        Detail::SpeedNotExplained { .. } => {
            "bearing drag alone does not explain the measured speed: check the nozzle angles and for rubbing parts".into()
        }
        Detail::Regulator { limit_pa, .. } => format!(
            "pressure above {}: fit a regulator",
            q(D::Pressure, *limit_pa, u)
        ),
        Detail::Pressure {
            measured_pa,
            design_pa,
            percent,
            within,
        } => match within {
            Within::Beyond(_) if measured_pa < design_pa => format!(
                "pressure {percent:.0} % below design: loss upstream — check the hose, filter, valve"
            ),
            Within::Beyond(_) => format!(
                "pressure {percent:.0} % above design: expect more flow and speed than designed"
            ),
            Within::ReadingBand => "pressure as designed, within reading accuracy".into(),
            w => format!("pressure close to design ({})", within_words(*w, "it")),
        },
        Detail::Flow {
            measured_m3_s,
            nominal_m3_s,
            percent,
            within,
            effective_diameter_m,
            ..
        } => {
            if effective_diameter_m.is_none() {
                "more flow than the arms can pass at this pressure: check the flow reading and look for a leak at the swivel".into()
            } else {
                match within {
                    Within::ReadingBand => "flow as a new nozzle's, within reading accuracy".into(),
                    Within::Tolerance(t) => format!("flow within {t:.0} % of a new nozzle's"),
                    Within::Beyond(_) if measured_m3_s > nominal_m3_s => {
                        format!("flow {percent:.0} % over nominal: nozzle worn — replace it")
                    }
                    Within::Beyond(_) => format!(
                        "flow {percent:.0} % under nominal: nozzle partly clogged — clean or replace it"
                    ),
                }
            }
        }
        Detail::Throw {
            measured_m,
            expected_m,
            percent,
            within,
            explained,
            ..
        } => match within {
            Within::ReadingBand => "throw as designed, within reading accuracy".into(),
            Within::Tolerance(t) => format!("throw within {t:.0} % of design"),
            Within::Beyond(_) if measured_m < expected_m => {
                if *explained {
                    format!("throw {percent:.0} % short, as the speed and flow found explain")
                } else {
                    format!(
                        "throw {percent:.0} % short of expected: nozzle damaged or partly blocked (the jet breaks up early), or wind during the test"
                    )
                }
            }
            Within::Beyond(_) => {
                if *explained {
                    format!("throw {percent:.0} % long, as the speed and flow found explain")
                } else {
                    format!(
                        "throw {percent:.0} % beyond expected: larger drops than the model assumes — calibrate the spray to this throw"
                    )
                }
            }
        },
    }
}

/// " (lo–hi from the reading)", or nothing for an exact reading.
fn rpm_band(b: &[f64; 2]) -> String {
    if b[1] > b[0] {
        format!(" ({:.1}–{:.1} from the reading)", b[0], b[1])
    } else {
        String::new()
    }
}

/// " (lo to hi)" in units, or nothing for an exact reading.
fn unit_band(dim: D, b: &[f64; 2], u: UnitSystem) -> String {
    if b[1] > b[0] {
        format!(" ({} to {})", q(dim, b[0], u), q(dim, b[1], u))
    } else {
        String::new()
    }
}

/// The numbers behind a finding.
pub fn finding_evidence(f: &Finding, u: UnitSystem) -> String {
    match &f.detail {
        Detail::Speed {
            measured_rpm,
            band_rpm,
            design_rpm,
            design_pressure_pa,
            at_pressure_rpm,
            ..
        } => {
            let mut s = format!(
                "measured {measured_rpm:.1} rpm{}, the design {design_rpm:.1} rpm at its {}",
                rpm_band(band_rpm),
                q(D::Pressure, *design_pressure_pa, u)
            );
            if let Some(e) = at_pressure_rpm {
                if (e - design_rpm).abs() > 0.05 {
                    s.push_str(&format!(", {e:.1} rpm at the measured pressure"));
                }
            }
            s
        }
        Detail::DesignDoesNotRun {
            measured_rpm,
            band_rpm,
            ..
        } => format!("measured {measured_rpm:.1} rpm{}", rpm_band(band_rpm)),
        Detail::SpeedNotExplained {
            measured_rpm,
            model_rpm,
        } => match model_rpm {
            Some(r) => format!(
                "with the implied drag the model settles at {r:.1} rpm, not {measured_rpm:.1}"
            ),
            None => "with the implied drag the model does not settle at any speed".into(),
        },
        Detail::Regulator { pressure_pa, .. } => {
            format!("measured {} at the inlet", q(D::Pressure, *pressure_pa, u))
        }
        Detail::Pressure {
            measured_pa,
            design_pa,
            ..
        } => format!(
            "measured {}, design inlet {}",
            q(D::Pressure, *measured_pa, u),
            q(D::Pressure, *design_pa, u)
        ),
        Detail::Flow {
            measured_m3_s,
            band_m3_s,
            nominal_m3_s,
            pressure_pa,
            rpm,
            effective_diameter_m,
            nominal_diameter_m,
            ..
        } => {
            let mut s = format!(
                "measured {}{}, a new nozzle passes {} at {} and {rpm:.1} rpm",
                q(D::Flow, *measured_m3_s, u),
                unit_band(D::Flow, band_m3_s, u),
                q(D::Flow, *nominal_m3_s, u),
                q(D::Pressure, *pressure_pa, u),
            );
            if let Some(d) = effective_diameter_m {
                s.push_str(&format!(
                    "; effective nozzle {} against {} nominal",
                    q(D::SmallLength, *d, u),
                    q(D::SmallLength, *nominal_diameter_m, u)
                ));
            }
            s
        }
        Detail::Throw {
            measured_m,
            band_m,
            expected_m,
            as_found_m,
            pressure_pa,
            ..
        } => {
            let mut s = format!(
                "measured {}{}, expected {} at {}",
                q(D::Length, *measured_m, u),
                unit_band(D::Length, band_m, u),
                q(D::Length, *expected_m, u),
                q(D::Pressure, *pressure_pa, u)
            );
            if let Some(af) = as_found_m {
                s.push_str(&format!(
                    "; {} with the speed and flow as found",
                    q(D::Length, *af, u)
                ));
            }
            s
        }
    }
}

/// How much of the deviation a cause accounts for, in words.
fn amount(explains: Option<f64>, deviation_rpm: Option<f64>) -> String {
    let Some(e) = explains else {
        return String::new();
    };
    if e.abs() < 0.05 {
        return "no part of the deviation".into();
    }
    let verb = if e < 0.0 {
        "slows it by"
    } else {
        "speeds it up by"
    };
    let share = match deviation_rpm {
        Some(d) if d.abs() >= 0.05 => {
            if e.signum() == d.signum() {
                format!(" ({:.0} % of the deviation)", 100.0 * (e / d))
            } else {
                " (against the deviation)".to_string()
            }
        }
        _ => String::new(),
    };
    format!("{verb} {:.1} rpm{share}", e.abs())
}

/// One cause in words, with its numbers.
pub fn cause_text(c: &Cause, deviation_rpm: Option<f64>, u: UnitSystem) -> String {
    let how = amount(c.explains_rpm, deviation_rpm);
    match c.evidence {
        CauseEvidence::Pressure {
            measured_pa,
            design_pa,
        } => match c.explains_rpm {
            Some(_) => format!(
                "pressure {} against {} by design: {how}",
                q(D::Pressure, measured_pa, u),
                q(D::Pressure, design_pa, u)
            ),
            None => format!(
                "pressure {} against {} by design: the design does not run at one of them",
                q(D::Pressure, measured_pa, u),
                q(D::Pressure, design_pa, u)
            ),
        },
        CauseEvidence::NozzleFromFlow {
            scale,
            effective_diameter_m,
            nominal_diameter_m,
        } => format!(
            "nozzle as found from the flow, {} against {} new ({}): {}",
            q(D::SmallLength, effective_diameter_m, u),
            q(D::SmallLength, nominal_diameter_m, u),
            if scale < 1.0 {
                "partly clogged"
            } else if scale > 1.0 {
                "worn"
            } else {
                "as new"
            },
            if how.is_empty() {
                "its effect on speed cannot be said, the model does not run".into()
            } else {
                how
            }
        ),
        CauseEvidence::NozzleUnmeasured(n) => match n {
            NozzleAlone::Clogged {
                effective_diameter_m,
                nominal_diameter_m,
                ..
            } => format!(
                "nozzle (no flow measured): one clogged to {} against {} new would explain the rest alone — measure the flow to tell",
                q(D::SmallLength, effective_diameter_m, u),
                q(D::SmallLength, nominal_diameter_m, u)
            ),
            NozzleAlone::LargerThanNew => "nozzle (no flow measured): impossible alone — it would need a nozzle larger than new (a worn nozzle shows as more flow: measure it)".into(),
            NozzleAlone::NotFound => "nozzle (no flow measured): no nozzle size explains it alone".into(),
        },
        CauseEvidence::Part {
            design_n_m,
            share,
            alone,
            design_mu_kinetic,
        } => {
            let name = cause_name(c.kind);
            let head = if design_n_m > 0.0 {
                format!(
                    "{name}: {} by design, {:.0} % of the resisting torque",
                    q(D::Torque, design_n_m, u),
                    100.0 * share
                )
            } else {
                format!("{name}: none in the design")
            };
            let alone_words = match alone {
                Alone::Factor { factor, needed_n_m } => {
                    let mu = design_mu_kinetic
                        .map(|mu| format!(", μ_k {:.3} against {mu:.3}", factor * mu))
                        .unwrap_or_default();
                    format!(
                        "alone it would need {} design ({}{mu})",
                        times(factor),
                        q(D::Torque, needed_n_m, u)
                    )
                }
                Alone::Added { needed_n_m } => {
                    format!("alone it would need {}", q(D::Torque, needed_n_m, u))
                }
                Alone::NegativeFriction => {
                    "impossible alone — it would need negative friction".into()
                }
                Alone::Absent => "cannot be the cause".into(),
            };
            if how.is_empty() {
                format!("{head}; {alone_words}")
            } else {
                format!("{head}; {how}; {alone_words}")
            }
        }
    }
}

/// The resisting torque's split at the measured speed, in words.
pub fn split_text(s: &ResistSplit, measured_rpm: f64, u: UnitSystem) -> String {
    let p = s.parts;
    let total = p.total_n_m();
    let pct = |t: f64| {
        if total > 0.0 {
            format!(" ({:.0} %)", 100.0 * t / total)
        } else {
            String::new()
        }
    };
    let mut line = format!(
        "resisting torque by design at {measured_rpm:.1} rpm: bearing {}{}, seal {}{}, brake {}{}, air {}{}; total {} against {}",
        q(D::Torque, p.bearing_n_m, u),
        pct(p.bearing_n_m),
        q(D::Torque, p.seal_n_m, u),
        pct(p.seal_n_m),
        q(D::Torque, p.brake_n_m, u),
        pct(p.brake_n_m),
        q(D::Torque, p.air_n_m, u),
        pct(p.air_n_m),
        q(D::Torque, total, u),
        if s.drive_n_m >= 0.0 {
            format!("a drive of {}", q(D::Torque, s.drive_n_m, u))
        } else {
            format!("jets that brake it by {}", q(D::Torque, -s.drive_n_m, u))
        },
    );
    if s.excess_n_m > 0.0 {
        line.push_str(&format!(
            " — {} more drag would hold the measured speed",
            q(D::Torque, s.excess_n_m, u)
        ));
    } else if s.excess_n_m < 0.0 && -s.excess_n_m > total {
        line.push_str(
            " — even with no drag at all the jets could not hold the measured speed: check the nozzle angles and the pressure gauge",
        );
    } else if s.excess_n_m < 0.0 {
        line.push_str(&format!(
            " — {} less drag would hold the measured speed",
            q(D::Torque, -s.excess_n_m, u)
        ));
    }
    line
}

/// The deviation from the design the causes are measured against, rpm.
pub fn deviation_rpm(c: &FieldCheck) -> Option<f64> {
    c.design_rpm.map(|d| c.measured_rpm - d)
}

/// Whether the causes are worth showing: the speed lies outside its reading band.
pub fn show_causes(c: &FieldCheck) -> bool {
    match c.findings.first().map(|f| &f.detail) {
        Some(Detail::Speed { within, .. }) => !matches!(within, Within::ReadingBand),
        _ => true,
    }
}

/// The whole check as text, for the command line.
pub fn check_text(name: &str, c: &FieldCheck, u: UnitSystem) -> String {
    let mut s = format!(
        "{name}: field check at {}\n",
        q(D::Pressure, c.inlet_pressure_pa, u)
    );
    for (k, f) in c.findings.iter().enumerate() {
        s.push_str(&format!(
            "  {}. {}{}\n     {}\n",
            k + 1,
            if f.fault { "" } else { "ok: " },
            finding_text(f, u),
            finding_evidence(f, u)
        ));
        if k == 0 && show_causes(c) {
            s.push_str("\n  Causes, by how much of the deviation each explains\n");
            let dev = deviation_rpm(c);
            for cause in &c.causes {
                s.push_str(&format!("   - {}\n", cause_text(cause, dev, u)));
            }
            s.push_str(&format!(
                "  {}\n\n",
                split_text(&c.split, c.measured_rpm, u)
            ));
        }
    }
    s
}
