//! Findings of a field check as typed values: what each is about, whether it
//! is a fault, how far outside its tolerance, and the numbers behind it. The
//! words (and the units they are shown in) belong to the report layer
//! (`crate::report::field`).
//!
//! The first finding is always the speed against the design: its direction
//! (slower, faster, as designed) is the sign of measured − design speed, and
//! it names the cause that explains most of it. The others follow, most
//! serious first.

use super::causes::{Cause, CauseKind};
use super::{FieldCheck, FieldReading, FieldTolerances, REGULATOR_LIMIT_PA, VOIDS_COMPARISON};
use crate::physics::balance::SpinStatus;

/// What a finding is about.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum FindingKind {
    /// Inlet pressure above the regulator limit.
    RegulatorNeeded,
    /// Inlet pressure below the design's.
    PressureLow,
    /// Inlet pressure above the design's.
    PressureHigh,
    /// Inlet pressure as designed.
    PressureOk,
    /// The design does not run, yet the rotor turns.
    DesignDoesNotRun,
    /// Slower than designed.
    Slow,
    /// Faster than designed.
    Fast,
    /// Speed as designed.
    SpeedOk,
    /// The implied bearing friction does not reproduce the measured speed.
    SpeedNotExplained,
    /// More flow than a new nozzle passes.
    FlowHigh,
    /// Less flow than a new nozzle passes.
    FlowLow,
    /// Flow as a new nozzle's.
    FlowOk,
    /// More flow than any nozzle size could pass.
    FlowBeyondModel,
    /// Shorter throw than expected.
    ThrowShort,
    /// Longer throw than expected.
    ThrowLong,
    /// Throw as expected.
    ThrowOk,
}

impl FindingKind {
    /// The fixed key used in JSON ("slow", "flow_low", …).
    pub fn key(self) -> &'static str {
        match self {
            FindingKind::RegulatorNeeded => "regulator_needed",
            FindingKind::PressureLow => "pressure_low",
            FindingKind::PressureHigh => "pressure_high",
            FindingKind::PressureOk => "pressure_ok",
            FindingKind::DesignDoesNotRun => "design_does_not_run",
            FindingKind::Slow => "slow",
            FindingKind::Fast => "fast",
            FindingKind::SpeedOk => "speed_ok",
            FindingKind::SpeedNotExplained => "speed_not_explained",
            FindingKind::FlowHigh => "flow_high",
            FindingKind::FlowLow => "flow_low",
            FindingKind::FlowOk => "flow_ok",
            FindingKind::FlowBeyondModel => "flow_beyond_model",
            FindingKind::ThrowShort => "throw_short",
            FindingKind::ThrowLong => "throw_long",
            FindingKind::ThrowOk => "throw_ok",
        }
    }
}

/// Which way a measured speed lies from the design's.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Direction {
    /// Measured below the design.
    Slower,
    /// Measured above the design.
    Faster,
    /// Measured equal to the design.
    AsDesigned,
}

impl Direction {
    /// The direction of `measured` against `reference`.
    pub fn of(measured: f64, reference: f64) -> Self {
        if measured < reference {
            Direction::Slower
        } else if measured > reference {
            Direction::Faster
        } else {
            Direction::AsDesigned
        }
    }

    /// The fixed key used in JSON.
    pub fn key(self) -> &'static str {
        match self {
            Direction::Slower => "slower",
            Direction::Faster => "faster",
            Direction::AsDesigned => "as_designed",
        }
    }
}

/// How a reading sits against its expected value.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Within {
    /// The expected value lies inside the reading band.
    ReadingBand,
    /// Outside the band but within the tolerance, percent.
    Tolerance(f64),
    /// Beyond the tolerance, percent.
    Beyond(f64),
}

impl Within {
    /// True beyond the tolerance.
    pub fn fault(self) -> bool {
        matches!(self, Within::Beyond(_))
    }
}

/// The numbers behind a finding, in SI.
#[derive(Debug, Clone, PartialEq)]
pub enum Detail {
    /// The speed against the design's own operating speed.
    Speed {
        /// Measured, rpm.
        measured_rpm: f64,
        /// Band the reading allows, rpm.
        band_rpm: [f64; 2],
        /// The design's own operating speed, rpm.
        design_rpm: f64,
        /// The design's own inlet pressure, Pa.
        design_pressure_pa: f64,
        /// Which way.
        direction: Direction,
        /// |measured − design| / design, percent (≥ 0).
        percent: f64,
        /// Against the reading band and tolerance.
        within: Within,
        /// The cause that explains most of it, when one does.
        top: Option<Cause>,
        /// The speed the design gives at the measured pressure, rpm.
        at_pressure_rpm: Option<f64>,
    },
    /// The design does not run where the rotor is found turning.
    DesignDoesNotRun {
        /// Measured, rpm.
        measured_rpm: f64,
        /// Band the reading allows, rpm.
        band_rpm: [f64; 2],
        /// The pressure the design was solved at, Pa.
        pressure_pa: f64,
        /// True when the design stalls at rest there (else: no steady speed).
        stalls: bool,
    },
    /// The implied bearing friction does not reproduce the measured speed.
    SpeedNotExplained {
        /// Measured, rpm.
        measured_rpm: f64,
        /// Where the model with the implied friction settles, rpm (None: nowhere).
        model_rpm: Option<f64>,
    },
    /// Inlet pressure above the regulator limit.
    Regulator {
        /// Measured, Pa.
        pressure_pa: f64,
        /// The limit, Pa.
        limit_pa: f64,
    },
    /// Inlet pressure against the design's.
    Pressure {
        /// Measured, Pa.
        measured_pa: f64,
        /// The design's own inlet pressure, Pa.
        design_pa: f64,
        /// |measured − design| / design, percent.
        percent: f64,
        /// Against the reading band and tolerance.
        within: Within,
    },
    /// Flow against a new nozzle's.
    Flow {
        /// Measured, m³/s.
        measured_m3_s: f64,
        /// Band the reading allows, m³/s.
        band_m3_s: [f64; 2],
        /// A new nozzle's at the measured pressure and speed, m³/s.
        nominal_m3_s: f64,
        /// At this pressure, Pa.
        pressure_pa: f64,
        /// And this speed, rpm.
        rpm: f64,
        /// |measured − nominal| / nominal, percent.
        percent: f64,
        /// Against the reading band and tolerance.
        within: Within,
        /// Area-equivalent diameter found, m (None when no size passes the flow).
        effective_diameter_m: Option<f64>,
        /// Area-equivalent diameter of the new nozzles, m.
        nominal_diameter_m: f64,
    },
    /// Throw against the model's.
    Throw {
        /// Measured, m.
        measured_m: f64,
        /// Band the reading allows, m.
        band_m: [f64; 2],
        /// The design's at the measured pressure, m.
        expected_m: f64,
        /// The as-found design's, m.
        as_found_m: Option<f64>,
        /// At this pressure, Pa.
        pressure_pa: f64,
        /// |measured − expected| / expected, percent.
        percent: f64,
        /// Against the reading band and tolerance.
        within: Within,
        /// The speed and flow found account for it.
        explained: bool,
    },
}

/// One finding.
#[derive(Debug, Clone, PartialEq)]
pub struct Finding {
    /// What it is about.
    pub kind: FindingKind,
    /// True when it is outside its tolerance.
    pub fault: bool,
    /// How far outside the tolerance: the deviation of the reading band's
    /// nearer end over the tolerance (above 1 is a fault; 0 inside the band).
    pub score: f64,
    /// The numbers behind it.
    pub detail: Detail,
}

impl Finding {
    /// The direction of a speed finding (None for the others). A rotor that
    /// turns where the design does not run is faster than the design.
    pub fn direction(&self) -> Option<Direction> {
        match &self.detail {
            Detail::Speed { direction, .. } => Some(*direction),
            Detail::DesignDoesNotRun { .. } => Some(Direction::Faster),
            _ => None,
        }
    }
}

/// A reading judged against an expected value.
#[derive(Debug, Clone, Copy)]
pub(super) struct Judged {
    /// |100 · (measured − expected) / expected|.
    pub percent: f64,
    /// Against the band and tolerance.
    pub within: Within,
    /// |deviation of the band's nearer end| / tolerance.
    pub score: f64,
}

pub(super) fn judge(
    measured: f64,
    band: [f64; 2],
    expected: f64,
    tolerance_percent: f64,
) -> Judged {
    let pct = |x: f64| 100.0 * (x - expected) / expected;
    let in_band = band[0] <= expected && expected <= band[1];
    let nearer = if in_band {
        0.0
    } else if band[0] > expected {
        pct(band[0])
    } else {
        pct(band[1])
    };
    let score = nearer.abs() / tolerance_percent;
    Judged {
        percent: pct(measured).abs(),
        within: if in_band {
            Within::ReadingBand
        } else if score <= 1.0 {
            Within::Tolerance(tolerance_percent)
        } else {
            Within::Beyond(tolerance_percent)
        },
        score,
    }
}

/// The first cause in rank that accounts for part of `deviation_rpm`.
fn top_cause(causes: &[Cause], deviation_rpm: f64) -> Option<Cause> {
    causes.iter().find(|c| c.explains(deviation_rpm)).copied()
}

/// All findings of a check: the speed first, then the rest most serious first.
pub(super) fn findings(
    c: &FieldCheck,
    reading: &FieldReading,
    tol: &FieldTolerances,
) -> Vec<Finding> {
    let mut rest = Vec::new();
    pressure_findings(c, reading, tol, &mut rest);
    flow_findings(c, tol, &mut rest);
    throw_findings(c, tol, &mut rest);
    if let Some(f) = not_explained(c) {
        rest.push(f);
    }
    if c.design_rpm.is_some() && c.expected_rpm.is_none() {
        // The design runs at its own supply but not at the measured pressure.
        rest.push(Finding {
            kind: FindingKind::DesignDoesNotRun,
            fault: true,
            score: VOIDS_COMPARISON,
            detail: Detail::DesignDoesNotRun {
                measured_rpm: c.measured_rpm,
                band_rpm: c.measured_rpm_band,
                pressure_pa: c.inlet_pressure_pa,
                stalls: c.expected.status == SpinStatus::StallsAtRest,
            },
        });
    }
    rest.sort_by(|a, b| b.score.total_cmp(&a.score));
    let mut out = vec![speed_finding(c)];
    out.extend(rest);
    out
}

fn speed_finding(c: &FieldCheck) -> Finding {
    let m = c.measured_rpm;
    let band = c.measured_rpm_band;
    let Some(d) = c.design_rpm else {
        return Finding {
            kind: FindingKind::DesignDoesNotRun,
            fault: true,
            score: VOIDS_COMPARISON,
            detail: Detail::DesignDoesNotRun {
                measured_rpm: m,
                band_rpm: band,
                pressure_pa: c.design_inlet_pressure_pa,
                stalls: c.design_status == SpinStatus::StallsAtRest,
            },
        };
    };
    let j = judge(m, band, d, c.tolerances.speed_percent);
    let direction = Direction::of(m, d);
    let fault = j.within.fault();
    Finding {
        kind: match (fault, direction) {
            (true, Direction::Slower) => FindingKind::Slow,
            (true, Direction::Faster) => FindingKind::Fast,
            _ => FindingKind::SpeedOk,
        },
        fault,
        score: j.score,
        detail: Detail::Speed {
            measured_rpm: m,
            band_rpm: band,
            design_rpm: d,
            design_pressure_pa: c.design_inlet_pressure_pa,
            direction,
            percent: j.percent,
            within: j.within,
            top: if matches!(j.within, Within::ReadingBand) {
                None
            } else {
                top_cause(&c.causes, m - d)
            },
            at_pressure_rpm: c.expected_rpm,
        },
    }
}

fn not_explained(c: &FieldCheck) -> Option<Finding> {
    let f = c.friction?;
    let m = c.measured_rpm;
    let reproduced = f.model_rpm.is_some_and(|r| ((r - m) / m).abs() <= 1e-4);
    // Only worth saying when the bearing is the cause named.
    let bearing_named = c
        .causes
        .iter()
        .find(|k| k.explains(m - c.design_rpm.unwrap_or(0.0)))
        .is_some_and(|k| k.kind == CauseKind::Bearing);
    (!reproduced && bearing_named && f.implied_running_torque_n_m >= 0.0).then_some(Finding {
        kind: FindingKind::SpeedNotExplained,
        fault: true,
        score: 1.0,
        detail: Detail::SpeedNotExplained {
            measured_rpm: m,
            model_rpm: f.model_rpm,
        },
    })
}

fn pressure_findings(
    c: &FieldCheck,
    reading: &FieldReading,
    tol: &FieldTolerances,
    out: &mut Vec<Finding>,
) {
    let p = c.inlet_pressure_pa;
    if p > REGULATOR_LIMIT_PA {
        out.push(Finding {
            kind: FindingKind::RegulatorNeeded,
            fault: true,
            score: p / REGULATOR_LIMIT_PA,
            detail: Detail::Regulator {
                pressure_pa: p,
                limit_pa: REGULATOR_LIMIT_PA,
            },
        });
    }
    let pd = c.design_inlet_pressure_pa;
    if pd <= 0.0 {
        return;
    }
    let res = reading.pressure_resolution_pa;
    let j = judge(p, [p - res, p + res], pd, tol.pressure_percent);
    let kind = if !j.within.fault() {
        FindingKind::PressureOk
    } else if p < pd {
        FindingKind::PressureLow
    } else {
        FindingKind::PressureHigh
    };
    out.push(Finding {
        kind,
        fault: j.within.fault(),
        score: j.score,
        detail: Detail::Pressure {
            measured_pa: p,
            design_pa: pd,
            percent: j.percent,
            within: j.within,
        },
    });
}

fn flow_findings(c: &FieldCheck, tol: &FieldTolerances, out: &mut Vec<Finding>) {
    let Some(f) = &c.flow else { return };
    if f.nominal_m3_s <= 0.0 {
        return;
    }
    let j = judge(
        f.measured_m3_s,
        f.band_m3_s,
        f.nominal_m3_s,
        tol.flow_percent,
    );
    let (kind, fault, score) = if f.diameter_scale.is_none() {
        (FindingKind::FlowBeyondModel, true, j.score.max(1.0))
    } else if !j.within.fault() {
        (FindingKind::FlowOk, false, j.score)
    } else if f.measured_m3_s > f.nominal_m3_s {
        (FindingKind::FlowHigh, true, j.score)
    } else {
        (FindingKind::FlowLow, true, j.score)
    };
    out.push(Finding {
        kind,
        fault,
        score,
        detail: Detail::Flow {
            measured_m3_s: f.measured_m3_s,
            band_m3_s: f.band_m3_s,
            nominal_m3_s: f.nominal_m3_s,
            pressure_pa: c.inlet_pressure_pa,
            rpm: c.measured_rpm,
            percent: j.percent,
            within: j.within,
            effective_diameter_m: f.implied_effective_diameter_m,
            nominal_diameter_m: f.nominal_effective_diameter_m,
        },
    });
}

fn throw_findings(c: &FieldCheck, tol: &FieldTolerances, out: &mut Vec<Finding>) {
    let Some(t) = &c.throw else { return };
    let Some(e) = t.expected_m else { return };
    let j = judge(t.measured_m, t.band_m, e, tol.throw_percent);
    let explained = t
        .as_found_m
        .is_some_and(|af| judge(t.measured_m, t.band_m, af, tol.throw_percent).score <= 1.0);
    let kind = if !j.within.fault() {
        FindingKind::ThrowOk
    } else if t.measured_m < e {
        FindingKind::ThrowShort
    } else {
        FindingKind::ThrowLong
    };
    out.push(Finding {
        kind,
        fault: j.within.fault(),
        score: j.score,
        detail: Detail::Throw {
            measured_m: t.measured_m,
            band_m: t.band_m,
            expected_m: e,
            as_found_m: t.as_found_m,
            pressure_pa: c.inlet_pressure_pa,
            percent: j.percent,
            within: j.within,
            explained,
        },
    });
}
