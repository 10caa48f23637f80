//! How a head covers the ground: the spin solver's jets handed to the throw,
//! the pattern and the layout (model.md M6 → M7–M9).
//!
//! The jets are taken at the operating point when the rotor runs. A head that
//! does not turn (stalled at rest) still sprays: its jets are taken at rest, as
//! stationary jets. A head with no equilibrium has no settled speed, so its
//! throw is that of the jets at rest too, and the report says so.

use super::balance::{SpinModel, SpinReport, SpinStatus};
use super::design::{Design, Layout, SpraySpec};
use super::jet::JetExit;
use super::layout::{
    overlap, recommend_spacing, HeadPattern, LayoutResult, OverlapOptions, PatternFamily,
    SpacingGoal,
};
use super::pattern::{
    radial_pattern, throw_at_rest_and_running, wetted_radii_in_wind, wetted_radius, windy_pattern,
    PatternGrid, PatternOptions, ThrowComparison, ThrowReport, WindRadii,
};
use super::spray::{calibrate, Calibration};
use super::torque::jets;
use super::trajectory::{FlightEnv, ThrowError};

/// The jets and speed the throw is computed for.
#[derive(Debug, Clone, PartialEq)]
pub struct SprayingState {
    /// Every arm's jet, in arm order.
    pub jets: Vec<JetExit>,
    /// Rotor speed, rad/s (0 when not turning).
    pub omega_rad_s: f64,
    /// True when these are the operating-point jets of a running rotor.
    pub running: bool,
}

/// The jets at the operating point, or at rest when the rotor does not run.
pub fn spraying_state(design: &Design, report: &SpinReport) -> SprayingState {
    match (&report.operating, report.status) {
        (Some(op), SpinStatus::Running) => SprayingState {
            jets: op.jets.clone(),
            omega_rad_s: op.omega_rad_s(),
            running: true,
        },
        _ => SprayingState {
            jets: jets(design, &report.at_rest),
            omega_rad_s: 0.0,
            running: false,
        },
    }
}

/// The jets of the rotor held still at the design's supply.
pub fn jets_at_rest(design: &Design) -> Vec<JetExit> {
    let model = SpinModel::new(design);
    jets(design, &model.state(0.0))
}

/// Air, water and wind of the design, for drop flight.
pub fn flight_env(design: &Design) -> FlightEnv {
    let model = SpinModel::new(design);
    FlightEnv::new(&model.fluids.air, &model.fluids.water, &design.wind)
}

/// Throw of one head: per-nozzle throws, radial profile, throw at rest
/// against throw at speed, and the calibration when a measured wetted radius
/// is given.
#[derive(Debug, Clone, PartialEq)]
pub struct HeadThrow {
    /// The jets used.
    pub spraying: SprayingState,
    /// Throw and radial profile in still air (drop sizes scaled by the calibration).
    pub throw: ThrowReport,
    /// Wetted radius at rest against running.
    pub rest_vs_running: ThrowComparison,
    /// The calibration, when a measured wetted radius was given.
    pub calibration: Option<Calibration>,
    /// The spray settings used (the design's, with a calibration applied).
    pub spray: SpraySpec,
}

/// Throw of the design at its spin state. `measured_wetted_radius_m`
/// calibrates the jet breakup coefficient so the model's wetted radius matches it.
pub fn head_throw(
    design: &Design,
    report: &SpinReport,
    opts: &PatternOptions,
    measured_wetted_radius_m: Option<f64>,
) -> Result<HeadThrow, ThrowError> {
    let spraying = spraying_state(design, report);
    let env = flight_env(design);
    let calibration = match measured_wetted_radius_m {
        Some(r) => Some(calibrate(
            &spraying.jets,
            &design.spray,
            &env,
            &opts.flight,
            r,
        )?),
        None => None,
    };
    let spray = calibration.map_or(design.spray, |c| c.applied_to(&design.spray));
    let throw = radial_pattern(&spraying.jets, &spray, &env, spraying.omega_rad_s, opts)?;
    let rest_vs_running =
        throw_at_rest_and_running(&jets_at_rest(design), &spraying.jets, &spray, &env, opts)?;
    Ok(HeadThrow {
        spraying,
        throw,
        rest_vs_running,
        calibration,
        spray,
    })
}

/// The wetted radius alone, m (still air, the standard's threshold), for the
/// inverse uses (field check, design targets, sweeps).
pub fn wetted_radius_m(design: &Design, report: &SpinReport) -> Result<f64, ThrowError> {
    let spraying = spraying_state(design, report);
    let opts = PatternOptions::default();
    wetted_radius(
        &spraying.jets,
        &design.spray,
        &flight_env(design),
        &opts.flight,
    )
    .map(|w| w.standard_m)
}

/// The 2-D pattern of the head in the design's wind, with the spray settings
/// of `head` (a calibration included).
pub fn head_pattern_in_wind(
    design: &Design,
    head: &HeadThrow,
    opts: &PatternOptions,
) -> Result<PatternGrid, ThrowError> {
    windy_pattern(&head.spraying.jets, &head.spray, &flight_env(design), opts)
}

/// The head's wetted radius upwind, downwind and across the design's wind
/// (`None` in calm air), read at the same threshold as the still-air radius.
pub fn head_wind_radii(
    design: &Design,
    head: &HeadThrow,
    opts: &PatternOptions,
) -> Result<Option<WindRadii>, ThrowError> {
    if design.wind.speed_m_s.is_nan() || design.wind.speed_m_s <= 0.0 {
        return Ok(None);
    }
    let grid = head_pattern_in_wind(design, head, opts)?;
    Ok(wetted_radii_in_wind(
        &grid,
        &design.wind.velocity(),
        head.throw.wetting_threshold_mm_h,
    ))
}

/// Overlap of the head in `layout`: with no wind the radial profile, in wind
/// the 2-D pattern (the same for every head of the layout).
pub fn layout_overlap(
    design: &Design,
    head: &HeadThrow,
    layout: &Layout,
    pattern_opts: &PatternOptions,
    overlap_opts: &OverlapOptions,
) -> Result<LayoutResult, ThrowError> {
    let opts = OverlapOptions {
        wetted_radius_m: overlap_opts
            .wetted_radius_m
            .or(Some(head.throw.wetted_radius_m)),
        ..*overlap_opts
    };
    if design.wind.speed_m_s > 0.0 {
        let grid = head_pattern_in_wind(design, head, pattern_opts)?;
        Ok(overlap(layout, &grid as &dyn HeadPattern, &opts)?)
    } else {
        Ok(overlap(
            layout,
            &head.throw.profile as &dyn HeadPattern,
            &opts,
        )?)
    }
}

/// A recommended spacing for one pattern family in one wind.
#[derive(Debug, Clone, PartialEq)]
pub struct SpacingRecommendation {
    /// The pattern family.
    pub family: PatternFamily,
    /// Wind speed the overlap was computed in, m/s (0: calm air).
    pub wind_m_s: f64,
    /// The overlap at the recommended spacing; `None` when even the closest
    /// scanned spacing misses the goal.
    pub result: Option<LayoutResult>,
}

/// The largest spacing meeting `goal` for each of `families` (model.md M9),
/// in calm air and, when the design has wind, in that wind too.
pub fn recommend_spacings(
    design: &Design,
    head: &HeadThrow,
    families: &[PatternFamily],
    goal: SpacingGoal,
    pattern_opts: &PatternOptions,
    overlap_opts: &OverlapOptions,
) -> Result<Vec<SpacingRecommendation>, ThrowError> {
    let opts = OverlapOptions {
        wetted_radius_m: overlap_opts
            .wetted_radius_m
            .or(Some(head.throw.wetted_radius_m)),
        ..*overlap_opts
    };
    let windy = if design.wind.speed_m_s > 0.0 {
        Some(head_pattern_in_wind(design, head, pattern_opts)?)
    } else {
        None
    };
    let mut out = Vec::new();
    for &family in families {
        out.push(SpacingRecommendation {
            family,
            wind_m_s: 0.0,
            result: recommend_spacing(&head.throw.profile, family, goal, &opts)?,
        });
    }
    if let Some(grid) = &windy {
        for &family in families {
            out.push(SpacingRecommendation {
                family,
                wind_m_s: design.wind.speed_m_s,
                result: recommend_spacing(grid, family, goal, &opts)?,
            });
        }
    }
    Ok(out)
}

/// CU and DU_lq of a design on its own layout, % (None without a layout, or
/// when the head throws no water).
pub fn uniformity_on_layout(design: &Design, report: &SpinReport) -> Option<(f64, f64)> {
    let layout = design.layout?;
    let opts = PatternOptions::default();
    let head = head_throw(design, report, &opts, None).ok()?;
    let result = layout_overlap(design, &head, &layout, &opts, &OverlapOptions::default()).ok()?;
    Some((
        result.uniformity.cu_percent,
        result.uniformity.du_lq_percent,
    ))
}
