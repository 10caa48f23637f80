//! Unit tags: the `mm(160)`, `kPa(280)`, `deg(22)` wrappers every dimensional
//! value in a scenario file carries, one enum per dimension.
//!
//! A tag says how the number was written; [`Length::si`] and its siblings turn
//! it into SI once, at load (temperatures into °C, as the design keeps them).
//! The conversion factors are the exact ones in [`crate::units::factor`].
//! Going the other way, `with_si` keeps a tag's unit and puts an SI value in
//! it, which is how a design is written back in metric or US units.

use std::fmt;

use serde::{Deserialize, Serialize};

use std::f64::consts::PI;

use crate::units::factor::*;
use crate::units::UnitSystem;

/// Each tag's conversion is `si = (number − zero) · num / den` with exact
/// `num` or `den`, so round numbers convert exactly (`F(122)` is 50 °C).
///
/// Rounds to 12 significant figures, so a value converted out of SI is written
/// as `2.4`, not `2.4000000000000004`. The relative change is at most 5·10⁻¹².
pub(crate) fn tidy(x: f64) -> f64 {
    if !x.is_finite() || x == 0.0 {
        return x;
    }
    format!("{x:.11e}").parse().unwrap_or(x)
}

macro_rules! unit_tag {
    (
        $(#[$meta:meta])*
        $name:ident {
            $( $(#[$vmeta:meta])* $variant:ident => $num:expr, $den:expr, $zero:expr; )+
        }
    ) => {
        $(#[$meta])*
        #[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
        #[allow(non_camel_case_types)]
        pub enum $name {
            $( $(#[$vmeta])* $variant(f64), )+
        }

        impl $name {
            /// Every tag this dimension accepts, as written in a file.
            pub const TAGS: &'static [&'static str] = &[
                $( unraw(stringify!($variant)), )+
            ];

            /// The value in SI units (°C for temperatures).
            pub fn si(self) -> f64 {
                match self {
                    $( $name::$variant(v) => (v - $zero) * $num / $den, )+
                }
            }

            /// The number as written, without its unit.
            pub fn number(self) -> f64 {
                match self {
                    $( $name::$variant(v) => v, )+
                }
            }

            /// The unit tag as written in a file (`mm`, `kPa`).
            pub fn tag(self) -> &'static str {
                match self {
                    $( $name::$variant(_) => unraw(stringify!($variant)), )+
                }
            }

            /// The value `number` written with the tag `tag` (`"mm"`, `"in"`),
            /// or None when this dimension has no such tag.
            pub fn from_tag(tag: &str, number: f64) -> Option<Self> {
                $( if tag == unraw(stringify!($variant)) {
                    return Some($name::$variant(number));
                } )+
                None
            }

            /// The same unit as `self`, holding the SI value `si` (rounded to
            /// 12 significant figures so it reads cleanly in a file).
            pub fn with_si(self, si: f64) -> Self {
                match self {
                    $( $name::$variant(_) => $name::$variant(tidy(si * $den / $num + $zero)), )+
                }
            }
        }

        impl fmt::Display for $name {
            fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
                write!(f, "{}({})", self.tag(), self.number())
            }
        }
    };
}

/// `stringify!(r#in)` is `"r#in"`; the file and serde say `in`.
const fn unraw(s: &'static str) -> &'static str {
    match s.as_bytes() {
        [b'r', b'#', rest @ ..] => match std::str::from_utf8(rest) {
            Ok(t) => t,
            Err(_) => s,
        },
        _ => s,
    }
}

unit_tag! {
    /// A length: `mm(160)`, `cm(16)`, `m(9)`, `in(6.5)`, `ft(30)`.
    Length {
        /// Millimetres.
        mm => 1.0, 1.0e3, 0.0;
        /// Centimetres.
        cm => 1.0, 1.0e2, 0.0;
        /// Metres.
        m => 1.0, 1.0, 0.0;
        /// International inches (0.0254 m).
        r#in => INCH_M, 1.0, 0.0;
        /// International feet (0.3048 m).
        ft => FOOT_M, 1.0, 0.0;
    }
}

unit_tag! {
    /// A gauge pressure: `kPa(280)`, `bar(2.8)`, `MPa(0.28)`, `psi(40)`.
    Pressure {
        /// Kilopascals.
        kPa => 1.0e3, 1.0, 0.0;
        /// Bar (100 kPa).
        bar => BAR_PA, 1.0, 0.0;
        /// Megapascals.
        MPa => 1.0e6, 1.0, 0.0;
        /// Pounds-force per square inch.
        psi => PSI_PA, 1.0, 0.0;
    }
}

unit_tag! {
    /// A volumetric flow: `L_min(12)`, `L_s(0.2)`, `m3_h(0.7)`, `gpm(3.2)`.
    FlowRate {
        /// Litres per minute.
        L_min => 1.0, 60.0e3, 0.0;
        /// Litres per second.
        L_s => 1.0, 1.0e3, 0.0;
        /// Cubic metres per hour.
        m3_h => 1.0, 3600.0, 0.0;
        /// US gallons per minute.
        gpm => US_GALLON_M3, 60.0, 0.0;
    }
}

unit_tag! {
    /// An angle: `deg(22)`, `rad(0.38)`.
    Angle {
        /// Degrees.
        deg => PI, 180.0, 0.0;
        /// Radians.
        rad => 1.0, 1.0, 0.0;
    }
}

unit_tag! {
    /// A temperature: `C(18)`, `F(65)`.
    Temperature {
        /// Degrees Celsius.
        C => 1.0, 1.0, 0.0;
        /// Degrees Fahrenheit.
        F => 1.0, 1.8, 32.0;
    }
}

unit_tag! {
    /// A torque: `N_m(0.02)`, `lbf_in(0.18)`, `lbf_ft(0.015)`.
    Torque {
        /// Newton metres.
        N_m => 1.0, 1.0, 0.0;
        /// Pound-force inches.
        lbf_in => LBF_IN_N_M, 1.0, 0.0;
        /// Pound-force feet.
        lbf_ft => LBF_FT_N_M, 1.0, 0.0;
    }
}

unit_tag! {
    /// A mass: `g(180)`, `kg(0.2)`, `oz(6)`, `lb(0.4)`.
    Mass {
        /// Grams.
        g => 1.0, 1.0e3, 0.0;
        /// Kilograms.
        kg => 1.0, 1.0, 0.0;
        /// Avoirdupois ounces.
        oz => OUNCE_KG, 1.0, 0.0;
        /// Avoirdupois pounds.
        lb => POUND_KG, 1.0, 0.0;
    }
}

unit_tag! {
    /// An area: `mm2(110)`, `cm2(1.1)`, `in2(0.17)`.
    Area {
        /// Square millimetres.
        mm2 => 1.0, 1.0e6, 0.0;
        /// Square centimetres.
        cm2 => 1.0, 1.0e4, 0.0;
        /// Square inches.
        in2 => INCH_M * INCH_M, 1.0, 0.0;
    }
}

unit_tag! {
    /// A speed: `m_s(2)`, `km_h(7)`, `mph(4)`, `ft_s(6)`.
    Speed {
        /// Metres per second.
        m_s => 1.0, 1.0, 0.0;
        /// Kilometres per hour.
        km_h => 1.0, 3.6, 0.0;
        /// Miles per hour.
        mph => MPH_M_S, 1.0, 0.0;
        /// Feet per second.
        ft_s => FOOT_M, 1.0, 0.0;
    }
}

unit_tag! {
    /// A mass moment of inertia: `kg_m2(0.0012)`, `lb_in2(4.1)`.
    MomentOfInertia {
        /// Kilogram square metres.
        kg_m2 => 1.0, 1.0, 0.0;
        /// Pound square inches.
        lb_in2 => LB_IN2_KG_M2, 1.0, 0.0;
    }
}

unit_tag! {
    /// A density: `kg_m3(8500)`, `g_cm3(8.5)`, `lb_ft3(530)`.
    Density {
        /// Kilograms per cubic metre.
        kg_m3 => 1.0, 1.0, 0.0;
        /// Grams per cubic centimetre.
        g_cm3 => 1.0e3, 1.0, 0.0;
        /// Pounds per cubic foot.
        lb_ft3 => LB_FT3_KG_M3, 1.0, 0.0;
    }
}

/// Which tags a design written back in one unit system uses.
impl Length {
    /// Short lengths (nozzles, bores, arm radii): mm or in.
    pub fn small(si_m: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Length::mm(0.0),
            UnitSystem::Us => Length::r#in(0.0),
        }
        .with_si(si_m)
    }

    /// Long lengths (hoses, spacing, altitude): m or ft.
    pub fn large(si_m: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Length::m(0.0),
            UnitSystem::Us => Length::ft(0.0),
        }
        .with_si(si_m)
    }
}

impl Pressure {
    /// kPa or psi.
    pub fn in_system(si_pa: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Pressure::kPa(0.0),
            UnitSystem::Us => Pressure::psi(0.0),
        }
        .with_si(si_pa)
    }
}

impl FlowRate {
    /// L/min or gpm.
    pub fn in_system(si_m3_s: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => FlowRate::L_min(0.0),
            UnitSystem::Us => FlowRate::gpm(0.0),
        }
        .with_si(si_m3_s)
    }
}

impl Angle {
    /// Degrees in both systems.
    pub fn in_system(si_rad: f64, _system: UnitSystem) -> Self {
        Angle::deg(0.0).with_si(si_rad)
    }
}

impl Temperature {
    /// °C or °F.
    pub fn in_system(celsius: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Temperature::C(0.0),
            UnitSystem::Us => Temperature::F(0.0),
        }
        .with_si(celsius)
    }
}

impl Torque {
    /// N·m or lbf·in.
    pub fn in_system(si_n_m: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Torque::N_m(0.0),
            UnitSystem::Us => Torque::lbf_in(0.0),
        }
        .with_si(si_n_m)
    }
}

impl Mass {
    /// Small masses (nozzle bodies): g or oz.
    pub fn small(si_kg: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Mass::g(0.0),
            UnitSystem::Us => Mass::oz(0.0),
        }
        .with_si(si_kg)
    }

    /// A whole rotor: g or lb.
    pub fn rotor(si_kg: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Mass::g(0.0),
            UnitSystem::Us => Mass::lb(0.0),
        }
        .with_si(si_kg)
    }
}

impl Area {
    /// mm² or in².
    pub fn in_system(si_m2: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Area::mm2(0.0),
            UnitSystem::Us => Area::in2(0.0),
        }
        .with_si(si_m2)
    }
}

impl Speed {
    /// Wind: m/s or mph.
    pub fn wind(si_m_s: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Speed::m_s(0.0),
            UnitSystem::Us => Speed::mph(0.0),
        }
        .with_si(si_m_s)
    }
}

impl MomentOfInertia {
    /// kg·m² or lb·in².
    pub fn in_system(si_kg_m2: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => MomentOfInertia::kg_m2(0.0),
            UnitSystem::Us => MomentOfInertia::lb_in2(0.0),
        }
        .with_si(si_kg_m2)
    }
}

impl Density {
    /// kg/m³ or lb/ft³.
    pub fn in_system(si_kg_m3: f64, system: UnitSystem) -> Self {
        match system {
            UnitSystem::Metric => Density::kg_m3(0.0),
            UnitSystem::Us => Density::lb_ft3(0.0),
        }
        .with_si(si_kg_m3)
    }
}

/// The serde names of the unit-tag enums and their tags, for error messages:
/// (enum name, what it measures, tags).
pub(crate) const TAG_ENUMS: &[(&str, &str, &[&str])] = &[
    ("Length", "a length", Length::TAGS),
    ("Pressure", "a pressure", Pressure::TAGS),
    ("FlowRate", "a flow", FlowRate::TAGS),
    ("Angle", "an angle", Angle::TAGS),
    ("Temperature", "a temperature", Temperature::TAGS),
    ("Torque", "a torque", Torque::TAGS),
    ("Mass", "a mass", Mass::TAGS),
    ("Area", "an area", Area::TAGS),
    ("Speed", "a speed", Speed::TAGS),
    (
        "MomentOfInertia",
        "a moment of inertia",
        MomentOfInertia::TAGS,
    ),
    ("Density", "a density", Density::TAGS),
];

/// Whether `name` is one of the unit tags (for tidying serde paths).
pub(crate) fn is_unit_tag(name: &str) -> bool {
    TAG_ENUMS.iter().any(|(_, _, tags)| tags.contains(&name))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::{parse_quantity, Dimension};

    #[test]
    fn tags_agree_with_the_unit_parser() {
        // Each tag means what the same unit typed on the command line means.
        let cases: &[(f64, f64, Dimension, &str)] = &[
            (Length::r#in(6.5).si(), 0.0, Dimension::Length, "6.5in"),
            (Length::ft(30.0).si(), 0.0, Dimension::Length, "30ft"),
            (Length::mm(160.0).si(), 0.0, Dimension::Length, "160mm"),
            (Pressure::psi(40.0).si(), 0.0, Dimension::Pressure, "40psi"),
            (Pressure::bar(2.8).si(), 0.0, Dimension::Pressure, "2.8bar"),
            (FlowRate::gpm(3.2).si(), 0.0, Dimension::Flow, "3.2gpm"),
            (FlowRate::m3_h(0.7).si(), 0.0, Dimension::Flow, "0.7m3/h"),
            (
                Temperature::F(65.0).si(),
                0.0,
                Dimension::Temperature,
                "65F",
            ),
            (
                Torque::lbf_in(0.18).si(),
                0.0,
                Dimension::Torque,
                "0.18lbf·in",
            ),
            (Mass::lb(0.4).si(), 0.0, Dimension::Mass, "0.4lb"),
            (Area::in2(0.17).si(), 0.0, Dimension::Area, "0.17in2"),
            (Speed::mph(4.0).si(), 0.0, Dimension::Speed, "4mph"),
            (
                MomentOfInertia::lb_in2(4.0).si(),
                0.0,
                Dimension::Inertia,
                "4lb·in2",
            ),
            (
                Density::lb_ft3(530.0).si(),
                0.0,
                Dimension::Density,
                "530lb/ft3",
            ),
        ];
        for &(si, _, dim, text) in cases {
            let parsed = parse_quantity(dim, text).unwrap();
            assert!((si - parsed).abs() <= 1e-15 * si.abs(), "{text}");
        }
    }

    #[test]
    fn known_values() {
        // 65 °F = 18.333… °C; 32 °F = 0 °C; 212 °F = 100 °C (definition of the scale).
        assert!((Temperature::F(65.0).si() - 18.333_333_333_333_33).abs() < 1e-12);
        assert!(Temperature::F(32.0).si().abs() < 1e-12);
        assert!((Temperature::F(212.0).si() - 100.0).abs() < 1e-12);
        // 40 psi = 275.79 kPa (NIST SP 811 factor 6.894 757 kPa/psi).
        assert!((Pressure::psi(40.0).si() - 275_790.29).abs() < 0.01);
        // Round values convert exactly, so range limits hold exactly.
        assert_eq!(Temperature::F(122.0).si(), 50.0);
        assert_eq!(Temperature::F(32.0).si(), 0.0);
        assert_eq!(Length::mm(2.4).si(), 0.0024);
        assert_eq!(Angle::deg(90.0).si(), std::f64::consts::FRAC_PI_2);
        assert_eq!(FlowRate::L_min(12.0).si(), 0.0002);
        assert_eq!(Length::r#in(1.0).tag(), "in");
        assert_eq!(Length::r#in(6.5).to_string(), "in(6.5)");
        assert_eq!(Length::TAGS, &["mm", "cm", "m", "in", "ft"]);
    }

    #[test]
    fn with_si_round_trips_and_reads_cleanly() {
        assert_eq!(Length::small(0.0024, UnitSystem::Metric), Length::mm(2.4));
        assert_eq!(
            Length::small(0.0254 * 6.5, UnitSystem::Us),
            Length::r#in(6.5)
        );
        assert_eq!(
            Temperature::in_system(20.0, UnitSystem::Us),
            Temperature::F(68.0)
        );
        assert_eq!(
            Pressure::in_system(280e3, UnitSystem::Metric),
            Pressure::kPa(280.0)
        );
        for x in [1e-7, 0.0015e-3, 0.123_456_789_012_345, 3.0e5, 8500.0] {
            let t = Pressure::psi(0.0).with_si(x);
            assert!((t.si() - x).abs() <= 5e-12 * x, "{x}");
        }
    }

    #[test]
    fn tags_serialize_as_written() {
        let text = ron::to_string(&Length::r#in(6.5)).unwrap();
        assert_eq!(text, "in(6.5)");
        let back: Length = ron::from_str("in(6.5)").unwrap();
        assert_eq!(back, Length::r#in(6.5));
        let back: Temperature = ron::from_str("F(65)").unwrap();
        assert_eq!(back, Temperature::F(65.0));
    }
}
