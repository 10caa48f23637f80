//! What a technician reads at a running sprinkler (model.md M10): the inlet
//! pressure, the rotation, optionally the flow and the wetted radius, each
//! with the resolution it was read to and the band [lo, hi] that allows.

/// Default stopwatch resolution for hand timing, s (common practice: a hand
/// stopwatch is good to about 0.2 s, reaction time included).
pub const DEFAULT_STOPWATCH_RESOLUTION_S: f64 = 0.2;
/// Default counting resolution, turns: whole turns counted past a fixed mark
/// (the timing at the mark is what the stopwatch resolution covers).
pub const DEFAULT_COUNT_RESOLUTION_TURNS: f64 = 0.0;
/// Default resolution of a caught volume, m³ (a marked jug read to 50 mL:
/// common practice).
pub const DEFAULT_VOLUME_RESOLUTION_M3: f64 = 0.05e-3;
/// Default resolution of a measured throw, m (a tape read at the edge of the
/// wetted area: our choice).
pub const DEFAULT_THROW_RESOLUTION_M: f64 = 0.1;

/// How the rotation was measured.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum RotationReading {
    /// Read directly, rpm, with the reading's resolution (± rpm).
    Rpm {
        /// Speed, rpm.
        rpm: f64,
        /// ± resolution of the reading, rpm.
        resolution_rpm: f64,
    },
    /// One turn timed, s.
    SecondsPerTurn {
        /// Time for one turn, s.
        seconds: f64,
        /// ± stopwatch resolution, s.
        stopwatch_resolution_s: f64,
    },
    /// N turns counted over T seconds.
    TurnsOver {
        /// Turns counted.
        turns: f64,
        /// Time taken, s.
        seconds: f64,
        /// ± stopwatch resolution, s.
        stopwatch_resolution_s: f64,
        /// ± counting resolution, turns.
        count_resolution_turns: f64,
    },
}

impl RotationReading {
    /// An rpm read exactly (no resolution given).
    pub fn rpm(rpm: f64) -> Self {
        RotationReading::Rpm {
            rpm,
            resolution_rpm: 0.0,
        }
    }

    /// One turn timed with a hand stopwatch (default resolution).
    pub fn seconds_per_turn(seconds: f64) -> Self {
        RotationReading::SecondsPerTurn {
            seconds,
            stopwatch_resolution_s: DEFAULT_STOPWATCH_RESOLUTION_S,
        }
    }

    /// N whole turns timed with a hand stopwatch (default resolutions).
    pub fn turns_over(turns: f64, seconds: f64) -> Self {
        RotationReading::TurnsOver {
            turns,
            seconds,
            stopwatch_resolution_s: DEFAULT_STOPWATCH_RESOLUTION_S,
            count_resolution_turns: DEFAULT_COUNT_RESOLUTION_TURNS,
        }
    }

    /// (turns, ± turns, seconds, ± seconds) of a timed reading.
    fn timed(&self) -> Option<(f64, f64, f64, f64)> {
        match *self {
            RotationReading::Rpm { .. } => None,
            RotationReading::SecondsPerTurn {
                seconds,
                stopwatch_resolution_s,
            } => Some((1.0, 0.0, seconds, stopwatch_resolution_s)),
            RotationReading::TurnsOver {
                turns,
                seconds,
                stopwatch_resolution_s,
                count_resolution_turns,
            } => Some((
                turns,
                count_resolution_turns,
                seconds,
                stopwatch_resolution_s,
            )),
        }
    }

    /// The measured speed, rpm.
    pub fn measured_rpm(&self) -> f64 {
        match *self {
            RotationReading::Rpm { rpm, .. } => rpm,
            _ => self.timed().map_or(0.0, |(n, _, t, _)| 60.0 * n / t),
        }
    }

    /// The band [lo, hi] of speeds the reading allows, rpm (see the module docs).
    pub fn band_rpm(&self) -> Result<[f64; 2], FieldError> {
        self.validate()?;
        Ok(match *self {
            RotationReading::Rpm {
                rpm,
                resolution_rpm,
            } => [rpm - resolution_rpm, rpm + resolution_rpm],
            _ => {
                let (n, dn, t, dt) = self.timed().unwrap_or((1.0, 0.0, 1.0, 0.0));
                [60.0 * (n - dn) / (t + dt), 60.0 * (n + dn) / (t - dt)]
            }
        })
    }

    pub(super) fn validate(&self) -> Result<(), FieldError> {
        match *self {
            RotationReading::Rpm {
                rpm,
                resolution_rpm,
            } => {
                positive("rpm", rpm)?;
                resolution("rpm resolution", resolution_rpm, rpm, "rpm")
            }
            RotationReading::SecondsPerTurn {
                seconds,
                stopwatch_resolution_s,
            } => {
                positive("seconds per turn", seconds)?;
                resolution(
                    "stopwatch resolution",
                    stopwatch_resolution_s,
                    seconds,
                    "seconds per turn",
                )
            }
            RotationReading::TurnsOver {
                turns,
                seconds,
                stopwatch_resolution_s,
                count_resolution_turns,
            } => {
                positive("turns", turns)?;
                positive("over (seconds)", seconds)?;
                resolution(
                    "stopwatch resolution",
                    stopwatch_resolution_s,
                    seconds,
                    "over (seconds)",
                )?;
                resolution("count resolution", count_resolution_turns, turns, "turns")
            }
        }
    }
}

/// How the flow was measured.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum FlowReading {
    /// A flow rate read from a meter, m³/s, with its resolution.
    Rate {
        /// Flow, m³/s.
        flow_m3_s: f64,
        /// ± resolution, m³/s.
        resolution_m3_s: f64,
    },
    /// A volume caught over a time.
    Caught {
        /// Volume caught, m³.
        volume_m3: f64,
        /// Time, s.
        seconds: f64,
        /// ± resolution of the volume, m³.
        volume_resolution_m3: f64,
        /// ± stopwatch resolution, s.
        stopwatch_resolution_s: f64,
    },
}

impl FlowReading {
    /// A volume caught over a hand-timed interval (default resolutions).
    pub fn caught(volume_m3: f64, seconds: f64) -> Self {
        FlowReading::Caught {
            volume_m3,
            seconds,
            volume_resolution_m3: DEFAULT_VOLUME_RESOLUTION_M3,
            stopwatch_resolution_s: DEFAULT_STOPWATCH_RESOLUTION_S,
        }
    }

    /// A flow rate read exactly (no resolution given).
    pub fn rate(flow_m3_s: f64) -> Self {
        FlowReading::Rate {
            flow_m3_s,
            resolution_m3_s: 0.0,
        }
    }

    /// The measured flow, m³/s.
    pub fn measured_m3_s(&self) -> f64 {
        match *self {
            FlowReading::Rate { flow_m3_s, .. } => flow_m3_s,
            FlowReading::Caught {
                volume_m3, seconds, ..
            } => volume_m3 / seconds,
        }
    }

    /// The band [lo, hi] the reading allows, m³/s.
    pub fn band_m3_s(&self) -> Result<[f64; 2], FieldError> {
        match *self {
            FlowReading::Rate {
                flow_m3_s,
                resolution_m3_s,
            } => {
                positive("flow", flow_m3_s)?;
                resolution("flow resolution", resolution_m3_s, flow_m3_s, "flow")?;
                Ok([flow_m3_s - resolution_m3_s, flow_m3_s + resolution_m3_s])
            }
            FlowReading::Caught {
                volume_m3,
                seconds,
                volume_resolution_m3,
                stopwatch_resolution_s,
            } => {
                positive("caught volume", volume_m3)?;
                positive("over (seconds)", seconds)?;
                resolution(
                    "volume resolution",
                    volume_resolution_m3,
                    volume_m3,
                    "caught volume",
                )?;
                resolution(
                    "stopwatch resolution",
                    stopwatch_resolution_s,
                    seconds,
                    "over (seconds)",
                )?;
                Ok([
                    (volume_m3 - volume_resolution_m3) / (seconds + stopwatch_resolution_s),
                    (volume_m3 + volume_resolution_m3) / (seconds - stopwatch_resolution_s),
                ])
            }
        }
    }
}

/// A measured wetted radius.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ThrowReading {
    /// Wetted radius, m.
    pub throw_m: f64,
    /// ± resolution, m.
    pub resolution_m: f64,
}

impl ThrowReading {
    /// A throw measured with the default resolution.
    pub fn new(throw_m: f64) -> Self {
        ThrowReading {
            throw_m,
            resolution_m: DEFAULT_THROW_RESOLUTION_M,
        }
    }
}

/// Everything measured at the sprinkler.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldReading {
    /// Gauge pressure at the sprinkler inlet, Pa.
    pub inlet_pressure_pa: f64,
    /// ± resolution of the pressure reading, Pa.
    pub pressure_resolution_pa: f64,
    /// The rotation.
    pub rotation: RotationReading,
    /// The flow, if measured.
    pub flow: Option<FlowReading>,
    /// The wetted radius, if measured.
    pub throw: Option<ThrowReading>,
}

impl FieldReading {
    /// Pressure and rotation only (pressure read exactly).
    pub fn new(inlet_pressure_pa: f64, rotation: RotationReading) -> Self {
        FieldReading {
            inlet_pressure_pa,
            pressure_resolution_pa: 0.0,
            rotation,
            flow: None,
            throw: None,
        }
    }
}

/// How far a reading may sit from the model before it is a finding, percent.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FieldTolerances {
    /// Speed, beyond the reading band (default 5 %: the model's own accuracy; our choice).
    pub speed_percent: f64,
    /// Pressure against the design's inlet pressure (default 10 %; our choice).
    pub pressure_percent: f64,
    /// Flow against a new nozzle's (default 10 %: common practice, replace beyond).
    pub flow_percent: f64,
    /// Throw against the model's (default 10 %; our choice).
    pub throw_percent: f64,
}

impl Default for FieldTolerances {
    fn default() -> Self {
        FieldTolerances {
            speed_percent: 5.0,
            pressure_percent: 10.0,
            flow_percent: 10.0,
            throw_percent: 10.0,
        }
    }
}

/// A reading or setting that cannot be used.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum FieldError {
    /// A reading that is not a positive finite number.
    #[error("field check: {field} = {value} must be a positive number")]
    NotPositive {
        /// Which reading.
        field: &'static str,
        /// The value given.
        value: f64,
    },
    /// A resolution that is negative or as large as the reading itself.
    #[error("field check: {field} = {value} must be zero or more and smaller than the {of} reading ({reading})")]
    BadResolution {
        /// Which resolution.
        field: &'static str,
        /// The value given.
        value: f64,
        /// The reading it belongs to.
        of: &'static str,
        /// That reading's value.
        reading: f64,
    },
}

pub(super) fn positive(field: &'static str, value: f64) -> Result<(), FieldError> {
    if value.is_finite() && value > 0.0 {
        Ok(())
    } else {
        Err(FieldError::NotPositive { field, value })
    }
}

pub(super) fn resolution(
    field: &'static str,
    value: f64,
    reading: f64,
    of: &'static str,
) -> Result<(), FieldError> {
    if value.is_finite() && value >= 0.0 && value < reading {
        Ok(())
    } else {
        Err(FieldError::BadResolution {
            field,
            value,
            of,
            reading,
        })
    }
}
