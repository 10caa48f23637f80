//! Catch cans beside the model in words: the rating of the cans, what the
//! gap between cans and model suggests, and the spray fitted to a leg, in
//! metric or US units.

use crate::inverse::audit::{AuditReport, CanNote};
use crate::inverse::leg::LegFit;
use crate::physics::layout::LayoutResult;
use crate::physics::pattern::M_S_TO_MM_H;
use crate::units::{format_quantity, Dimension as D, UnitSystem};

fn rate(mm_h: f64, u: UnitSystem) -> String {
    format_quantity(D::ApplicationRate, mm_h / M_S_TO_MM_H, u)
}

fn length(m: f64, u: UnitSystem) -> String {
    format_quantity(D::Length, m, u)
}

/// Percent by which `a` differs from `b`, as a size.
fn gap_percent(a: f64, b: f64) -> f64 {
    if b > 0.0 {
        (100.0 * (a - b) / b).abs()
    } else {
        0.0
    }
}

/// One note in plain words: what was measured against the model, and what
/// the gap suggests.
pub fn note_text(note: &CanNote, u: UnitSystem) -> String {
    match *note {
        CanNote::ThrowShort {
            measured_m,
            model_m,
        } => format!(
            "shorter throw: the farthest wetted can stands at {} against {} modelled \
             ({:.0} % short). Likely the pressure at the head is lower than the \
             scenario's, the nozzle is worn or damaged, or the jet breaks up sooner \
             than modelled (--fit sets the breakup to the leg)",
            length(measured_m, u),
            length(model_m, u),
            gap_percent(measured_m, model_m)
        ),
        CanNote::ThrowLong {
            measured_m,
            model_m,
        } => format!(
            "longer throw: the farthest wetted can stands at {} against {} modelled \
             ({:.0} % farther). Likely the pressure at the head is higher than the \
             scenario's, or the jet holds together longer than modelled (--fit sets \
             the breakup to the leg)",
            length(measured_m, u),
            length(model_m, u),
            gap_percent(measured_m, model_m)
        ),
        CanNote::ThrowAgrees {
            measured_m,
            model_m,
        } => format!(
            "throw as modelled: the farthest wetted can stands at {} against {} modelled",
            length(measured_m, u),
            length(model_m, u)
        ),
        CanNote::NoThrow { threshold_mm_h } => format!(
            "no can caught the wetting threshold of {}: the head did not reach the \
             leg, or the test was too short to measure",
            rate(threshold_mm_h, u)
        ),
        CanNote::DryNearHead {
            within_m,
            measured_mm_h,
            model_mm_h,
        } => format!(
            "dry ring near the head: the cans within {} caught {} against {} modelled. \
             Likely the jet stays whole past the near ground (a missing or worn \
             breakup pin or spreader), or wind carried the fine drops off",
            length(within_m, u),
            rate(measured_mm_h, u),
            rate(model_mm_h, u)
        ),
        CanNote::WetNearHead {
            within_m,
            measured_mm_h,
            model_mm_h,
        } => format!(
            "wet ring near the head: the cans within {} caught {} against {} modelled. \
             Likely the jet breaks up early (a damaged or dirty nozzle, low pressure) \
             or the head leaks at the swivel",
            length(within_m, u),
            rate(measured_mm_h, u),
            rate(model_mm_h, u)
        ),
        CanNote::LessWater {
            measured_mm_h,
            model_mm_h,
        } => format!(
            "less water: the cans give a mean of {} against {} modelled ({:.0} % less). \
             Likely a lower flow (low pressure or a partly clogged nozzle), or water \
             lost to wind and evaporation during the test",
            rate(measured_mm_h, u),
            rate(model_mm_h, u),
            gap_percent(measured_mm_h, model_mm_h)
        ),
        CanNote::MoreWater {
            measured_mm_h,
            model_mm_h,
        } => format!(
            "more water: the cans give a mean of {} against {} modelled ({:.0} % more). \
             Likely a higher pressure than the scenario's, or a worn, enlarged nozzle",
            rate(measured_mm_h, u),
            rate(model_mm_h, u),
            gap_percent(measured_mm_h, model_mm_h)
        ),
        CanNote::WaterAgrees {
            measured_mm_h,
            model_mm_h,
        } => format!(
            "rate as modelled: the cans give a mean of {} against {} modelled",
            rate(measured_mm_h, u),
            rate(model_mm_h, u)
        ),
    }
}

/// The measured section of the layout report: the cans as caught, the leg
/// overlapped in the layout, and the notes.
pub fn measured_text(
    report: &AuditReport,
    source: &str,
    grid: bool,
    model: &LayoutResult,
    notes: &[CanNote],
    u: UnitSystem,
) -> String {
    let c = &report.cans;
    let mut s = format!(
        "\nMeasured catch cans ({source}, {} cans, {})\n",
        c.count,
        if grid {
            "a grid between working heads, rated as it stands"
        } else {
            "a radial leg from one head"
        }
    );
    s.push_str(&format!(
        "  as caught: CU {:.1} %   DU low quarter {:.1} %   DU low half {:.1} %   mean {}\n",
        c.cu_percent,
        c.du_lq_percent,
        c.du_lh_percent,
        rate(c.mean, u)
    ));
    if grid {
        s.push_str(&format!(
            "  model in this layout: CU {:.1} %   DU low quarter {:.1} %   DU low half {:.1} %   mean {}\n",
            model.uniformity.cu_percent,
            model.uniformity.du_lq_percent,
            model.uniformity.du_lh_percent,
            rate(model.mean_rate_mm_h, u)
        ));
    }
    if let Some(l) = &report.layout {
        let m = &l.uniformity;
        s.push_str(&format!(
            "  the measured leg overlapped in this layout: CU {:.1} %   DU low quarter {:.1} %   \
             DU low half {:.1} %   mean {} (model: CU {:.1} %, DU {:.1} %, mean {})\n",
            m.cu_percent,
            m.du_lq_percent,
            m.du_lh_percent,
            rate(l.mean_rate_mm_h, u),
            model.uniformity.cu_percent,
            model.uniformity.du_lq_percent,
            rate(model.mean_rate_mm_h, u)
        ));
    }
    if !notes.is_empty() {
        s.push_str("  measured against modelled:\n");
        for n in notes {
            s.push_str(&format!("  · {}\n", note_text(n, u)));
        }
    }
    s
}

/// The spray fitted to the leg, and the layout from the fitted model.
pub fn fit_text(fit: &LegFit, fitted: &LayoutResult, u: UnitSystem) -> String {
    let mut s = format!(
        "\nSpray fitted to the leg ({}, least squares)\n",
        if fit.d50_m.is_some() {
            "jet breakup coefficient and median drop size"
        } else {
            "jet breakup coefficient"
        }
    );
    s.push_str(&format!(
        "  breakup coefficient {:.2} → {:.2}{}; misfit (rms over the cans) {} → {}\n",
        fit.breakup_before,
        fit.breakup,
        if fit.at_limit {
            " (at the end of the plausible range 2–22: the breakup alone does not explain the leg)"
        } else {
            ""
        },
        rate(fit.rms_before_mm_h, u),
        rate(fit.rms_after_mm_h, u)
    ));
    if let (Some(d), Some(d0)) = (fit.d50_m, fit.d50_before_m) {
        s.push_str(&format!(
            "  median drop d50 {} → {}\n",
            format_quantity(D::SmallLength, d0, u),
            format_quantity(D::SmallLength, d, u)
        ));
    }
    s.push_str(&format!(
        "  fitted wetted radius {}{}\n",
        length(fit.throw.wetted_radius_m, u),
        fit.measured_throw_m
            .map(|m| format!(" (the leg's farthest wetted can: {})", length(m, u)))
            .unwrap_or_default()
    ));
    let f = &fitted.uniformity;
    s.push_str(&format!(
        "  layout from the fitted model: CU {:.1} %   DU low quarter {:.1} %   DU low half {:.1} %   mean {}\n",
        f.cu_percent,
        f.du_lq_percent,
        f.du_lh_percent,
        rate(fitted.mean_rate_mm_h, u)
    ));
    s
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn notes_in_both_unit_systems() {
        let n = CanNote::ThrowShort {
            measured_m: 7.5,
            model_m: 9.0,
        };
        let m = note_text(&n, UnitSystem::Metric);
        assert!(m.starts_with("shorter throw"), "{m}");
        assert!(
            m.contains("7.50 m against 9.00 m") && m.contains("17 % short"),
            "{m}"
        );
        let us = note_text(&n, UnitSystem::Us);
        assert!(us.contains("ft") && !us.contains(" m "), "{us}");
        let w = CanNote::LessWater {
            measured_mm_h: 8.0,
            model_mm_h: 10.0,
        };
        assert!(note_text(&w, UnitSystem::Us).contains("in/h"));
    }
}
