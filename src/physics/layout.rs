//! Head layouts, overlap and uniformity (model.md M9).
//!
//! **Overlap.** Heads stand on a lattice: square S × S, rectangle S × L, or
//! equilateral triangle (rows S·√3/2 apart, alternate rows shifted S/2). The
//! rectangle [0, S) × [0, L) is one repeating cell of each lattice (for the
//! triangle too: a shift by one row moves y by L and x by S/2, so each strip of
//! height L maps onto the first). Catch points sit at the centres of a uniform
//! grid over that cell; each collects the sum of every head within reach. By
//! periodicity the exact mean over the cell is Q/(S·L); the grid mean matches
//! it up to the grid's sampling error.
//!
//! **Uniformity** (functions over a plain slice, so measured catch-can data can
//! use them too; every catch carries equal weight, as on a uniform grid):
//!
//! - Christiansen (1942): CU = 100 (1 − Σ|x − x̄| / (n x̄)).
//! - Low-quarter distribution uniformity (Keller & Merriam 1978):
//!   DU_lq = 100 · mean(lowest k) / x̄ with **k = n/4 rounded to the nearest
//!   whole catch, halves rounded up, at least one** (n = 4 → 1, 10 → 3, 15 → 4).
//! - Low-half DU_lh the same way with k = n/2 rounded (halves up), at least one.
//! - Run-time factor for the driest quarter 1 / DU_lq (DU as a fraction): the
//!   factor on the run time that brings the driest quarter up to the target depth ("the total
//!   amount to be applied would be the desired amount divided by the DU",
//!   Wikipedia, "Distribution uniformity"; the Irrigation Association's
//!   auditor training uses the same 1/DU_lq form, from memory). Other manuals
//!   soften it (e.g. 1/(0.4 + 0.6 DU_lq)); this tool does not.
//! - CV: population standard deviation over the mean.
//!
//! **Soil intake.** When the mean rate P exceeds the soil intake rate I, water
//! ponds. Taking a surface storage S_s (water the surface holds before it runs
//! off), a cycle may run t_run = S_s/(P − I) before runoff starts, and the stored
//! water soaks in within t_soak = S_s/I. The suggestion rounds the run time down
//! and the soak time up to whole minutes (at least one).

use super::design::Layout;
use super::pattern::{wetting_threshold_mm_h, PatternGrid, RadialProfile, M_S_TO_MM_H};
use super::{invalid, require_positive, InvalidInput};
use std::f64::consts::PI;

/// Default catch cells along a row over one repeating cell.
pub const DEFAULT_CELLS_ALONG_ROW: usize = 40;
/// Most heads allowed to reach one catch point (a guard on absurd spacings).
pub const MAX_HEADS_IN_REACH: f64 = 20_000.0;
/// Default surface storage before runoff, mm (a project assumption for level turf).
pub const DEFAULT_SURFACE_STORAGE_MM: f64 = 2.5;

/// A single head's application rate around it, for overlap.
pub trait HeadPattern {
    /// Rate at offset (`dx_m`, `dy_m`) from the head, mm/h.
    fn rate_mm_h_at(&self, dx_m: f64, dy_m: f64) -> f64;
    /// No water lands farther than this from the head, m.
    fn reach_m(&self) -> f64;
    /// Water the head puts down, m³/s (sets the expected mean rate).
    fn flow_m3_s(&self) -> f64;
}

impl HeadPattern for RadialProfile {
    fn rate_mm_h_at(&self, dx_m: f64, dy_m: f64) -> f64 {
        RadialProfile::rate_mm_h_at(self, dx_m.hypot(dy_m))
    }
    fn reach_m(&self) -> f64 {
        self.outer_radius_m()
    }
    fn flow_m3_s(&self) -> f64 {
        self.applied_flow_m3_s()
    }
}

impl HeadPattern for PatternGrid {
    fn rate_mm_h_at(&self, dx_m: f64, dy_m: f64) -> f64 {
        PatternGrid::rate_mm_h_at(self, dx_m, dy_m)
    }
    fn reach_m(&self) -> f64 {
        PatternGrid::reach_m(self)
    }
    fn flow_m3_s(&self) -> f64 {
        self.applied_flow_m3_s()
    }
}

/// A measured radial leg: rate against distance, straight lines between cans,
/// the first can's rate held in to the head, zero beyond the last can.
#[derive(Debug, Clone, PartialEq)]
pub struct MeasuredLeg {
    /// (distance from the head m, rate mm/h), sorted by distance.
    points: Vec<(f64, f64)>,
}

impl MeasuredLeg {
    /// A leg from (distance m, rate mm/h) pairs in any order.
    ///
    /// Distances must be ≥ 0 and distinct, rates ≥ 0, at least two cans.
    pub fn new(mut points: Vec<(f64, f64)>) -> Result<MeasuredLeg, InvalidInput> {
        if points.len() < 2 {
            return Err(invalid(
                "radial leg cans",
                points.len() as f64,
                "at least 2 cans",
            ));
        }
        for &(r, q) in &points {
            if !(r.is_finite() && r >= 0.0) {
                return Err(invalid("can distance (m)", r, "zero or more"));
            }
            if !(q.is_finite() && q >= 0.0) {
                return Err(invalid("can rate (mm/h)", q, "zero or more"));
            }
        }
        points.sort_by(|a, b| a.0.total_cmp(&b.0));
        if points
            .iter()
            .zip(points.iter().skip(1))
            .any(|(a, b)| a.0 == b.0)
        {
            return Err(InvalidInput {
                field: "radial leg".to_string(),
                detail: "has two cans at the same distance".to_string(),
            });
        }
        Ok(MeasuredLeg { points })
    }

    /// The cans, sorted by distance: (m, mm/h).
    pub fn points(&self) -> &[(f64, f64)] {
        &self.points
    }

    /// Rate at distance `r_m`, mm/h.
    pub fn rate_at(&self, r_m: f64) -> f64 {
        let i = self.points.partition_point(|p| p.0 <= r_m);
        match (
            i.checked_sub(1).and_then(|j| self.points.get(j)),
            self.points.get(i),
        ) {
            (None, Some(first)) => first.1,
            (Some(a), Some(b)) => a.1 + (b.1 - a.1) * (r_m - a.0) / (b.0 - a.0),
            (Some(last), None) if r_m <= last.0 => last.1,
            _ => 0.0,
        }
    }
}

impl HeadPattern for MeasuredLeg {
    fn rate_mm_h_at(&self, dx_m: f64, dy_m: f64) -> f64 {
        self.rate_at(dx_m.hypot(dy_m))
    }
    fn reach_m(&self) -> f64 {
        self.points.last().map_or(0.0, |p| p.0)
    }
    /// ∫ rate 2πr dr over the piecewise-linear leg (exact).
    fn flow_m3_s(&self) -> f64 {
        let mut total = 0.0;
        if let Some(&(r0, q0)) = self.points.first() {
            total += q0 * PI * r0 * r0;
        }
        for (&(a, qa), &(b, qb)) in self.points.iter().zip(self.points.iter().skip(1)) {
            // ∫_a^b (qa + s (r − a)) 2πr dr, s = (qb − qa)/(b − a).
            let s = (qb - qa) / (b - a);
            let c = qa - s * a;
            total += 2.0 * PI * (c * (b * b - a * a) / 2.0 + s * (b.powi(3) - a.powi(3)) / 3.0);
        }
        total / M_S_TO_MM_H
    }
}

/// Uniformity figures of a set of catches.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct UniformityStats {
    /// Number of catches.
    pub count: usize,
    /// Mean catch (same unit as the catches).
    pub mean: f64,
    /// Smallest catch.
    pub min: f64,
    /// Largest catch.
    pub max: f64,
    /// Christiansen coefficient of uniformity, %; never below 0 (see `cu_clamped`).
    pub cu_percent: f64,
    /// True when Christiansen's formula gave less than 0 (catches so uneven
    /// that the mean deviation exceeds the mean) and 0 is reported instead.
    pub cu_clamped: bool,
    /// Low-quarter distribution uniformity, %.
    pub du_lq_percent: f64,
    /// Low-half distribution uniformity, %.
    pub du_lh_percent: f64,
    /// Coefficient of variation (population standard deviation / mean).
    pub cv: f64,
    /// Catches counted in the low quarter.
    pub low_quarter_count: usize,
    /// Catches counted in the low half.
    pub low_half_count: usize,
    /// Run-time factor 1/DU_lq that gives the driest quarter the mean depth;
    /// `None` when DU_lq is 0 (no run time is enough).
    pub driest_quarter_runtime_factor: Option<f64>,
}

/// Number of catches in the lowest `fraction` of `n`: n·fraction rounded to
/// the nearest whole catch (halves up), at least one.
pub fn low_count(n: usize, fraction: f64) -> usize {
    ((n as f64 * fraction).round() as usize).clamp(1, n.max(1))
}

fn validated(catches: &[f64]) -> Result<(Vec<f64>, f64), InvalidInput> {
    if catches.is_empty() {
        return Err(InvalidInput {
            field: "catches".to_string(),
            detail: "are empty: at least one catch is needed".to_string(),
        });
    }
    for (i, &c) in catches.iter().enumerate() {
        if !(c.is_finite() && c >= 0.0) {
            return Err(invalid(&format!("catch {}", i + 1), c, "zero or more"));
        }
    }
    let mean = mean_of(catches.iter().copied());
    if mean <= 0.0 {
        return Err(InvalidInput {
            field: "catches".to_string(),
            detail: "are all zero: nothing was caught to rate".to_string(),
        });
    }
    let mut sorted = catches.to_vec();
    sorted.sort_by(f64::total_cmp);
    Ok((sorted, mean))
}

/// Mean of finite values, without overflow: when the plain sum overflows
/// (catches near the largest float), each value is divided first.
fn mean_of(values: impl Iterator<Item = f64> + Clone) -> f64 {
    let n = values.clone().count().max(1) as f64;
    let mean = values.clone().sum::<f64>() / n;
    if mean.is_finite() {
        mean
    } else {
        values.map(|v| v / n).sum()
    }
}

/// CU from the mean absolute deviation, which cannot overflow.
fn cu_of(catches: &[f64], mean: f64) -> f64 {
    let mean_dev = mean_of(catches.iter().map(|c| (c - mean).abs()));
    100.0 * (1.0 - mean_dev / mean)
}

/// Christiansen coefficient of uniformity, %, clamped at 0 (the formula
/// goes negative when the mean deviation exceeds the mean).
pub fn christiansen_cu_percent(catches: &[f64]) -> Result<f64, InvalidInput> {
    let (_, mean) = validated(catches)?;
    Ok(cu_of(catches, mean).max(0.0))
}

fn du_of(sorted: &[f64], mean: f64, fraction: f64) -> (f64, usize) {
    let k = low_count(sorted.len(), fraction);
    let low = mean_of(sorted.iter().take(k).copied());
    (100.0 * low / mean, k)
}

/// Low-quarter distribution uniformity, % (quarter counted as in the module docs).
pub fn du_low_quarter_percent(catches: &[f64]) -> Result<f64, InvalidInput> {
    let (sorted, mean) = validated(catches)?;
    Ok(du_of(&sorted, mean, 0.25).0)
}

/// Low-half distribution uniformity, %.
pub fn du_low_half_percent(catches: &[f64]) -> Result<f64, InvalidInput> {
    let (sorted, mean) = validated(catches)?;
    Ok(du_of(&sorted, mean, 0.5).0)
}

/// Run-time factor 1/DU_lq that gives the driest quarter the mean depth,
/// from DU_lq in %; `None` when DU_lq ≤ 0.
pub fn driest_quarter_runtime_factor(du_lq_percent: f64) -> Option<f64> {
    (du_lq_percent.is_finite() && du_lq_percent > 0.0).then(|| 100.0 / du_lq_percent)
}

/// All uniformity figures of a set of catches (any consistent unit: mm, mm/h, mL).
pub fn uniformity(catches: &[f64]) -> Result<UniformityStats, InvalidInput> {
    let (sorted, mean) = validated(catches)?;
    // Variance relative to the mean², so that large catches cannot overflow.
    let rel_var = mean_of(catches.iter().map(|c| ((c - mean) / mean).powi(2)));
    let (du_lq, k_q) = du_of(&sorted, mean, 0.25);
    let (du_lh, k_h) = du_of(&sorted, mean, 0.5);
    let cu = cu_of(catches, mean);
    Ok(UniformityStats {
        count: catches.len(),
        mean,
        min: sorted.first().copied().unwrap_or(0.0),
        max: sorted.last().copied().unwrap_or(0.0),
        cu_percent: cu.max(0.0),
        cu_clamped: cu < 0.0,
        du_lq_percent: du_lq,
        du_lh_percent: du_lh,
        cv: rel_var.sqrt(),
        low_quarter_count: k_q,
        low_half_count: k_h,
        driest_quarter_runtime_factor: driest_quarter_runtime_factor(du_lq),
    })
}

/// How to lay the catch grid over one repeating cell.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OverlapOptions {
    /// Catch cells along a row (across the head spacing S); the count across
    /// rows follows so the cells are as near square as the cell allows.
    pub cells_along_row: usize,
    /// Wetted radius of one head, m, for the spacing percentages; `None`: the
    /// pattern's reach.
    pub wetted_radius_m: Option<f64>,
}

impl Default for OverlapOptions {
    fn default() -> Self {
        OverlapOptions {
            cells_along_row: DEFAULT_CELLS_ALONG_ROW,
            wetted_radius_m: None,
        }
    }
}

/// Catch rates over one repeating cell.
#[derive(Debug, Clone, PartialEq)]
pub struct CatchGrid {
    /// Cell size along a row (x), m.
    pub dx_m: f64,
    /// Cell size across rows (y), m.
    pub dy_m: f64,
    /// Rates, one `Vec` per row of catch points (lowest y first), mm/h.
    pub rate_mm_h: Vec<Vec<f64>>,
}

/// The uniformity of catches that are all zero: nothing is wetted, every
/// figure is 0 (a result, not an error, for a layout whose heads miss every
/// catch point).
fn all_dry(count: usize) -> UniformityStats {
    UniformityStats {
        count,
        mean: 0.0,
        min: 0.0,
        max: 0.0,
        cu_percent: 0.0,
        cu_clamped: false,
        du_lq_percent: 0.0,
        du_lh_percent: 0.0,
        cv: 0.0,
        low_quarter_count: low_count(count, 0.25),
        low_half_count: low_count(count, 0.5),
        driest_quarter_runtime_factor: None,
    }
}

/// Catch cells across the spacing are refined until a cell is at most this
/// fraction of the head's reach, so heads far apart are still sampled well.
const CELLS_PER_REACH: f64 = 8.0;
/// Most catch cells along a row after refinement.
const MAX_REFINED_CELLS_ALONG_ROW: usize = 600;

/// Overlap of a layout: mean rate, uniformity, the catch grid.
#[derive(Debug, Clone, PartialEq)]
pub struct LayoutResult {
    /// The layout.
    pub layout: Layout,
    /// Head spacing along a row S, m.
    pub spacing_m: f64,
    /// Row spacing L, m.
    pub rows_m: f64,
    /// Mean application rate over the catch grid, mm/h.
    pub mean_rate_mm_h: f64,
    /// Q/(S·L): the exact mean for the head's flow, mm/h.
    pub expected_rate_mm_h: f64,
    /// Uniformity of the catch grid (rates in mm/h).
    pub uniformity: UniformityStats,
    /// Head spacing S as % of the wetted diameter.
    pub spacing_percent_of_diameter: f64,
    /// Row spacing L as % of the wetted diameter.
    pub rows_percent_of_diameter: f64,
    /// Share of the catch points that stay dry (below the wetting threshold), %.
    pub dry_percent: f64,
    /// The wetting threshold of the head (model.md M8), mm/h: a catch point
    /// below it counts as dry.
    pub wetting_threshold_mm_h: f64,
    /// True when every catch point gets water: the heads' patterns meet.
    pub heads_meet: bool,
    /// The catch grid.
    pub grid: CatchGrid,
}

/// Short name of a layout pattern: "square", "rectangle" or "triangle".
pub fn pattern_name(layout: &Layout) -> &'static str {
    match layout {
        Layout::Square { .. } => "square",
        Layout::Rectangle { .. } => "rectangle",
        Layout::Triangle { .. } => "triangle",
    }
}

/// Overlaps `head` on `layout` and rates the result.
pub fn overlap(
    layout: &Layout,
    head: &dyn HeadPattern,
    opts: &OverlapOptions,
) -> Result<LayoutResult, InvalidInput> {
    let s = require_positive("head spacing (m)", layout.spacing_m())?;
    let l = require_positive("row spacing (m)", layout.rows_m())?;
    if opts.cells_along_row == 0 || opts.cells_along_row > 2000 {
        return Err(invalid(
            "catch cells along a row",
            opts.cells_along_row as f64,
            "1 to 2000",
        ));
    }
    let reach = head.reach_m();
    if !(reach.is_finite() && reach > 0.0) {
        return Err(InvalidInput {
            field: "head pattern".to_string(),
            detail: "wets nothing: no water to overlap".to_string(),
        });
    }
    // Heads within reach of one catch point: keep the overlap sum bounded.
    let heads_in_reach = PI * (reach + s + l).powi(2) / (s * l);
    if heads_in_reach > MAX_HEADS_IN_REACH {
        return Err(InvalidInput {
            field: "head spacing".to_string(),
            detail: format!(
                "of {s} m × {l} m is far too close for a head that wets {reach:.1} m \
                 (over {MAX_HEADS_IN_REACH} heads would overlap at each point)"
            ),
        });
    }
    let wetted = match opts.wetted_radius_m {
        Some(r) => require_positive("wetted radius (m)", r)?,
        None => reach,
    };
    // Heads far apart: refine so a cell stays small against the head's reach.
    let wanted = (CELLS_PER_REACH * s.max(l) / reach).ceil();
    let nx = if wanted > opts.cells_along_row as f64 {
        (wanted.min(MAX_REFINED_CELLS_ALONG_ROW as f64) as usize).max(opts.cells_along_row)
    } else {
        opts.cells_along_row
    };
    let ny = ((nx as f64 * l / s).round() as usize).clamp(1, 4000);
    let (dx, dy) = (s / nx as f64, l / ny as f64);
    let shift = match layout {
        Layout::Triangle { .. } => 0.5 * s,
        _ => 0.0,
    };
    let j_lo = (-reach / l).floor() as i64 - 1;
    let j_hi = ((l + reach) / l).ceil() as i64 + 1;
    let mut rows = Vec::with_capacity(ny);
    let mut all = Vec::with_capacity(nx * ny);
    for iy in 0..ny {
        let y = (iy as f64 + 0.5) * dy;
        let mut row = Vec::with_capacity(nx);
        for ix in 0..nx {
            let x = (ix as f64 + 0.5) * dx;
            let mut rate = 0.0;
            for j in j_lo..=j_hi {
                let hy = j as f64 * l;
                let oy = y - hy;
                if oy.abs() > reach {
                    continue;
                }
                let row_shift = if j.rem_euclid(2) == 1 { shift } else { 0.0 };
                let i_lo = ((x - reach - row_shift) / s).floor() as i64;
                let i_hi = ((x + reach - row_shift) / s).ceil() as i64;
                for i in i_lo..=i_hi {
                    let hx = i as f64 * s + row_shift;
                    let ox = x - hx;
                    if ox.hypot(oy) <= reach {
                        rate += head.rate_mm_h_at(ox, oy);
                    }
                }
            }
            row.push(rate);
            all.push(rate);
        }
        rows.push(row);
    }
    let stats = if all.iter().all(|&c| c == 0.0) {
        all_dry(all.len())
    } else {
        uniformity(&all)?
    };
    let threshold = wetting_threshold_mm_h(head.flow_m3_s());
    let dry = all.iter().filter(|&&c| c < threshold).count();
    let dry_percent = 100.0 * dry as f64 / all.len().max(1) as f64;
    let expected = head.flow_m3_s() / (s * l) * M_S_TO_MM_H;
    Ok(LayoutResult {
        layout: *layout,
        spacing_m: s,
        rows_m: l,
        mean_rate_mm_h: stats.mean,
        expected_rate_mm_h: expected,
        uniformity: stats,
        spacing_percent_of_diameter: 100.0 * s / (2.0 * wetted),
        rows_percent_of_diameter: 100.0 * l / (2.0 * wetted),
        dry_percent,
        wetting_threshold_mm_h: threshold,
        heads_meet: dry == 0,
        grid: CatchGrid {
            dx_m: dx,
            dy_m: dy,
            rate_mm_h: rows,
        },
    })
}

/// A cycle-and-soak schedule that keeps water from running off.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CycleSoak {
    /// Longest run per cycle, whole minutes (≥ 1).
    pub run_min: f64,
    /// Soak time between cycles, whole minutes (≥ 1).
    pub soak_min: f64,
    /// Depth applied per cycle, mm.
    pub depth_per_cycle_mm: f64,
}

/// Outcome of comparing the application rate with the soil intake rate.
#[derive(Debug, Clone, PartialEq)]
pub enum IntakeVerdict {
    /// The soil takes the water as fast as it comes.
    WithinIntake,
    /// The rate exceeds the intake rate.
    Exceeds {
        /// A warning in plain words.
        warning: String,
        /// The suggested schedule.
        cycle: CycleSoak,
    },
}

/// Checks `mean_rate_mm_h` against a soil intake rate `intake_mm_h`, with
/// `surface_storage_mm` of water held on the surface before runoff (see the
/// module docs; [`DEFAULT_SURFACE_STORAGE_MM`] if unknown).
pub fn intake_check(
    mean_rate_mm_h: f64,
    intake_mm_h: f64,
    surface_storage_mm: f64,
) -> Result<IntakeVerdict, InvalidInput> {
    if !(mean_rate_mm_h.is_finite() && mean_rate_mm_h >= 0.0) {
        return Err(invalid(
            "application rate (mm/h)",
            mean_rate_mm_h,
            "zero or more",
        ));
    }
    let intake = require_positive("soil intake rate (mm/h)", intake_mm_h)?;
    let storage = require_positive("surface storage (mm)", surface_storage_mm)?;
    if mean_rate_mm_h <= intake {
        return Ok(IntakeVerdict::WithinIntake);
    }
    let run_min = (60.0 * storage / (mean_rate_mm_h - intake))
        .floor()
        .max(1.0);
    let soak_min = (60.0 * storage / intake).ceil().max(1.0);
    Ok(IntakeVerdict::Exceeds {
        warning: format!(
            "the mean application rate {mean_rate_mm_h:.1} mm/h is above the soil intake \
             rate {intake:.1} mm/h: water will pond and run off; water in cycles of at \
             most {run_min:.0} min with {soak_min:.0} min soaks between them"
        ),
        cycle: CycleSoak {
            run_min,
            soak_min,
            depth_per_cycle_mm: mean_rate_mm_h * run_min / 60.0,
        },
    })
}

/// The uniformity a recommended spacing must reach.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum SpacingGoal {
    /// Christiansen's CU at least this, %.
    Cu(f64),
    /// Low-quarter DU at least this, %.
    DuLq(f64),
}

impl SpacingGoal {
    /// The goal's figure in `result`, %.
    pub fn value(&self, result: &LayoutResult) -> f64 {
        match self {
            SpacingGoal::Cu(_) => result.uniformity.cu_percent,
            SpacingGoal::DuLq(_) => result.uniformity.du_lq_percent,
        }
    }

    /// The wanted figure, %.
    pub fn percent(&self) -> f64 {
        match *self {
            SpacingGoal::Cu(p) | SpacingGoal::DuLq(p) => p,
        }
    }

    /// True when `result` meets the goal.
    pub fn met_by(&self, result: &LayoutResult) -> bool {
        self.value(result) >= self.percent()
    }
}

/// Head pattern of a layout family, for [`recommend_spacing`]: the lattice
/// with head spacing S along a row.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum PatternFamily {
    /// S × S.
    Square,
    /// S × L with L = `rows_ratio` · S, or L fixed.
    Rectangle(RowRule),
    /// Equilateral triangles of side S.
    Triangle,
}

/// How a rectangle's row spacing follows the head spacing.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum RowRule {
    /// L = ratio · S.
    Ratio(f64),
    /// L fixed, m.
    Fixed(f64),
}

/// Row spacing over head spacing of a recommended rectangle when the rows
/// are not given: 1.15 (a project choice, model.md M9).
pub const DEFAULT_ROWS_RATIO: f64 = 1.15;

impl PatternFamily {
    /// The layout with head spacing `s` m.
    pub fn layout(&self, s: f64) -> Layout {
        match *self {
            PatternFamily::Square => Layout::Square { spacing_m: s },
            PatternFamily::Rectangle(RowRule::Ratio(k)) => Layout::Rectangle {
                spacing_m: s,
                rows_m: k * s,
            },
            PatternFamily::Rectangle(RowRule::Fixed(l)) => Layout::Rectangle {
                spacing_m: s,
                rows_m: l,
            },
            PatternFamily::Triangle => Layout::Triangle { spacing_m: s },
        }
    }
}

/// The scan of [`recommend_spacing`] starts at this fraction of the head's
/// reach…
pub const RECOMMEND_SCAN_START: f64 = 0.2;
/// …ends at this fraction (the spacing equal to the wetted diameter)…
pub const RECOMMEND_SCAN_END: f64 = 2.0;
/// …in steps of this fraction.
pub const RECOMMEND_SCAN_STEP: f64 = 0.05;
/// Bisection stops when the bracket is this fraction of the reach (1 cm on a
/// 10 m head).
const RECOMMEND_TOLERANCE: f64 = 1e-3;

/// The largest head spacing of a pattern family that meets `goal` with every
/// spacing below it (model.md M9, "recommended spacing").
///
/// CU and DU are not monotone in the spacing (a ring-shaped profile can
/// overlap well again past a poor spacing), so this does not look for *any*
/// spacing that meets the goal: it scans from [`RECOMMEND_SCAN_START`] × the
/// head's reach outwards in steps of [`RECOMMEND_SCAN_STEP`] × the reach,
/// stops at the first spacing that misses the goal, and bisects between the
/// last spacing that met it and that one down to 10⁻³ of the reach. The answer
/// is the largest spacing such that every scanned spacing from the scan start
/// up to it meets the goal. `Ok(None)` when the scan start already misses the
/// goal. When nothing up to [`RECOMMEND_SCAN_END`] × the reach misses it, that
/// end is returned.
pub fn recommend_spacing(
    head: &dyn HeadPattern,
    family: PatternFamily,
    goal: SpacingGoal,
    opts: &OverlapOptions,
) -> Result<Option<LayoutResult>, InvalidInput> {
    let reach = head.reach_m();
    if !(reach.is_finite() && reach > 0.0) {
        return Err(InvalidInput {
            field: "head pattern".to_string(),
            detail: "wets nothing: no spacing to recommend".to_string(),
        });
    }
    let at = |s: f64| overlap(&family.layout(s), head, opts);
    let steps =
        ((RECOMMEND_SCAN_END - RECOMMEND_SCAN_START) / RECOMMEND_SCAN_STEP).round() as usize;
    let mut good: Option<(f64, LayoutResult)> = None;
    let mut bad: Option<f64> = None;
    for k in 0..=steps {
        let s = reach * (RECOMMEND_SCAN_START + RECOMMEND_SCAN_STEP * k as f64);
        let r = at(s)?;
        if goal.met_by(&r) {
            good = Some((s, r));
        } else {
            bad = Some(s);
            break;
        }
    }
    let Some((mut lo, mut best)) = good else {
        return Ok(None);
    };
    let Some(mut hi) = bad else {
        return Ok(Some(best));
    };
    while hi - lo > RECOMMEND_TOLERANCE * reach {
        let mid = 0.5 * (lo + hi);
        let r = at(mid)?;
        if goal.met_by(&r) {
            lo = mid;
            best = r;
        } else {
            hi = mid;
        }
    }
    Ok(Some(best))
}

#[cfg(test)]
#[path = "layout_tests.rs"]
mod tests;
