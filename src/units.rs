//! Units at the edges: reading quantities typed with a unit, and showing SI
//! values in the unit a practitioner expects.
//!
//! The physics core works in SI only (m, s, kg, Pa, rad; temperatures in °C,
//! as [`crate::physics::design::Design`] keeps them). Everything a person
//! types — a command-line argument such as `2.8bar`, a value entered in the
//! terminal interface — goes through [`parse_quantity`] once, and everything
//! shown goes through [`format_quantity`] or [`to_display`] once.
//!
//! Conversion factors are the exact definitions behind NIST SP 811 (2008),
//! Appendix B: the international inch (0.0254 m) and foot (0.3048 m), the
//! avoirdupois pound (0.453 592 37 kg), the pound-force (pound × standard
//! gravity 9.806 65 m/s²), the US liquid gallon (231 in³), the bar (10⁵ Pa)
//! and the degree Fahrenheit (t/°C = (t/°F − 32)/1.8). Derived factors (psi,
//! lbf·in, lb·in², lb/ft³) are computed from those, so they carry no rounding
//! beyond the last bit of a double.

use std::f64::consts::PI;
use std::fmt;

use crate::physics::design::GRAVITY_M_S2;

/// Exact conversion factors to SI (NIST SP 811, Appendix B definitions).
pub mod factor {
    use super::{GRAVITY_M_S2, PI};

    /// One international inch in metres (exact).
    pub const INCH_M: f64 = 0.0254;
    /// One international foot in metres (exact).
    pub const FOOT_M: f64 = 0.3048;
    /// One statute mile in metres (exact).
    pub const MILE_M: f64 = 1609.344;
    /// One avoirdupois pound in kilograms (exact).
    pub const POUND_KG: f64 = 0.453_592_37;
    /// One avoirdupois ounce in kilograms (a sixteenth of a pound, exact).
    pub const OUNCE_KG: f64 = POUND_KG / 16.0;
    /// One pound-force in newtons: pound × standard gravity (exact, 4.448 221 615 260 5 N).
    pub const POUND_FORCE_N: f64 = POUND_KG * GRAVITY_M_S2;
    /// One pound-force per square inch in pascals (≈ 6 894.757 Pa).
    pub const PSI_PA: f64 = POUND_FORCE_N / (INCH_M * INCH_M);
    /// One bar in pascals (exact).
    pub const BAR_PA: f64 = 1.0e5;
    /// One litre in cubic metres (exact).
    pub const LITRE_M3: f64 = 1.0e-3;
    /// One US liquid gallon (231 in³) in cubic metres (exact, 3.785 411 784 × 10⁻³ m³).
    pub const US_GALLON_M3: f64 = 231.0 * INCH_M * INCH_M * INCH_M;
    /// One mile per hour in metres per second (exact, 0.447 04).
    pub const MPH_M_S: f64 = MILE_M / 3600.0;
    /// One pound-force inch in newton metres (≈ 0.112 984 8 N·m).
    pub const LBF_IN_N_M: f64 = POUND_FORCE_N * INCH_M;
    /// One pound-force foot in newton metres (≈ 1.355 818 N·m).
    pub const LBF_FT_N_M: f64 = POUND_FORCE_N * FOOT_M;
    /// One pound square inch (lb·in²) in kg·m² (≈ 2.926 397 × 10⁻⁴).
    pub const LB_IN2_KG_M2: f64 = POUND_KG * INCH_M * INCH_M;
    /// One pound per cubic foot in kg/m³ (≈ 16.018 46).
    pub const LB_FT3_KG_M3: f64 = POUND_KG / (FOOT_M * FOOT_M * FOOT_M);
    /// One degree of angle in radians.
    pub const DEGREE_RAD: f64 = PI / 180.0;
    /// One revolution per minute in radians per second.
    pub const RPM_RAD_S: f64 = 2.0 * PI / 60.0;
    /// Size of one degree Fahrenheit in kelvin (exact: 1/1.8).
    pub const FAHRENHEIT_STEP_K: f64 = 1.0 / 1.8;
}

use factor::*;

/// Which unit system values are shown in.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Default)]
pub enum UnitSystem {
    /// SI-based units a practitioner uses: mm, m, kPa, L/min, °C, N·m.
    #[default]
    Metric,
    /// US customary units: in, ft, psi, gpm, °F, lbf·in.
    Us,
}

impl UnitSystem {
    /// The other system (for a metric/US toggle).
    pub fn toggled(self) -> Self {
        match self {
            UnitSystem::Metric => UnitSystem::Us,
            UnitSystem::Us => UnitSystem::Metric,
        }
    }
}

impl fmt::Display for UnitSystem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            UnitSystem::Metric => "metric",
            UnitSystem::Us => "us",
        })
    }
}

/// The physical dimension of a quantity, which fixes its SI unit and the units
/// accepted and shown for it.
///
/// Lengths come in two kinds because a practitioner reads them differently: a
/// nozzle or arm radius in millimetres or inches ([`Dimension::SmallLength`]),
/// a throw, hose or head spacing in metres or feet ([`Dimension::Length`]).
/// Both accept every length unit when parsing.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Dimension {
    /// A long length, SI m; shown in m or ft (throw, spacing, hose length).
    Length,
    /// A short length, SI m; shown in mm or in (nozzle, bore, arm radius).
    SmallLength,
    /// Gauge pressure, SI Pa; shown in kPa or psi.
    Pressure,
    /// Volumetric flow, SI m³/s; shown in L/min or gpm.
    Flow,
    /// Plane angle, SI rad; shown in degrees.
    Angle,
    /// Temperature, kept in °C (as the design does); shown in °C or °F.
    Temperature,
    /// Torque, SI N·m; shown in N·m or lbf·in.
    Torque,
    /// Mass, SI kg; shown in g or oz.
    Mass,
    /// Area, SI m²; shown in mm² or in².
    Area,
    /// Speed, SI m/s; shown in m/s or ft/s.
    Speed,
    /// Mass moment of inertia, SI kg·m²; shown in kg·m² or lb·in².
    Inertia,
    /// Density, SI kg/m³; shown in kg/m³ or lb/ft³.
    Density,
    /// Time, SI s; shown in s.
    Time,
    /// Volume, SI m³; shown in L or gal (catch volumes).
    Volume,
    /// Rotation speed, SI rad/s; shown in rpm.
    AngularSpeed,
    /// Application (precipitation) rate, SI m/s; shown in mm/h or in/h.
    ApplicationRate,
}

impl Dimension {
    /// Every dimension, for iteration in tests and help texts.
    pub const ALL: [Dimension; 16] = [
        Dimension::Length,
        Dimension::SmallLength,
        Dimension::Pressure,
        Dimension::Flow,
        Dimension::Angle,
        Dimension::Temperature,
        Dimension::Torque,
        Dimension::Mass,
        Dimension::Area,
        Dimension::Speed,
        Dimension::Inertia,
        Dimension::Density,
        Dimension::Time,
        Dimension::Volume,
        Dimension::AngularSpeed,
        Dimension::ApplicationRate,
    ];

    /// A plain-word name ("pressure", "flow") for messages.
    pub fn name(self) -> &'static str {
        match self {
            Dimension::Length | Dimension::SmallLength => "length",
            Dimension::Pressure => "pressure",
            Dimension::Flow => "flow",
            Dimension::Angle => "angle",
            Dimension::Temperature => "temperature",
            Dimension::Torque => "torque",
            Dimension::Mass => "mass",
            Dimension::Area => "area",
            Dimension::Speed => "speed",
            Dimension::Inertia => "moment of inertia",
            Dimension::Density => "density",
            Dimension::Time => "time",
            Dimension::Volume => "volume",
            Dimension::AngularSpeed => "rotation speed",
            Dimension::ApplicationRate => "application rate",
        }
    }

    /// A typical value with its unit, for help in messages (`2.8bar`).
    pub fn example(self) -> &'static str {
        match self {
            Dimension::Length => "7.5m",
            Dimension::SmallLength => "160mm",
            Dimension::Pressure => "2.8bar",
            Dimension::Flow => "12L/min",
            Dimension::Angle => "22deg",
            Dimension::Temperature => "18C",
            Dimension::Torque => "0.02N·m",
            Dimension::Mass => "180g",
            Dimension::Area => "110mm2",
            Dimension::Speed => "2m/s",
            Dimension::Inertia => "0.0012kg·m2",
            Dimension::Density => "8500kg/m3",
            Dimension::Time => "14.2s",
            Dimension::Volume => "5L",
            Dimension::AngularSpeed => "30rpm",
            Dimension::ApplicationRate => "12mm/h",
        }
    }

    /// The units accepted for this dimension, as they are usually written.
    pub fn accepted_units(self) -> Vec<&'static str> {
        units_of(self)
            .filter_map(|u| u.aliases.first().copied())
            .collect()
    }

    fn family(self) -> Dimension {
        match self {
            Dimension::SmallLength => Dimension::Length,
            other => other,
        }
    }
}

impl fmt::Display for Dimension {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// A unit: how to write it, how to read it, and how to reach SI.
///
/// `si = (value − zero) · num / den`: multiplying by an exact `num` or dividing
/// by an exact `den` keeps round values exact (`mm(2.4)` is 0.0024 m, not
/// 0.002 400 000 000 000 000 2; 122 °F is 50 °C, not 50.000 000 000 000 01).
struct UnitDef {
    dim: Dimension,
    /// Label shown after a number.
    label: &'static str,
    /// Spellings accepted when parsing, already in canonical form (see
    /// [`canonical_unit`]); the first is the one listed in messages.
    aliases: &'static [&'static str],
    num: f64,
    den: f64,
    zero: f64,
}

const fn unit(
    dim: Dimension,
    label: &'static str,
    aliases: &'static [&'static str],
    num: f64,
) -> UnitDef {
    UnitDef {
        dim,
        label,
        aliases,
        num,
        den: 1.0,
        zero: 0.0,
    }
}

/// A unit that is an exact fraction of the SI unit: `si = value / den`.
const fn unit_div(
    dim: Dimension,
    label: &'static str,
    aliases: &'static [&'static str],
    den: f64,
) -> UnitDef {
    unit_ratio(dim, label, aliases, 1.0, den)
}

/// A unit that is `num / den` SI units.
const fn unit_ratio(
    dim: Dimension,
    label: &'static str,
    aliases: &'static [&'static str],
    num: f64,
    den: f64,
) -> UnitDef {
    UnitDef {
        dim,
        label,
        aliases,
        num,
        den,
        zero: 0.0,
    }
}

use Dimension as D;

/// Every unit known to the parser; the first unit of each dimension in this
/// table is not special, display units are chosen in [`display_unit`].
static UNITS: &[UnitDef] = &[
    // Length
    unit(D::Length, "m", &["m"], 1.0),
    unit_div(D::Length, "mm", &["mm"], 1.0e3),
    unit_div(D::Length, "cm", &["cm"], 1.0e2),
    unit(D::Length, "km", &["km"], 1.0e3),
    unit(D::Length, "in", &["in", "inch", "inches", "\""], INCH_M),
    unit(D::Length, "ft", &["ft", "foot", "feet", "'"], FOOT_M),
    unit(D::Length, "yd", &["yd"], 3.0 * FOOT_M),
    // Pressure
    unit(D::Pressure, "kPa", &["kPa"], 1.0e3),
    unit(D::Pressure, "bar", &["bar"], BAR_PA),
    unit(D::Pressure, "psi", &["psi", "lbf/in2"], PSI_PA),
    unit(D::Pressure, "MPa", &["MPa"], 1.0e6),
    unit(D::Pressure, "Pa", &["Pa"], 1.0),
    // Flow
    unit_div(
        D::Flow,
        "L/min",
        &["L/min", "l/min", "lpm", "Lpm", "L_min"],
        60.0e3,
    ),
    unit_div(D::Flow, "L/s", &["L/s", "l/s", "L_s"], 1.0e3),
    unit_div(D::Flow, "m³/h", &["m3/h", "m3_h"], 3600.0),
    unit(D::Flow, "m³/s", &["m3/s"], 1.0),
    unit_ratio(
        D::Flow,
        "gpm",
        &["gpm", "gal/min", "GPM"],
        US_GALLON_M3,
        60.0,
    ),
    // Angle
    unit_ratio(D::Angle, "°", &["deg", "°", "degree", "degrees"], PI, 180.0),
    unit(D::Angle, "rad", &["rad"], 1.0),
    // Temperature (SI here is °C, as in the design)
    unit(D::Temperature, "°C", &["C", "°C", "degC"], 1.0),
    UnitDef {
        dim: D::Temperature,
        label: "°F",
        aliases: &["F", "°F", "degF"],
        num: 1.0,
        den: 1.8,
        zero: 32.0,
    },
    UnitDef {
        dim: D::Temperature,
        label: "K",
        aliases: &["K"],
        num: 1.0,
        den: 1.0,
        zero: 273.15,
    },
    // Torque
    unit(D::Torque, "N·m", &["Nm", "N_m"], 1.0),
    unit_div(D::Torque, "N·mm", &["Nmm"], 1.0e3),
    unit(
        D::Torque,
        "lbf·in",
        &["lbfin", "inlbf", "inlb", "lbf_in"],
        LBF_IN_N_M,
    ),
    unit(
        D::Torque,
        "lbf·ft",
        &["lbfft", "ftlbf", "ftlb", "lbf_ft"],
        LBF_FT_N_M,
    ),
    // Mass
    unit_div(D::Mass, "g", &["g"], 1.0e3),
    unit(D::Mass, "kg", &["kg"], 1.0),
    unit(D::Mass, "oz", &["oz"], OUNCE_KG),
    unit(D::Mass, "lb", &["lb", "lbs"], POUND_KG),
    // Area
    unit_div(D::Area, "mm²", &["mm2"], 1.0e6),
    unit_div(D::Area, "cm²", &["cm2"], 1.0e4),
    unit(D::Area, "m²", &["m2"], 1.0),
    unit(D::Area, "in²", &["in2", "sqin"], INCH_M * INCH_M),
    // Speed
    unit(D::Speed, "m/s", &["m/s", "m_s"], 1.0),
    unit_div(D::Speed, "km/h", &["km/h", "kph", "km_h"], 3.6),
    unit(D::Speed, "ft/s", &["ft/s", "fps", "ft_s"], FOOT_M),
    unit(D::Speed, "mph", &["mph", "mi/h"], MPH_M_S),
    // Inertia
    unit(D::Inertia, "kg·m²", &["kgm2", "kg_m2"], 1.0),
    unit_div(D::Inertia, "g·cm²", &["gcm2", "g_cm2"], 1.0e7),
    unit(D::Inertia, "lb·in²", &["lbin2", "lb_in2"], LB_IN2_KG_M2),
    // Density
    unit(D::Density, "kg/m³", &["kg/m3", "kg_m3"], 1.0),
    unit(D::Density, "g/cm³", &["g/cm3", "g_cm3"], 1.0e3),
    unit(D::Density, "lb/ft³", &["lb/ft3", "lb_ft3"], LB_FT3_KG_M3),
    // Time
    unit(D::Time, "s", &["s", "sec"], 1.0),
    unit(D::Time, "min", &["min"], 60.0),
    unit(D::Time, "h", &["h", "hr"], 3600.0),
    // Volume
    unit_div(D::Volume, "L", &["L", "l"], 1.0e3),
    unit_div(D::Volume, "mL", &["mL", "ml"], 1.0e6),
    unit(D::Volume, "m³", &["m3"], 1.0),
    unit(D::Volume, "gal", &["gal"], US_GALLON_M3),
    // Rotation speed
    unit_ratio(
        D::AngularSpeed,
        "rpm",
        &["rpm", "rev/min", "r/min"],
        2.0 * PI,
        60.0,
    ),
    unit(D::AngularSpeed, "rad/s", &["rad/s"], 1.0),
    // Application rate
    unit_div(D::ApplicationRate, "mm/h", &["mm/h", "mm/hr"], 3.6e6),
    unit_ratio(
        D::ApplicationRate,
        "in/h",
        &["in/h", "in/hr"],
        INCH_M,
        3600.0,
    ),
];

fn units_of(dim: Dimension) -> impl Iterator<Item = &'static UnitDef> {
    let family = dim.family();
    UNITS.iter().filter(move |u| u.dim == family)
}

/// The unit used for display of `dim` in `system`: the one a practitioner reads.
fn display_unit(dim: Dimension, system: UnitSystem) -> &'static UnitDef {
    let label = match (dim, system) {
        (D::Length, UnitSystem::Metric) => "m",
        (D::Length, UnitSystem::Us) => "ft",
        (D::SmallLength, UnitSystem::Metric) => "mm",
        (D::SmallLength, UnitSystem::Us) => "in",
        (D::Pressure, UnitSystem::Metric) => "kPa",
        (D::Pressure, UnitSystem::Us) => "psi",
        (D::Flow, UnitSystem::Metric) => "L/min",
        (D::Flow, UnitSystem::Us) => "gpm",
        (D::Angle, _) => "°",
        (D::Temperature, UnitSystem::Metric) => "°C",
        (D::Temperature, UnitSystem::Us) => "°F",
        (D::Torque, UnitSystem::Metric) => "N·m",
        (D::Torque, UnitSystem::Us) => "lbf·in",
        (D::Mass, UnitSystem::Metric) => "g",
        (D::Mass, UnitSystem::Us) => "oz",
        (D::Area, UnitSystem::Metric) => "mm²",
        (D::Area, UnitSystem::Us) => "in²",
        (D::Speed, UnitSystem::Metric) => "m/s",
        (D::Speed, UnitSystem::Us) => "ft/s",
        (D::Inertia, UnitSystem::Metric) => "kg·m²",
        (D::Inertia, UnitSystem::Us) => "lb·in²",
        (D::Density, UnitSystem::Metric) => "kg/m³",
        (D::Density, UnitSystem::Us) => "lb/ft³",
        (D::Time, _) => "s",
        (D::Volume, UnitSystem::Metric) => "L",
        (D::Volume, UnitSystem::Us) => "gal",
        (D::AngularSpeed, _) => "rpm",
        (D::ApplicationRate, UnitSystem::Metric) => "mm/h",
        (D::ApplicationRate, UnitSystem::Us) => "in/h",
    };
    // Every label above is in the table; the fallback only guards against a
    // future edit that breaks that, and shows SI rather than panicking.
    units_of(dim)
        .find(|u| u.label == label)
        .unwrap_or(&SI_FALLBACK)
}

static SI_FALLBACK: UnitDef = unit(D::Length, "(SI)", &["SI"], 1.0);

/// Why a typed quantity could not be read.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
pub enum UnitError {
    /// Nothing was typed.
    #[error("no value given: expected a {dim} with its unit, e.g. {example}")]
    Empty {
        /// What was expected.
        dim: Dimension,
        /// A typical value with its unit.
        example: &'static str,
    },
    /// The text does not start with a number.
    #[error(
        "`{input}` does not start with a number: expected a {dim} with its unit, e.g. {example}"
    )]
    NotANumber {
        /// The text as typed.
        input: String,
        /// What was expected.
        dim: Dimension,
        /// A typical value with its unit.
        example: &'static str,
    },
    /// A number without a unit.
    #[error("`{input}` has no unit: write the {dim} with one of {accepted} (e.g. {example})")]
    MissingUnit {
        /// The text as typed.
        input: String,
        /// What was expected.
        dim: Dimension,
        /// The accepted units, comma separated.
        accepted: String,
        /// A typical value with its unit.
        example: &'static str,
    },
    /// A unit that is not one of this dimension's.
    #[error("`{unit}` is not a unit of {dim}: use one of {accepted} (e.g. {example})")]
    UnknownUnit {
        /// The unit as typed.
        unit: String,
        /// What was expected.
        dim: Dimension,
        /// The accepted units, comma separated.
        accepted: String,
        /// A typical value with its unit.
        example: &'static str,
    },
    /// A number too large to represent.
    #[error("`{input}` is too large to be a {dim}")]
    NotFinite {
        /// The text as typed.
        input: String,
        /// What was expected.
        dim: Dimension,
    },
}

/// Brings a typed unit to the form the alias table uses: no spaces, no
/// multiplication dots, superscripts as digits, `º` as `°`.
fn canonical_unit(unit: &str) -> String {
    unit.chars()
        .filter(|c| !c.is_whitespace() && !matches!(c, '·' | '⋅' | '*' | '-' | '.' | '^'))
        .map(|c| match c {
            '²' => '2',
            '³' => '3',
            'º' => '°',
            other => other,
        })
        .collect()
}

fn find_unit(dim: Dimension, typed: &str) -> Option<&'static UnitDef> {
    let canon = canonical_unit(typed);
    if let Some(u) = units_of(dim).find(|u| u.aliases.contains(&canon.as_str())) {
        return Some(u);
    }
    // Case-insensitive fallback, only when it is unambiguous in this dimension
    // (`KPA`, `PSI`, `Mph`), never across dimensions.
    let lower = canon.to_lowercase();
    let mut hits = units_of(dim).filter(|u| u.aliases.iter().any(|a| a.to_lowercase() == lower));
    match (hits.next(), hits.next()) {
        (Some(u), None) => Some(u),
        _ => None,
    }
}

/// Splits `"2.8 bar"` into the number's text and the rest.
fn split_number(s: &str) -> (&str, &str) {
    let bytes = s.as_bytes();
    let mut i = 0;
    if matches!(bytes.first(), Some(b'+' | b'-')) {
        i = 1;
    }
    let mut digits = 0;
    while let Some(b) = bytes.get(i) {
        if b.is_ascii_digit() {
            digits += 1;
            i += 1;
        } else if *b == b'.' {
            i += 1;
        } else {
            break;
        }
    }
    if digits == 0 {
        return ("", s);
    }
    // Exponent only when digits follow: `2e5Pa` yes, `2 e` never arises.
    if matches!(bytes.get(i), Some(b'e' | b'E')) {
        let mut j = i + 1;
        if matches!(bytes.get(j), Some(b'+' | b'-')) {
            j += 1;
        }
        if bytes.get(j).is_some_and(u8::is_ascii_digit) {
            while bytes.get(j).is_some_and(u8::is_ascii_digit) {
                j += 1;
            }
            i = j;
        }
    }
    // `i` only ever advanced over ASCII bytes, so it is a char boundary.
    s.split_at(i)
}

/// Reads a quantity typed with its unit (`2.8bar`, `40 psi`, `12L/min`,
/// `0.18lbf·in`) and returns it in SI (°C for temperatures).
///
/// Spaces between number and unit are allowed; the unit must be one of the
/// dimension's ([`Dimension::accepted_units`]). The value's sign and range are
/// not checked here: that is the caller's job, with the caller's field name.
pub fn parse_quantity(dim: Dimension, text: &str) -> Result<f64, UnitError> {
    let input = text.trim();
    if input.is_empty() {
        return Err(UnitError::Empty {
            dim,
            example: dim.example(),
        });
    }
    let (number, rest) = split_number(input);
    let value: f64 = match number.parse() {
        Ok(v) => v,
        Err(_) => {
            return Err(UnitError::NotANumber {
                input: input.to_string(),
                dim,
                example: dim.example(),
            })
        }
    };
    let unit_text = rest.trim();
    let accepted = || dim.accepted_units().join(", ");
    if unit_text.is_empty() {
        return Err(UnitError::MissingUnit {
            input: input.to_string(),
            dim,
            accepted: accepted(),
            example: dim.example(),
        });
    }
    let Some(u) = find_unit(dim, unit_text) else {
        return Err(UnitError::UnknownUnit {
            unit: unit_text.to_string(),
            dim,
            accepted: accepted(),
            example: dim.example(),
        });
    };
    let si = (value - u.zero) * u.num / u.den;
    if !si.is_finite() {
        return Err(UnitError::NotFinite {
            input: input.to_string(),
            dim,
        });
    }
    Ok(si)
}

/// The unit label shown for `dim` in `system` (`"kPa"`, `"gpm"`, `"°"`), for table headers.
pub fn unit_label(dim: Dimension, system: UnitSystem) -> &'static str {
    display_unit(dim, system).label
}

/// The display unit of `dim` in `system` spelt for a CSV column name: ASCII
/// letters, digits and `_` only (`kPa`, `psi`, `L_min`, `gpm`, `N_m`,
/// `lbf_in`, `mm_h`, `deg`, `degC`). Column `pressure_kPa` holds kPa.
pub fn unit_key(dim: Dimension, system: UnitSystem) -> String {
    let mut key = String::new();
    for c in unit_label(dim, system).chars() {
        match c {
            '°' => key.push_str("deg"),
            '/' | '·' => key.push('_'),
            '²' => key.push('2'),
            '³' => key.push('3'),
            c if c.is_ascii_alphanumeric() => key.push(c),
            _ => {}
        }
    }
    key
}

/// A CSV column name: `name` and the unit of its values (`inlet_pressure_psi`).
pub fn csv_key(name: &str, dim: Dimension, system: UnitSystem) -> String {
    format!("{name}_{}", unit_key(dim, system))
}

/// An SI value (°C for temperatures) in the display unit of `dim` in `system`.
pub fn to_display(dim: Dimension, si: f64, system: UnitSystem) -> f64 {
    let u = display_unit(dim, system);
    si * u.den / u.num + u.zero
}

/// The inverse of [`to_display`]: a value in the display unit back to SI.
pub fn from_display(dim: Dimension, shown: f64, system: UnitSystem) -> f64 {
    let u = display_unit(dim, system);
    (shown - u.zero) * u.num / u.den
}

/// A number with a sensible precision for a reading: three significant
/// figures, but never rounding away digits left of the decimal point
/// (`280`, `1250`, `40.6`, `2.80`, `0.0200`); below 10⁻⁴ or from 10⁹ up,
/// e-notation (`2.00e-5`). Non-finite values show as `n/a`.
pub fn format_number(value: f64) -> String {
    if !value.is_finite() {
        return "n/a".to_string();
    }
    if value == 0.0 {
        return "0".to_string();
    }
    let magnitude = value.abs().log10().floor();
    if !(-4.0..9.0).contains(&magnitude) {
        // Far from everyday sizes: three significant figures in e-notation.
        return format!("{value:.2e}");
    }
    let decimals = if magnitude >= 2.0 {
        0
    } else {
        // Three significant figures; capped so tiny values stay readable.
        (2.0 - magnitude).min(12.0) as usize
    };
    let text = format!("{value:.decimals$}");
    // Rounding can carry into a new digit (99.96 → "100.0"); one digit fewer then.
    let rounded: f64 = text.parse().unwrap_or(value);
    if decimals > 0 && rounded.abs().log10().floor() > magnitude {
        let d = decimals - 1;
        return format!("{value:.d$}");
    }
    text
}

/// An SI value (°C for temperatures) as text in the unit a practitioner reads,
/// e.g. `"280 kPa"`, `"40.6 psi"`, `"2.40 mm"`, `"22.0°"`, `"20.0 °C"`.
///
/// Angles and temperatures show one decimal; everything else three
/// significant figures (see [`format_number`]).
pub fn format_quantity(dim: Dimension, si: f64, system: UnitSystem) -> String {
    let u = display_unit(dim, system);
    let shown = to_display(dim, si, system);
    let number = match dim {
        D::Angle | D::Temperature if shown.is_finite() => format!("{shown:.1}"),
        _ => format_number(shown),
    };
    if u.label == "°" {
        format!("{number}°")
    } else {
        format!("{number} {}", u.label)
    }
}

#[cfg(test)]
#[path = "units_tests.rs"]
mod tests;
