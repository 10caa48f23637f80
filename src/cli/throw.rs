//! `spinwright throw`: trajectories per nozzle, wetted radius, radial profile.

use std::io::Write;
use std::path::Path;

use serde::Serialize;

use super::text::{csv_number, TextTable};
use super::{load_design, CliError, Format, Outcome, Output};
use crate::physics::balance::solve;
use crate::physics::coverage::{head_throw, head_wind_radii, HeadThrow};
use crate::physics::design::Design;
use crate::physics::pattern::{PatternOptions, WindRadii};
use crate::units::{
    csv_key, format_number, format_quantity, to_display, unit_label, Dimension as D, UnitSystem,
};

/// Profile sample spacing for reports, m.
const PROFILE_STEP_M: f64 = 0.25;

#[derive(Debug, Serialize)]
struct ThrowJson {
    wetted_radius_m: f64,
    wetting_threshold_mm_h: f64,
    farthest_drop_m: f64,
    peak_height_m: f64,
    throw_at_rest_m: f64,
    running: bool,
    #[serde(skip_serializing_if = "Option::is_none")]
    wetted_radius_upwind_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    wetted_radius_downwind_m: Option<f64>,
    #[serde(skip_serializing_if = "Option::is_none")]
    wetted_radius_crosswind_m: Option<f64>,
    nozzles: Vec<Option<NozzleThrowJson>>,
    profile: Vec<ProfileJson>,
    peak_depth_per_turn_mm: Option<f64>,
    breakup_coefficient: f64,
    #[serde(skip_serializing_if = "Option::is_none")]
    calibration: Option<CalibrationJson>,
}

#[derive(Debug, Serialize)]
struct CalibrationJson {
    measured_wetted_radius_m: f64,
    breakup_coefficient: f64,
    uncalibrated_breakup_coefficient: f64,
    uncalibrated_wetted_radius_m: f64,
}

#[derive(Debug, Serialize)]
struct NozzleThrowJson {
    throw_m: DropThrowsJson,
    d50_m: f64,
    largest_drop_m: f64,
    intact_length_m: f64,
    peak_height_m: f64,
}

#[derive(Debug, Serialize)]
struct DropThrowsJson {
    largest: f64,
    median: f64,
    small: f64,
}

#[derive(Debug, Serialize)]
struct ProfileJson {
    r_m: f64,
    rate_mm_h: f64,
}

fn throw_json(head: &HeadThrow, wind: Option<WindRadii>) -> ThrowJson {
    ThrowJson {
        wetted_radius_m: head.throw.wetted_radius_m,
        wetting_threshold_mm_h: head.throw.wetting_threshold_mm_h,
        farthest_drop_m: head.throw.farthest_drop_m,
        peak_height_m: head.throw.peak_height_m,
        throw_at_rest_m: head.rest_vs_running.at_rest_m,
        running: head.spraying.running,
        wetted_radius_upwind_m: wind.map(|w| w.upwind_m),
        wetted_radius_downwind_m: wind.map(|w| w.downwind_m),
        wetted_radius_crosswind_m: wind.map(|w| w.crosswind_m),
        nozzles: head
            .throw
            .nozzles
            .iter()
            .map(|n| {
                n.as_ref().map(|t| NozzleThrowJson {
                    throw_m: DropThrowsJson {
                        largest: t.throw_largest_m,
                        median: t.throw_median_m,
                        small: t.throw_small_m,
                    },
                    d50_m: t.spectrum.d50_m,
                    largest_drop_m: t.spectrum.largest_m,
                    intact_length_m: t.breakup.intact_length_m,
                    peak_height_m: t.peak_height_m,
                })
            })
            .collect(),
        profile: head
            .throw
            .profile
            .sampled(PROFILE_STEP_M)
            .into_iter()
            .map(|p| ProfileJson {
                r_m: p.r_m,
                rate_mm_h: p.rate_mm_h,
            })
            .collect(),
        peak_depth_per_turn_mm: head.throw.peak_depth_per_turn_mm,
        breakup_coefficient: head.throw.breakup_coefficient,
        calibration: head.calibration.map(|c| CalibrationJson {
            measured_wetted_radius_m: c.measured_radius_m,
            breakup_coefficient: c.breakup_coefficient,
            uncalibrated_breakup_coefficient: c.uncalibrated_breakup_coefficient,
            uncalibrated_wetted_radius_m: c.uncalibrated_radius_m,
        }),
    }
}

/// The text report of a head's throw; `wind` the radii in the design's wind.
pub fn throw_text(
    design: &Design,
    head: &HeadThrow,
    wind: Option<WindRadii>,
    units: UnitSystem,
) -> String {
    let q = |dim, v| format_quantity(dim, v, units);
    let mut s = String::new();
    s.push_str(&format!(
        "{}: wetted radius {}{}\n",
        design.name,
        q(D::Length, head.throw.wetted_radius_m),
        if head.spraying.running {
            ""
        } else {
            " (not turning: jets at rest)"
        }
    ));
    s.push_str(&format!(
        "  (farthest point still getting {}; the farthest drop lands at {}; \
         paths peak {} above ground)\n",
        q(
            D::ApplicationRate,
            head.throw.wetting_threshold_mm_h / crate::physics::pattern::M_S_TO_MM_H
        ),
        q(D::Length, head.throw.farthest_drop_m),
        q(D::Length, head.throw.peak_height_m),
    ));
    if let Some(w) = wind {
        s.push_str(&format!(
            "  in the site's wind of {}: upwind {}, downwind {}, across {}\n",
            q(D::Speed, design.wind.speed_m_s),
            q(D::Length, w.upwind_m),
            q(D::Length, w.downwind_m),
            q(D::Length, w.crosswind_m),
        ));
    }
    let cmp = head.rest_vs_running;
    s.push_str(&format!(
        "  held still it would throw {}; turning costs {:.1} % of the throw\n",
        q(D::Length, cmp.at_rest_m),
        -cmp.change_percent
    ));
    if let Some(c) = head.calibration {
        s.push_str(&format!(
            "  calibrated to a measured {}: jet breakup coefficient {:.2} (was {:.2}; \
             the model gave {} before)\n",
            q(D::Length, c.measured_radius_m),
            c.breakup_coefficient,
            c.uncalibrated_breakup_coefficient,
            q(D::Length, c.uncalibrated_radius_m)
        ));
    }
    if let Some(d) = head.throw.peak_depth_per_turn_mm {
        let depth = to_display(D::SmallLength, d / 1000.0, units);
        s.push_str(&format!(
            "  depth per turn at the peak ring: {} {}\n",
            format_number(depth),
            unit_label(D::SmallLength, units)
        ));
    }
    s.push('\n');
    let len = unit_label(D::Length, units);
    let small = unit_label(D::SmallLength, units);
    let mut t = TextTable::new(vec![
        "nozzle".to_string(),
        format!("intact jet {len}"),
        format!("largest drop {small}"),
        format!("throw {len}"),
        format!("median drop {small}"),
        format!("throw {len}"),
        format!("small drop {small}"),
        format!("throw {len}"),
    ]);
    let show = |dim, v| format_number(to_display(dim, v, units));
    for (k, n) in head.throw.nozzles.iter().enumerate() {
        match n {
            Some(n) => t.row([
                format!("{}", k + 1),
                show(D::Length, n.breakup.intact_length_m),
                show(D::SmallLength, n.spectrum.largest_m),
                show(D::Length, n.throw_largest_m),
                show(D::SmallLength, n.median_drop_m),
                show(D::Length, n.throw_median_m),
                show(D::SmallLength, n.small_drop_m),
                show(D::Length, n.throw_small_m),
            ]),
            None => t.row([format!("{}", k + 1), "not flowing".to_string()]),
        }
    }
    s.push_str(&t.render(2));
    s.push('\n');
    let rate = unit_label(D::ApplicationRate, units);
    let mut p = TextTable::new(vec![format!("distance {len}"), format!("rate {rate}")]);
    for point in head.throw.profile.sampled(PROFILE_STEP_M) {
        p.row([
            show(D::Length, point.r_m),
            show(
                D::ApplicationRate,
                point.rate_mm_h / crate::physics::pattern::M_S_TO_MM_H,
            ),
        ]);
    }
    s.push_str("Radial profile (still air)\n");
    s.push_str(&p.render(2));
    s
}

/// Run `throw`.
pub fn run(
    path: &Path,
    measured_m: Option<f64>,
    o: Output,
    out: &mut dyn Write,
) -> Result<Outcome, CliError> {
    let design = load_design(path)?;
    let report = solve(&design);
    let opts = PatternOptions::default();
    let head = head_throw(&design, &report, &opts, measured_m)
        .map_err(|e| CliError::Usage(format!("{}: {e}", path.display())))?;
    let wind = head_wind_radii(&design, &head, &opts)
        .map_err(|e| CliError::Usage(format!("{}: {e}", path.display())))?;
    let units: UnitSystem = o.units.into();
    match o.format {
        Format::Json => {
            serde_json::to_writer_pretty(&mut *out, &throw_json(&head, wind))
                .map_err(std::io::Error::from)?;
            writeln!(out)?;
        }
        Format::Text => write!(out, "{}", throw_text(&design, &head, wind, units))?,
        Format::Csv => {
            let mut w = csv::Writer::from_writer(out);
            let mut header = vec![
                csv_key("r", D::Length, units),
                csv_key("rate", D::ApplicationRate, units),
                csv_key("wetted_radius", D::Length, units),
            ];
            if wind.is_some() {
                header.extend(
                    ["upwind", "downwind", "crosswind"]
                        .map(|side| csv_key(&format!("wetted_radius_{side}"), D::Length, units)),
                );
            }
            w.write_record(&header)?;
            let shown = |v: f64| csv_number(to_display(D::Length, v, units));
            for p in head.throw.profile.sampled(PROFILE_STEP_M) {
                let mut row = vec![
                    shown(p.r_m),
                    csv_number(to_display(
                        D::ApplicationRate,
                        p.rate_mm_h / crate::physics::pattern::M_S_TO_MM_H,
                        units,
                    )),
                    shown(head.throw.wetted_radius_m),
                ];
                if let Some(r) = wind {
                    row.extend([r.upwind_m, r.downwind_m, r.crosswind_m].map(shown));
                }
                w.write_record(&row)?;
            }
            w.flush()?;
        }
    }
    Ok(Outcome::Done)
}
