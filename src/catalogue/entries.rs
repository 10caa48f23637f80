//! The entries of the catalogue, in the order the interface lists them.
//!
//! One `NAME = Input { … };` per input. [`ALL`] is built from the same list,
//! so an entry written here is everywhere at once.

use std::f64::consts::PI;

use super::vary::{ArmRule, How, Search, Vary};
use super::{
    line, line_mut, step, washer, washer_mut, Access, Group, Input, Range, Step, Unit, NO_STEP,
};
use crate::physics::design::{Bearing, Inertia, Layout, Line, Supply, WasherRule};
use crate::units::Dimension as D;

const DEG: f64 = PI / 180.0;

macro_rules! catalogue {
    ($($(#[$doc:meta])* $name:ident = $entry:expr;)*) => {
        $($(#[$doc])* pub static $name: Input = $entry;)*
        /// Every input, in list order.
        pub static ALL: &[&Input] = &[$(&$name),*];
    };
}

/// A design-wide number input with no sweep.
macro_rules! number {
    ($path:expr, $label:expr, $help:expr, $group:expr, $unit:expr, $range:expr, $step:expr,
     |$d:ident| $get:expr, |$dm:ident, $v:ident| $set:expr) => {
        Input {
            path: $path,
            label: $label,
            help: $help,
            group: $group,
            unit: $unit,
            access: Access::Number {
                get: |$d| $get,
                set: |$dm, $v| $set,
            },
            range: $range,
            step: $step,
            vary: None,
            editable: true,
        }
    };
}

/// A number every arm has.
macro_rules! arm {
    ($path:expr, $label:expr, $help:expr, $unit:expr, $range:expr, $step:expr,
     |$a:ident| $field:expr) => {
        Input {
            path: $path,
            label: $label,
            help: $help,
            group: Group::Arms,
            unit: $unit,
            access: Access::Arm {
                get: |$a| $field,
                set: |$a, v| $field = v,
            },
            range: $range,
            step: $step,
            vary: None,
            editable: true,
        }
    };
}

fn pressure_of(s: &Supply) -> Option<f64> {
    match s {
        Supply::Pressure { inlet_pa } => Some(*inlet_pa),
        _ => None,
    }
}

fn flow_of(s: &Supply) -> Option<f64> {
    match s {
        Supply::Flow { total_m3_s } => Some(*total_m3_s),
        _ => None,
    }
}

fn estimate(i: &Inertia) -> Option<(f64, f64, f64)> {
    match *i {
        Inertia::Estimate {
            tube_density_kg_m3,
            tube_wall_m,
            tip_mass_kg,
        } => Some((tube_density_kg_m3, tube_wall_m, tip_mass_kg)),
        Inertia::Given { .. } => None,
    }
}

fn measured(b: &Bearing) -> Option<(f64, f64)> {
    match *b {
        Bearing::Measured {
            running_n_m,
            breakaway_n_m,
        } => Some((running_n_m, breakaway_n_m)),
        Bearing::Washer(_) => None,
    }
}

catalogue! {
    /// Pressure, flow or hose supply.
    SUPPLY = Input {
        path: "supply",
        label: "feed",
        help: "how water arrives: a held pressure, a held flow, or a hose from a tap",
        group: Group::Supply,
        unit: Unit::None,
        access: Access::Choice {
            options: &["pressure", "flow", "hose"],
            get: |d| Some(match d.supply {
                Supply::Pressure { .. } => 0,
                Supply::Flow { .. } => 1,
                Supply::Line(_) => 2,
            }),
            set: |d, i, seed| {
                d.supply = match (i, d.supply) {
                    (0, s @ Supply::Pressure { .. })
                    | (1, s @ Supply::Flow { .. })
                    | (2, s @ Supply::Line(_)) => s,
                    (0, _) => Supply::Pressure { inlet_pa: seed.inlet_pa },
                    (1, _) => Supply::Flow { total_m3_s: seed.flow_m3_s },
                    // A 15 m garden hose of 16 mm bore from a tap 50 kPa above
                    // the present inlet pressure (an invented starting point).
                    _ => Supply::Line(Line {
                        source_pa: seed.inlet_pa + 50.0e3,
                        length_m: 15.0,
                        bore_m: 16.0e-3,
                        roughness_m: 1.5e-6,
                        minor_k: 2.0,
                        lift_m: 0.0,
                    }),
                };
                true
            },
        },
        range: Range::Unchecked,
        step: NO_STEP,
        vary: None,
        editable: true,
    };
    /// Inlet gauge pressure of a pressure supply.
    INLET_PRESSURE = Input {
        vary: Some(Vary {
            name: "pressure",
            key: "pressure_pa",
            how: How::SupplyPressure,
            search: None,
            aliases: &[],
        }),
        ..number!("supply.Pressure", "inlet pressure", "gauge pressure at the sprinkler inlet",
            Group::Supply, Unit::Dim(D::Pressure), Range::Positive, step(5.0e3),
            |d| pressure_of(&d.supply),
            |d, v| match &mut d.supply {
                Supply::Pressure { inlet_pa } => { *inlet_pa = v; true }
                _ => false,
            })
    };
    /// Total flow of a fixed-flow supply.
    TOTAL_FLOW = Input {
        vary: Some(Vary {
            name: "flow",
            key: "flow_m3_s",
            how: How::SupplyFlow,
            search: None,
            aliases: &[],
        }),
        ..number!("supply.Flow", "total flow", "total flow held fixed (a metering pump)",
            Group::Supply, Unit::Dim(D::Flow), Range::Positive, step(0.5e-3 / 60.0),
            |d| flow_of(&d.supply),
            |d, v| match &mut d.supply {
                Supply::Flow { total_m3_s } => { *total_m3_s = v; true }
                _ => false,
            })
    };
    /// Source pressure of a hose supply.
    LINE_SOURCE = number!("supply.Line.source", "source pressure",
        "gauge pressure at the tap or pump", Group::Supply, Unit::Dim(D::Pressure),
        Range::Positive, step(5.0e3),
        |d| line(d).map(|l| l.source_pa), |d, v| line_mut(d).map(|l| l.source_pa = v).is_some());
    /// Hose length.
    LINE_LENGTH = number!("supply.Line.length", "hose length",
        "hose length from the source to the sprinkler", Group::Supply, Unit::Dim(D::Length),
        Range::Positive, step(0.5),
        |d| line(d).map(|l| l.length_m), |d, v| line_mut(d).map(|l| l.length_m = v).is_some());
    /// Hose bore.
    LINE_BORE = number!("supply.Line.bore", "hose bore", "hose inside diameter", Group::Supply,
        Unit::Dim(D::SmallLength), Range::Positive, step(1.0e-3),
        |d| line(d).map(|l| l.bore_m), |d, v| line_mut(d).map(|l| l.bore_m = v).is_some());
    /// Hose wall roughness.
    LINE_ROUGHNESS = number!("supply.Line.roughness", "hose roughness", "hose wall roughness",
        Group::Supply, Unit::Dim(D::SmallLength), Range::NonNegative, step(1.0e-6),
        |d| line(d).map(|l| l.roughness_m),
        |d, v| line_mut(d).map(|l| l.roughness_m = v).is_some());
    /// Hose minor losses.
    LINE_MINOR_K = number!("supply.Line.minor_k", "hose fittings K",
        "fittings and couplings, in velocity heads", Group::Supply, Unit::None,
        Range::NonNegative, step(0.1),
        |d| line(d).map(|l| l.minor_k), |d, v| line_mut(d).map(|l| l.minor_k = v).is_some());
    /// Rise from the source to the inlet.
    LINE_LIFT = number!("supply.Line.lift", "lift to inlet",
        "rise from the source to the inlet (negative: downhill)", Group::Supply,
        Unit::Dim(D::Length), Range::Any, step(0.1),
        |d| line(d).map(|l| l.lift_m), |d, v| line_mut(d).map(|l| l.lift_m = v).is_some());
    /// Swivel inlet bore.
    SWIVEL_BORE = number!("rotor.swivel.inlet_bore", "swivel bore", "swivel inlet bore",
        Group::Supply, Unit::Dim(D::SmallLength), Range::Positive, step(0.5e-3),
        |d| Some(d.rotor.swivel.inlet_bore_m), |d, v| { d.rotor.swivel.inlet_bore_m = v; true });
    /// Swivel loss coefficient.
    SWIVEL_K = number!("rotor.swivel.k", "swivel K", "swivel loss, in velocity heads",
        Group::Supply, Unit::None, Range::NonNegative, step(0.1),
        |d| Some(d.rotor.swivel.k), |d, v| { d.rotor.swivel.k = v; true });

    /// Hub radius (inner end of arm drag).
    HUB_RADIUS = number!("rotor.hub_radius", "hub radius", "where the arms leave the hub",
        Group::Arms, Unit::Dim(D::SmallLength), Range::NonNegative, step(1.0e-3),
        |d| Some(d.rotor.hub_radius_m), |d, v| { d.rotor.hub_radius_m = v; true });
    /// The number of arms (changed with the arm keys, not edited as a number).
    ARM_COUNT = Input {
        editable: false,
        range: Range::Unchecked,
        ..number!("rotor.arms", "arms", "the number of arms, one nozzle each", Group::Arms,
            Unit::None, Range::Positive, step(1.0),
            |d| Some(d.rotor.arms.len() as f64),
            |d, v| {
                let n = v.round();
                match d.rotor.arms.last().copied() {
                    Some(last) if (1.0..=1.0e3).contains(&n) => {
                        d.rotor.arms.resize(n as usize, last);
                        true
                    }
                    _ => false,
                }
            })
    };
    /// Inertia given or estimated.
    INERTIA = Input {
        path: "rotor.inertia",
        label: "inertia",
        help: "rotor inertia: estimated from the arms, or a given value",
        group: Group::Arms,
        unit: Unit::None,
        access: Access::Choice {
            options: &["estimated", "given"],
            get: |d| Some(match d.rotor.inertia {
                Inertia::Estimate { .. } => 0,
                Inertia::Given { .. } => 1,
            }),
            set: |d, i, seed| {
                d.rotor.inertia = match (i, d.rotor.inertia) {
                    (0, Inertia::Estimate { .. }) | (1, Inertia::Given { .. }) => d.rotor.inertia,
                    (1, _) => Inertia::Given { kg_m2: seed.inertia_kg_m2 },
                    // Brass tube, 1 mm wall, 8 g nozzle bodies (as the shipped scenarios).
                    _ => Inertia::Estimate {
                        tube_density_kg_m3: 8500.0,
                        tube_wall_m: 1.0e-3,
                        tip_mass_kg: 8.0e-3,
                    },
                };
                true
            },
        },
        range: Range::Unchecked,
        step: NO_STEP,
        vary: None,
        editable: true,
    };
    /// A given inertia.
    INERTIA_GIVEN = number!("rotor.inertia.Given", "inertia value",
        "mass moment of inertia about the spin axis", Group::Arms, Unit::Dim(D::Inertia),
        Range::Positive, step(1.0e-4),
        |d| match d.rotor.inertia { Inertia::Given { kg_m2 } => Some(kg_m2), _ => None },
        |d, v| match &mut d.rotor.inertia {
            Inertia::Given { kg_m2 } => { *kg_m2 = v; true }
            _ => false,
        });
    /// Tube material density (estimate).
    TUBE_DENSITY = number!("rotor.inertia.Estimate.tube_density", "tube density",
        "arm tube material density (brass about 8500 kg/m³)", Group::Arms,
        Unit::Dim(D::Density), Range::Positive, step(100.0),
        |d| estimate(&d.rotor.inertia).map(|e| e.0),
        |d, v| match &mut d.rotor.inertia {
            Inertia::Estimate { tube_density_kg_m3, .. } => { *tube_density_kg_m3 = v; true }
            _ => false,
        });
    /// Tube wall (estimate).
    TUBE_WALL = number!("rotor.inertia.Estimate.tube_wall", "tube wall",
        "arm tube wall thickness", Group::Arms, Unit::Dim(D::SmallLength), Range::Positive,
        step(0.1e-3),
        |d| estimate(&d.rotor.inertia).map(|e| e.1),
        |d, v| match &mut d.rotor.inertia {
            Inertia::Estimate { tube_wall_m, .. } => { *tube_wall_m = v; true }
            _ => false,
        });
    /// Tip mass (estimate).
    TIP_MASS = number!("rotor.inertia.Estimate.tip_mass", "tip mass",
        "mass of each nozzle body at an arm tip", Group::Arms, Unit::Dim(D::Mass),
        Range::NonNegative, step(1.0e-3),
        |d| estimate(&d.rotor.inertia).map(|e| e.2),
        |d, v| match &mut d.rotor.inertia {
            Inertia::Estimate { tip_mass_kg, .. } => { *tip_mass_kg = v; true }
            _ => false,
        });

    /// Nozzle exit diameter (per arm).
    NOZZLE_DIAMETER = Input {
        vary: Some(Vary {
            name: "nozzle",
            key: "nozzle_m",
            how: How::Arms { rule: ArmRule::Scale, check: None, set: None },
            search: Some(Search::Scaled {
                bounds: |_, a| (0.2e-3, a.tube.bore_m.max(0.2e-3)),
            }),
            aliases: &[],
        }),
        ..arm!("rotor.arms[].nozzle.diameter", "nozzle", "nozzle exit diameter",
            Unit::Dim(D::SmallLength), Range::Positive, step(0.1e-3), |a| a.nozzle.diameter_m)
    };
    /// Jet angle above horizontal (per arm).
    ELEVATION = Input {
        vary: Some(Vary {
            name: "elevation",
            key: "elevation_rad",
            how: How::Arms { rule: ArmRule::Shift, check: None, set: None },
            search: Some(Search::Shifted { lo: 0.0, hi: 89.0 * DEG }),
            aliases: &[],
        }),
        ..arm!("rotor.arms[].nozzle.elevation", "elevation", "jet angle above horizontal",
            Unit::Dim(D::Angle),
            Range::Between {
                lo: 0.0,
                hi: 90.0 * DEG * (1.0 + 1e-12),
                rule: "must be between 0° (level) and 90° (straight up)",
            },
            step(DEG), |a| a.nozzle.elevation_rad)
    };
    /// Jet angle from the backward tangent (per arm).
    DEFLECTION = Input {
        vary: Some(Vary {
            name: "deflection",
            key: "deflection_rad",
            how: How::Arms { rule: ArmRule::Shift, check: None, set: None },
            search: Some(Search::Shifted { lo: -89.0 * DEG, hi: 89.0 * DEG }),
            aliases: &[],
        }),
        ..arm!("rotor.arms[].nozzle.deflection", "deflection",
            "jet angle from straight back (0 most torque, 90 radial)", Unit::Dim(D::Angle),
            Range::Between {
                lo: -180.0 * DEG * (1.0 + 1e-12),
                hi: 180.0 * DEG * (1.0 + 1e-12),
                rule: "must be between -180° and 180° (0 = straight back along the arm's tangent, 90 = outward)",
            },
            step(DEG), |a| a.nozzle.deflection_rad)
    };
    /// Discharge coefficient (per arm).
    NOZZLE_CD = Input {
        vary: Some(Vary {
            name: "cd",
            key: "cd",
            how: How::Arms { rule: ArmRule::Scale, check: None, set: None },
            search: None,
            aliases: &[],
        }),
        ..arm!("rotor.arms[].nozzle.cd", "Cd", "nozzle discharge coefficient", Unit::None,
            Range::Fraction, step(0.01), |a| a.nozzle.cd)
    };
    /// Velocity coefficient (per arm).
    NOZZLE_CV = Input {
        vary: Some(Vary {
            name: "cv",
            key: "cv",
            how: How::Arms { rule: ArmRule::Scale, check: None, set: None },
            search: None,
            aliases: &[],
        }),
        ..arm!("rotor.arms[].nozzle.cv", "Cv", "nozzle velocity coefficient", Unit::None,
            Range::Fraction, step(0.01), |a| a.nozzle.cv)
    };
    /// Nozzle radius from the spin axis (per arm).
    RADIUS = Input {
        vary: Some(Vary {
            name: "radius",
            key: "radius_m",
            how: How::Arms {
                rule: ArmRule::Scale,
                check: Some(|d, _, v| {
                    (v <= d.rotor.hub_radius_m).then_some("puts a nozzle inside the hub radius")
                }),
                // A given tube length scales with the arm.
                set: Some(|a, v| {
                    if let Some(length) = &mut a.tube.length_m {
                        *length *= v / a.radius_m;
                    }
                    a.radius_m = v;
                }),
            },
            search: Some(Search::Scaled {
                bounds: |d, _| ((1.2 * d.rotor.hub_radius_m).max(0.02), 2.5),
            }),
            aliases: &[],
        }),
        ..arm!("rotor.arms[].radius", "radius", "nozzle exit radius from the spin axis",
            Unit::Dim(D::SmallLength), Range::Positive, step(5.0e-3), |a| a.radius_m)
    };
    /// Nozzle height above ground (per arm).
    HEIGHT = Input {
        vary: Some(Vary {
            name: "height",
            key: "height_m",
            how: How::Arms { rule: ArmRule::Shift, check: None, set: None },
            search: None,
            aliases: &[],
        }),
        ..arm!("rotor.arms[].height", "height", "nozzle height above ground",
            Unit::Dim(D::SmallLength), Range::NonNegative, step(10.0e-3), |a| a.height_m)
    };
    /// Arm direction around the hub (per arm).
    AZIMUTH = arm!("rotor.arms[].azimuth", "azimuth", "arm direction around the hub",
        Unit::Dim(D::Angle), Range::Any, step(5.0 * DEG), |a| a.azimuth_rad);
    /// Rise of the arm from the swivel to the nozzle (per arm).
    RISE = arm!("rotor.arms[].rise", "rise", "arm rise from the swivel to the nozzle",
        Unit::Dim(D::SmallLength), Range::Any, step(5.0e-3), |a| a.rise_m);
    /// Tube bore (per arm).
    TUBE_BORE = Input {
        vary: Some(Vary {
            name: "bore",
            key: "bore_m",
            how: How::Arms {
                rule: ArmRule::Scale,
                check: Some(|_, a, v| {
                    (v >= a.tube.outer_m)
                        .then_some("makes a tube bore as wide as its outside diameter")
                }),
                set: None,
            },
            search: None,
            aliases: &[],
        }),
        ..arm!("rotor.arms[].tube.bore", "tube bore", "arm tube inside diameter",
            Unit::Dim(D::SmallLength), Range::Positive, step(0.5e-3), |a| a.tube.bore_m)
    };
    /// Tube outside diameter (per arm).
    TUBE_OUTER = arm!("rotor.arms[].tube.outer", "tube outside",
        "arm tube outside diameter (air drag)", Unit::Dim(D::SmallLength), Range::Positive,
        step(0.5e-3), |a| a.tube.outer_m);
    /// Tube wall roughness (per arm).
    TUBE_ROUGHNESS = arm!("rotor.arms[].tube.roughness", "tube roughness",
        "arm tube wall roughness", Unit::Dim(D::SmallLength), Range::NonNegative, step(1.0e-6),
        |a| a.tube.roughness_m);
    /// Minor losses along the arm (per arm).
    TUBE_MINOR_K = arm!("rotor.arms[].tube.minor_k", "tube fittings K",
        "elbows and entry along the arm, in velocity heads", Unit::None, Range::NonNegative,
        step(0.1), |a| a.tube.minor_k);
    /// Developed tube length (per arm; auto: the arm radius). Not in the list.
    TUBE_LENGTH = Input {
        path: "rotor.arms[].tube.length",
        label: "tube length",
        help: "developed tube length from hub to nozzle (auto: the arm radius)",
        group: Group::Arms,
        unit: Unit::Dim(D::SmallLength),
        access: Access::ArmOptional {
            get: |a| a.tube.length_m,
            set: |a, v| a.tube.length_m = v,
        },
        range: Range::Positive,
        step: step(5.0e-3),
        vary: None,
        editable: false,
    };

    /// Washer or measured bearing.
    BEARING = Input {
        path: "friction.bearing",
        label: "bearing",
        help: "thrust bearing: a washer, or torques measured at the unit",
        group: Group::Friction,
        unit: Unit::None,
        access: Access::Choice {
            options: &["washer", "measured"],
            get: |d| Some(match d.friction.bearing {
                Bearing::Washer(_) => 0,
                Bearing::Measured { .. } => 1,
            }),
            set: |d, i, seed| {
                d.friction.bearing = match (i, d.friction.bearing) {
                    (0, b @ Bearing::Washer(_)) | (1, b @ Bearing::Measured { .. }) => b,
                    (0, _) => Bearing::Washer(seed.washer),
                    _ => Bearing::Measured {
                        running_n_m: seed.running_n_m,
                        breakaway_n_m: seed.breakaway_n_m,
                    },
                };
                true
            },
        },
        range: Range::Unchecked,
        step: NO_STEP,
        vary: None,
        editable: true,
    };
    /// Washer kinetic friction coefficient.
    MU_KINETIC = Input {
        vary: Some(Vary { name: "mu", key: "mu", how: How::Field, search: None, aliases: &[] }),
        ..number!("friction.bearing.Washer.mu_kinetic", "μ running",
            "washer friction coefficient while turning", Group::Friction, Unit::None,
            Range::NonNegative, step(0.01),
            |d| washer(d).map(|w| w.mu_kinetic),
            |d, v| washer_mut(d).map(|w| w.mu_kinetic = v).is_some())
    };
    /// Washer static friction coefficient.
    MU_STATIC = Input {
        vary: Some(Vary {
            name: "mu_static",
            key: "mu_static",
            how: How::Field,
            search: None,
            aliases: &[],
        }),
        ..number!("friction.bearing.Washer.mu_static", "μ breakaway",
            "washer friction coefficient at breakaway", Group::Friction, Unit::None,
            Range::NonNegative, step(0.01),
            |d| washer(d).map(|w| w.mu_static),
            |d, v| washer_mut(d).map(|w| w.mu_static = v).is_some())
    };
    /// Washer inner radius.
    WASHER_INNER = number!("friction.bearing.Washer.inner", "washer inner r",
        "washer inner radius", Group::Friction, Unit::Dim(D::SmallLength), Range::NonNegative,
        step(0.5e-3),
        |d| washer(d).map(|w| w.inner_m), |d, v| washer_mut(d).map(|w| w.inner_m = v).is_some());
    /// Washer outer radius.
    WASHER_OUTER = number!("friction.bearing.Washer.outer", "washer outer r",
        "washer outer radius", Group::Friction, Unit::Dim(D::SmallLength), Range::Positive,
        step(0.5e-3),
        |d| washer(d).map(|w| w.outer_m), |d, v| washer_mut(d).map(|w| w.outer_m = v).is_some());
    /// Area on which hub pressure lifts the rotor.
    THRUST_AREA = number!("friction.bearing.Washer.thrust_area", "thrust area",
        "area on which hub pressure lifts the rotor", Group::Friction, Unit::Dim(D::Area),
        Range::NonNegative, step(5.0e-6),
        |d| washer(d).map(|w| w.thrust_area_m2),
        |d, v| washer_mut(d).map(|w| w.thrust_area_m2 = v).is_some());
    /// Mass of the rotating part.
    ROTOR_MASS = number!("friction.bearing.Washer.rotor_mass", "rotor mass",
        "mass of the rotating part", Group::Friction, Unit::Dim(D::Mass), Range::Positive,
        step(10.0e-3),
        |d| washer(d).map(|w| w.rotor_mass_kg),
        |d, v| washer_mut(d).map(|w| w.rotor_mass_kg = v).is_some());
    /// Run-in or new washer.
    RADIUS_RULE = Input {
        path: "friction.bearing.Washer.radius_rule",
        label: "washer state",
        help: "run-in (uniform wear) or new (uniform pressure)",
        group: Group::Friction,
        unit: Unit::None,
        access: Access::Choice {
            options: &["run-in", "new"],
            get: |d| washer(d).map(|w| match w.radius_rule {
                WasherRule::UniformWear => 0,
                WasherRule::UniformPressure => 1,
            }),
            set: |d, i, _| washer_mut(d).map(|w| {
                w.radius_rule = if i == 0 {
                    WasherRule::UniformWear
                } else {
                    WasherRule::UniformPressure
                };
            }).is_some(),
        },
        range: Range::Unchecked,
        step: NO_STEP,
        vary: None,
        editable: true,
    };
    /// Measured running torque.
    RUNNING = Input {
        vary: Some(Vary {
            name: "running",
            key: "running_n_m",
            how: How::Field,
            search: None,
            aliases: &[],
        }),
        ..number!("friction.bearing.Measured.running", "running torque",
            "torque to keep it turning slowly (spring scale × arm radius)", Group::Friction,
            Unit::Dim(D::Torque), Range::NonNegative, step(1.0e-3),
            |d| measured(&d.friction.bearing).map(|m| m.0),
            |d, v| match &mut d.friction.bearing {
                Bearing::Measured { running_n_m, .. } => { *running_n_m = v; true }
                Bearing::Washer(_) => false,
            })
    };
    /// Measured breakaway torque.
    BREAKAWAY = Input {
        vary: Some(Vary {
            name: "breakaway",
            key: "breakaway_n_m",
            how: How::Field,
            search: None,
            aliases: &[],
        }),
        ..number!("friction.bearing.Measured.breakaway", "breakaway torque",
            "torque to start it from rest", Group::Friction, Unit::Dim(D::Torque),
            Range::NonNegative, step(1.0e-3),
            |d| measured(&d.friction.bearing).map(|m| m.1),
            |d, v| match &mut d.friction.bearing {
                Bearing::Measured { breakaway_n_m, .. } => { *breakaway_n_m = v; true }
                Bearing::Washer(_) => false,
            })
    };
    /// Seal torque at zero pressure.
    SEAL_BASE = number!("friction.seal.base", "seal drag", "seal torque at zero pressure",
        Group::Friction, Unit::Dim(D::Torque), Range::NonNegative, step(1.0e-3),
        |d| Some(d.friction.seal.base_n_m), |d, v| { d.friction.seal.base_n_m = v; true });
    /// Seal torque added per unit of hub pressure (the file writes it per kPa).
    SEAL_PER_PRESSURE = number!("friction.seal.per_kpa", "seal slope",
        "seal torque added per unit of hub gauge pressure", Group::Friction,
        Unit::Per(D::Torque, D::Pressure), Range::NonNegative, step(1.0e-8),
        |d| Some(d.friction.seal.per_pa_n_m), |d, v| { d.friction.seal.per_pa_n_m = v; true });
    /// Viscous brake c₁.
    BRAKE_VISCOUS = Input {
        vary: Some(Vary {
            name: "viscous",
            key: "viscous_n_m_s_rad",
            how: How::Field,
            search: Some(Search::Brake { power: 1 }),
            aliases: &["brake"],
        }),
        ..number!("friction.brake.viscous", "viscous c₁",
            "brake torque per unit speed, c₁ (torque = c₁·ω), SI in both unit systems",
            Group::Friction, Unit::Si("N·m·s"), Range::NonNegative, step(0.05),
            |d| Some(d.friction.brake.viscous), |d, v| { d.friction.brake.viscous = v; true })
    };
    /// Quadratic brake c₂.
    BRAKE_QUADRATIC = Input {
        vary: Some(Vary {
            name: "quadratic",
            key: "quadratic_n_m_s2_rad2",
            how: How::Field,
            search: Some(Search::Brake { power: 2 }),
            aliases: &[],
        }),
        ..number!("friction.brake.quadratic", "quadratic c₂",
            "brake torque per speed squared, c₂ (torque = c₂·ω²), SI in both unit systems",
            Group::Friction, Unit::Si("N·m·s²"), Range::NonNegative, step(0.01),
            |d| Some(d.friction.brake.quadratic), |d, v| { d.friction.brake.quadratic = v; true })
    };
    /// Arm drag coefficient.
    ARM_DRAG_CD = number!("friction.arm_drag_cd", "arm drag Cd",
        "drag coefficient of an arm tube in cross-flow", Group::Friction, Unit::None,
        Range::NonNegative, step(0.1),
        |d| Some(d.friction.arm_drag_cd), |d, v| { d.friction.arm_drag_cd = v; true });

    /// Median drop size (or auto).
    D50 = Input {
        path: "spray.d50",
        label: "median drop",
        help: "volume median drop diameter (auto: the model's estimate)",
        group: Group::Spray,
        unit: Unit::Dim(D::SmallLength),
        access: Access::Optional {
            get: |d| Some(d.spray.d50_m),
            set: |d, v| { d.spray.d50_m = v; true },
        },
        range: Range::Positive,
        step: step(0.1e-3),
        vary: None,
        editable: true,
    };
    /// Spread exponent (or auto).
    SPREAD = Input {
        path: "spray.spread",
        label: "spread n",
        help: "Rosin-Rammler spread exponent (auto: 2.5)",
        group: Group::Spray,
        unit: Unit::None,
        access: Access::Optional {
            get: |d| Some(d.spray.spread),
            set: |d, v| { d.spray.spread = v; true },
        },
        range: Range::Positive,
        step: step(0.1),
        vary: None,
        editable: true,
    };
    /// Largest drop (or auto).
    LARGEST = Input {
        path: "spray.largest",
        label: "largest drop",
        help: "largest drop diameter (auto: from the spectrum)",
        group: Group::Spray,
        unit: Unit::Dim(D::SmallLength),
        access: Access::Optional {
            get: |d| Some(d.spray.largest_m),
            set: |d, v| { d.spray.largest_m = v; true },
        },
        range: Range::Positive,
        step: step(0.1e-3),
        vary: None,
        editable: true,
    };

    /// No layout, square, rectangle or triangle.
    LAYOUT = Input {
        path: "layout",
        label: "pattern",
        help: "head layout for overlap and uniformity",
        group: Group::Layout,
        unit: Unit::None,
        access: Access::Choice {
            options: &["none", "square", "rectangle", "triangle"],
            get: |d| Some(match d.layout {
                None => 0,
                Some(Layout::Square { .. }) => 1,
                Some(Layout::Rectangle { .. }) => 2,
                Some(Layout::Triangle { .. }) => 3,
            }),
            set: |d, i, seed| {
                let s = d.layout.map_or(seed.spacing_m, |l| l.spacing_m());
                d.layout = match i {
                    0 => None,
                    1 => Some(Layout::Square { spacing_m: s }),
                    2 => Some(match d.layout {
                        Some(r @ Layout::Rectangle { .. }) => r,
                        _ => Layout::Rectangle { spacing_m: s, rows_m: s },
                    }),
                    _ => Some(Layout::Triangle { spacing_m: s }),
                };
                true
            },
        },
        range: Range::Unchecked,
        step: NO_STEP,
        vary: None,
        editable: true,
    };
    /// Head spacing of a square layout.
    SQUARE_SPACING = number!("layout.Square.spacing", "head spacing",
        "head spacing along a row and between rows", Group::Layout, Unit::Dim(D::Length),
        Range::Positive, step(0.5),
        |d| match d.layout { Some(Layout::Square { spacing_m }) => Some(spacing_m), _ => None },
        |d, v| match &mut d.layout {
            Some(Layout::Square { spacing_m }) => { *spacing_m = v; true }
            _ => false,
        });
    /// Head spacing along a row of a rectangular layout.
    RECTANGLE_SPACING = number!("layout.Rectangle.spacing", "head spacing",
        "head spacing along a row", Group::Layout, Unit::Dim(D::Length), Range::Positive,
        step(0.5),
        |d| match d.layout { Some(Layout::Rectangle { spacing_m, .. }) => Some(spacing_m), _ => None },
        |d, v| match &mut d.layout {
            Some(Layout::Rectangle { spacing_m, .. }) => { *spacing_m = v; true }
            _ => false,
        });
    /// Row spacing of a rectangular layout.
    RECTANGLE_ROWS = number!("layout.Rectangle.rows", "row spacing", "spacing between rows",
        Group::Layout, Unit::Dim(D::Length), Range::Positive, step(0.5),
        |d| match d.layout { Some(Layout::Rectangle { rows_m, .. }) => Some(rows_m), _ => None },
        |d, v| match &mut d.layout {
            Some(Layout::Rectangle { rows_m, .. }) => { *rows_m = v; true }
            _ => false,
        });
    /// Head spacing of a triangular layout.
    TRIANGLE_SPACING = number!("layout.Triangle.spacing", "head spacing",
        "head spacing along a row (rows 0.87 of it apart)", Group::Layout, Unit::Dim(D::Length),
        Range::Positive, step(0.5),
        |d| match d.layout { Some(Layout::Triangle { spacing_m }) => Some(spacing_m), _ => None },
        |d, v| match &mut d.layout {
            Some(Layout::Triangle { spacing_m }) => { *spacing_m = v; true }
            _ => false,
        });

    /// Scenario name.
    NAME = Input {
        path: "name",
        label: "name",
        help: "scenario name",
        group: Group::Site,
        unit: Unit::None,
        access: Access::Text {
            get: |d| d.name.clone(),
            set: |d, t| d.name = t.to_string(),
        },
        range: Range::Unchecked,
        step: NO_STEP,
        vary: None,
        editable: true,
    };
    /// Water temperature.
    WATER_TEMPERATURE = Input {
        vary: Some(Vary {
            name: "water_temperature",
            key: "water_temperature_c",
            how: How::Field,
            search: None,
            aliases: &[],
        }),
        ..number!("water.temperature", "water temp", "water temperature", Group::Site,
            Unit::Dim(D::Temperature),
            Range::Between {
                lo: 0.0,
                hi: 50.0,
                rule: "must be between 0 and 50 °C (32–122 °F), the range of the water property correlations",
            },
            step(1.0),
            |d| Some(d.water_temperature_c), |d, v| { d.water_temperature_c = v; true })
    };
    /// Air temperature.
    AIR_TEMPERATURE = number!("air.temperature", "air temp", "air temperature", Group::Site,
        Unit::Dim(D::Temperature),
        Range::Between { lo: -40.0, hi: 60.0, rule: "must be between -40 and 60 °C (-40–140 °F)" },
        step(1.0),
        |d| Some(d.site.air_temperature_c), |d, v| { d.site.air_temperature_c = v; true });
    /// Altitude.
    ALTITUDE = number!("air.altitude", "altitude", "site altitude", Group::Site,
        Unit::Dim(D::Length),
        Range::Between {
            lo: -500.0,
            hi: 11_000.0,
            rule: "must be between -500 m and 11000 m (the standard atmosphere's troposphere)",
        },
        step(50.0),
        |d| Some(d.site.altitude_m), |d, v| { d.site.altitude_m = v; true });
    /// Wind speed.
    WIND_SPEED = Input {
        vary: Some(Vary { name: "wind", key: "wind_m_s", how: How::Field, search: None, aliases: &[] }),
        ..number!("wind.speed", "wind", "wind speed at nozzle height", Group::Site,
            Unit::Dim(D::Speed), Range::NonNegative, step(0.5),
            |d| Some(d.wind.speed_m_s), |d, v| { d.wind.speed_m_s = v; true })
    };
    /// Direction the wind blows from.
    WIND_FROM = number!("wind.from", "wind from, ccw of +x",
        "direction the wind blows from, degrees counter-clockwise from +x (right on the depth map; 90 = from +y, the top)",
        Group::Site, Unit::Dim(D::Angle), Range::Any,
        // 5° fine, 45° (an eighth of a turn) coarse.
        Step { fine: 5.0 * DEG, coarse: 9.0 },
        |d| Some(d.wind.from_rad), |d, v| { d.wind.from_rad = v; true });
}
