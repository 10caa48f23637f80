//! The scenario file's shape, field for field as `docs/format.md` describes it.
//!
//! These types mirror the file, not the physics: every dimensional value keeps
//! its unit tag, so a file read and written back says what its author wrote.
//! [`Scenario::to_design`](super::Scenario::to_design) turns them into the SI
//! [`Design`](crate::physics::design::Design).
//!
//! Every struct refuses unknown fields; optional fields carry their documented
//! default. Enums are externally tagged (`Pressure(kPa(280))`,
//! `Washer(mu_kinetic: 0.1, …)`), the natural RON spelling.

use serde::{Deserialize, Serialize};

use super::tags::{
    Angle, Area, Density, FlowRate, Length, Mass, MomentOfInertia, Pressure, Speed, Temperature,
    Torque,
};

/// The scenario file format version this build reads and writes.
pub const FORMAT_VERSION: u32 = 1;

fn format_version() -> u32 {
    FORMAT_VERSION
}

/// A whole scenario file.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Scenario {
    /// File format version (optional, 1 when left out). A file with a higher
    /// number was written by a newer spinwright and is refused.
    #[serde(default = "format_version")]
    pub version: u32,
    /// A name for reports.
    pub name: String,
    /// Free notes: where the numbers come from, what was changed.
    #[serde(default)]
    pub notes: String,
    /// Water conditions (optional).
    #[serde(default)]
    pub water: Water,
    /// Air at the site (optional).
    #[serde(default)]
    pub air: Air,
    /// Height of the lowest thing over the watered area (a wire, a branch, a
    /// roof), optional: jets whose drop paths rise above it are warned of.
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        with = "implicit_some"
    )]
    pub clearance: Option<Length>,
    /// How water reaches the sprinkler.
    pub supply: Supply,
    /// The rotating part.
    pub rotor: Rotor,
    /// What resists rotation.
    pub friction: Friction,
    /// Drop-size spectrum overrides (optional, all `Auto`).
    #[serde(default)]
    pub spray: Spray,
    /// Head layout for uniformity (optional).
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        with = "implicit_some"
    )]
    pub layout: Option<Layout>,
    /// Wind over the site (optional, calm).
    #[serde(default)]
    pub wind: Wind,
}

/// Water conditions.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct Water {
    /// Water temperature (0–50 °C), default `C(20)`.
    pub temperature: Temperature,
}

impl Default for Water {
    fn default() -> Self {
        Water {
            temperature: Temperature::C(20.0),
        }
    }
}

/// Air at the site.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct Air {
    /// Air temperature, default `C(20)`.
    pub temperature: Temperature,
    /// Altitude above sea level, default `m(0)`.
    pub altitude: Length,
}

impl Default for Air {
    fn default() -> Self {
        Air {
            temperature: Temperature::C(20.0),
            altitude: Length::m(0.0),
        }
    }
}

/// How water reaches the sprinkler inlet (model.md M4).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum Supply {
    /// Gauge pressure held at the inlet: `Pressure(kPa(280))`.
    Pressure(Pressure),
    /// Total flow held fixed: `Flow(L_min(12))`.
    Flow(FlowRate),
    /// A pressure source through a hose or pipe.
    Line {
        /// Gauge pressure at the source.
        source: Pressure,
        /// Hose length.
        length: Length,
        /// Hose bore.
        bore: Length,
        /// Wall roughness.
        roughness: Length,
        /// Sum of minor-loss coefficients (bare number).
        minor_k: f64,
        /// Rise from source to inlet (negative: downhill).
        lift: Length,
    },
}

/// The rotating part.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Rotor {
    /// Radius where the arms leave the hub.
    pub hub_radius: Length,
    /// The swivel at the inlet.
    pub swivel: Swivel,
    /// The arms, one nozzle each.
    pub arms: Vec<Arm>,
    /// Rotor inertia.
    pub inertia: Inertia,
}

/// The swivel.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Swivel {
    /// Inlet bore.
    pub inlet_bore: Length,
    /// Loss coefficient on the inlet velocity head (bare number).
    pub k: f64,
}

/// One arm with its tip nozzle.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Arm {
    /// Horizontal radius of the nozzle from the spin axis.
    pub radius: Length,
    /// Azimuth of the arm around the hub.
    pub azimuth: Angle,
    /// Height of the nozzle above ground.
    pub height: Length,
    /// Rise from the swivel to the nozzle (optional, 0).
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        with = "implicit_some"
    )]
    pub rise: Option<Length>,
    /// The arm tube.
    pub tube: Tube,
    /// The tip nozzle.
    pub nozzle: Nozzle,
}

/// The arm tube.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Tube {
    /// Bore (inside diameter).
    pub bore: Length,
    /// Outside diameter.
    pub outer: Length,
    /// Wall roughness.
    pub roughness: Length,
    /// Minor-loss coefficients along the arm (bare number).
    pub minor_k: f64,
    /// Developed length hub to nozzle (optional, the arm radius).
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        with = "implicit_some"
    )]
    pub length: Option<Length>,
}

/// A nozzle.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Nozzle {
    /// Exit diameter.
    pub diameter: Length,
    /// Jet angle above horizontal (0–90°).
    pub elevation: Angle,
    /// Jet angle from the backward tangent (−180–180°).
    pub deflection: Angle,
    /// Discharge coefficient, (0, 1].
    pub cd: f64,
    /// Velocity coefficient, (0, 1].
    pub cv: f64,
}

/// How the rotor inertia is known.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum Inertia {
    /// Estimated from arm tubes, the water in them and tip masses.
    Estimate {
        /// Tube material density.
        tube_density: Density,
        /// Tube wall thickness.
        tube_wall: Length,
        /// Mass at each arm tip.
        tip_mass: Mass,
    },
    /// Given directly: `Given(kg_m2(0.0012))`.
    Given(MomentOfInertia),
}

/// What resists rotation (model.md M5).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Friction {
    /// The thrust bearing.
    pub bearing: Bearing,
    /// Seal drag (optional, none).
    #[serde(default)]
    pub seal: Seal,
    /// Speed brake (optional, none).
    #[serde(default)]
    pub brake: Brake,
    /// Drag coefficient of an arm tube in cross-flow (optional, 1.1).
    #[serde(default = "default_arm_drag_cd")]
    pub arm_drag_cd: f64,
}

/// Drag coefficient of a circular cylinder in cross-flow at the arm's
/// Reynolds numbers (10³–10⁵): about 1.1 (common practice).
pub const DEFAULT_ARM_DRAG_CD: f64 = 1.1;

fn default_arm_drag_cd() -> f64 {
    DEFAULT_ARM_DRAG_CD
}

/// The thrust bearing.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum Bearing {
    /// A flat thrust washer.
    Washer {
        /// Kinetic friction coefficient (bare number).
        mu_kinetic: f64,
        /// Static friction coefficient (bare number).
        mu_static: f64,
        /// Inner radius.
        inner: Length,
        /// Outer radius.
        outer: Length,
        /// Area on which hub pressure lifts the rotor.
        thrust_area: Area,
        /// Mass of the rotating part.
        rotor_mass: Mass,
        /// Friction radius rule (optional, `UniformWear`).
        #[serde(default)]
        radius_rule: WasherRule,
    },
    /// Running and breakaway torque measured at the unit.
    Measured {
        /// Torque to keep it turning slowly.
        running: Torque,
        /// Torque to start it from rest.
        breakaway: Torque,
    },
}

/// How a washer's friction radius is taken.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum WasherRule {
    /// A run-in washer: mean radius.
    #[default]
    UniformWear,
    /// A new washer: ⅔(r_o³ − r_i³)/(r_o² − r_i²).
    UniformPressure,
}

/// Seal drag.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct Seal {
    /// Torque at zero pressure (default `N_m(0)`).
    pub base: Torque,
    /// Added torque per kPa of hub pressure (default `N_m(0)`).
    pub per_kpa: Torque,
}

impl Default for Seal {
    fn default() -> Self {
        Seal {
            base: Torque::N_m(0.0),
            per_kpa: Torque::N_m(0.0),
        }
    }
}

/// Speed brake, SI coefficients as bare numbers.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct Brake {
    /// c₁, N·m·s/rad.
    pub viscous: f64,
    /// c₂, N·m·s²/rad².
    pub quadratic: f64,
}

/// Drop-size spectrum overrides.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct Spray {
    /// Volume median diameter: `Auto` or a length (`mm(1.1)`).
    pub d50: DropSize,
    /// Rosin–Rammler spread: `Auto` or a bare number.
    pub spread: Spread,
    /// Largest drop: `Auto` or a length.
    pub largest: DropSize,
    /// Jet breakup coefficient C_b (intact length over d·√(ρ_w/ρ_air)):
    /// `Auto` (the published 11, model.md M7) or a bare number from 2 to 22.
    pub breakup: Breakup,
}

/// A jet breakup coefficient, or `Auto`.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[serde(
    untagged,
    expecting = "expected `Auto` or a bare number such as 8 (the breakup coefficient has no unit)"
)]
pub enum Breakup {
    /// The published default.
    #[default]
    #[serde(with = "auto_word")]
    Auto,
    /// The coefficient C_b.
    Value(f64),
}

/// A drop size, or `Auto` for the documented relation.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[allow(non_camel_case_types)]
pub enum DropSize {
    /// From the published relation (model.md M8).
    #[default]
    Auto,
    /// Millimetres.
    mm(f64),
    /// Micrometres.
    um(f64),
    /// Inches.
    r#in(f64),
}

impl DropSize {
    /// The size in metres, `None` for `Auto`.
    pub fn si(self) -> Option<f64> {
        match self {
            DropSize::Auto => None,
            DropSize::mm(v) => Some(Length::mm(v).si()),
            DropSize::um(v) => Some(v / 1.0e6),
            DropSize::r#in(v) => Some(Length::r#in(v).si()),
        }
    }
}

impl std::fmt::Display for DropSize {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            DropSize::Auto => f.write_str("Auto"),
            DropSize::mm(v) => write!(f, "mm({v})"),
            DropSize::um(v) => write!(f, "um({v})"),
            DropSize::r#in(v) => write!(f, "in({v})"),
        }
    }
}

/// A spread exponent, or `Auto`.
#[derive(Debug, Clone, Copy, PartialEq, Default, Serialize, Deserialize)]
#[serde(
    untagged,
    expecting = "expected `Auto` or a bare number such as 2.5 (the spread has no unit)"
)]
pub enum Spread {
    /// From the published relation.
    #[default]
    #[serde(with = "auto_word")]
    Auto,
    /// The Rosin–Rammler exponent n.
    Value(f64),
}

/// Head layout (model.md M9).
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum Layout {
    /// Square grid.
    Square {
        /// Head spacing.
        spacing: Length,
    },
    /// Heads `spacing` apart along rows `rows` apart.
    Rectangle {
        /// Head spacing along a row.
        spacing: Length,
        /// Row spacing.
        rows: Length,
    },
    /// Equilateral triangles.
    Triangle {
        /// Head spacing along a row.
        spacing: Length,
    },
}

/// Wind over the site.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields, default)]
pub struct Wind {
    /// Wind speed (default `m_s(0)`).
    pub speed: Speed,
    /// Direction it blows from, counter-clockwise from +x (default `deg(0)`).
    pub from: Angle,
}

impl Default for Wind {
    fn default() -> Self {
        Wind {
            speed: Speed::m_s(0.0),
            from: Angle::deg(0.0),
        }
    }
}

/// An optional field written as its bare value (`length: mm(170)`), not
/// `Some(mm(170))`; a missing field is `None` through `#[serde(default)]`.
pub(crate) mod implicit_some {
    use serde::{Deserialize, Deserializer, Serialize, Serializer};

    pub fn serialize<S: Serializer, T: Serialize>(
        value: &Option<T>,
        serializer: S,
    ) -> Result<S::Ok, S::Error> {
        match value {
            Some(v) => v.serialize(serializer),
            None => serializer.serialize_none(),
        }
    }

    pub fn deserialize<'de, D: Deserializer<'de>, T: Deserialize<'de>>(
        deserializer: D,
    ) -> Result<Option<T>, D::Error> {
        T::deserialize(deserializer).map(Some)
    }
}

/// The bare word `Auto` inside an untagged enum.
mod auto_word {
    use serde::{Deserialize, Deserializer, Serializer};

    #[derive(Deserialize)]
    enum Word {
        Auto,
    }

    pub fn serialize<S: Serializer>(serializer: S) -> Result<S::Ok, S::Error> {
        serializer.serialize_unit_variant("Spread", 0, "Auto")
    }

    pub fn deserialize<'de, D: Deserializer<'de>>(deserializer: D) -> Result<(), D::Error> {
        Word::deserialize(deserializer).map(|Word::Auto| ())
    }
}
