//! `layout --catch-cans`: a measured catch-can test rated beside the model,
//! and with `--fit` the spray fitted to its leg.

use std::path::Path;

use serde::Serialize;

use crate::cli::CliError;
use crate::inverse::audit::{audit, interpret, leg_pattern, AuditReport, CanNote, ModelSide};
use crate::inverse::leg::{fit_leg, LegFit};
use crate::physics::coverage::{flight_env, layout_overlap, HeadThrow};
use crate::physics::design::{Design, Layout};
use crate::physics::layout::{LayoutResult, OverlapOptions};
use crate::physics::pattern::PatternOptions;
use crate::scenario::cans::{read_catch_cans, CatchCanError, CatchSet};

#[derive(Debug, Serialize)]
pub(super) struct MeasuredJson {
    source: String,
    cans: usize,
    mean_rate_mm_h: f64,
    cu_percent: f64,
    du_lq_percent: f64,
    du_lh_percent: f64,
    overlap_cu_percent: Option<f64>,
    overlap_du_lq_percent: Option<f64>,
    shape: &'static str,
    overlap_du_lh_percent: Option<f64>,
    overlap_mean_rate_mm_h: Option<f64>,
    measured_throw_m: Option<f64>,
    notes: Vec<&'static str>,
    fit: Option<LegFitJson>,
}

#[derive(Debug, Serialize)]
struct LegFitJson {
    breakup_before: f64,
    breakup: f64,
    d50_before_m: Option<f64>,
    d50_m: Option<f64>,
    at_limit: bool,
    rms_misfit_before_mm_h: f64,
    rms_misfit_mm_h: f64,
    wetted_radius_m: f64,
    mean_rate_mm_h: f64,
    cu_percent: f64,
    du_lq_percent: f64,
    du_lh_percent: f64,
}

pub(super) fn measured_json(m: &Measured) -> MeasuredJson {
    let (report, source) = (&m.report, &m.source);
    MeasuredJson {
        source: source.to_string(),
        cans: report.cans.count,
        mean_rate_mm_h: report.cans.mean,
        cu_percent: report.cans.cu_percent,
        du_lq_percent: report.cans.du_lq_percent,
        du_lh_percent: report.cans.du_lh_percent,
        overlap_cu_percent: report.layout.as_ref().map(|l| l.uniformity.cu_percent),
        overlap_du_lq_percent: report.layout.as_ref().map(|l| l.uniformity.du_lq_percent),
        shape: if m.grid { "grid" } else { "radial_leg" },
        overlap_du_lh_percent: report.layout.as_ref().map(|l| l.uniformity.du_lh_percent),
        overlap_mean_rate_mm_h: report.layout.as_ref().map(|l| l.mean_rate_mm_h),
        measured_throw_m: m.notes.iter().find_map(|n| match n {
            CanNote::ThrowShort { measured_m, .. }
            | CanNote::ThrowLong { measured_m, .. }
            | CanNote::ThrowAgrees { measured_m, .. } => Some(*measured_m),
            _ => None,
        }),
        notes: m.notes.iter().map(CanNote::key).collect(),
        fit: m.fit.as_ref().map(|(f, l)| LegFitJson {
            breakup_before: f.breakup_before,
            breakup: f.breakup,
            d50_before_m: f.d50_before_m,
            d50_m: f.d50_m,
            at_limit: f.at_limit,
            rms_misfit_before_mm_h: f.rms_before_mm_h,
            rms_misfit_mm_h: f.rms_after_mm_h,
            wetted_radius_m: f.throw.wetted_radius_m,
            mean_rate_mm_h: l.mean_rate_mm_h,
            cu_percent: l.uniformity.cu_percent,
            du_lq_percent: l.uniformity.du_lq_percent,
            du_lh_percent: l.uniformity.du_lh_percent,
        }),
    }
}

/// A catch-can test rated beside the model.
pub(super) struct Measured {
    pub(super) report: AuditReport,
    pub(super) source: String,
    pub(super) grid: bool,
    pub(super) notes: Vec<CanNote>,
    /// The spray fitted to the leg, and the layout from the fitted model.
    pub(super) fit: Option<(LegFit, LayoutResult)>,
}

/// Reads and rates the catch cans, interprets them against the model and,
/// with `fit`, fits the spray to the leg.
pub(super) fn rate_catch_cans(
    csv_path: &Path,
    fit: Option<bool>,
    design: &Design,
    head: &HeadThrow,
    layout: &Layout,
    model: &LayoutResult,
) -> Result<Measured, CliError> {
    let usage = |e: CatchCanError| CliError::Usage(e.to_string());
    let data = read_catch_cans(csv_path).map_err(usage)?;
    let report = audit(&data, Some(layout), &OverlapOptions::default()).map_err(usage)?;
    let notes = interpret(
        &data,
        &report,
        &ModelSide {
            profile: &head.throw.profile,
            wetted_radius_m: head.throw.wetted_radius_m,
            threshold_mm_h: head.throw.wetting_threshold_mm_h,
            mean_rate_mm_h: model.mean_rate_mm_h,
        },
    );
    let fit = if let Some(fit_d50) = fit {
        let leg = leg_pattern(&data).map_err(|e| CliError::Usage(format!("--fit: {e}")))?;
        let bad = |e| CliError::Usage(format!("--fit: {}: {e}", csv_path.display()));
        let f = fit_leg(
            &head.spraying.jets,
            &head.spray,
            &flight_env(design),
            head.spraying.omega_rad_s,
            &PatternOptions::default(),
            &leg,
            fit_d50,
        )
        .map_err(bad)?;
        let fitted_head = HeadThrow {
            throw: f.throw.clone(),
            spray: f.spray,
            ..head.clone()
        };
        let l = layout_overlap(
            design,
            &fitted_head,
            layout,
            &PatternOptions::default(),
            &OverlapOptions::default(),
        )
        .map_err(bad)?;
        Some((f, l))
    } else {
        None
    };
    Ok(Measured {
        report,
        source: csv_path.display().to_string(),
        grid: matches!(data.cans, CatchSet::Grid(_)),
        notes,
        fit,
    })
}
