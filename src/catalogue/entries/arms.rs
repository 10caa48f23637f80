//! The rotor: hub, arm count, inertia, and the inputs every arm has.

use super::*;
use crate::catalogue::vary::{ArmRule, How, Search, Vary};
use crate::catalogue::{step, Access, Group, Input, Range, Unit, NO_STEP};
use crate::physics::design::Inertia;
use crate::units::Dimension as D;

catalogue! {
    /// Hub radius (inner end of arm drag).
    HUB_RADIUS = Input {
        vary: Some(Vary::field("hub_radius", "hub_radius_m")),
        ..number!("rotor.hub_radius", "hub radius", "where the arms leave the hub",
        Group::Arms, Unit::Dim(D::SmallLength), Range::NonNegative, step(1.0e-3),
        |d| Some(d.rotor.hub_radius_m), |d, v| { d.rotor.hub_radius_m = v; true })
    };
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
    INERTIA_GIVEN = Input {
        vary: Some(Vary::field("inertia", "inertia_kg_m2")),
        ..number!("rotor.inertia.Given", "inertia value",
        "mass moment of inertia about the spin axis", Group::Arms, Unit::Dim(D::Inertia),
        Range::Positive, step(1.0e-4),
        |d| match d.rotor.inertia { Inertia::Given { kg_m2 } => Some(kg_m2), _ => None },
        |d, v| match &mut d.rotor.inertia {
            Inertia::Given { kg_m2 } => { *kg_m2 = v; true }
            _ => false,
        })
    };
    /// Tube material density (estimate).
    TUBE_DENSITY = Input {
        vary: Some(Vary::field("tube_density", "tube_density_kg_m3")),
        ..number!("rotor.inertia.Estimate.tube_density", "tube density",
        "arm tube material density (brass about 8500 kg/m³)", Group::Arms,
        Unit::Dim(D::Density), Range::Positive, step(100.0),
        |d| estimate(&d.rotor.inertia).map(|e| e.0),
        |d, v| match &mut d.rotor.inertia {
            Inertia::Estimate { tube_density_kg_m3, .. } => { *tube_density_kg_m3 = v; true }
            _ => false,
        })
    };
    /// Tube wall (estimate).
    TUBE_WALL = Input {
        vary: Some(Vary::field("tube_wall", "tube_wall_m")),
        ..number!("rotor.inertia.Estimate.tube_wall", "tube wall",
        "arm tube wall thickness", Group::Arms, Unit::Dim(D::SmallLength), Range::Positive,
        step(0.1e-3),
        |d| estimate(&d.rotor.inertia).map(|e| e.1),
        |d, v| match &mut d.rotor.inertia {
            Inertia::Estimate { tube_wall_m, .. } => { *tube_wall_m = v; true }
            _ => false,
        })
    };
    /// Tip mass (estimate).
    TIP_MASS = Input {
        vary: Some(Vary::field("tip_mass", "tip_mass_kg")),
        ..number!("rotor.inertia.Estimate.tip_mass", "tip mass",
        "mass of each nozzle body at an arm tip", Group::Arms, Unit::Dim(D::Mass),
        Range::NonNegative, step(1.0e-3),
        |d| estimate(&d.rotor.inertia).map(|e| e.2),
        |d, v| match &mut d.rotor.inertia {
            Inertia::Estimate { tip_mass_kg, .. } => { *tip_mass_kg = v; true }
            _ => false,
        })
    };

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
    AZIMUTH = Input {
        vary: Some(Vary::arms("azimuth", "azimuth_rad", ArmRule::Shift)),
        ..arm!("rotor.arms[].azimuth", "azimuth", "arm direction around the hub",
        Unit::Dim(D::Angle), Range::Any, step(5.0 * DEG), |a| a.azimuth_rad)
    };
    /// Rise of the arm from the swivel to the nozzle (per arm).
    RISE = Input {
        vary: Some(Vary::arms("rise", "rise_m", ArmRule::Shift)),
        ..arm!("rotor.arms[].rise", "rise", "arm rise from the swivel to the nozzle",
        Unit::Dim(D::SmallLength), Range::Any, step(5.0e-3), |a| a.rise_m)
    };
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
    TUBE_OUTER = Input {
        vary: Some(Vary::arms("tube_outer", "tube_outer_m", ArmRule::Scale)),
        ..arm!("rotor.arms[].tube.outer", "tube outside",
        "arm tube outside diameter (air drag)", Unit::Dim(D::SmallLength), Range::Positive,
        step(0.5e-3), |a| a.tube.outer_m)
    };
    /// Tube wall roughness (per arm).
    TUBE_ROUGHNESS = Input {
        vary: Some(Vary::arms("tube_roughness", "tube_roughness_m", ArmRule::Shift)),
        ..arm!("rotor.arms[].tube.roughness", "tube roughness",
        "arm tube wall roughness", Unit::Dim(D::SmallLength), Range::NonNegative, step(1.0e-6),
        |a| a.tube.roughness_m)
    };
    /// Minor losses along the arm (per arm).
    TUBE_MINOR_K = Input {
        vary: Some(Vary::arms("tube_minor_k", "tube_minor_k", ArmRule::Shift)),
        ..arm!("rotor.arms[].tube.minor_k", "tube fittings K",
        "elbows and entry along the arm, in velocity heads", Unit::None, Range::NonNegative,
        step(0.1), |a| a.tube.minor_k)
    };
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
}
