//! Spray, head layout, name, water, air and wind.

use super::*;
use crate::catalogue::vary::{How, Vary};
use crate::catalogue::{step, Access, Group, Input, Range, Step, Unit, NO_STEP};
use crate::physics::design::Layout;
use crate::units::Dimension as D;

catalogue! {
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
        vary: Some(Vary::field("d50", "d50_m")),
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
        vary: Some(Vary::field("spread", "spread")),
        editable: true,
    };
    /// Largest drop (or auto).
    LARGEST = Input {
        path: "spray.largest",
        label: "largest drop",
        help: "largest drop diameter (auto: the nozzle diameter, at most 9 mm)",
        group: Group::Spray,
        unit: Unit::Dim(D::SmallLength),
        access: Access::Optional {
            get: |d| Some(d.spray.largest_m),
            set: |d, v| { d.spray.largest_m = v; true },
        },
        range: Range::Positive,
        step: step(0.1e-3),
        vary: Some(Vary::field("largest", "largest_m")),
        editable: true,
    };
    /// Jet breakup coefficient (or auto).
    BREAKUP = Input {
        path: "spray.breakup",
        label: "jet breakup C_b",
        help: "intact jet length over d·√(ρw/ρair) (auto: 11, Valencia et al. 2022; 6.6–8.2 for well-made nozzles)",
        group: Group::Spray,
        unit: Unit::None,
        access: Access::Optional {
            get: |d| Some(d.spray.breakup),
            set: |d, v| { d.spray.breakup = v; true },
        },
        range: Range::Between {
            lo: 2.0,
            hi: 22.0,
            rule: "must be from 2 to 22 (a plausible jet; the published default is 11), or Auto",
        },
        step: step(0.5),
        vary: Some(Vary::field("breakup", "breakup")),
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
    SQUARE_SPACING = Input {
        vary: Some(Vary { how: How::LayoutSpacing, ..Vary::field("spacing", "spacing_m") }),
        ..number!("layout.Square.spacing", "head spacing",
        "head spacing along a row and between rows", Group::Layout, Unit::Dim(D::Length),
        Range::Positive, step(0.5),
        |d| match d.layout { Some(Layout::Square { spacing_m }) => Some(spacing_m), _ => None },
        |d, v| match &mut d.layout {
            Some(Layout::Square { spacing_m }) => { *spacing_m = v; true }
            _ => false,
        })
    };
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
    RECTANGLE_ROWS = Input {
        vary: Some(Vary::field("rows", "rows_m")),
        ..number!("layout.Rectangle.rows", "row spacing", "spacing between rows",
        Group::Layout, Unit::Dim(D::Length), Range::Positive, step(0.5),
        |d| match d.layout { Some(Layout::Rectangle { rows_m, .. }) => Some(rows_m), _ => None },
        |d, v| match &mut d.layout {
            Some(Layout::Rectangle { rows_m, .. }) => { *rows_m = v; true }
            _ => false,
        })
    };
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
    AIR_TEMPERATURE = Input {
        vary: Some(Vary::field("air_temperature", "air_temperature_c")),
        ..number!("air.temperature", "air temp", "air temperature", Group::Site,
        Unit::Dim(D::Temperature),
        Range::Between { lo: -40.0, hi: 60.0, rule: "must be between -40 and 60 °C (-40–140 °F)" },
        step(1.0),
        |d| Some(d.site.air_temperature_c), |d, v| { d.site.air_temperature_c = v; true })
    };
    /// Altitude.
    ALTITUDE = Input {
        vary: Some(Vary::field("altitude", "altitude_m")),
        ..number!("air.altitude", "altitude", "site altitude", Group::Site,
        Unit::Dim(D::Length),
        Range::Between {
            lo: -500.0,
            hi: 11_000.0,
            rule: "must be between -500 m and 11000 m (the standard atmosphere's troposphere)",
        },
        step(50.0),
        |d| Some(d.site.altitude_m), |d, v| { d.site.altitude_m = v; true })
    };
    /// Height of the lowest thing overhead (or none).
    CLEARANCE = Input {
        path: "clearance",
        label: "overhead clearance",
        help: "height of the lowest thing overhead (lines, eaves): jets peaking above it are warned of",
        group: Group::Site,
        unit: Unit::Dim(D::Length),
        access: Access::Optional {
            get: |d| Some(d.site.clearance_m),
            set: |d, v| { d.site.clearance_m = v; true },
        },
        range: Range::Between {
            lo: 0.0,
            hi: 1000.0,
            rule: "must be between 0 and 1000 m (the height of the lowest thing overhead)",
        },
        step: step(0.5),
        vary: Some(Vary::field("clearance", "clearance_m")),
        editable: true,
    };
    /// Wind speed.
    WIND_SPEED = Input {
        vary: Some(Vary { name: "wind", key: "wind_m_s", how: How::Field, search: None, aliases: &[] }),
        ..number!("wind.speed", "wind", "wind speed at nozzle height", Group::Site,
            Unit::Dim(D::Speed), Range::NonNegative, step(0.5),
            |d| Some(d.wind.speed_m_s), |d, v| { d.wind.speed_m_s = v; true })
    };
    /// Direction the wind blows from.
    WIND_FROM = Input {
        vary: Some(Vary::field("wind_from", "wind_from_rad")),
        ..number!("wind.from", "wind from, ccw of +x",
        "direction the wind blows from, degrees counter-clockwise from +x (right on the depth map; 90 = from +y, the top)",
        Group::Site, Unit::Dim(D::Angle), Range::Any,
        // 5° fine, 45° (an eighth of a turn) coarse.
        Step { fine: 5.0 * DEG, coarse: 9.0 },
        |d| Some(d.wind.from_rad), |d, v| { d.wind.from_rad = v; true })
    };
}
