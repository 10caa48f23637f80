//! Measured catch-can tests rated like the model's pattern and set beside it.
//!
//! A test read by [`crate::scenario::cans`] gets the same uniformity figures
//! as the model ([`crate::physics::layout::uniformity`]); a radial leg (one
//! head, cans along a line away from it) can also be overlapped in a layout,
//! exactly as the model's radial profile is. [`interpret`] sets the cans
//! beside the model as typed notes (the words are in `report::cans`).

use crate::physics::design::Layout;
use crate::physics::layout::{
    overlap, uniformity, LayoutResult, MeasuredLeg, OverlapOptions, UniformityStats,
};
use crate::physics::pattern::RadialProfile;
use crate::scenario::cans::{CatchCanData, CatchCanError, CatchSet};

/// Uniformity of a test, and of a radial leg overlapped in a layout.
#[derive(Debug, Clone, PartialEq)]
pub struct AuditReport {
    /// Figures over the cans as they stand (rates in mm/h). For a radial leg
    /// these describe the leg itself, not a field.
    pub cans: UniformityStats,
    /// The radial leg overlapped in the layout, when one was given.
    pub layout: Option<LayoutResult>,
}

/// The radial leg of a test as a head pattern for overlap.
pub fn leg_pattern(data: &CatchCanData) -> Result<MeasuredLeg, CatchCanError> {
    match &data.cans {
        CatchSet::Radial(cans) => MeasuredLeg::new(
            cans.iter().map(|c| (c.distance_m, c.rate_mm_h)).collect(),
        )
        .map_err(|source| CatchCanError::Rating {
            file: data.source.clone(),
            source,
        }),
        CatchSet::Grid(_) => Err(CatchCanError::File {
            file: data.source.clone(),
            message: "holds a grid of cans; overlapping a head in a layout, and fitting \
                      the spray, need a radial leg (distance, catch) from one head"
                .to_string(),
        }),
    }
}

/// Rates a test: uniformity over its cans and, for a radial leg with a
/// `layout`, over the leg's overlap in that layout. A grid (cans set out
/// between working heads) is rated as it stands, whatever the layout.
pub fn audit(
    data: &CatchCanData,
    layout: Option<&Layout>,
    opts: &OverlapOptions,
) -> Result<AuditReport, CatchCanError> {
    let rating = |source| CatchCanError::Rating {
        file: data.source.clone(),
        source,
    };
    let cans = uniformity(&data.rates_mm_h()).map_err(rating)?;
    let layout = match layout {
        Some(l) if matches!(data.cans, CatchSet::Radial(_)) => {
            let leg = leg_pattern(data)?;
            Some(overlap(l, &leg, opts).map_err(rating)?)
        }
        _ => None,
    };
    Ok(AuditReport { cans, layout })
}

/// Measured throw of a radial leg: the distance of the farthest can whose
/// rate is still at least `threshold_mm_h` (the wetting threshold, model.md
/// M8), m; `None` when no can reaches it.
pub fn measured_throw_m(leg: &MeasuredLeg, threshold_mm_h: f64) -> Option<f64> {
    leg.points()
        .iter()
        .rev()
        .find(|(_, q)| *q >= threshold_mm_h)
        .map(|(r, _)| *r)
}

/// Relative gap that counts as a difference between cans and model when
/// comparing throws and rates (common practice: a catch-can test repeats to
/// about ±5 % in throw and ±10 % in rate).
pub const THROW_GAP: f64 = 0.05;
/// See [`THROW_GAP`]: relative gap in mean rate that counts.
pub const RATE_GAP: f64 = 0.10;
/// Cans nearer the head than this share of the measured throw are the
/// "near the head" cans of [`CanNote::DryNearHead`] / [`CanNote::WetNearHead`].
pub const NEAR_HEAD_SHARE: f64 = 1.0 / 3.0;
/// Near-head cans catching less than this share of the model (or more than
/// its inverse) are a dry (wet) ring (common practice).
pub const NEAR_HEAD_RATIO: f64 = 0.6;

/// What the gap between cans and model suggests, as typed values (the words
/// are in `report::cans`). Rates in mm/h, lengths in m.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum CanNote {
    /// The leg's throw is shorter than the model's by more than [`THROW_GAP`].
    ThrowShort {
        /// Farthest can at the wetting threshold, m.
        measured_m: f64,
        /// The model's wetted radius, m.
        model_m: f64,
    },
    /// The leg's throw is longer than the model's by more than [`THROW_GAP`].
    ThrowLong {
        /// Farthest can at the wetting threshold, m.
        measured_m: f64,
        /// The model's wetted radius, m.
        model_m: f64,
    },
    /// The throws agree within [`THROW_GAP`] (or the can spacing).
    ThrowAgrees {
        /// Farthest can at the wetting threshold, m.
        measured_m: f64,
        /// The model's wetted radius, m.
        model_m: f64,
    },
    /// No can of the leg reaches the wetting threshold.
    NoThrow {
        /// The threshold, mm/h.
        threshold_mm_h: f64,
    },
    /// Near the head the cans caught much less than the model puts there.
    DryNearHead {
        /// Cans out to this distance, m.
        within_m: f64,
        /// Their mean rate, mm/h.
        measured_mm_h: f64,
        /// The model's mean rate at the same distances, mm/h.
        model_mm_h: f64,
    },
    /// Near the head the cans caught much more than the model puts there.
    WetNearHead {
        /// Cans out to this distance, m.
        within_m: f64,
        /// Their mean rate, mm/h.
        measured_mm_h: f64,
        /// The model's mean rate at the same distances, mm/h.
        model_mm_h: f64,
    },
    /// The overlapped (leg) or caught (grid) mean rate is below the model's.
    LessWater {
        /// From the cans, mm/h.
        measured_mm_h: f64,
        /// The model's, mm/h.
        model_mm_h: f64,
    },
    /// The overlapped (leg) or caught (grid) mean rate is above the model's.
    MoreWater {
        /// From the cans, mm/h.
        measured_mm_h: f64,
        /// The model's, mm/h.
        model_mm_h: f64,
    },
    /// The mean rates agree within [`RATE_GAP`].
    WaterAgrees {
        /// From the cans, mm/h.
        measured_mm_h: f64,
        /// The model's, mm/h.
        model_mm_h: f64,
    },
}

impl CanNote {
    /// Short key for JSON.
    pub fn key(&self) -> &'static str {
        match self {
            CanNote::ThrowShort { .. } => "shorter_throw",
            CanNote::ThrowLong { .. } => "longer_throw",
            CanNote::ThrowAgrees { .. } => "throw_agrees",
            CanNote::NoThrow { .. } => "no_can_wetted",
            CanNote::DryNearHead { .. } => "dry_near_head",
            CanNote::WetNearHead { .. } => "wet_near_head",
            CanNote::LessWater { .. } => "less_water",
            CanNote::MoreWater { .. } => "more_water",
            CanNote::WaterAgrees { .. } => "rate_agrees",
        }
    }
}

/// The model a test is set beside: the head's radial profile in still air,
/// its wetted radius and threshold, and the layout's mean rate.
#[derive(Debug, Clone, Copy)]
pub struct ModelSide<'a> {
    /// The head's radial profile.
    pub profile: &'a RadialProfile,
    /// The model's wetted radius, m.
    pub wetted_radius_m: f64,
    /// The wetting threshold, mm/h.
    pub threshold_mm_h: f64,
    /// The model layout's mean rate, mm/h.
    pub mean_rate_mm_h: f64,
}

/// Measured against modelled, for a person: the leg's throw against the
/// model's, the near-head cans against the model at the same distances, and
/// the mean rate (overlapped leg, or grid as caught) against the model's.
pub fn interpret(data: &CatchCanData, report: &AuditReport, model: &ModelSide) -> Vec<CanNote> {
    let mut notes = Vec::new();
    if let CatchSet::Radial(cans) = &data.cans {
        let mut sorted: Vec<(f64, f64)> =
            cans.iter().map(|c| (c.distance_m, c.rate_mm_h)).collect();
        sorted.sort_by(|a, b| a.0.total_cmp(&b.0));
        let throw = sorted
            .iter()
            .rev()
            .find(|(_, q)| *q >= model.threshold_mm_h)
            .map(|(r, _)| *r);
        // The last wetted can stands somewhere before the true edge: allow
        // one can spacing beyond it before calling the throw short.
        let spacing = sorted
            .iter()
            .zip(sorted.iter().skip(1))
            .map(|(a, b)| b.0 - a.0)
            .fold(0.0, f64::max);
        match throw {
            None => notes.push(CanNote::NoThrow {
                threshold_mm_h: model.threshold_mm_h,
            }),
            Some(m) => {
                let r = model.wetted_radius_m;
                let note = if m + spacing < r * (1.0 - THROW_GAP) {
                    CanNote::ThrowShort {
                        measured_m: m,
                        model_m: r,
                    }
                } else if m > r * (1.0 + THROW_GAP) {
                    CanNote::ThrowLong {
                        measured_m: m,
                        model_m: r,
                    }
                } else {
                    CanNote::ThrowAgrees {
                        measured_m: m,
                        model_m: r,
                    }
                };
                notes.push(note);
                let within = NEAR_HEAD_SHARE * m.max(r);
                let near: Vec<&(f64, f64)> = sorted.iter().filter(|c| c.0 <= within).collect();
                if !near.is_empty() {
                    let n = near.len() as f64;
                    let measured = near.iter().map(|c| c.1).sum::<f64>() / n;
                    let modelled = near
                        .iter()
                        .map(|c| model.profile.rate_mm_h_at(c.0))
                        .sum::<f64>()
                        / n;
                    if measured < NEAR_HEAD_RATIO * modelled {
                        notes.push(CanNote::DryNearHead {
                            within_m: within,
                            measured_mm_h: measured,
                            model_mm_h: modelled,
                        });
                    } else if measured * NEAR_HEAD_RATIO > modelled {
                        notes.push(CanNote::WetNearHead {
                            within_m: within,
                            measured_mm_h: measured,
                            model_mm_h: modelled,
                        });
                    }
                }
            }
        }
    }
    let measured = match (&data.cans, &report.layout) {
        (CatchSet::Radial(_), Some(l)) => Some(l.mean_rate_mm_h),
        (CatchSet::Grid(_), _) => Some(report.cans.mean),
        _ => None,
    };
    if let Some(m) = measured {
        let model_mm_h = model.mean_rate_mm_h;
        notes.push(if m < model_mm_h * (1.0 - RATE_GAP) {
            CanNote::LessWater {
                measured_mm_h: m,
                model_mm_h,
            }
        } else if m > model_mm_h * (1.0 + RATE_GAP) {
            CanNote::MoreWater {
                measured_mm_h: m,
                model_mm_h,
            }
        } else {
            CanNote::WaterAgrees {
                measured_mm_h: m,
                model_mm_h,
            }
        });
    }
    notes
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::cans::parse_catch_cans;

    #[test]
    fn reads_a_grid_in_inches() {
        let text = "duration,1,h\nx_ft,y_ft,catch_in\n0,0,0.5\n10,0,0.4\n0,10,0.3\n10,10,0.6\n";
        let d = parse_catch_cans(text, "g.csv").unwrap();
        let CatchSet::Grid(cans) = &d.cans else {
            panic!("not a grid")
        };
        assert!((cans[1].x_m - 3.048).abs() < 1e-12);
        assert!((cans[0].rate_mm_h - 12.7).abs() < 1e-9);
        assert!(audit(&d, None, &OverlapOptions::default()).is_ok());
        // A grid between working heads is rated as it stands, layout or not.
        let sq = Layout::Square { spacing_m: 9.0 };
        let rated = audit(&d, Some(&sq), &OverlapOptions::default()).unwrap();
        assert!(rated.layout.is_none());
        assert_eq!(rated.cans.count, 4);
        // Rates 12.7, 10.16, 7.62, 15.24 mm/h: mean 11.43 mm/h.
        assert!((rated.cans.mean - 11.43).abs() < 1e-9);
    }
}
