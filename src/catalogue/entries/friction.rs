//! Bearing, seal, brake and arm drag.

use super::*;
use crate::catalogue::vary::{How, Search, Vary};
use crate::catalogue::{step, washer, washer_mut, Access, Group, Input, Range, Unit, NO_STEP};
use crate::physics::design::{Bearing, WasherRule};
use crate::units::Dimension as D;

catalogue! {
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
    WASHER_INNER = Input {
        vary: Some(Vary::field("washer_inner", "washer_inner_m")),
        ..number!("friction.bearing.Washer.inner", "washer inner r",
        "washer inner radius", Group::Friction, Unit::Dim(D::SmallLength), Range::NonNegative,
        step(0.5e-3),
        |d| washer(d).map(|w| w.inner_m), |d, v| washer_mut(d).map(|w| w.inner_m = v).is_some())
    };
    /// Washer outer radius.
    WASHER_OUTER = Input {
        vary: Some(Vary::field("washer_outer", "washer_outer_m")),
        ..number!("friction.bearing.Washer.outer", "washer outer r",
        "washer outer radius", Group::Friction, Unit::Dim(D::SmallLength), Range::Positive,
        step(0.5e-3),
        |d| washer(d).map(|w| w.outer_m), |d, v| washer_mut(d).map(|w| w.outer_m = v).is_some())
    };
    /// Area on which hub pressure lifts the rotor.
    THRUST_AREA = Input {
        vary: Some(Vary::field("thrust_area", "thrust_area_m2")),
        ..number!("friction.bearing.Washer.thrust_area", "thrust area",
        "area on which hub pressure lifts the rotor", Group::Friction, Unit::Dim(D::Area),
        Range::NonNegative, step(5.0e-6),
        |d| washer(d).map(|w| w.thrust_area_m2),
        |d, v| washer_mut(d).map(|w| w.thrust_area_m2 = v).is_some())
    };
    /// Mass of the rotating part.
    ROTOR_MASS = Input {
        vary: Some(Vary::field("rotor_mass", "rotor_mass_kg")),
        ..number!("friction.bearing.Washer.rotor_mass", "rotor mass",
        "mass of the rotating part", Group::Friction, Unit::Dim(D::Mass), Range::Positive,
        step(10.0e-3),
        |d| washer(d).map(|w| w.rotor_mass_kg),
        |d, v| washer_mut(d).map(|w| w.rotor_mass_kg = v).is_some())
    };
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
    SEAL_BASE = Input {
        vary: Some(Vary::field("seal", "seal_n_m")),
        ..number!("friction.seal.base", "seal drag", "seal torque at zero pressure",
        Group::Friction, Unit::Dim(D::Torque), Range::NonNegative, step(1.0e-3),
        |d| Some(d.friction.seal.base_n_m), |d, v| { d.friction.seal.base_n_m = v; true })
    };
    /// Seal torque added per unit of hub pressure (the file writes it per kPa).
    SEAL_PER_PRESSURE = Input {
        vary: Some(Vary::field("seal_per_pressure", "seal_per_pressure_n_m_pa")),
        ..number!("friction.seal.per_kpa", "seal slope",
        "seal torque added per unit of hub gauge pressure", Group::Friction,
        Unit::Per(D::Torque, D::Pressure), Range::NonNegative, step(1.0e-8),
        |d| Some(d.friction.seal.per_pa_n_m), |d, v| { d.friction.seal.per_pa_n_m = v; true })
    };
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
    ARM_DRAG_CD = Input {
        vary: Some(Vary::field("arm_drag_cd", "arm_drag_cd")),
        ..number!("friction.arm_drag_cd", "arm drag Cd",
        "drag coefficient of an arm tube in cross-flow", Group::Friction, Unit::None,
        Range::NonNegative, step(0.1),
        |d| Some(d.friction.arm_drag_cd), |d, v| { d.friction.arm_drag_cd = v; true })
    };
}
