//! Supply and swivel.

use super::*;
use crate::catalogue::vary::{How, Vary};
use crate::catalogue::{line, line_mut, step, Access, Group, Input, Range, Unit, NO_STEP};
use crate::physics::design::{Line, Supply};
use crate::units::Dimension as D;

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
    LINE_LENGTH = Input {
        vary: Some(Vary::field("hose_length", "hose_length_m")),
        ..number!("supply.Line.length", "hose length",
        "hose length from the source to the sprinkler", Group::Supply, Unit::Dim(D::Length),
        Range::Positive, step(0.5),
        |d| line(d).map(|l| l.length_m), |d, v| line_mut(d).map(|l| l.length_m = v).is_some())
    };
    /// Hose bore.
    LINE_BORE = Input {
        vary: Some(Vary::field("hose_bore", "hose_bore_m")),
        ..number!("supply.Line.bore", "hose bore", "hose inside diameter", Group::Supply,
        Unit::Dim(D::SmallLength), Range::Positive, step(1.0e-3),
        |d| line(d).map(|l| l.bore_m), |d, v| line_mut(d).map(|l| l.bore_m = v).is_some())
    };
    /// Hose wall roughness.
    LINE_ROUGHNESS = Input {
        vary: Some(Vary::field("hose_roughness", "hose_roughness_m")),
        ..number!("supply.Line.roughness", "hose roughness", "hose wall roughness",
        Group::Supply, Unit::Dim(D::SmallLength), Range::NonNegative, step(1.0e-6),
        |d| line(d).map(|l| l.roughness_m),
        |d, v| line_mut(d).map(|l| l.roughness_m = v).is_some())
    };
    /// Hose minor losses.
    LINE_MINOR_K = Input {
        vary: Some(Vary::field("hose_minor_k", "hose_minor_k")),
        ..number!("supply.Line.minor_k", "hose fittings K",
        "fittings and couplings, in velocity heads", Group::Supply, Unit::None,
        Range::NonNegative, step(0.1),
        |d| line(d).map(|l| l.minor_k), |d, v| line_mut(d).map(|l| l.minor_k = v).is_some())
    };
    /// Rise from the source to the inlet.
    LINE_LIFT = Input {
        vary: Some(Vary::field("lift", "lift_m")),
        ..number!("supply.Line.lift", "lift to inlet",
        "rise from the source to the inlet (negative: downhill)", Group::Supply,
        Unit::Dim(D::Length), Range::Any, step(0.1),
        |d| line(d).map(|l| l.lift_m), |d, v| line_mut(d).map(|l| l.lift_m = v).is_some())
    };
    /// Swivel inlet bore.
    SWIVEL_BORE = Input {
        vary: Some(Vary::field("swivel_bore", "swivel_bore_m")),
        ..number!("rotor.swivel.inlet_bore", "swivel bore", "swivel inlet bore",
        Group::Supply, Unit::Dim(D::SmallLength), Range::Positive, step(0.5e-3),
        |d| Some(d.rotor.swivel.inlet_bore_m), |d, v| { d.rotor.swivel.inlet_bore_m = v; true })
    };
    /// Swivel loss coefficient.
    SWIVEL_K = Input {
        vary: Some(Vary::field("swivel_k", "swivel_k")),
        ..number!("rotor.swivel.k", "swivel K", "swivel loss, in velocity heads",
        Group::Supply, Unit::None, Range::NonNegative, step(0.1),
        |d| Some(d.rotor.swivel.k), |d, v| { d.rotor.swivel.k = v; true })
    };
}
