//! The scenario as an editable list: which fields there are, how each one is
//! read from and written into a [`Design`], and how far a nudge moves it.
//!
//! Values live in SI in the design; a field knows its [`Dimension`] so the
//! list can show it in the chosen unit system and read typed values with their
//! unit. Nudge steps are given in SI and shown as a round number in the
//! display unit (a 0.1 mm step on a nozzle becomes 0.005 in in US units).
//! Nothing here checks ranges: every candidate design goes through the
//! scenario validation in [`super::app`] before it is kept.

use std::f64::consts::PI;

use crate::physics::design::{Bearing, Design, Inertia, Layout, Line, Supply, Washer, WasherRule};
use crate::units::{self, Dimension as D, UnitSystem};

/// The six groups of the list, in the order they are shown.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Group {
    /// How water reaches the inlet, and the swivel.
    Supply,
    /// The rotor: hub, inertia, and each arm with its nozzle.
    Arms,
    /// Bearing, seal, brake and air drag.
    Friction,
    /// Drop-size spectrum overrides.
    Spray,
    /// Head layout.
    Layout,
    /// Name, water and air, wind.
    Site,
}

impl Group {
    /// The group's heading.
    pub fn title(self) -> &'static str {
        match self {
            Group::Supply => "Supply",
            Group::Arms => "Arms & nozzles",
            Group::Friction => "Friction",
            Group::Spray => "Spray",
            Group::Layout => "Layout",
            Group::Site => "Site",
        }
    }
}

/// A field of one arm.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ArmField {
    /// Nozzle radius from the spin axis.
    Radius,
    /// Azimuth around the hub.
    Azimuth,
    /// Nozzle height above ground.
    Height,
    /// Rise of the arm from the swivel to the nozzle.
    Rise,
    /// Tube bore.
    Bore,
    /// Tube outside diameter.
    Outer,
    /// Tube wall roughness.
    Roughness,
    /// Minor losses along the arm.
    MinorK,
    /// Nozzle exit diameter.
    Diameter,
    /// Jet angle above horizontal.
    Elevation,
    /// Jet angle from the backward tangent.
    Deflection,
    /// Discharge coefficient.
    Cd,
    /// Velocity coefficient.
    Cv,
}

impl ArmField {
    /// Every arm field, in list order (nozzle first: it is what gets tuned).
    pub const ALL: [ArmField; 13] = [
        ArmField::Diameter,
        ArmField::Elevation,
        ArmField::Deflection,
        ArmField::Cd,
        ArmField::Cv,
        ArmField::Radius,
        ArmField::Height,
        ArmField::Azimuth,
        ArmField::Rise,
        ArmField::Bore,
        ArmField::Outer,
        ArmField::Roughness,
        ArmField::MinorK,
    ];
}

/// One editable field.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Field {
    /// Pressure, flow or hose supply.
    SupplyKind,
    /// Inlet gauge pressure (pressure supply).
    InletPressure,
    /// Total flow (flow supply).
    TotalFlow,
    /// Source pressure (hose supply).
    LineSource,
    /// Hose length.
    LineLength,
    /// Hose bore.
    LineBore,
    /// Hose roughness.
    LineRoughness,
    /// Hose minor losses.
    LineMinorK,
    /// Rise from source to inlet.
    LineLift,
    /// Swivel inlet bore.
    SwivelBore,
    /// Swivel loss coefficient.
    SwivelK,
    /// Hub radius (inner end of arm drag).
    HubRadius,
    /// Inertia given or estimated.
    InertiaKind,
    /// Given inertia.
    InertiaGiven,
    /// Tube material density (estimate).
    TubeDensity,
    /// Tube wall (estimate).
    TubeWall,
    /// Tip mass (estimate).
    TipMass,
    /// A field of arm `n` (from 0).
    Arm(usize, ArmField),
    /// Washer or measured bearing.
    BearingKind,
    /// Washer kinetic friction coefficient.
    MuKinetic,
    /// Washer static friction coefficient.
    MuStatic,
    /// Washer inner radius.
    WasherInner,
    /// Washer outer radius.
    WasherOuter,
    /// Area pressure lifts the rotor by.
    ThrustArea,
    /// Rotor mass.
    RotorMass,
    /// Uniform wear or uniform pressure.
    RadiusRule,
    /// Measured running torque.
    Running,
    /// Measured breakaway torque.
    Breakaway,
    /// Seal torque at zero pressure.
    SealBase,
    /// Seal torque per kPa.
    SealPerKpa,
    /// Viscous brake c₁.
    BrakeViscous,
    /// Quadratic brake c₂.
    BrakeQuadratic,
    /// Arm drag coefficient.
    ArmDragCd,
    /// Median drop size (or auto).
    D50,
    /// Spread exponent (or auto).
    Spread,
    /// Largest drop (or auto).
    Largest,
    /// No layout, square, rectangle or triangle.
    LayoutKind,
    /// Head spacing along a row.
    Spacing,
    /// Row spacing (rectangle).
    Rows,
    /// Scenario name.
    Name,
    /// Water temperature.
    WaterTemp,
    /// Air temperature.
    AirTemp,
    /// Altitude.
    Altitude,
    /// Wind speed.
    WindSpeed,
    /// Direction the wind blows from.
    WindFrom,
}

/// A line of the list: a group heading, an arm heading, or a field.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Row {
    /// A group heading.
    Group(Group),
    /// The heading of arm `n` (from 0).
    ArmHeading(usize),
    /// An editable field.
    Field(Field),
}

/// What a field holds, for showing it.
#[derive(Debug, Clone, PartialEq)]
pub enum Value {
    /// A number in SI (°C for temperatures), with its dimension (None: bare number).
    Number(f64, Option<D>),
    /// An optional size or number left to the model (`auto`).
    Auto(Option<D>),
    /// One of a few choices.
    Choice(&'static str),
    /// Free text.
    Text(String),
}

/// How a field is edited.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// A number, nudged and typed.
    Number,
    /// A number that may also be `auto`.
    OptionalNumber,
    /// A choice, cycled with ←/→.
    Choice,
    /// Text, typed.
    Text,
}

/// The rows of the list for a design (which fields exist depends on its choices).
pub fn rows(design: &Design) -> Vec<Row> {
    use Field as F;
    let mut out = vec![Row::Group(Group::Supply), Row::Field(F::SupplyKind)];
    match design.supply {
        Supply::Pressure { .. } => out.push(Row::Field(F::InletPressure)),
        Supply::Flow { .. } => out.push(Row::Field(F::TotalFlow)),
        Supply::Line(_) => out.extend(
            [
                F::LineSource,
                F::LineLength,
                F::LineBore,
                F::LineRoughness,
                F::LineMinorK,
                F::LineLift,
            ]
            .map(Row::Field),
        ),
    }
    out.extend([F::SwivelBore, F::SwivelK].map(Row::Field));

    out.push(Row::Group(Group::Arms));
    out.extend([F::HubRadius, F::InertiaKind].map(Row::Field));
    match design.rotor.inertia {
        Inertia::Given { .. } => out.push(Row::Field(F::InertiaGiven)),
        Inertia::Estimate { .. } => {
            out.extend([F::TubeDensity, F::TubeWall, F::TipMass].map(Row::Field))
        }
    }
    for k in 0..design.rotor.arms.len() {
        out.push(Row::ArmHeading(k));
        out.extend(ArmField::ALL.map(|f| Row::Field(F::Arm(k, f))));
    }

    out.push(Row::Group(Group::Friction));
    out.push(Row::Field(F::BearingKind));
    match design.friction.bearing {
        Bearing::Washer(_) => out.extend(
            [
                F::MuKinetic,
                F::MuStatic,
                F::WasherInner,
                F::WasherOuter,
                F::ThrustArea,
                F::RotorMass,
                F::RadiusRule,
            ]
            .map(Row::Field),
        ),
        Bearing::Measured { .. } => out.extend([F::Running, F::Breakaway].map(Row::Field)),
    }
    out.extend(
        [
            F::SealBase,
            F::SealPerKpa,
            F::BrakeViscous,
            F::BrakeQuadratic,
            F::ArmDragCd,
        ]
        .map(Row::Field),
    );

    out.push(Row::Group(Group::Spray));
    out.extend([F::D50, F::Spread, F::Largest].map(Row::Field));

    out.push(Row::Group(Group::Layout));
    out.push(Row::Field(F::LayoutKind));
    match design.layout {
        None => {}
        Some(Layout::Rectangle { .. }) => out.extend([F::Spacing, F::Rows].map(Row::Field)),
        Some(_) => out.push(Row::Field(F::Spacing)),
    }

    out.push(Row::Group(Group::Site));
    out.extend(
        [
            F::Name,
            F::WaterTemp,
            F::AirTemp,
            F::Altitude,
            F::WindSpeed,
            F::WindFrom,
        ]
        .map(Row::Field),
    );
    out
}

impl Field {
    /// The group the field belongs to.
    pub fn group(self) -> Group {
        use Field as F;
        match self {
            F::SupplyKind
            | F::InletPressure
            | F::TotalFlow
            | F::LineSource
            | F::LineLength
            | F::LineBore
            | F::LineRoughness
            | F::LineMinorK
            | F::LineLift
            | F::SwivelBore
            | F::SwivelK => Group::Supply,
            F::HubRadius
            | F::InertiaKind
            | F::InertiaGiven
            | F::TubeDensity
            | F::TubeWall
            | F::TipMass
            | F::Arm(..) => Group::Arms,
            F::BearingKind
            | F::MuKinetic
            | F::MuStatic
            | F::WasherInner
            | F::WasherOuter
            | F::ThrustArea
            | F::RotorMass
            | F::RadiusRule
            | F::Running
            | F::Breakaway
            | F::SealBase
            | F::SealPerKpa
            | F::BrakeViscous
            | F::BrakeQuadratic
            | F::ArmDragCd => Group::Friction,
            F::D50 | F::Spread | F::Largest => Group::Spray,
            F::LayoutKind | F::Spacing | F::Rows => Group::Layout,
            F::Name | F::WaterTemp | F::AirTemp | F::Altitude | F::WindSpeed | F::WindFrom => {
                Group::Site
            }
        }
    }

    /// The arm a field belongs to, if any.
    pub fn arm(self) -> Option<usize> {
        match self {
            Field::Arm(k, _) => Some(k),
            _ => None,
        }
    }

    /// The short label shown in the list.
    pub fn label(self) -> &'static str {
        use Field as F;
        match self {
            F::SupplyKind => "feed",
            F::InletPressure => "inlet pressure",
            F::TotalFlow => "total flow",
            F::LineSource => "source pressure",
            F::LineLength => "hose length",
            F::LineBore => "hose bore",
            F::LineRoughness => "hose roughness",
            F::LineMinorK => "hose fittings K",
            F::LineLift => "lift to inlet",
            F::SwivelBore => "swivel bore",
            F::SwivelK => "swivel K",
            F::HubRadius => "hub radius",
            F::InertiaKind => "inertia",
            F::InertiaGiven => "inertia value",
            F::TubeDensity => "tube density",
            F::TubeWall => "tube wall",
            F::TipMass => "tip mass",
            F::Arm(_, a) => match a {
                ArmField::Radius => "radius",
                ArmField::Azimuth => "azimuth",
                ArmField::Height => "height",
                ArmField::Rise => "rise",
                ArmField::Bore => "tube bore",
                ArmField::Outer => "tube outside",
                ArmField::Roughness => "tube roughness",
                ArmField::MinorK => "tube fittings K",
                ArmField::Diameter => "nozzle",
                ArmField::Elevation => "elevation",
                ArmField::Deflection => "deflection",
                ArmField::Cd => "Cd",
                ArmField::Cv => "Cv",
            },
            F::BearingKind => "bearing",
            F::MuKinetic => "μ running",
            F::MuStatic => "μ breakaway",
            F::WasherInner => "washer inner r",
            F::WasherOuter => "washer outer r",
            F::ThrustArea => "thrust area",
            F::RotorMass => "rotor mass",
            F::RadiusRule => "washer state",
            F::Running => "running torque",
            F::Breakaway => "breakaway torque",
            F::SealBase => "seal drag",
            F::SealPerKpa => "seal per kPa",
            F::BrakeViscous => "brake c1",
            F::BrakeQuadratic => "brake c2",
            F::ArmDragCd => "arm drag Cd",
            F::D50 => "median drop",
            F::Spread => "spread n",
            F::Largest => "largest drop",
            F::LayoutKind => "pattern",
            F::Spacing => "head spacing",
            F::Rows => "row spacing",
            F::Name => "name",
            F::WaterTemp => "water temp",
            F::AirTemp => "air temp",
            F::Altitude => "altitude",
            F::WindSpeed => "wind",
            F::WindFrom => "wind from",
        }
    }

    /// A longer description for the hint line.
    pub fn describe(self) -> &'static str {
        use Field as F;
        match self {
            F::SupplyKind => {
                "how water arrives: a held pressure, a held flow, or a hose from a tap"
            }
            F::InletPressure => "gauge pressure at the sprinkler inlet",
            F::TotalFlow => "total flow held fixed (a metering pump)",
            F::LineSource => "gauge pressure at the tap or pump",
            F::LineLength => "hose length from the source to the sprinkler",
            F::LineBore => "hose inside diameter",
            F::LineRoughness => "hose wall roughness",
            F::LineMinorK => "fittings and couplings, in velocity heads",
            F::LineLift => "rise from the source to the inlet (negative: downhill)",
            F::SwivelBore => "swivel inlet bore",
            F::SwivelK => "swivel loss, in velocity heads",
            F::HubRadius => "where the arms leave the hub",
            F::InertiaKind => "rotor inertia: estimated from the arms, or a given value",
            F::InertiaGiven => "mass moment of inertia about the spin axis",
            F::TubeDensity => "arm tube material density (brass about 8500 kg/m³)",
            F::TubeWall => "arm tube wall thickness",
            F::TipMass => "mass of each nozzle body at an arm tip",
            F::Arm(_, a) => match a {
                ArmField::Radius => "nozzle exit radius from the spin axis",
                ArmField::Azimuth => "arm direction around the hub",
                ArmField::Height => "nozzle height above ground",
                ArmField::Rise => "arm rise from the swivel to the nozzle",
                ArmField::Bore => "arm tube inside diameter",
                ArmField::Outer => "arm tube outside diameter (air drag)",
                ArmField::Roughness => "arm tube wall roughness",
                ArmField::MinorK => "elbows and entry along the arm, in velocity heads",
                ArmField::Diameter => "nozzle exit diameter",
                ArmField::Elevation => "jet angle above horizontal",
                ArmField::Deflection => "jet angle from straight back (0 most torque, 90 radial)",
                ArmField::Cd => "nozzle discharge coefficient",
                ArmField::Cv => "nozzle velocity coefficient",
            },
            F::BearingKind => "thrust bearing: a washer, or torques measured at the unit",
            F::MuKinetic => "washer friction coefficient while turning",
            F::MuStatic => "washer friction coefficient at breakaway",
            F::WasherInner => "washer inner radius",
            F::WasherOuter => "washer outer radius",
            F::ThrustArea => "area on which hub pressure lifts the rotor",
            F::RotorMass => "mass of the rotating part",
            F::RadiusRule => "run-in (uniform wear) or new (uniform pressure)",
            F::Running => "torque to keep it turning slowly (spring scale × arm radius)",
            F::Breakaway => "torque to start it from rest",
            F::SealBase => "seal torque at zero pressure",
            F::SealPerKpa => "seal torque added per kPa of hub pressure",
            F::BrakeViscous => "viscous brake, N·m·s/rad",
            F::BrakeQuadratic => "quadratic brake, N·m·s²/rad²",
            F::ArmDragCd => "drag coefficient of an arm tube in cross-flow",
            F::D50 => "volume median drop diameter (auto: the model's estimate)",
            F::Spread => "Rosin-Rammler spread exponent (auto: 2.5)",
            F::Largest => "largest drop diameter (auto: from the spectrum)",
            F::LayoutKind => "head layout for overlap and uniformity",
            F::Spacing => "head spacing along a row",
            F::Rows => "spacing between rows",
            F::Name => "scenario name",
            F::WaterTemp => "water temperature",
            F::AirTemp => "air temperature",
            F::Altitude => "site altitude",
            F::WindSpeed => "wind speed at nozzle height",
            F::WindFrom => "direction the wind blows from",
        }
    }

    /// How the field is edited.
    pub fn kind(self) -> Kind {
        use Field as F;
        match self {
            F::SupplyKind | F::InertiaKind | F::BearingKind | F::RadiusRule | F::LayoutKind => {
                Kind::Choice
            }
            F::D50 | F::Spread | F::Largest => Kind::OptionalNumber,
            F::Name => Kind::Text,
            _ => Kind::Number,
        }
    }

    /// The dimension of a numeric field (None: a bare number or not numeric).
    pub fn dimension(self) -> Option<D> {
        use Field as F;
        Some(match self {
            F::InletPressure | F::LineSource => D::Pressure,
            F::TotalFlow => D::Flow,
            F::LineLength | F::LineLift | F::Spacing | F::Rows | F::Altitude => D::Length,
            F::LineBore
            | F::LineRoughness
            | F::SwivelBore
            | F::HubRadius
            | F::TubeWall
            | F::WasherInner
            | F::WasherOuter
            | F::D50
            | F::Largest => D::SmallLength,
            F::InertiaGiven => D::Inertia,
            F::TubeDensity => D::Density,
            F::TipMass | F::RotorMass => D::Mass,
            F::ThrustArea => D::Area,
            F::Running | F::Breakaway | F::SealBase | F::SealPerKpa => D::Torque,
            F::WaterTemp | F::AirTemp => D::Temperature,
            F::WindSpeed => D::Speed,
            F::WindFrom => D::Angle,
            F::Arm(_, a) => match a {
                ArmField::Radius
                | ArmField::Height
                | ArmField::Rise
                | ArmField::Bore
                | ArmField::Outer
                | ArmField::Roughness
                | ArmField::Diameter => D::SmallLength,
                ArmField::Azimuth | ArmField::Elevation | ArmField::Deflection => D::Angle,
                ArmField::MinorK | ArmField::Cd | ArmField::Cv => return None,
            },
            _ => return None,
        })
    }

    /// The fine nudge step in SI (°C for temperatures); coarse is ten times it.
    pub fn fine_step_si(self) -> f64 {
        use Field as F;
        let deg = PI / 180.0;
        match self {
            F::InletPressure | F::LineSource => 5.0e3,
            F::TotalFlow => 0.5e-3 / 60.0,
            F::LineLength => 0.5,
            F::LineBore => 1.0e-3,
            F::LineRoughness | F::Arm(_, ArmField::Roughness) => 1.0e-6,
            F::LineMinorK | F::SwivelK | F::Arm(_, ArmField::MinorK) | F::ArmDragCd => 0.1,
            F::LineLift => 0.1,
            F::SwivelBore | F::WasherInner | F::WasherOuter => 0.5e-3,
            F::HubRadius => 1.0e-3,
            F::InertiaGiven => 1.0e-4,
            F::TubeDensity => 100.0,
            F::TubeWall => 0.1e-3,
            F::TipMass => 1.0e-3,
            F::Arm(_, a) => match a {
                ArmField::Radius => 5.0e-3,
                ArmField::Azimuth => 5.0 * deg,
                ArmField::Height => 10.0e-3,
                ArmField::Rise => 5.0e-3,
                ArmField::Bore | ArmField::Outer => 0.5e-3,
                ArmField::Diameter => 0.1e-3,
                ArmField::Elevation | ArmField::Deflection => deg,
                ArmField::Cd | ArmField::Cv => 0.01,
                ArmField::Roughness | ArmField::MinorK => 0.1,
            },
            F::MuKinetic | F::MuStatic => 0.01,
            F::ThrustArea => 5.0e-6,
            F::RotorMass => 10.0e-3,
            F::Running | F::Breakaway | F::SealBase => 1.0e-3,
            F::SealPerKpa => 1.0e-5,
            F::BrakeViscous => 0.05,
            F::BrakeQuadratic => 0.01,
            F::D50 | F::Largest => 0.1e-3,
            F::Spread => 0.1,
            F::Spacing | F::Rows => 0.5,
            F::WaterTemp | F::AirTemp => 1.0,
            F::Altitude => 50.0,
            F::WindSpeed => 0.5,
            F::WindFrom => 15.0 * deg,
            F::SupplyKind
            | F::InertiaKind
            | F::BearingKind
            | F::RadiusRule
            | F::LayoutKind
            | F::Name => 0.0,
        }
    }

    /// The value of the field in `design`.
    pub fn get(self, design: &Design) -> Value {
        use Field as F;
        let num = |v: f64| Value::Number(v, self.dimension());
        let opt = |v: Option<f64>| match v {
            Some(v) => Value::Number(v, self.dimension()),
            None => Value::Auto(self.dimension()),
        };
        match self {
            F::SupplyKind => Value::Choice(match design.supply {
                Supply::Pressure { .. } => "pressure",
                Supply::Flow { .. } => "flow",
                Supply::Line(_) => "hose",
            }),
            F::InertiaKind => Value::Choice(match design.rotor.inertia {
                Inertia::Estimate { .. } => "estimated",
                Inertia::Given { .. } => "given",
            }),
            F::BearingKind => Value::Choice(match design.friction.bearing {
                Bearing::Washer(_) => "washer",
                Bearing::Measured { .. } => "measured",
            }),
            F::RadiusRule => Value::Choice(match washer(design).map(|w| w.radius_rule) {
                Some(WasherRule::UniformPressure) => "new",
                _ => "run-in",
            }),
            F::LayoutKind => Value::Choice(match design.layout {
                None => "none",
                Some(Layout::Square { .. }) => "square",
                Some(Layout::Rectangle { .. }) => "rectangle",
                Some(Layout::Triangle { .. }) => "triangle",
            }),
            F::Name => Value::Text(design.name.clone()),
            F::D50 => opt(design.spray.d50_m),
            F::Spread => opt(design.spray.spread),
            F::Largest => opt(design.spray.largest_m),
            _ => num(self.number(design).unwrap_or(f64::NAN)),
        }
    }

    /// The SI value of a numeric field, if the design has it.
    pub fn number(self, design: &Design) -> Option<f64> {
        use Field as F;
        let line = match design.supply {
            Supply::Line(l) => Some(l),
            _ => None,
        };
        let w = washer(design);
        let est = match design.rotor.inertia {
            Inertia::Estimate {
                tube_density_kg_m3,
                tube_wall_m,
                tip_mass_kg,
            } => Some((tube_density_kg_m3, tube_wall_m, tip_mass_kg)),
            Inertia::Given { .. } => None,
        };
        let measured = match design.friction.bearing {
            Bearing::Measured {
                running_n_m,
                breakaway_n_m,
            } => Some((running_n_m, breakaway_n_m)),
            Bearing::Washer(_) => None,
        };
        let f = &design.friction;
        Some(match self {
            F::InletPressure => match design.supply {
                Supply::Pressure { inlet_pa } => inlet_pa,
                _ => return None,
            },
            F::TotalFlow => match design.supply {
                Supply::Flow { total_m3_s } => total_m3_s,
                _ => return None,
            },
            F::LineSource => line?.source_pa,
            F::LineLength => line?.length_m,
            F::LineBore => line?.bore_m,
            F::LineRoughness => line?.roughness_m,
            F::LineMinorK => line?.minor_k,
            F::LineLift => line?.lift_m,
            F::SwivelBore => design.rotor.swivel.inlet_bore_m,
            F::SwivelK => design.rotor.swivel.k,
            F::HubRadius => design.rotor.hub_radius_m,
            F::InertiaGiven => match design.rotor.inertia {
                Inertia::Given { kg_m2 } => kg_m2,
                Inertia::Estimate { .. } => return None,
            },
            F::TubeDensity => est?.0,
            F::TubeWall => est?.1,
            F::TipMass => est?.2,
            F::Arm(k, a) => {
                let arm = design.rotor.arms.get(k)?;
                match a {
                    ArmField::Radius => arm.radius_m,
                    ArmField::Azimuth => arm.azimuth_rad,
                    ArmField::Height => arm.height_m,
                    ArmField::Rise => arm.rise_m,
                    ArmField::Bore => arm.tube.bore_m,
                    ArmField::Outer => arm.tube.outer_m,
                    ArmField::Roughness => arm.tube.roughness_m,
                    ArmField::MinorK => arm.tube.minor_k,
                    ArmField::Diameter => arm.nozzle.diameter_m,
                    ArmField::Elevation => arm.nozzle.elevation_rad,
                    ArmField::Deflection => arm.nozzle.deflection_rad,
                    ArmField::Cd => arm.nozzle.cd,
                    ArmField::Cv => arm.nozzle.cv,
                }
            }
            F::MuKinetic => w?.mu_kinetic,
            F::MuStatic => w?.mu_static,
            F::WasherInner => w?.inner_m,
            F::WasherOuter => w?.outer_m,
            F::ThrustArea => w?.thrust_area_m2,
            F::RotorMass => w?.rotor_mass_kg,
            F::Running => measured?.0,
            F::Breakaway => measured?.1,
            F::SealBase => f.seal.base_n_m,
            F::SealPerKpa => f.seal.per_pa_n_m * 1.0e3,
            F::BrakeViscous => f.brake.viscous,
            F::BrakeQuadratic => f.brake.quadratic,
            F::ArmDragCd => f.arm_drag_cd,
            F::D50 => design.spray.d50_m?,
            F::Spread => design.spray.spread?,
            F::Largest => design.spray.largest_m?,
            F::Spacing => design.layout?.spacing_m(),
            F::Rows => design.layout?.rows_m(),
            F::WaterTemp => design.water_temperature_c,
            F::AirTemp => design.site.air_temperature_c,
            F::Altitude => design.site.altitude_m,
            F::WindSpeed => design.wind.speed_m_s,
            F::WindFrom => design.wind.from_rad,
            F::SupplyKind
            | F::InertiaKind
            | F::BearingKind
            | F::RadiusRule
            | F::LayoutKind
            | F::Name => return None,
        })
    }

    /// Writes a number (SI; `None` sets an optional field to auto). Returns
    /// false when the design has no such field.
    pub fn set_number(self, design: &mut Design, value: Option<f64>) -> bool {
        use Field as F;
        match (self, value) {
            (F::D50, v) => design.spray.d50_m = v,
            (F::Spread, v) => design.spray.spread = v,
            (F::Largest, v) => design.spray.largest_m = v,
            (_, None) => return false,
            (_, Some(v)) => return self.set_value(design, v),
        }
        true
    }

    fn set_value(self, design: &mut Design, v: f64) -> bool {
        use Field as F;
        match self {
            F::InletPressure => match &mut design.supply {
                Supply::Pressure { inlet_pa } => *inlet_pa = v,
                _ => return false,
            },
            F::TotalFlow => match &mut design.supply {
                Supply::Flow { total_m3_s } => *total_m3_s = v,
                _ => return false,
            },
            F::LineSource
            | F::LineLength
            | F::LineBore
            | F::LineRoughness
            | F::LineMinorK
            | F::LineLift => {
                let Supply::Line(l) = &mut design.supply else {
                    return false;
                };
                match self {
                    F::LineSource => l.source_pa = v,
                    F::LineLength => l.length_m = v,
                    F::LineBore => l.bore_m = v,
                    F::LineRoughness => l.roughness_m = v,
                    F::LineMinorK => l.minor_k = v,
                    _ => l.lift_m = v,
                }
            }
            F::SwivelBore => design.rotor.swivel.inlet_bore_m = v,
            F::SwivelK => design.rotor.swivel.k = v,
            F::HubRadius => design.rotor.hub_radius_m = v,
            F::InertiaGiven => match &mut design.rotor.inertia {
                Inertia::Given { kg_m2 } => *kg_m2 = v,
                Inertia::Estimate { .. } => return false,
            },
            F::TubeDensity | F::TubeWall | F::TipMass => match &mut design.rotor.inertia {
                Inertia::Estimate {
                    tube_density_kg_m3,
                    tube_wall_m,
                    tip_mass_kg,
                } => match self {
                    F::TubeDensity => *tube_density_kg_m3 = v,
                    F::TubeWall => *tube_wall_m = v,
                    _ => *tip_mass_kg = v,
                },
                Inertia::Given { .. } => return false,
            },
            F::Arm(k, a) => {
                let Some(arm) = design.rotor.arms.get_mut(k) else {
                    return false;
                };
                match a {
                    ArmField::Radius => arm.radius_m = v,
                    ArmField::Azimuth => arm.azimuth_rad = v,
                    ArmField::Height => arm.height_m = v,
                    ArmField::Rise => arm.rise_m = v,
                    ArmField::Bore => arm.tube.bore_m = v,
                    ArmField::Outer => arm.tube.outer_m = v,
                    ArmField::Roughness => arm.tube.roughness_m = v,
                    ArmField::MinorK => arm.tube.minor_k = v,
                    ArmField::Diameter => arm.nozzle.diameter_m = v,
                    ArmField::Elevation => arm.nozzle.elevation_rad = v,
                    ArmField::Deflection => arm.nozzle.deflection_rad = v,
                    ArmField::Cd => arm.nozzle.cd = v,
                    ArmField::Cv => arm.nozzle.cv = v,
                }
            }
            F::MuKinetic
            | F::MuStatic
            | F::WasherInner
            | F::WasherOuter
            | F::ThrustArea
            | F::RotorMass => {
                let Bearing::Washer(w) = &mut design.friction.bearing else {
                    return false;
                };
                match self {
                    F::MuKinetic => w.mu_kinetic = v,
                    F::MuStatic => w.mu_static = v,
                    F::WasherInner => w.inner_m = v,
                    F::WasherOuter => w.outer_m = v,
                    F::ThrustArea => w.thrust_area_m2 = v,
                    _ => w.rotor_mass_kg = v,
                }
            }
            F::Running | F::Breakaway => match &mut design.friction.bearing {
                Bearing::Measured {
                    running_n_m,
                    breakaway_n_m,
                } => {
                    if self == F::Running {
                        *running_n_m = v
                    } else {
                        *breakaway_n_m = v
                    }
                }
                Bearing::Washer(_) => return false,
            },
            F::SealBase => design.friction.seal.base_n_m = v,
            F::SealPerKpa => design.friction.seal.per_pa_n_m = v / 1.0e3,
            F::BrakeViscous => design.friction.brake.viscous = v,
            F::BrakeQuadratic => design.friction.brake.quadratic = v,
            F::ArmDragCd => design.friction.arm_drag_cd = v,
            F::D50 => design.spray.d50_m = Some(v),
            F::Spread => design.spray.spread = Some(v),
            F::Largest => design.spray.largest_m = Some(v),
            F::Spacing => match &mut design.layout {
                Some(Layout::Square { spacing_m })
                | Some(Layout::Triangle { spacing_m })
                | Some(Layout::Rectangle { spacing_m, .. }) => *spacing_m = v,
                None => return false,
            },
            F::Rows => match &mut design.layout {
                Some(Layout::Rectangle { rows_m, .. }) => *rows_m = v,
                _ => return false,
            },
            F::WaterTemp => design.water_temperature_c = v,
            F::AirTemp => design.site.air_temperature_c = v,
            F::Altitude => design.site.altitude_m = v,
            F::WindSpeed => design.wind.speed_m_s = v,
            F::WindFrom => design.wind.from_rad = v,
            F::SupplyKind
            | F::InertiaKind
            | F::BearingKind
            | F::RadiusRule
            | F::LayoutKind
            | F::Name => return false,
        }
        true
    }

    /// Steps a choice field to its next (`forward`) or previous option.
    /// `hint` supplies values for a newly chosen option (the current state's
    /// pressure, flow and bearing torques), so the design stays near where it was.
    pub fn cycle(self, design: &mut Design, forward: bool, hint: &ChoiceHint) -> bool {
        use Field as F;
        let step = |i: usize, n: usize| {
            if forward {
                (i + 1) % n
            } else {
                (i + n - 1) % n
            }
        };
        match self {
            F::SupplyKind => {
                let i = match design.supply {
                    Supply::Pressure { .. } => 0,
                    Supply::Flow { .. } => 1,
                    Supply::Line(_) => 2,
                };
                design.supply = match step(i, 3) {
                    0 => Supply::Pressure {
                        inlet_pa: hint.inlet_pa,
                    },
                    1 => Supply::Flow {
                        total_m3_s: hint.flow_m3_s,
                    },
                    // A 15 m garden hose of 16 mm bore from a tap 50 kPa above
                    // the present inlet pressure (an invented starting point).
                    _ => Supply::Line(Line {
                        source_pa: hint.inlet_pa + 50.0e3,
                        length_m: 15.0,
                        bore_m: 16.0e-3,
                        roughness_m: 1.5e-6,
                        minor_k: 2.0,
                        lift_m: 0.0,
                    }),
                };
            }
            F::InertiaKind => {
                design.rotor.inertia = match design.rotor.inertia {
                    Inertia::Estimate { .. } => Inertia::Given {
                        kg_m2: hint.inertia_kg_m2,
                    },
                    // Brass tube, 1 mm wall, 8 g nozzle bodies (as the shipped scenarios).
                    Inertia::Given { .. } => Inertia::Estimate {
                        tube_density_kg_m3: 8500.0,
                        tube_wall_m: 1.0e-3,
                        tip_mass_kg: 8.0e-3,
                    },
                };
            }
            F::BearingKind => {
                design.friction.bearing = match design.friction.bearing {
                    Bearing::Washer(_) => Bearing::Measured {
                        running_n_m: hint.running_n_m,
                        breakaway_n_m: hint.breakaway_n_m,
                    },
                    Bearing::Measured { .. } => Bearing::Washer(hint.washer),
                };
            }
            F::RadiusRule => {
                let Bearing::Washer(w) = &mut design.friction.bearing else {
                    return false;
                };
                w.radius_rule = match w.radius_rule {
                    WasherRule::UniformWear => WasherRule::UniformPressure,
                    WasherRule::UniformPressure => WasherRule::UniformWear,
                };
            }
            F::LayoutKind => {
                let s = design.layout.map_or(hint.spacing_m, |l| l.spacing_m());
                let i = match design.layout {
                    None => 0,
                    Some(Layout::Square { .. }) => 1,
                    Some(Layout::Rectangle { .. }) => 2,
                    Some(Layout::Triangle { .. }) => 3,
                };
                design.layout = match step(i, 4) {
                    0 => None,
                    1 => Some(Layout::Square { spacing_m: s }),
                    2 => Some(Layout::Rectangle {
                        spacing_m: s,
                        rows_m: s,
                    }),
                    _ => Some(Layout::Triangle { spacing_m: s }),
                };
            }
            _ => return false,
        }
        true
    }
}

/// Values that seed a newly chosen option of a choice field.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ChoiceHint {
    /// Inlet pressure now, Pa.
    pub inlet_pa: f64,
    /// Total flow now, m³/s.
    pub flow_m3_s: f64,
    /// Inertia now, kg·m².
    pub inertia_kg_m2: f64,
    /// Running bearing torque now, N·m.
    pub running_n_m: f64,
    /// Breakaway torque now, N·m.
    pub breakaway_n_m: f64,
    /// A washer to go back to.
    pub washer: Washer,
    /// A head spacing to start a layout with, m.
    pub spacing_m: f64,
}

fn washer(design: &Design) -> Option<Washer> {
    match design.friction.bearing {
        Bearing::Washer(w) => Some(w),
        Bearing::Measured { .. } => None,
    }
}

/// The nearest of 1, 2, 5 × 10ⁿ to `x` (in log terms), for round steps.
pub fn nice_step(x: f64) -> f64 {
    if !(x.is_finite() && x > 0.0) {
        return 1.0;
    }
    let exp = x.log10().floor();
    let base = 10f64.powf(exp);
    let m = x / base;
    let candidates: [f64; 4] = [1.0, 2.0, 5.0, 10.0];
    let best = candidates
        .iter()
        .copied()
        .min_by(|a: &f64, b: &f64| (a.ln() - m.ln()).abs().total_cmp(&(b.ln() - m.ln()).abs()))
        .unwrap_or(1.0);
    best * base
}

/// The nudge step of a field in display units of `system`.
pub fn display_step(field: Field, system: UnitSystem, coarse: bool) -> f64 {
    let fine_si = field.fine_step_si();
    let shown = match field.dimension() {
        // A difference of temperatures: scale only, no offset.
        Some(dim) => {
            (units::to_display(dim, fine_si, system) - units::to_display(dim, 0.0, system)).abs()
        }
        None => fine_si,
    };
    let fine = nice_step(shown);
    if coarse {
        fine * 10.0
    } else {
        fine
    }
}

/// The value after one nudge: moves to the next multiple of the step in the
/// display unit beyond the value (so values land on round numbers), in SI.
pub fn nudged(field: Field, si: f64, system: UnitSystem, forward: bool, coarse: bool) -> f64 {
    let step = display_step(field, system, coarse);
    // The next grid point strictly beyond the value (within rounding noise).
    let next = |shown: f64| {
        let k = shown / step;
        let k = if forward {
            (k + 1e-9).floor() + 1.0
        } else {
            (k - 1e-9).ceil() - 1.0
        };
        k * step
    };
    match field.dimension() {
        Some(dim) => units::from_display(dim, next(units::to_display(dim, si, system)), system),
        None => next(si),
    }
}

/// The value as shown in the list, in `system`.
pub fn show(value: &Value, system: UnitSystem) -> String {
    match value {
        Value::Number(v, Some(dim)) => units::format_quantity(*dim, *v, system),
        Value::Number(v, None) => units::format_number(*v),
        Value::Auto(_) => "auto".to_string(),
        Value::Choice(c) => (*c).to_string(),
        Value::Text(t) => t.clone(),
    }
}

/// The value as it is offered for typing: the number in the display unit with the unit.
pub fn typing_seed(value: &Value, system: UnitSystem) -> String {
    match value {
        Value::Number(v, Some(dim)) => {
            let shown = units::to_display(*dim, *v, system);
            let label = units::unit_label(*dim, system);
            let label = match label {
                "°" => "deg",
                other => other,
            };
            format!("{}{label}", trim_number(shown))
        }
        Value::Number(v, None) => trim_number(*v),
        Value::Auto(_) => "auto".to_string(),
        Value::Choice(c) => (*c).to_string(),
        Value::Text(t) => t.clone(),
    }
}

/// A number without trailing zeros, to six significant figures.
fn trim_number(v: f64) -> String {
    if !v.is_finite() {
        return String::new();
    }
    let s = format!("{:.6}", v);
    let s = if v != 0.0 && v.abs() < 1.0e-3 {
        format!("{v:e}")
    } else {
        s
    };
    if s.contains('.') && !s.contains('e') {
        s.trim_end_matches('0').trim_end_matches('.').to_string()
    } else {
        s
    }
}

/// Why a typed value could not be read.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct TypedError(pub String);

/// Reads a typed value for a numeric field: a number with a unit of the
/// field's dimension (`2.8bar`, `45psi`, `6.5in`), a bare number in the unit
/// shown beside the field, or `auto` for an optional field. Returns SI
/// (`None` for auto).
pub fn parse_typed(
    field: Field,
    text: &str,
    system: UnitSystem,
) -> Result<Option<f64>, TypedError> {
    let t = text.trim();
    if field.kind() == Kind::OptionalNumber && t.eq_ignore_ascii_case("auto") {
        return Ok(None);
    }
    let bare: Option<f64> = t.parse::<f64>().ok();
    match (field.dimension(), bare) {
        (_, Some(v)) if !v.is_finite() => Err(TypedError(format!("`{t}` is not a finite number"))),
        (None, Some(v)) => Ok(Some(v)),
        (None, None) => Err(TypedError(format!(
            "`{t}` is not a number; {} is a bare number (e.g. 0.96)",
            field.label()
        ))),
        (Some(dim), Some(v)) => Ok(Some(units::from_display(dim, v, system))),
        (Some(dim), None) => units::parse_quantity(dim, t)
            .map(Some)
            .map_err(|e| TypedError(e.to_string())),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scenario::builtin_example;

    fn design() -> Design {
        builtin_example().to_design().unwrap()
    }

    #[test]
    fn every_listed_number_reads_back_what_it_wrote() {
        let d = design();
        for row in rows(&d) {
            let Row::Field(f) = row else { continue };
            if f.kind() != Kind::Number {
                continue;
            }
            let v = f.number(&d).unwrap_or_else(|| panic!("{f:?} has no value"));
            let mut e = d.clone();
            assert!(f.set_number(&mut e, Some(v * 1.5 + 0.25)), "{f:?}");
            let back = f.number(&e).unwrap();
            assert!((back - (v * 1.5 + 0.25)).abs() < 1e-12, "{f:?}");
        }
    }

    #[test]
    fn steps_are_round_in_both_systems() {
        let nozzle = Field::Arm(0, ArmField::Diameter);
        assert_eq!(display_step(nozzle, UnitSystem::Metric, false), 0.1);
        // 0.1 mm = 0.0039 in → 0.005 in.
        assert!((display_step(nozzle, UnitSystem::Us, false) - 0.005).abs() < 1e-15);
        assert_eq!(
            display_step(Field::InletPressure, UnitSystem::Metric, true),
            50.0
        );
        // 5 kPa = 0.725 psi → 1 psi.
        assert_eq!(
            display_step(Field::InletPressure, UnitSystem::Us, false),
            1.0
        );
        // 1 °C = 1.8 °F → 2 °F (a difference, no offset).
        assert_eq!(display_step(Field::WaterTemp, UnitSystem::Us, false), 2.0);
    }

    #[test]
    fn nudges_land_on_round_values() {
        let f = Field::Arm(0, ArmField::Diameter);
        let up = nudged(f, 2.43e-3, UnitSystem::Metric, true, false);
        assert!((up - 2.5e-3).abs() < 1e-12, "{up}");
        let down = nudged(f, 2.43e-3, UnitSystem::Metric, false, false);
        assert!((down - 2.4e-3).abs() < 1e-12, "{down}");
        let from_grid = nudged(f, 2.4e-3, UnitSystem::Metric, false, false);
        assert!((from_grid - 2.3e-3).abs() < 1e-12, "{from_grid}");
        let p = nudged(Field::InletPressure, 300e3, UnitSystem::Metric, true, true);
        assert!((p - 350e3).abs() < 1e-6);
        let t = nudged(Field::WaterTemp, 15.0, UnitSystem::Us, true, false);
        // 15 °C = 59 °F → 60 °F = 15.56 °C.
        assert!((t - (60.0 - 32.0) / 1.8).abs() < 1e-9, "{t}");
    }

    #[test]
    fn typed_values_need_a_unit_of_the_right_kind_or_the_shown_one() {
        let f = Field::InletPressure;
        let m = UnitSystem::Metric;
        assert_eq!(parse_typed(f, "2.8bar", m), Ok(Some(2.8e5)));
        let psi = parse_typed(f, "45psi", m).unwrap().unwrap();
        assert!((psi - 45.0 * crate::units::factor::PSI_PA).abs() < 1e-6);
        assert_eq!(parse_typed(f, "300", m), Ok(Some(300e3)));
        let e = parse_typed(f, "3m", m).unwrap_err();
        assert!(e.0.contains("pressure"), "{}", e.0);
        let arm = Field::Arm(0, ArmField::Radius);
        let r = parse_typed(arm, "6.5in", m).unwrap().unwrap();
        assert!((r - 0.1651).abs() < 1e-12);
        assert_eq!(parse_typed(Field::D50, "auto", m), Ok(None));
        assert!(parse_typed(Field::Arm(0, ArmField::Cd), "high", m).is_err());
        assert!(parse_typed(Field::Arm(0, ArmField::Cd), "inf", m).is_err());
    }

    #[test]
    fn typing_seed_reads_back_to_the_same_value() {
        let d = design();
        for system in [UnitSystem::Metric, UnitSystem::Us] {
            for row in rows(&d) {
                let Row::Field(f) = row else { continue };
                if f.kind() != Kind::Number {
                    continue;
                }
                let v = f.number(&d).unwrap();
                let seed = typing_seed(&f.get(&d), system);
                let back = parse_typed(f, &seed, system)
                    .unwrap_or_else(|e| panic!("{f:?} `{seed}`: {}", e.0))
                    .unwrap();
                assert!(
                    (back - v).abs() <= 1e-5 * v.abs().max(1e-9),
                    "{f:?} {system}: `{seed}` → {back}, want {v}"
                );
            }
        }
    }

    #[test]
    fn choices_cycle_through_every_option_and_back() {
        let d = design();
        let hint = ChoiceHint {
            inlet_pa: 300e3,
            flow_m3_s: 3e-4,
            inertia_kg_m2: 1e-3,
            running_n_m: 0.02,
            breakaway_n_m: 0.03,
            washer: washer(&d).unwrap(),
            spacing_m: 8.0,
        };
        for (f, n) in [
            (Field::SupplyKind, 3),
            (Field::LayoutKind, 4),
            (Field::BearingKind, 2),
            (Field::InertiaKind, 2),
            (Field::RadiusRule, 2),
        ] {
            let mut e = d.clone();
            let mut seen = vec![f.get(&e)];
            for _ in 0..n {
                assert!(f.cycle(&mut e, true, &hint));
                seen.push(f.get(&e));
            }
            assert_eq!(seen.first(), seen.last(), "{f:?}");
            seen.pop();
            seen.dedup();
            assert_eq!(seen.len(), n, "{f:?}");
        }
    }
}
