//! Fits in words: the speed fit over several readings and the coast-down,
//! in metric or US units. Brake coefficients are shown as a torque per rad/s
//! (c₁) and per (rad/s)² (c₂) in the unit system's torque unit.

use crate::inverse::coast::{CoastResult, InertiaSource};
use crate::inverse::fit::{FitResult, Fitted, Prediction, Visit};
use crate::units::{
    format_number, format_quantity, to_display, unit_label, Dimension as D, UnitSystem,
};

/// A brake coefficient with its unit: `power` 1 for c₁, 2 for c₂.
pub fn brake_coefficient(value: f64, power: u8, u: UnitSystem) -> String {
    let unit = unit_label(D::Torque, u);
    let per = if power == 1 { "s/rad" } else { "s²/rad²" };
    format!(
        "{} {unit}·{per}",
        format_number(to_display(D::Torque, value, u))
    )
}

fn pm(half: Option<f64>, show: impl Fn(f64) -> String) -> String {
    match half {
        Some(h) => format!(" ± {}", show(h)),
        None => String::new(),
    }
}

fn status(f: &Fitted) -> &'static str {
    if !f.fitted {
        " (held at the design's)"
    } else if f.at_zero {
        " (at zero: the readings ask for none)"
    } else {
        ""
    }
}

/// The speed fit as text.
pub fn fit_text(name: &str, r: &FitResult, predictions: &[Prediction], u: UnitSystem) -> String {
    let torque = |v: f64| format_quantity(D::Torque, v, u);
    let plural =
        |n: usize, one: &str, many: &str| format!("{n} {}", if n == 1 { one } else { many });
    let mut s = format!(
        "{name}: fitted to {} ({}, {} left)\n",
        plural(r.residuals.len(), "reading", "readings"),
        plural(r.params.len(), "parameter", "parameters"),
        plural(r.dof, "degree of freedom", "degrees of freedom"),
    );
    if r.running_is_mu {
        s.push_str(&format!(
            "  bearing μ_k           {}{}{}\n  running friction      {} (mean over the readings){}\n",
            format_number(r.running.value),
            pm(r.running.ci95, format_number),
            status(&r.running),
            torque(r.running_friction_n_m),
            pm(
                r.running_friction_std_n_m
                    .zip(r.running.ci95.zip(r.running.std_error))
                    .map(|(s, (c, e))| s * c / e),
                torque
            ),
        ));
    } else {
        s.push_str(&format!(
            "  running friction      {}{}{}\n",
            torque(r.running.value),
            pm(r.running.ci95, torque),
            status(&r.running)
        ));
    }
    s.push_str(&format!(
        "  brake, viscous c₁     {}{}{}\n",
        brake_coefficient(r.viscous.value, 1, u),
        pm(r.viscous.ci95, |h| brake_coefficient(h, 1, u)),
        status(&r.viscous)
    ));
    s.push_str(&format!(
        "  brake, quadratic c₂   {}{}{}\n",
        brake_coefficient(r.quadratic.value, 2, u),
        pm(r.quadratic.ci95, |h| brake_coefficient(h, 2, u)),
        status(&r.quadratic)
    ));
    if let (Some(sc), Some(d)) = (r.nozzle_scale, r.effective_diameter_m) {
        s.push_str(&format!(
            "  nozzle (from flows)   {} against {} new ({:.1} % of the diameter{})\n",
            format_quantity(D::SmallLength, d, u),
            format_quantity(D::SmallLength, r.nominal_diameter_m, u),
            100.0 * sc.value,
            sc.ci95
                .map_or(String::new(), |h| format!(" ± {:.1} %", 100.0 * h))
        ));
    }
    s.push_str("  (± is the 95 % interval from the residual scatter; none with no degree of freedom left)\n");
    s.push_str(&format!("\n  rms residual {:.2} rpm\n", r.rms_residual_rpm));
    let flows = r.residuals.iter().any(|x| x.measured_flow_m3_s.is_some());
    s.push_str(&format!(
        "  {:<12} {:>10} {:>10} {:>10}{}\n",
        format!("pressure {}", unit_label(D::Pressure, u)),
        "measured",
        "model",
        "residual",
        if flows {
            format!(
                "  {:>14} {:>14}",
                format!("flow {}", unit_label(D::Flow, u)),
                "model flow"
            )
        } else {
            String::new()
        }
    ));
    for x in &r.residuals {
        s.push_str(&format!(
            "  {:<12} {:>10.1} {:>10.1} {:>10.2}",
            format_number(to_display(D::Pressure, x.inlet_pressure_pa, u)),
            x.measured_rpm,
            x.model_rpm,
            x.residual_rpm.abs()
        ));
        if flows {
            let show = |v: Option<f64>| {
                v.map_or("—".to_string(), |q| {
                    format_number(to_display(D::Flow, q, u))
                })
            };
            s.push_str(&format!(
                "  {:>14} {:>14}",
                show(x.measured_flow_m3_s),
                show(x.model_flow_m3_s)
            ));
        }
        if x.residual_rpm != 0.0 {
            s.push_str(if x.residual_rpm > 0.0 {
                "  (model faster)"
            } else {
                "  (model slower)"
            });
        }
        if let Some(t) = &x.time {
            s.push_str(&format!("  {t}"));
        }
        s.push('\n');
    }
    for p in predictions {
        s.push_str(&format!(
            "  at {}: {}\n",
            format_quantity(D::Pressure, p.inlet_pressure_pa, u),
            match p.rpm {
                Some(n) => format!(
                    "{n:.1} rpm{}",
                    p.ci95_rpm.map_or(String::new(), |h| format!(" ± {h:.1}"))
                ),
                None => "the fitted model does not run".into(),
            }
        ));
    }
    let mean_rpm =
        r.residuals.iter().map(|x| x.measured_rpm).sum::<f64>() / r.residuals.len().max(1) as f64;
    if r.rms_residual_rpm > 0.1 * mean_rpm {
        s.push_str("  note: the model misses these readings by more than 10 %: check them against the design (pressure at the inlet, speed in rpm)\n");
    }
    if !r.converged {
        s.push_str("  note: the fit stopped at its iteration limit; the values may not be final\n");
    }
    s
}

/// The running friction's change from the first visit to the last, percent
/// (None with fewer than two visits or none at first).
pub fn trend_percent(visits: &[Visit]) -> Option<f64> {
    let (first, last) = (visits.first()?, visits.last()?);
    (visits.len() >= 2 && first.running_friction_n_m > 0.0)
        .then(|| 100.0 * (last.running_friction_n_m / first.running_friction_n_m - 1.0))
}

/// The trend over visits as text (empty with fewer than two visits).
pub fn trend_text(visits: &[Visit], u: UnitSystem) -> String {
    let (Some(first), Some(last)) = (visits.first(), visits.last()) else {
        return String::new();
    };
    if visits.len() < 2 {
        return String::new();
    }
    let torque = |v: f64| format_quantity(D::Torque, v, u);
    let mut s = String::from(
        "\n  Running friction by visit (each fitted alone, the brake held at the design's)\n",
    );
    for v in visits {
        s.push_str(&format!(
            "  {}  {}  ({} reading{})\n",
            v.date,
            torque(v.running_friction_n_m),
            v.readings,
            if v.readings == 1 { "" } else { "s" }
        ));
    }
    let line = match trend_percent(visits) {
        Some(p) if p.abs() < 0.5 => format!("running friction unchanged since {}", first.date),
        Some(p) if p > 0.0 => format!("running friction up {p:.0} % since {}", first.date),
        Some(p) => format!("running friction down {:.0} % since {}", -p, first.date),
        None => format!(
            "running friction from none on {} to {} on {}",
            first.date,
            torque(last.running_friction_n_m),
            last.date
        ),
    };
    s.push_str(&format!("  {line}\n"));
    s
}

/// The coast-down fit as text, with its assumptions.
pub fn coast_text(name: &str, r: &CoastResult, u: UnitSystem) -> String {
    let torque = |v: f64| format_quantity(D::Torque, v, u);
    let mut s = format!("{name}: coast-down with the water off\n");
    s.push_str(&format!(
        "  dry running friction  {}{}{}\n",
        torque(r.running_friction_n_m.value),
        pm(r.running_friction_n_m.ci95, torque),
        if r.running_friction_n_m.at_zero {
            " (at zero)"
        } else {
            ""
        }
    ));
    s.push_str(&format!(
        "  brake, viscous c₁     {}{}{}\n",
        brake_coefficient(r.viscous_n_m_s.value, 1, u),
        pm(r.viscous_n_m_s.ci95, |h| brake_coefficient(h, 1, u)),
        if r.viscous_n_m_s.at_zero {
            " (at zero)"
        } else {
            ""
        }
    ));
    s.push_str(&format!(
        "  speed at time zero    {:.1} rpm{}\n",
        r.omega0_rad_s.value * 60.0 / std::f64::consts::TAU,
        pm(r.omega0_rad_s.ci95, |h| format!(
            "{:.1} rpm",
            h * 60.0 / std::f64::consts::TAU
        ))
    ));
    s.push_str(&format!(
        "  stops after           {}\n",
        r.stop_time_s.map_or(
            "— (not within a hundred times the record)".into(),
            |t| format!("{t:.1} s")
        )
    ));
    s.push_str(&format!(
        "  rms residual          {}\n",
        if r.turn_times {
            format!("{:.3} s", r.rms_residual)
        } else {
            format!("{:.2} rpm", r.rms_residual)
        }
    ));
    s.push_str("  (± is the 95 % interval from the residual scatter)\n\nAssumptions\n");
    s.push_str(&format!(
        "  - inertia {} ({})\n",
        format_quantity(D::Inertia, r.inertia_kg_m2, u),
        match r.inertia_source {
            InertiaSource::Given => "given in the design",
            InertiaSource::Estimated => "estimated from the design's arms, drained of water",
            InertiaSource::Override => "given on the command line",
        }
    ));
    s.push_str("  - no water torque from time zero: the first time is a pass of the mark at or just after shut-off\n");
    s.push_str(&format!(
        "  - brake c₂ held at the design's {}; air drag on the arms from the design, {}\n",
        brake_coefficient(r.quadratic_n_m_s2, 2, u),
        brake_coefficient(r.air_n_m_s2, 2, u)
    ));
    s.push_str("  - dry running friction is the bearing under the rotor's weight alone plus the seal at no pressure; no wind\n");
    s.push_str(&format!(
        "\n  {:>8} {:>10} {:>10}\n",
        if r.turn_times { "turn" } else { "time s" },
        if r.turn_times { "measured s" } else { "rpm" },
        "model"
    ));
    for x in &r.residuals {
        if r.turn_times {
            s.push_str(&format!(
                "  {:>8.0} {:>10.2} {:>10.2}\n",
                x.at, x.measured, x.model
            ));
        } else {
            s.push_str(&format!(
                "  {:>8.2} {:>10.1} {:>10.1}\n",
                x.at, x.measured, x.model
            ));
        }
    }
    s
}
